"""The report's writers in-process, on tables made here: the history,
statistics and distribution sections of report.html (which the command fills
when the build has Load History and Load Distribution), CSV of vtkTables with
units and integer counts, JSON without NaN, atomic writes and the staging
folder (a failed case leaves nothing; a committed one replaces an earlier
run's files and removes the ones this run did not make)."""
import json
import math
import os

import report_testing as R
from vtkmodules.vtkCommonCore import vtkDoubleArray, vtkStringArray
from vtkmodules.vtkCommonDataModel import vtkTable
from wallloads import config as C, htmlreport, outputs

W = R.workdir("pages")


def table(columns):
    t = vtkTable()
    for name, values in columns.items():
        if values and isinstance(values[0], str):
            a = vtkStringArray()
            for v in values:
                a.InsertNextValue(v)
        else:
            a = vtkDoubleArray()
            width = len(values[0]) if values and isinstance(values[0], tuple) else 1
            a.SetNumberOfComponents(width)
            for v in values:
                a.InsertNextTuple(v if width > 1 else (v,))
        a.SetName(name)
        t.AddColumn(a)
    return t


dist = table({"Bin": [0.0, 1.0], "Centre": [0.25, 0.75], "Area": [1.0, 1.0], "Drag Per Length": [2.0, 3.0],
              "Cumulative Force": [(1.0, 0.0, 0.0), (2.5, 0.0, 0.0)]})
text = outputs.table_to_csv(dist, {"Centre": "m", "Area": "m^2", "Drag Per Length": "N/m", "Cumulative Force": "N"})
lines = text.splitlines()
R.expect("table CSV: units and split components in the header",
         lines[0] == "Bin,Centre [m],Area [m^2],Drag Per Length [N/m],Cumulative Force X [N],Cumulative Force Y [N],"
                     "Cumulative Force Z [N]", lines[0])
R.expect("table CSV: counts as integers, values exact", lines[1].startswith("0,0.25,1.0,2.0,1.0"), lines[1])
stats = table({"Quantity": ["Total: Drag", "Total: Lift"], "Mean": [1.5, float("nan")],
               "Dominant Frequency": [2.0, float("nan")], "Strouhal Number": [0.2, float("nan")]})
R.expect("table CSV: NaN written as nan", "nan" in outputs.table_to_csv(stats, {}))
R.expect("JSON: NaN becomes null", json.loads(outputs.json_text({"a": float("nan"), "b": [1.0, (2.0, 3.0)]}))
         == {"a": None, "b": [1.0, [2.0, 3.0]]})

settings = C.defaults()
settings["cases"] = ["/x/case.vtm"]
rows = {"Wall": {"Faces": 4.0, "Area": 2.0, "Force": (1.0, 0.0, 0.0), "Drag": 1.0},
        "Total": {"Faces": 4.0, "Area": 2.0, "Force": (1.0, 0.0, 0.0), "Drag": 1.0}}
units = {"Faces": "-", "Area": "m^2", "Force": "N", "Drag": "N"}
record = {"config": C.as_record(settings), "created": "2026-01-01T00:00:00Z",
          "software": {"version": "0", "paraview": "5.11.0"},
          "case": {"file": "/x/case.vtm", "format": "VTK", "files": [{"path": "/x/case.vtm", "bytes": 1, "sha256": "0"}],
                   "time_steps": 3, "selected_time_steps": 3, "report_time": 1.0, "blocks": []},
          "choices": {"walls": ["Wall"], "volume": [], "pressure": {"array": "p", "association": "CELLS", "how": "auto"},
                      "shear": {"source": "none", "how": "auto"}, "orientation": "into-wall",
                      "drag_direction": [1, 0, 0], "lift_direction": [0, 0, 1], "reference_density": 1.0},
          "warnings": ["a warning"], "left_out": ["a note"]}
extras = {"history": {"steps": 3, "statistics": {
              "Total: Drag": {"Mean": {"value": 1.5, "unit": "N"}, "Dominant Frequency": {"value": 2.0, "unit": "Hz"},
                              "Strouhal Number": {"value": 0.2, "unit": "-"}}}},
          "distribution": {"axis": [1.0, 0.0, 0.0], "units": {"Centre": "m", "Area": "m^2", "Drag Per Length": "N/m"},
                           "columns": outputs.table_columns(dist)}}
page = htmlreport.case_page("Trial", record, rows, units, extras, [], W, "Caution text.")
for part in ("History and statistics", "Total: Drag", "Dominant Frequency [Hz]", "Distribution along (1, 0, 0)",
             "Drag Per Length [N/m]", "a warning", "a note", "Caution text.", "Drag [N]", ">Total<"):
    R.expect("report page shows %r" % part, part in page)

# Staging: a discarded case leaves nothing; a committed one replaces old files
# and removes stale ones of an earlier run.
final = os.path.join(W, "case")
os.makedirs(final)
for name, data in (("loads.csv", "old"), ("history.csv", "old"), ("notes.txt", "mine")):
    with open(os.path.join(final, name), "w") as handle:
        handle.write(data)
stage = outputs.Staging(final)
stage.write("loads.csv", "new")
stage.discard()
R.expect("discarded: earlier files untouched, no staging left",
         open(os.path.join(final, "loads.csv")).read() == "old" and sorted(os.listdir(W)) == ["case"])
stage = outputs.Staging(final)
stage.write("loads.csv", "new")
stage.commit()
R.expect("committed: new file in place, stale output removed, the user's file kept",
         open(os.path.join(final, "loads.csv")).read() == "new"
         and sorted(os.listdir(final)) == ["loads.csv", "notes.txt"] and sorted(os.listdir(W)) == ["case"])
outputs.write_atomic(os.path.join(W, "x.txt"), "whole")
R.expect("atomic write: the file and no temporary", open(os.path.join(W, "x.txt")).read() == "whole"
         and not [f for f in os.listdir(W) if f.endswith(".tmp")])
drag, lift = C.effective_axes(dict(settings, **{"axes.angle_of_attack": 4.0, "axes.sideslip": 0.0}))
R.close("angle of attack 4 deg: drag direction z", drag[2], math.sin(math.radians(4.0)), rtol=1e-15)
R.close("angle of attack 4 deg: lift direction x", lift[0], -math.sin(math.radians(4.0)), rtol=1e-15)
R.done(__file__)
