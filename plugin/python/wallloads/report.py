"""``wallloads-report``: cases and a TOML config in; CSV, JSON, PNG and a
self-contained HTML report out, per case, with an index over all cases.

Run by pvbatch (the ``wallloads-report`` launcher arranges the plugin, the
Python path and the expat fix on every rank), so ``mpirun -np N
wallloads-report ...`` runs the filters on N ranks while this script, on rank
0, writes the files.  Thin Python over the C++ filters: Wall Traction (and
Shear Projection when the shear comes from the volume), Load Integration, and
Load History / Load Distribution where this build has them.

Exit codes: 0 every case done, 1 a case failed (the others still reported),
2 bad command line or configuration.
"""
import datetime
import os
import platform
import sys
import time as _time
import traceback

from . import batch, cases, config as C, htmlreport, outputs, render, sweep

__all__ = ["run", "version"]

CAUTION = ("These results support, and do not replace, engineering judgement, the applicable local "
           "codes and standards, and licensed professional practice.")

#: Units of the Load Distribution table (issue 10), used when its arrays carry none.
DISTRIBUTION_UNITS = {"Bin": "-", "Start": "m", "End": "m", "Centre": "m", "Area": "m^2",
                      "Pressure Force Per Length": "N/m", "Viscous Force Per Length": "N/m",
                      "Force Per Length": "N/m", "Drag Per Length": "N/m", "Side Force Per Length": "N/m",
                      "Lift Per Length": "N/m", "Cumulative Force": "N", "Moment": "N m"}
STATISTICS_UNITS = {"Samples": "-", "Statistics Start": "s", "Integrated Autocorrelation Time": "s",
                    "Dominant Frequency": "Hz", "Strouhal Number": "-"}

ORIENTATION = {"into-wall": 0, "into-fluid": 1, "wall-normal-array": 2}
KIND = {"static": 0, "per-unit-density": 1}
VISCOSITY_KIND = {"dynamic": 0, "kinematic": 1}
SHEAR_SOURCE = {"none": 0, "array": 1, "gradient": 2}
METHOD = {"near-wall-difference": 0, "gradient-tensor": 1, "wall-fit": 2, "wall-law": 3}


def version():
    try:
        from . import _paths
        return _paths.VERSION
    except ImportError:
        return "unknown"


def paraview_version():
    try:
        from paraview import servermanager
        return "%d.%d.%d" % (servermanager.vtkSMProxyManager.GetVersionMajor(),
                             servermanager.vtkSMProxyManager.GetVersionMinor(),
                             servermanager.vtkSMProxyManager.GetVersionPatch())
    except Exception:
        return "unknown"


class Progress:
    """Progress lines on stderr: '[k/n] case: what'."""

    def __init__(self, total):
        self.total = total
        self.index = 0
        self.name = ""

    def case(self, index, name):
        self.index, self.name = index, name

    def __call__(self, text):
        _stderr("[%d/%d] %s: %s\n" % (self.index, self.total, self.name, text))


class CaseResult:
    def __init__(self, name, path):
        self.name, self.path = name, path
        self.status, self.error = "failed", ""
        self.rows, self.units, self.record = {}, {}, {}
        self.seconds = 0.0
        self.cell_size = {}


# ---------------------------------------------------------------------------
# Entry point
# ---------------------------------------------------------------------------

def _stderr(text):
    """Straight to the process's stderr: in pvbatch, sys.stderr goes through
    VTK's output window as error text, where batch.watch() would see it."""
    sys.stdout.flush()
    os.write(2, text.encode("utf-8", "replace"))


def _err(text):
    _stderr("wallloads-report: error: %s\n" % text)


def run(argv):
    try:
        settings, flags = C.parse(argv)
        if flags["help"]:
            sys.stdout.write(C.help_text(version()))
            return 0
        if flags["version"]:
            sys.stdout.write("wallloads-report %s (ParaView %s)\n" % (version(), paraview_version()))
            return 0
        if flags["print_config"]:
            sys.stdout.write(C.to_toml(settings))
            return 0
        if settings["output.images"] == "yes" and not render.available():
            raise C.ConfigError("output.images = 'yes' but there is no X display (DISPLAY is unset): "
                                "run under Xvfb, or use --images auto|no")
        out_dir = os.path.abspath(settings["output.directory"])
        if os.path.exists(out_dir) and not os.path.isdir(out_dir):
            raise C.ConfigError("output directory %s exists and is not a folder" % out_dir)
        made_out_dir = not os.path.exists(out_dir)
        try:
            os.makedirs(out_dir, exist_ok=True)
            probe = os.path.join(out_dir, ".wallloads-write-test-%d" % os.getpid())
            with open(probe, "w"):
                pass
            os.unlink(probe)
        except OSError as exc:
            raise C.ConfigError("output directory %s cannot be written: %s" % (out_dir, exc.strerror or exc))
    except C.ConfigError as exc:
        _err(exc)
        return 2
    started = _time.time()
    simple = batch.load_plugin(threads=False)
    batch.use_threads(settings["run.smp_backend"])
    study = bool(settings["convergence.cases"])
    paths = settings["convergence.cases"] if study else settings["cases"]
    names = _case_names(paths, ["fine", "medium", "coarse"] if study else None)
    progress = Progress(len(paths))
    results = []
    for i, (path, name) in enumerate(zip(paths, names), 1):
        progress.case(i, name)
        results.append(report_case(simple, settings, path, name, out_dir, progress, study))
    study_result = None
    if study:
        study_result = sweep.convergence_study(settings, results, out_dir)
    done = [r for r in results if r.status == "done"]
    failed = [r for r in results if r.status != "done"]
    if done:
        sweep.write_index(settings, results, study_result, out_dir, CAUTION, version())
    elif made_out_dir and os.path.isdir(out_dir) and not os.listdir(out_dir):
        os.rmdir(out_dir)           # nothing reported: leave no trace
    for r in failed:
        _err("case %s (%s) failed: %s" % (r.name, r.path, r.error))
    _stderr("wallloads-report: %d case%s, %d done, %d failed, %.1f s%s\n" % (
        len(results), "" if len(results) == 1 else "s", len(done), len(failed), _time.time() - started,
        (": " + os.path.join(out_dir, "index.html")) if done else ""))
    if study and study_result is None:
        return 1
    return 0 if not failed else 1


def _case_names(paths, fixed=None):
    """A folder name per case: the file name without extension, made unique."""
    if fixed:
        return fixed
    names = []
    for p in paths:
        base = os.path.splitext(os.path.basename(p))[0] or "case"
        name, k = base, 2
        while name in names:
            parent = os.path.basename(os.path.dirname(p))
            name = "%s-%s" % (parent, base) if k == 2 and parent else "%s-%d" % (base, k)
            k += 1
        names.append(name)
    return names


# ---------------------------------------------------------------------------
# One case
# ---------------------------------------------------------------------------

def report_case(simple, settings, path, name, out_dir, progress, study=False):
    result = CaseResult(name, path)
    t0 = _time.time()
    stage = None
    made = []
    try:
        stage = outputs.Staging(os.path.join(out_dir, name))
        _run_case(simple, settings, path, name, stage, progress, result, made, study)
        stage.commit()
        result.status = "done"
        result.seconds = _time.time() - t0
        progress("done in %.1f s -> %s" % (result.seconds, os.path.join(out_dir, name)))
    except (cases.CaseError, batch.PipelineError) as exc:
        result.error = str(exc)
        progress("FAILED: %s" % exc)
    except Exception as exc:  # a defect of ours: say so, keep going with the other cases
        result.error = "internal error (%s: %s); please report it with the traceback above" % (
            type(exc).__name__, exc)
        traceback.print_exc()
        progress("FAILED: %s" % result.error)
    finally:
        if stage is not None and result.status != "done":
            stage.discard()
        for proxy in reversed(made):
            try:
                simple.Delete(proxy)
            except Exception:
                pass
    return result


def _times(reader):
    values = reader.TimestepValues
    if values is None:
        return []
    if isinstance(values, (int, float)):
        return [float(values)]
    return [float(t) for t in values]


def _select_times(settings, times):
    if not times:
        return [], None
    sel = times
    if settings["time.range"]:
        t0, t1 = settings["time.range"]
        span = max(abs(t0), abs(t1), 1.0) * 1e-12
        sel = [t for t in times if t0 - span <= t <= t1 + span]
        if not sel:
            raise cases.CaseError("time.range [%g, %g] s holds none of the case's %d time steps (%g to %g s)"
                                  % (t0, t1, len(times), times[0], times[-1]))
    sel = sel[::settings["time.stride"]]
    rt = settings["time.report"]
    if rt == "last":
        report = sel[-1]
    else:
        report = min(times, key=lambda t: abs(t - rt))
    return sel, report


def _run_case(simple, settings, path, name, stage, progress, result, made, study):
    progress("reading %s" % path)
    with batch.watch() as w:
        reader, fmt = cases.open_case(simple, path)
    made.append(reader)
    try:
        files, checksum = cases.case_files(path)
    except OSError as exc:
        raise cases.CaseError("case file %s cannot be read: %s" % (path, exc.strerror or exc)) from None
    if w.errors:
        raise cases.CaseError("case file %s cannot be read: %s" % (path, w.message()))
    times = _times(reader)
    selected, t_report = _select_times(settings, times)
    t = t_report if t_report is not None else None
    with batch.watch() as w:
        blocks = cases.blocks_of(simple, reader, t)
    if w.errors:
        raise cases.CaseError("case file %s cannot be read: %s" % (path, w.message()))
    if not blocks or all(b.cells == 0 for b in blocks):
        raise cases.CaseError("case file %s holds no cells%s" % (
            path, (": " + w.message()) if w.errors else " (empty or unreadable)"))
    if fmt.startswith("CGNS") and _ranks() > 1 and not any(b.dimension == 2 for b in blocks):
        raise cases.CaseError("case file %s: ParaView 5.11's CGNS reader loads no boundary patches when it "
                              "runs on more than one rank (here %d); report CGNS cases without mpirun, or "
                              "give the walls as a surface file" % (path, _ranks()))
    if fmt.startswith("Exodus") and _ranks() > 1:
        raise cases.CaseError("case file %s: Exodus II cases cannot run on more than one rank (here %d): "
                              "ParaView 5.11's Exodus reader gives every block to the first rank and none to "
                              "the others, and the loads per block need the same blocks on every rank; "
                              "report Exodus cases without mpirun" % (path, _ranks()))
    walls, volumes, notes = cases.select_blocks(blocks, settings["walls.blocks"])
    composite = any(b.selector for b in blocks)
    if composite:
        wall_src = simple.ExtractBlock(Input=reader, Selectors=[b.selector for b in walls])
        made.append(wall_src)
    else:
        wall_src = reader
    batch.update(wall_src, t)
    wall_arrays = cases.arrays_of(wall_src)
    volume_src, volume_arrays = None, []
    if volumes:
        volume_src = simple.ExtractBlock(Input=reader, Selectors=[b.selector for b in volumes])
        made.append(volume_src)
    choices = {"walls": [b.path or b.name for b in walls], "volume": [b.path or b.name for b in volumes]}
    progress("%d wall block%s (%d faces)%s, %s" % (
        len(walls), "" if len(walls) == 1 else "s", sum(b.cells for b in walls),
        ", volume of %d cells" % sum(b.cells for b in volumes) if volumes else "",
        "%d time steps" % len(times) if len(times) > 1 else "steady"))

    # -- pressure ------------------------------------------------------------
    s = settings
    p_choice = s["pressure.array"]
    if p_choice == "none":
        pressure = None
    elif p_choice == "auto":
        pressure = cases.pick_array(wall_arrays, 1, "press")
        if pressure is None:
            notes.append("no 1-component floating-point array on the walls: no pressure load")
    else:
        pressure = cases.find_array(wall_arrays, p_choice, 1, "pressure")
    choices["pressure"] = {"array": pressure[1] if pressure else None,
                           "association": pressure[0] if pressure else None, "how": p_choice}

    # -- shear ----------------------------------------------------------------
    source = s["shear.source"]
    shear_arr = gradient = velocity = None
    if volume_src is not None and source in ("auto", "volume"):
        batch.update(volume_src, t)
        volume_arrays = cases.arrays_of(volume_src)
    if source == "auto":
        shear_arr = cases.pick_array([a for a in wall_arrays if "shear" in a[1].lower()], 3, "shear") \
            if s["shear.array"] == "auto" else cases.find_array(wall_arrays, s["shear.array"], 3,
                                                                 "wall shear stress")
        if shear_arr:
            source = "array"
        else:
            gradient = cases.pick_array(wall_arrays, 9, "grad") if s["shear.gradient"] == "auto" \
                else cases.find_array(wall_arrays, s["shear.gradient"], 9, "velocity gradient")
            if gradient:
                source = "gradient"
            elif volume_src is not None and cases.pick_array(
                    [a for a in volume_arrays if a[0] == "CELLS"], 3, "vel"):
                source = "volume"
            else:
                source = "none"
                notes.append("no wall shear stress, velocity gradient or volume velocity found: the "
                             "viscous loads are zero (set shear.source)")
    if source == "array" and shear_arr is None:
        shear_arr = cases.pick_array(wall_arrays, 3, "shear") if s["shear.array"] == "auto" \
            else cases.find_array(wall_arrays, s["shear.array"], 3, "wall shear stress")
        if shear_arr is None:
            raise cases.CaseError("shear.source = 'array' but the walls hold no 3-component array; they "
                                  "have %s" % cases.describe_arrays(wall_arrays))
    if source == "gradient" and gradient is None:
        gradient = cases.pick_array(wall_arrays, 9, "grad") if s["shear.gradient"] == "auto" \
            else cases.find_array(wall_arrays, s["shear.gradient"], 9, "velocity gradient")
        if gradient is None:
            raise cases.CaseError("shear.source = 'gradient' but the walls hold no 9-component array; "
                                  "they have %s" % cases.describe_arrays(wall_arrays))
    if source == "volume":
        if volume_src is None:
            raise cases.CaseError("shear.source = 'volume' but the case holds no volume cells; its "
                                  "blocks are %s" % cases.describe_blocks(blocks))
        cell_arrays = [a for a in volume_arrays if a[0] == "CELLS"]
        velocity = cases.pick_array(cell_arrays, 3, "vel") if s["shear.velocity"] == "auto" \
            else cases.find_array(volume_arrays, s["shear.velocity"], 3, "velocity", "the volume")
        if velocity is None:
            raise cases.CaseError("shear.source = 'volume' but the volume holds no 3-component array; it "
                                  "has %s" % cases.describe_arrays(volume_arrays))
    choices["shear"] = {"source": source, "how": s["shear.source"],
                        "array": shear_arr[1] if shear_arr else None,
                        "gradient": gradient[1] if gradient else None,
                        "velocity": velocity[1] if velocity else None,
                        "method": s["shear.method"] if source == "volume" else None,
                        "wall_velocity": s["shear.wall_velocity"] or None}
    orientation = s["walls.orientation"]
    if orientation == "auto":
        orientation = "wall-normal-array" if source == "volume" else "into-wall"
    choices["orientation"] = orientation

    # -- optional arrays --------------------------------------------------------
    on_volume = source == "volume"
    visc_arrays = volume_arrays if on_volume else wall_arrays
    visc_where = "the volume" if on_volume else "the walls"
    extra = {}
    for key, what, arrays, where in (
            ("fluid.density_array", "density", wall_arrays, "the walls"),
            ("fluid.viscosity_array", "viscosity", visc_arrays, visc_where),
            ("fluid.turbulent_viscosity_array", "turbulent viscosity", visc_arrays, visc_where)):
        if s[key]:
            extra[key] = cases.find_array(arrays, s[key], 1, what, where)
    if source == "volume" and s["shear.wall_velocity"]:
        extra["shear.wall_velocity"] = cases.find_array(wall_arrays, s["shear.wall_velocity"], 3,
                                                        "wall velocity")
    if s["walls.region_array"]:
        extra["walls.region_array"] = cases.find_array(wall_arrays, s["walls.region_array"], 1,
                                                       "region")

    drag, lift = C.effective_axes(s)
    load_dir = s["axes.load_direction"] or drag
    rho_ref = s["reference.density"] if s["reference.density"] is not None else s["fluid.density"]
    choices.update(drag_direction=drag, lift_direction=lift, load_direction=load_dir,
                   reference_density=rho_ref)

    # -- the filters ------------------------------------------------------------
    surface_in = wall_src
    if source == "volume":
        sp = simple.ShearProjection(Input=volume_src, Walls=wall_src)
        made.append(sp)
        _no_arrays(sp, ("WallVelocity", "VelocityGradient", "ViscosityArray", "TurbulentViscosityArray",
                        "DensityArray"))
        sp.Velocity = list(velocity)
        sp.Method = METHOD[s["shear.method"]]
        sp.Viscosity = s["fluid.viscosity"]
        sp.ViscosityKind = VISCOSITY_KIND[s["fluid.viscosity_kind"]]
        sp.Density = s["fluid.density"]
        if "fluid.viscosity_array" in extra:
            sp.ViscosityArray = list(extra["fluid.viscosity_array"])
        if "fluid.turbulent_viscosity_array" in extra:
            sp.TurbulentViscosityArray = list(extra["fluid.turbulent_viscosity_array"])
        if "shear.wall_velocity" in extra:
            sp.WallVelocity = list(extra["shear.wall_velocity"])
        surface_in = sp
    wt = simple.WallTraction(Input=surface_in)
    made.append(wt)
    _no_arrays(wt, ("DensityArray", "ViscosityArray", "TurbulentViscosityArray", "ShearStressArray",
                    "VelocityGradient"))
    wt.Pressure = list(pressure) if pressure else ["POINTS", "None"]
    wt.PressureKind = KIND[s["pressure.kind"]]
    wt.ReferencePressure = s["pressure.reference"]
    wt.Density = s["fluid.density"]
    if "fluid.density_array" in extra:
        wt.DensityArray = list(extra["fluid.density_array"])
    wt.Viscosity = s["fluid.viscosity"]
    wt.ViscosityKind = VISCOSITY_KIND[s["fluid.viscosity_kind"]]
    if not on_volume:
        if "fluid.viscosity_array" in extra:
            wt.ViscosityArray = list(extra["fluid.viscosity_array"])
        if "fluid.turbulent_viscosity_array" in extra:
            wt.TurbulentViscosityArray = list(extra["fluid.turbulent_viscosity_array"])
    if source == "array":
        wt.ShearSource = SHEAR_SOURCE["array"]
        wt.ShearStressArray = list(shear_arr)
        wt.ShearStressKind = KIND[s["shear.kind"]]
    elif source == "gradient":
        wt.ShearSource = SHEAR_SOURCE["gradient"]
        wt.VelocityGradient = list(gradient)
    elif source == "volume":
        wt.ShearSource = SHEAR_SOURCE["array"]
        wt.ShearStressArray = ["CELLS", "Wall Shear Stress"]
        wt.ShearStressKind = 0
    else:
        wt.ShearSource = SHEAR_SOURCE["none"]
    wt.IncludeNormalViscousStress = int(s["shear.include_normal_stress"])
    wt.Orientation = ORIENTATION[orientation]
    wt.LoadDirection = list(load_dir)
    wt.ReferenceSpeed = s["reference.speed"]

    li = simple.LoadIntegration(Input=wt)
    made.append(li)
    _no_arrays(li, ("RegionArray",))
    if "walls.region_array" in extra:
        li.RegionArray = list(extra["walls.region_array"])
    li.MomentCentre = list(s["axes.moment_centre"])
    li.DragDirection = list(drag)
    li.LiftDirection = list(lift)
    li.ReferenceDensity = rho_ref
    li.ReferenceSpeed = s["reference.speed"]
    li.ReferenceArea = s["reference.area"]
    li.ReferenceLength = s["reference.length"]
    li.ReferenceSpan = s["reference.span"]

    progress("loads at t = %s" % ("%g s" % t if t is not None else "(steady)"))
    with batch.watch() as w:
        batch.update(li, t)
    warnings = notes + _unique(w.warnings)
    left_out = []   # outputs this run does not make, and why
    table = batch._table_of(li, t)
    rows = batch.table_rows(table)
    if not rows:
        raise batch.PipelineError("Load Integration gave no table: no wall faces reached it")
    units = batch.column_units(table)
    result.rows, result.units = rows, units

    # -- distribution and history (when this build has the filters) --------------
    extras = {}
    if hasattr(simple, "LoadDistribution"):
        try:
            extras["distribution"] = _distribution(simple, settings, wt, t, drag, lift, made, stage)
        except batch.PipelineError as error:
            # E.g. flat walls across the axis (no length along it): the loads
            # are still reported, the distribution is said to be left out.
            extras["distribution"] = None
            left_out.append("no distribution: %s" % error)
    else:
        extras["distribution"] = None
        left_out.append("no distribution: this build has no Load Distribution filter")
    if len(selected) > 1:
        if hasattr(simple, "LoadHistory"):
            extras["history"] = _history(simple, settings, li, selected, made, stage, progress)
        else:
            extras["history"] = None
            left_out.append("no history of the %d time steps: this build has no Load History filter"
                            % len(selected))
    else:
        extras["history"] = None

    # -- pictures ------------------------------------------------------------------
    images = []
    want = settings["output.images"]
    if want == "yes" or (want == "auto" and render.available()):
        size = settings["output.image_size"]
        progress("pictures")
        bounds = wt.GetDataInformation().GetBounds()
        if render.surface(simple, wt, t if t is not None else 0.0, load_dir, stage.path("surface.png"), size,
                          bounds):
            images.append(("surface.png", "Walls coloured by the traction along %s" % _vec(load_dir)))
        else:
            stage.files.remove("surface.png")
            left_out.append("no surface picture: the walls carry no 'Directional Traction' array")
        hist = extras.get("history")
        if hist and hist["series"]:
            render.line_chart(simple, hist["port"], "Time", hist["series"], stage.path("history.png"), size,
                              "Load history", "Time [s]", "Force [N]")
            images.append(("history.png", "History of %s" % ", ".join(hist["series"])))
        dist = extras.get("distribution")
        if dist and dist["series"]:
            render.line_chart(simple, dist["port"], "Centre", dist["series"], stage.path("distribution.png"),
                              size, "Load distribution along %s" % _vec(dist["axis"]),
                              "Distance along the axis [m]", "Force per length [N/m]")
            images.append(("distribution.png", "Distribution of %s along %s"
                           % (", ".join(dist["series"]), _vec(dist["axis"]))))
    elif want == "auto":
        left_out.append("no pictures: no X display (DISPLAY is unset); run under Xvfb for them")
    elif want == "no":
        left_out.append("no pictures: output.images = 'no'")

    if study:
        result.cell_size = _cell_size_inputs(simple, settings, rows, volume_src, t, made)

    # -- files ------------------------------------------------------------------------
    stage.write("loads.csv", outputs.rows_to_csv(rows, units))
    record = {
        "wallloads_report": 1,
        "software": {"name": "WallLoads", "version": version(), "paraview": paraview_version(),
                     "python": platform.python_version()},
        "created": datetime.datetime.now(datetime.timezone.utc).strftime("%Y-%m-%dT%H:%M:%SZ"),
        "case": {"name": name, "file": os.path.abspath(path), "format": fmt, "sha256": checksum,
                 "files": files, "time_steps": len(times), "selected_time_steps": len(selected),
                 "report_time": t, "blocks": [{"name": b.name, "path": b.path, "kind": b.kind,
                                               "cells": b.cells} for b in blocks]},
        "config": C.as_record(settings),
        "choices": choices,
        "units": {k: v for k, v in units.items() if k != "Region"},
        "regions": {region: {col: {"value": list(v) if isinstance(v, tuple) else v,
                                   "unit": units.get(col, "")} for col, v in row.items()}
                    for region, row in rows.items()},
        "outputs": ["loads.csv", "loads.json"] + [f for f in ("history.csv", "statistics.csv",
                                                             "distribution.csv") if f in stage.files]
                   + [i[0] for i in images] + ["report.html"],
        "warnings": warnings,
        "left_out": left_out,
        "caution": CAUTION,
    }
    if extras.get("history"):
        record["statistics"] = extras["history"]["statistics"]
        warnings += [m for m in extras["history"]["warnings"] if m not in warnings]
    result.record = record
    stage.write("loads.json", outputs.json_text(record))
    title = settings["output.title"] or name
    stage.write("report.html", htmlreport.case_page(title, record, rows, units, extras, images, stage.folder,
                                                    CAUTION))


def _ranks():
    from vtkmodules.vtkParallelCore import vtkMultiProcessController
    controller = vtkMultiProcessController.GetGlobalController()
    return controller.GetNumberOfProcesses() if controller is not None else 1


def _unique(items):
    out = []
    for i in items:
        if i not in out:
            out.append(i)
    return out


def _vec(v):
    return "(%s)" % ", ".join("%.3g" % (x + 0.0) for x in v)


def _no_arrays(proxy, names):
    """Optional array pickers to None: ParaView's domains preselect an array
    when the input has one, and only what the configuration names may be used."""
    for name in names:
        if proxy.GetProperty(name) is not None:
            setattr(proxy, name, ["POINTS", "None"])


def _distribution(simple, settings, wt, t, drag, lift, made, stage):
    s = settings
    ld = simple.LoadDistribution(Input=wt)
    made.append(ld)
    axis = s["distribution.axis_direction"] or drag
    ld.AxisOrigin = list(s["distribution.axis_origin"])
    ld.AxisDirection = list(axis)
    ld.NumberOfBins = s["distribution.bins"]
    if s["distribution.range"]:
        ld.UseCustomRange = 1
        ld.Range = list(s["distribution.range"])
    ld.MomentCentre = list(s["axes.moment_centre"])
    ld.DragDirection = list(drag)
    ld.LiftDirection = list(lift)
    batch.update(ld, t)
    table = ld.GetClientSideObject().GetOutputDataObject(0)
    units = dict(DISTRIBUTION_UNITS)
    units.update({k: v for k, v in batch.column_units(table).items() if v})
    stage.write("distribution.csv", outputs.table_to_csv(table, units))
    cols = outputs.table_columns(table)
    series = [c for c in ("Drag Per Length", "Side Force Per Length", "Lift Per Length") if c in cols]
    return {"port": ld, "series": series, "axis": axis, "columns": cols, "units": units}


def _history(simple, settings, li, selected, made, stage, progress):
    s = settings
    hist = simple.LoadHistory(Input=simple.OutputPort(li, 1))
    made.append(hist)
    hist.UseCustomTimeRange = 1
    hist.TimeRange = [selected[0], selected[-1]]
    hist.Stride = s["time.stride"]
    if s["time.statistics_start"] is not None:
        hist.UseCustomStatisticsStart = 1
        hist.StatisticsStart = s["time.statistics_start"]
    hist.ReferenceLength = s["reference.length"]
    hist.ReferenceSpeed = s["reference.speed"]
    n = len(selected)
    seen = [0]

    def on_progress(obj, event):
        k = int(obj.GetProgress() * n + 1e-9)
        while seen[0] < min(k, n):
            seen[0] += 1
            progress("time step %d/%d (t = %g s)" % (seen[0], n, selected[seen[0] - 1]))

    algo = hist.GetClientSideObject()
    tag = algo.AddObserver("ProgressEvent", on_progress)
    try:
        w = batch.update(hist)
    finally:
        algo.RemoveObserver(tag)
    table = algo.GetOutputDataObject(0)
    stats = algo.GetOutputDataObject(1)
    base = batch.column_units(li.GetClientSideObject().GetOutputDataObject(1))

    def unit_of(column):
        if column == "Time":
            return "s"
        quantity = column.split(": ", 1)[-1]
        for suffix in (" X", " Y", " Z"):
            if quantity.endswith(suffix) and quantity[:-2] in base:
                quantity = quantity[:-2]
        return base.get(quantity, "")

    cols = outputs.table_columns(table)
    units = {c: unit_of(c) for c in cols}
    stage.write("history.csv", outputs.table_to_csv(table, units))
    stat_units = dict(STATISTICS_UNITS)
    stat_cols = outputs.table_columns(stats)
    stage.write("statistics.csv", outputs.statistics_csv(stat_cols, stat_units, unit_of))
    statistics = {}
    quantities = stat_cols.get("Quantity", [])
    for r, q in enumerate(quantities):
        statistics[q] = {c: {"value": v[r], "unit": stat_units.get(c, unit_of(q))}
                         for c, v in stat_cols.items() if c != "Quantity"}
    series = [c for c in ("Total: Drag", "Total: Side Force", "Total: Lift") if c in cols]
    return {"port": hist, "series": series, "columns": cols, "units": units, "statistics": statistics,
            "steps": len(cols.get("Time", [])), "warnings": _unique(w.warnings)}


def _cell_size_inputs(simple, settings, rows, volume_src, t, made):
    """Wetted area and face count, and fluid volume and cell count when a volume is there."""
    total = rows.get("Total", {})
    out = {"area": total.get("Area"), "faces": total.get("Faces")}
    if volume_src is not None:
        iv = simple.IntegrateVariables(Input=volume_src)
        made.append(iv)
        iv.DivideCellDataByVolume = 0
        batch.update(iv, t)
        data = iv.GetClientSideObject().GetOutputDataObject(0)
        vol = data.GetCellData().GetArray("Volume")
        out["volume"] = float(vol.GetValue(0)) if vol is not None and vol.GetNumberOfTuples() else None
        out["cells"] = volume_src.GetDataInformation().GetNumberOfCells()
    return out
