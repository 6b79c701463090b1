"""Right by default (issue 8): the automatic choices of the ParaView proxies,
whole solver cases with volume blocks, one reference state, units on every
output, the Load Summary, progress and abort.

The loads of a default pipeline are compared with the same pipeline given
every setting explicitly (the documented choices): the same computation, so
the totals must agree to rounding (1e-14 relative). The physics of those
explicit pipelines is verified elsewhere (test_stokes_sphere.py, ...).
"""
import math

import numpy as np
from vtkmodules.vtkCommonCore import vtkDataArray
from vtkmodules.vtkCommonDataModel import vtkCompositeDataSet, vtkMultiBlockDataSet

import scenes as S
import wl_testing as T

simple = T.load_plugin()
from wallloads.WallLoadsFilters import vtkLoadIntegration, vtkWallTraction  # noqa: E402

RNG = np.random.default_rng(808)
P, F, _ = S.uv_sphere(0.7, 10, 16, ordering="into_wall")
N = len(F)
expect, contains_all, Capture = T.expect, T.contains_all, T.Capture


def sphere(cell=None, point=None):
    return S.polydata(P, F, cell_arrays=cell or {}, point_arrays=point or {})


def loads(wt_props, data=None, li_props=None, source=None):
    src = source or T.producer(data)
    wt = simple.WallTraction(Input=src, **wt_props)
    li = simple.LoadIntegration(Input=wt, **(li_props or {}))
    rows = T.table_rows(T.output_of(li, 1))
    return wt, li, rows


def same_totals(label, a, b, rtol=1e-14):
    for key in ("Force", "Moment"):
        T.close_arrays("%s: Total %s" % (label, key), a["Total"][key], b["Total"][key],
                       rtol=rtol, atol=1e-300, source="same computation")


def total_force(source, **props):
    _, _, rows = loads(dict(Orientation="Stored normals point into the wall", **props), source=source)
    return rows


def check_automatic_pressure():
    print("\n== automatic pressure: names, cell before point, never integers ==")
    data = sphere(cell={"zone_id": np.arange(N, dtype=np.int32) % 3, "temperature": RNG.normal(300, 5, N),
                        "p": RNG.normal(1e3, 50, N), "wall_shear": RNG.normal(size=(N, 3))},
                  point={"p": RNG.normal(2e3, 50, len(P))})
    src = T.producer(data)
    wt, li, auto = loads({}, source=src)
    expect("Pressure and Shear Source default to Automatic",
           wt.Pressure[1] == "Automatic" and wt.ShearSource == "Automatic", "%s %s" % (wt.Pressure, wt.ShearSource))
    explicit = total_force(src, Pressure=["CELLS", "p"], ShearSource="Wall shear stress array",
                           ShearStressArray=["CELLS", "wall_shear"])
    same_totals("automatic takes cell 'p' and 'wall_shear' (== explicit)", auto, explicit)
    # The choice is discriminating: the other candidates give other loads.
    for label, other in (("point 'p'", ["POINTS", "p"]), ("'temperature'", ["CELLS", "temperature"]),
                         ("'zone_id'", ["CELLS", "zone_id"])):
        rows = total_force(src, Pressure=other, ShearSource="Wall shear stress array",
                           ShearStressArray=["CELLS", "wall_shear"])
        expect("... and not %s (other loads)" % label,
               np.max(np.abs(rows["Total"]["Force"] - auto["Total"]["Force"])) > 1e-6 * np.max(np.abs(auto["Total"]["Force"])))

    # Only an integer zone array and a non-pressure float: the float is taken
    # (the 'first 1-component array'), with a warning naming it.
    data2 = sphere(cell={"zone_id": np.ones(N, dtype=np.int32), "temperature": RNG.normal(300, 5, N)})
    src2 = T.producer(data2)
    wt2 = simple.WallTraction(Input=src2)
    cap = Capture(wt2)
    T.output_of(wt2)
    expect("no pressure-like name: a warning names the float array taken (never the integer one)",
           any("'temperature'" in w and "Pressure" in w for w in cap.warnings), str(cap.warnings))
    same_totals("... and the loads are those of 'temperature'", loads({}, source=src2)[2],
                total_force(src2, Pressure=["CELLS", "temperature"], ShearSource="None"))

    # Integers only and no shear: no load source, a warning says the loads are zero.
    data3 = sphere(cell={"zone_id": np.ones(N, dtype=np.int32)})
    wt3 = simple.WallTraction(Input=T.producer(data3))
    cap3 = Capture(wt3)
    out3 = T.output_of(wt3)
    expect("integers only: no load source, one warning that the loads are zero",
           any("no load source" in w and "zero" in w for w in cap3.warnings), str(cap3.warnings))
    expect("... and the forces are zero", np.all(T.cell_array(out3, "Force") == 0))
    # Pressure Kind None turns the pressure off whatever is selected.
    wt4 = simple.WallTraction(Input=src, PressureKind="None", ShearSource="None")
    cap4 = Capture(wt4)
    T.output_of(wt4)
    expect("Pressure Kind None: the warning names it",
           any("Pressure Kind None" in w for w in cap4.warnings), str(cap4.warnings))


def check_automatic_shear_and_orientation():
    print("\n== automatic shear: Shear Projection's name first, then 'shear', then a gradient ==")
    grad = RNG.normal(size=(N, 9))
    data = sphere(cell={"p": RNG.normal(size=N), "wall_shear": RNG.normal(size=(N, 3)),
                        "Wall Shear Stress": RNG.normal(size=(N, 3)), "velocity_gradient": grad})
    src = T.producer(data)
    auto = loads({}, source=src)[2]
    same_totals("'Wall Shear Stress' preferred to 'wall_shear' and to the gradient", auto,
                total_force(src, Pressure=["CELLS", "p"], ShearSource="Wall shear stress array",
                            ShearStressArray=["CELLS", "Wall Shear Stress"]))
    data2 = sphere(cell={"p": RNG.normal(size=N), "velocity_gradient": grad, "velocity": RNG.normal(size=(N, 3))})
    src2 = T.producer(data2)
    auto2 = loads(dict(Viscosity=1.3e-3), source=src2)[2]
    same_totals("no shear array: the gradient with Viscosity (never the 3-component 'velocity')", auto2,
                total_force(src2, Pressure=["CELLS", "p"], ShearSource="Velocity gradient",
                            VelocityGradient=["CELLS", "velocity_gradient"], Viscosity=1.3e-3))
    # Orientation Automatic follows a Wall Normal array (Shear Projection's).
    flipped = sphere(cell={"p": RNG.normal(1e3, 1, N)})
    wt_ref = simple.WallTraction(Input=T.producer(flipped), Orientation="Stored normals point into the fluid",
                                 Pressure=["CELLS", "p"], ShearSource="None")
    wn = T.output_of(wt_ref).GetCellData().GetArray("Wall Normal")
    with_normals = sphere(cell={"p": T.cell_array(flipped, "p").copy(),
                                "Wall Normal": np.array([wn.GetTuple3(i) for i in range(N)])})
    _, _, auto_n = loads(dict(ShearSource="None"), data=with_normals)
    _, _, explicit_n = loads(dict(Pressure=["CELLS", "p"], ShearSource="None",
                                  Orientation="Stored normals point into the fluid"), data=flipped)
    same_totals("Orientation Automatic follows the Wall Normal array", auto_n, explicit_n, rtol=1e-12)


def whole_case(with_surface=True):
    """A multiblock like a solver case: a hexahedral volume block and two wall patches."""
    mb = vtkMultiBlockDataSet()
    pts, cells = S.hex_box(np.linspace(-2, 2, 4), np.linspace(-2, 2, 4), np.linspace(-2, 2, 4))
    vol = S.unstructured_grid(pts, cells, [12] * len(cells), cell_arrays={"velocity": np.zeros((len(cells), 3))})
    mb.SetBlock(0, vol)
    mb.GetMetaData(0).Set(vtkCompositeDataSet.NAME(), "internal volume")
    if with_surface:
        top = F[: N // 2]
        bottom = F[N // 2:]
        for i, (name, faces) in enumerate((("upper wall", top), ("lower wall", bottom)), start=1):
            mb.SetBlock(i, S.polydata(P, faces, cell_arrays={"p": np.full(len(faces), 2.0e3),
                                                             "wall_shear": np.tile([0.1, 0.0, 0.0], (len(faces), 1))}))
            mb.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), name)
    return mb


def check_whole_case():
    print("\n== a whole case: volume blocks pass through, named once; a volume alone points to Shear Projection ==")
    case = whole_case()
    src = T.producer(case)
    wt = simple.WallTraction(Input=src)
    cap = Capture(wt)
    li = simple.LoadIntegration(Input=wt)
    capl = Capture(li)
    out = T.output_of(wt)
    rows = T.table_rows(T.output_of(li, 1))
    expect("no error from either filter", not cap.errors and not capl.errors, str(cap.errors + capl.errors))
    vol_out = out.GetBlock(0)
    expect("the volume block passes through untouched (no per-face arrays added)",
           vol_out.GetNumberOfCells() == 27 and vol_out.GetCellData().GetArray("Force") is None
           and vol_out.GetCellData().GetNumberOfArrays() == 1)
    expect("one row per wall patch and Total, none for the volume",
           list(rows) == ["upper wall", "lower wall", "Total"], str(list(rows)))
    # The same loads as the patches alone.
    patches = vtkMultiBlockDataSet()
    for i in (1, 2):
        patches.SetBlock(i - 1, case.GetBlock(i))
        patches.GetMetaData(i - 1).Set(vtkCompositeDataSet.NAME(), case.GetMetaData(i).Get(vtkCompositeDataSet.NAME()))
    _, _, alone = loads({}, data=patches)
    same_totals("whole case == patches alone", rows, alone, rtol=0.0)

    vol_only = T.producer(whole_case(with_surface=False))
    wt2 = simple.WallTraction(Input=vol_only)
    cap2 = Capture(wt2)
    out2 = T.output_of(wt2)
    expect("a volume alone: one error", len(cap2.errors) == 1, str(cap2.errors))
    contains_all("... that points to Shear Projection and names the block", cap2.errors[0],
                 ["Shear Projection", "internal volume", "Extract"])
    expect("... and no output", out2.GetNumberOfCells() == 0)


def check_reference_state_and_units():
    print("\n== one reference state; units on every output; the Load Summary ==")
    rho, U = 998.0, 2.5
    data = sphere(cell={"p": RNG.normal(2e3, 30, N), "wall_shear": RNG.normal(size=(N, 3))})
    src = T.producer(data)
    wt, li, rows = loads(dict(Density=rho, ReferenceSpeed=U, LoadDirection=[0, 1, 0]), source=src,
                         li_props=dict(ReferenceArea=0.3))
    q = 0.5 * rho * U * U
    T.check_close("Load Integration took Wall Traction's density and speed (Dynamic Pressure column)",
                  rows["Total"]["Dynamic Pressure"], q, rtol=1e-15)
    T.check_close("... and its Load Direction as the drag direction", rows["Total"]["Drag Direction"], [0, 1, 0])
    T.check_close("... lift defaults to +z made orthogonal", rows["Total"]["Lift Direction"], [0, 0, 1])
    T.check_close("Drag = Force . e_D", rows["Total"]["Drag"], rows["Total"]["Force"][1], rtol=1e-15)
    T.check_close("Drag Coefficient = Drag / (q A_ref)", rows["Total"]["Drag Coefficient"],
                  rows["Total"]["Drag"] / (q * 0.3), rtol=1e-14)
    _, _, explicit = loads(dict(Density=rho, ReferenceSpeed=U, LoadDirection=[0, 1, 0]), source=src,
                           li_props=dict(ReferenceArea=0.3, ReferenceDensity=rho, ReferenceSpeed=U,
                                         DragDirection=[0, 1, 0], LiftDirection=[0, 0, 1]))
    for key in ("Drag", "Lift", "Side Force", "Drag Coefficient", "Rolling Moment Coefficient"):
        T.check_close("defaults from Wall Traction == set explicitly: %s" % key, rows["Total"][key],
                      explicit["Total"][key], rtol=1e-15, atol=1e-300)
    # An override is honoured, and a different q is warned about.
    li2 = simple.LoadIntegration(Input=wt, ReferenceDensity=1.2, ReferenceArea=0.3)
    cap = Capture(li2)
    rows2 = T.table_rows(T.output_of(li2, 1))
    T.check_close("Reference Density set in Load Integration wins", rows2["Total"]["Reference Density"], 1.2)
    expect("a warning says the two dynamic pressures differ",
           any("differs" in w and "Wall Traction" in w for w in cap.warnings), str(cap.warnings))

    # Units: per-face arrays, field data, table and summary columns.
    out = T.output_of(wt)
    unit = vtkDataArray.UNITS_LABEL()
    cd = out.GetCellData()
    got = {n: cd.GetArray(n).GetInformation().Get(unit) for n in ("Force", "Face Area", "Pressure Coefficient")}
    expect("per-face arrays carry units", got == {"Force": "N", "Face Area": "m^2", "Pressure Coefficient": "-"}, str(got))
    expect("input arrays are not given units", cd.GetArray("p").GetInformation().Get(unit) is None)
    table = T.output_of(li, 1)
    missing = [table.GetColumnName(c) for c in range(table.GetNumberOfColumns())
               if table.GetColumnName(c) != "Region" and not table.GetColumn(c).GetInformation().Get(unit)]
    expect("every Load Table column carries its unit", not missing, str(missing))
    expect("units from the one list: GetColumnUnit",
           vtkLoadIntegration.GetColumnUnit("Pitching Moment") == "N m"
           and vtkWallTraction.GetArrayUnit("Wetted Area") == "m^2"
           and vtkLoadIntegration.GetColumnUnit("not ours") is None)
    summary = T.output_of(li, 2)
    names = [summary.GetColumnName(c) for c in range(summary.GetNumberOfColumns())]
    expect("Load Summary: region first, units in the names",
           names[0] == "Boundary" and "Drag [N]" in names and "Wetted Area [m^2]" in names
           and "Dynamic Pressure [Pa]" in names, str(names))
    expect("Load Summary sorted as ParaView 5.11 shows it (ignoring case): region first",
           sorted(names, key=str.lower)[0] == "Boundary")
    rows_s = [summary.GetColumnByName("Boundary").GetValue(r) for r in range(summary.GetNumberOfRows())]
    i_tot = rows_s.index("Total")
    for col, key in (("Drag [N]", "Drag"), ("Lift [N]", "Lift"), ("Wetted Area [m^2]", "Area"),
                     ("Drag Coefficient", "Drag Coefficient")):
        T.check_close("Load Summary %s == Load Table %s (Total)" % (col, key),
                      summary.GetColumnByName(col).GetValue(i_tot), rows["Total"][key], rtol=0.0, atol=0.0)
    expect("Load Summary Total row: numbers only",
           all(math.isfinite(summary.GetColumn(c).GetValue(i_tot)) for c in range(1, summary.GetNumberOfColumns())))


def check_progress_and_abort():
    print("\n== progress and abort (plain VTK classes) ==")
    mb = vtkMultiBlockDataSet()
    for i in range(4):
        mb.SetBlock(i, sphere(cell={"p": RNG.normal(size=N)}))
    for cls in (vtkWallTraction,):
        f = cls()
        f.SetInputDataObject(mb)
        f.SetInputArrayToProcess(0, 0, 0, 1, "p")
        seen = []
        f.AddObserver("ProgressEvent", lambda o, e: seen.append(o.GetProgress()))
        f.Update()
        expect("%s: progress from 0 to 1, per block" % cls.__name__,
               seen[0] == 0.0 and seen[-1] == 1.0 and len(seen) >= 5 and seen == sorted(seen), str(seen))
        li = vtkLoadIntegration()
        li.SetInputConnection(f.GetOutputPort())
        seen_li = []
        li.AddObserver("ProgressEvent", lambda o, e: seen_li.append(o.GetProgress()))
        li.Update()
        expect("vtkLoadIntegration: progress from 0 to 1",
               seen_li[0] == 0.0 and seen_li[-1] == 1.0 and seen_li == sorted(seen_li), str(seen_li))
        g = cls()
        g.SetInputDataObject(mb)
        g.SetInputArrayToProcess(0, 0, 0, 1, "p")
        g.AddObserver("ProgressEvent", lambda o, e: o.SetAbortExecute(1) if o.GetProgress() > 0.3 else None)
        g.Update()
        out = g.GetOutputDataObject(0)
        expect("%s: abort between blocks leaves no partial output" % cls.__name__,
               out.GetNumberOfBlocks() == 0 and out.GetFieldData().GetArray("Wetted Area") is None)


check_automatic_pressure()
check_automatic_shear_and_orientation()
check_whole_case()
check_reference_state_and_units()
check_progress_and_abort()
T.done("test_defaults_and_cases")
