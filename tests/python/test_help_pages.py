"""The help pages shown in ParaView's help browser (plugin/help/make_help.py).

Checks the pages the build made: every output array and table column of
filters/WallLoadsColumns.h listed with its unit, array pickers showing their
real default (never the index "0" ParaView's own pages show), no "must
contain" restriction for optional arrays, the overview page with both paths,
and the table of contents of the compiled help.
"""
import os
import re
import sys

import wl_testing as T

SRC = os.environ["WALLLOADS_SOURCE_DIR"]
HELP = os.path.join(os.path.dirname(os.environ["WALLLOADS_TEST_OUTPUT"]), "plugin", "paraview_help")
sys.path.insert(0, os.path.join(SRC, "plugin", "help"))
import make_help  # noqa: E402

cols = make_help.parse_columns(os.path.join(SRC, "filters", "WallLoadsColumns.h"))
wt = open(os.path.join(HELP, "filters.WallTraction.html")).read()
li = open(os.path.join(HELP, "filters.LoadIntegration.html")).read()
overview = open(os.path.join(HELP, "wallloads_overview.html")).read()


def row_of(page, name):
    m = re.search(r"<tr><td>%s</td><td>([^<]*)</td>" % re.escape(name), page)
    return m.group(1) if m else None


missing = [(n, u) for n, u, c, m in cols["WALLLOADS_FACE_ARRAYS"] + cols["WALLLOADS_TRACTION_FIELDS"]
           if row_of(wt, n) != (u or "-")]
T.expect("Wall Traction page: every output array and field value with its unit", not missing, str(missing))
loads = [(e[1], e[2]) for e in cols["WALLLOADS_LOAD_COLUMNS"]] + \
    [(n, u) for n, u, c, m in cols["WALLLOADS_REFERENCE_COLUMNS"] + cols["WALLLOADS_REGION_COLUMNS"]]
missing = [(n, u) for n, u in loads if row_of(li, n) != (u or "-")]
T.expect("Load Integration page: every table column with its unit", not missing, str(missing))
T.expect("Load Integration page: the summary's column names with units",
         all(s in li for s in ("Boundary", "Drag [N]", "Wetted Area [m^2]", "Dynamic Pressure [Pa]")))
T.expect("no 'must contain' restriction for the optional arrays", "must contain" not in wt + li)
defaults = re.findall(r"<code>(Pressure|DensityArray|RegionArray|ShearStressArray)</code></td><td>.*?</td><td>([^<]*)</td>",
                      wt + li)
T.expect("array pickers show their real default",
         dict(defaults) == {"Pressure": "Automatic", "DensityArray": "None", "RegionArray": "None",
                            "ShearStressArray": "the first 3-component floating-point array (the only one, when there is one)"},
         str(defaults))
sp = open(os.path.join(HELP, "filters.ShearProjection.html")).read()
missing = [(n, u) for n, u, c, m in cols["WALLLOADS_SHEAR_ARRAYS"] if row_of(sp, n) != (u or "-")]
T.expect("Shear Projection page: every output array with its unit", not missing, str(missing))
defaults = dict(re.findall(r"<code>(\w+)</code></td><td>.*?</td><td>([^<]*)</td>", sp))
T.expect("Shear Projection page: Velocity's real default, None for every optional picker",
         defaults.get("Velocity", "").startswith("the first 3-component")
         and all(defaults.get(k) == "None" for k in ("WallVelocity", "VelocityGradient", "ViscosityArray",
                                                     "TurbulentViscosityArray", "DensityArray")), str(defaults))
T.expect("Shear Projection page: no 'must contain' restriction", "must contain" not in sp)
ld = open(os.path.join(HELP, "filters.LoadDistribution.html")).read()
missing = [(n, u) for n, u, c, m in cols["WALLLOADS_DISTRIBUTION_COLUMNS"] + cols["WALLLOADS_DISTRIBUTION_FIELDS"]
           if row_of(ld, n) != (u or "-")]
T.expect("Load Distribution page: every table column and field value with its unit", not missing, str(missing))
T.expect("Load Distribution page: every property documented, with its default",
         all("<code>%s</code>" % p in ld for p in ("AxisOrigin", "AxisDirection", "NumberOfBins", "UseCustomRange",
                                                    "Range", "MomentCentre", "DragDirection", "LiftDirection")))
T.expect("when a property is shown is stated", "shown when Shear Source is 'Wall shear stress array'" in wt)
T.expect("panel labels and scripting names", "<b>Reference Pressure</b><br/><code>ReferencePressure</code>" in wt)
T.expect("overview: what each filter does and both paths",
         all(s in overview for s in ("Surface path", "Volume path", "Shear Projection", "Load Summary",
                                     "One reference state", "engineering judgement")))
lh = open(os.path.join(HELP, "filters.LoadHistory.html")).read()
missing = [(n, u) for n, u, c, m in cols["WALLLOADS_STATISTICS_COLUMNS"] if row_of(lh, n) != (u or "-")]
T.expect("Load History page: every statistics column with its unit", not missing, str(missing))
T.expect("Load History page: every property documented",
         all("<code>%s</code>" % p in lh for p in ("TimeRange", "Stride", "StatisticsStart", "ReferenceLength",
                                                   "ReferenceSpeed", "UseCustomTimeRange",
                                                   "UseCustomStatisticsStart")))
qhp = open(os.path.join(HELP, "WallLoads.qhp")).read()
T.expect("table of contents: the overview first, then every filter",
         re.search(r"<toc><section title=\"WallLoads\" ref=\"wallloads_overview.html\">"
                   r"<section title=\"Overview and workflows\"", qhp) is not None
         and all('ref="filters.%s.html"' % n in qhp for n in ("WallTraction", "LoadIntegration", "ShearProjection", "LoadDistribution")))
T.expect("table of contents: Load History", 'ref="filters.LoadHistory.html"' in qhp)
T.expect("the compiled help exists", os.path.getsize(os.path.join(HELP, "WallLoads.qch")) > 10000)
T.done("test_help_pages")
