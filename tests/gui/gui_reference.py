"""Reference loads for the user-level GUI test, by script with explicit settings.

    pvpython gui_reference.py OUT.json

The two chains of tests/gui/gui_user.py written out with every setting
explicit (the arrays, shear source, orientation and reference values the
README documents), so that the test can check that what the GUI gives with
its defaults (plus the reference values a user types) is the same
computation. Prints nothing on success; writes {chain: {region: {column:
value}}}.
"""
import json
import os
import sys

from wallloads import batch

simple = batch.load_plugin(threads=False)
DEMO = os.path.join(os.environ["WALLLOADS_SOURCE_DIR"], "examples", "demo")
with open(os.path.join(DEMO, "analytic.json")) as handle:
    PAR = json.load(handle)["parameters"]


def rows_of(li):
    rows = batch.load_table(li)
    return {region: {k: v for k, v in row.items()} for region, row in rows.items()}


out = {}
walls = simple.XMLMultiBlockDataReader(FileName=[os.path.join(DEMO, "bead.vtm")])
wt = simple.WallTraction(Input=walls, Pressure=["POINTS", "static_pressure"], PressureKind="Static",
                         ReferencePressure=PAR["p_inf"], ShearSource="Wall shear stress array",
                         ShearStressArray=["CELLS", "wall_shear"],
                         Orientation="Stored normals point into the wall", LoadDirection=[0, 0, 1],
                         Density=PAR["density"], ReferenceSpeed=PAR["stream_velocity"][2])
li = simple.LoadIntegration(Input=wt, DragDirection=[0, 0, 1], LiftDirection=[1, 0, 0],
                            ReferenceDensity=PAR["density"], ReferenceSpeed=PAR["stream_velocity"][2])
out["surface"] = rows_of(li)

volume = simple.XMLUnstructuredGridReader(FileName=[os.path.join(DEMO, "bead_volume.vtu")])
sp = simple.ShearProjection(Input=volume, Walls=walls)
sp.Velocity = ["CELLS", "velocity"]
sp.Method = "Near-wall difference"
sp.Viscosity = PAR["dynamic_viscosity"]
wt2 = simple.WallTraction(Input=sp, Pressure=["POINTS", "static_pressure"], PressureKind="Static",
                          ReferencePressure=PAR["p_inf"], ShearSource="Wall shear stress array",
                          ShearStressArray=["CELLS", "Wall Shear Stress"], Orientation="Use Wall Normal array",
                          LoadDirection=[0, 0, 1])
li2 = simple.LoadIntegration(Input=wt2, DragDirection=[0, 0, 1], LiftDirection=[1, 0, 0])
out["volume"] = rows_of(li2)

with open(sys.argv[1], "w") as handle:
    json.dump(out, handle)
