"""Bad and awkward input for Wall Traction and Load Integration: missing or
mis-sized arrays, NaN values, degenerate faces, non-surface cells, empty
input, multiblock errors, orientation diagnostics, and that the input is
never modified.

Errors and warnings are captured with observers on the client-side VTK
objects (vtkErrorMacro / vtkWarningMacro invoke ErrorEvent / WarningEvent
with the message as call data).
"""
import numpy as np

import vtkmodules.util.vtkConstants
from vtkmodules.util.numpy_support import numpy_to_vtk, vtk_to_numpy
from vtkmodules.vtkCommonCore import vtkPoints
from vtkmodules.vtkCommonDataModel import vtkCellArray, vtkCompositeDataSet, vtkMultiBlockDataSet, vtkPolyData

import wl_testing as T
import scenes as S

simple = T.load_plugin()
RNG = np.random.default_rng(4242)

INTO_FLUID = "Stored normals point into the fluid"
PER_FACE = ["Wall Normal", "Face Area", "Pressure Traction", "Viscous Traction", "Traction",
            "Pressure Force", "Viscous Force", "Force", "Normal Viscous Stress", "Directional Traction",
            "Pressure Coefficient", "Skin Friction Coefficient"]
TOTALS = ["Area", "Pressure Force", "Viscous Force", "Force", "Pressure Moment", "Viscous Moment", "Moment",
          "Drag", "Side Force", "Lift", "Rolling Moment", "Pitching Moment", "Yawing Moment"]


Capture = T.Capture


expect = T.expect


contains_all = T.contains_all


def cell_names(ds):
    cd = ds.GetCellData()
    return [cd.GetArrayName(i) for i in range(cd.GetNumberOfArrays())]


def field_names(ds):
    fd = ds.GetFieldData()
    return [fd.GetArrayName(i) for i in range(fd.GetNumberOfArrays())]


def totals_of(li):
    tot = T.output_of(li, 0)
    return {name: np.array(T.field(tot, name), dtype=float) for name in field_names(tot)}


def delete(*proxies):
    for p in proxies:
        simple.Delete(p)


SP, SF, SROWS = S.uv_sphere(1.1, 8, 12, center=(0.2, 0.3, -0.4))   # stored into the fluid
NS = len(SF)


# ---------------------------------------------------------------------------
# (a) missing array, wrong component count
# ---------------------------------------------------------------------------

def check_missing_and_wrong_width():
    print("\n== (a) missing array / wrong width ==")
    pd = S.polydata(SP, SF, cell_arrays={"p": RNG.normal(size=NS), "u": RNG.normal(size=(NS, 3)),
                                         "G": RNG.normal(size=(NS, 9))},
                    point_arrays={"q": SP[:, 0].copy()})
    src = T.producer(pd)
    wt = simple.WallTraction(Input=src, Orientation=INTO_FLUID)
    cap = Capture(wt)

    wt.Pressure = ["CELLS", "p_static"]
    out = T.output_of(wt)
    expect("missing pressure: one error", len(cap.errors) == 1, "%d errors" % len(cap.errors))
    contains_all("missing pressure: names the array and lists those that exist", cap.errors[0],
                 ["'p_static'", "not found", "cell data", "'p' (1)", "'u' (3)", "'G' (9)", "'q' (1)"])
    expect("missing pressure: no output cells", out.GetNumberOfCells() == 0, "%d cells" % out.GetNumberOfCells())
    expect("missing pressure: no output points", out.GetNumberOfPoints() == 0)
    expect("missing pressure: no per-face arrays", "Force" not in cell_names(out), str(cell_names(out)))
    expect("missing pressure: no field data", "Wetted Area" not in field_names(out), str(field_names(out)))

    # A cell array asked for as point data is missing too.  Through a proxy,
    # ParaView's pipeline converts a cell array requested on points (cell to
    # point averaging) before the filter sees it, so this is checked on the
    # VTK class itself.
    from vtkmodules.vtkCommonDataModel import vtkDataObject
    from wallloads.WallLoadsFilters import vtkWallTraction
    direct = vtkWallTraction()
    direct.SetInputData(pd)
    direct.SetInputArrayToProcess(0, 0, 0, vtkDataObject.FIELD_ASSOCIATION_POINTS, "p")
    dmsg = Capture(direct).errors
    direct.GetExecutive().AddObserver("ErrorEvent", lambda *a: None)   # keep the executive quiet
    direct.Update()
    expect("pressure asked on points (VTK class): one error", len(dmsg) == 1, str(dmsg))
    contains_all("pressure asked on points: says where it looked", dmsg[0], ["'p'", "point data", "'q' (1)"])
    expect("pressure asked on points: no output", direct.GetOutput().GetNumberOfCells() == 0)

    # wrong widths
    cases = [
        ("pressure of 3 components", dict(Pressure=["CELLS", "u"]), ["Pressure", "'u'", "3 components", "1 expected"]),
        ("velocity gradient of 3 components",
         dict(Pressure=["CELLS", "p"], ShearSource="Velocity gradient", VelocityGradient=["CELLS", "u"]),
         ["Velocity Gradient", "'u'", "3 components", "9 expected"]),
        ("wall shear stress of 9 components",
         dict(Pressure=["CELLS", "p"], ShearSource="Wall shear stress array", ShearStressArray=["CELLS", "G"]),
         ["Wall Shear Stress", "'G'", "9 components", "3 expected"]),
        ("density array of 3 components",
         dict(Pressure=["CELLS", "p"], ShearSource="None", PressureKind="Per unit density",
              DensityArray=["CELLS", "u"]),
         ["Density Array", "'u'", "3 components", "1 expected"]),
    ]
    for label, props, parts in cases:
        wt2 = simple.WallTraction(Input=src, Orientation=INTO_FLUID)
        cap2 = Capture(wt2)
        for k, v in props.items():
            setattr(wt2, k, v)
        out = T.output_of(wt2)
        expect("%s: one error" % label, len(cap2.errors) == 1, "%d errors" % len(cap2.errors))
        contains_all("%s: clear message" % label, cap2.errors[0], parts)
        expect("%s: no output" % label, out.GetNumberOfCells() == 0)
        delete(wt2)

    # documented errors of the settings themselves
    for label, props, parts in [
        ("zero LoadDirection", dict(Pressure=["CELLS", "p"], LoadDirection=[0, 0, 0]), ["Load Direction"]),
        # (the panel preselects a 3-component array; a script can still unset it)
        ("shear source without an array", dict(Pressure=["CELLS", "p"], ShearSource="Wall shear stress array",
                                               ShearStressArray=["CELLS", "None"]),
         ["Wall Shear Stress"]),
    ]:
        wt2 = simple.WallTraction(Input=src, Orientation=INTO_FLUID)
        cap2 = Capture(wt2)
        for k, v in props.items():
            setattr(wt2, k, v)
        out = T.output_of(wt2)
        expect("%s: one error" % label, len(cap2.errors) == 1, "%d errors" % len(cap2.errors))
        contains_all("%s: names the setting" % label, cap2.errors[0], parts)
        expect("%s: no output" % label, out.GetNumberOfCells() == 0)
        delete(wt2)

    # Load Integration on data that did not come from Wall Traction
    li = simple.LoadIntegration(Input=src)
    capl = Capture(li)
    T.output_of(li, 0)
    expect("Load Integration without Wall Traction arrays: error", len(capl.errors) == 1)
    contains_all("Load Integration without Wall Traction arrays: names it", capl.errors[0],
                 ["Pressure Force", "not found", "'p' (1)"])
    # parallel drag and lift directions
    wt.Pressure = ["CELLS", "p"]
    li2 = simple.LoadIntegration(Input=wt, DragDirection=[1, 1, 0], LiftDirection=[2, 2, 0])
    capl2 = Capture(li2)
    T.output_of(li2, 0)
    expect("parallel drag and lift: error", len(capl2.errors) == 1)
    contains_all("parallel drag and lift: message", capl2.errors[0], ["Drag Direction", "Lift Direction", "parallel"])
    delete(li2, li, wt, src)


# ---------------------------------------------------------------------------
# (b) NaN values, zero-area faces, vertices and lines mixed in
# ---------------------------------------------------------------------------

def cellarray(cells):
    sizes = [len(c) for c in cells]
    offsets = np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64)
    conn = np.array([i for c in cells for i in c], dtype=np.int64)
    ca = vtkCellArray()
    ca.SetData(numpy_to_vtk(offsets, deep=1, array_type=vtkmodules.util.vtkConstants.VTK_ID_TYPE),
               numpy_to_vtk(conn, deep=1, array_type=vtkmodules.util.vtkConstants.VTK_ID_TYPE))
    return ca


def mixed_polydata(verts, lines, polys, points, cell_arrays):
    """vtkPolyData with vertices, lines and polygons; cell ids run verts, lines, polys."""
    pd = vtkPolyData()
    pts = vtkPoints()
    pts.SetData(numpy_to_vtk(np.ascontiguousarray(points, dtype=float), deep=1))
    pd.SetPoints(pts)
    pd.SetVerts(cellarray(verts))
    pd.SetLines(cellarray(lines))
    pd.SetPolys(cellarray(polys))
    for name, values in cell_arrays.items():
        a = numpy_to_vtk(np.ascontiguousarray(values, dtype=float), deep=1)
        a.SetName(name)
        pd.GetCellData().AddArray(a)
    return pd


# the mixed scene of (b), reused by (d)
NAN_FACES = [5, 40, 77]                    # sphere faces with NaN pressure
VERTS = [(0,), (7,), (33,)]
LINES = [(1, 2), (10, 11, 12, 13)]
DEGENERATE = [(14, 14, 15), (20, 21, 21, 20)]   # repeated points: zero area
NV = len(VERTS) + len(LINES)


def mixed_scene():
    p = RNG.normal(100.0, 30.0, NS)
    p[NAN_FACES] = np.nan
    wss = RNG.normal(0.0, 0.5, (NS, 3))
    polys = list(SF) + DEGENERATE
    n_polys = len(polys)
    pad = np.full(NV, -7.0)
    p_all = np.concatenate([pad, p, [11.0, 12.0]])
    wss_all = np.concatenate([np.zeros((NV, 3)), wss, np.ones((2, 3))])
    mixed = mixed_polydata(VERTS, LINES, polys, SP, {"p": p_all, "wss": wss_all})
    keep = [k for k in range(NS) if k not in NAN_FACES]
    clean = S.polydata(SP, [SF[k] for k in keep], cell_arrays={"p": p[keep], "wss": wss[keep]})
    return mixed, clean, n_polys


WT_PROPS = dict(Pressure=["CELLS", "p"], ShearSource="Wall shear stress array", ShearStressArray=["CELLS", "wss"],
                Orientation=INTO_FLUID, ReferenceSpeed=20.0, ReferencePressure=90.0)
LI_PROPS = dict(MomentCentre=[0.5, -0.5, 0.1], ReferenceSpeed=20.0)


def check_skipped_faces():
    print("\n== (b) NaN values, zero-area faces, vertices and lines ==")
    mixed, clean, n_polys = mixed_scene()
    assert mixed.GetNumberOfCells() == NV + n_polys
    runs = {}
    for label, pd in (("mixed", mixed), ("clean", clean)):
        src = T.producer(pd)
        wt = simple.WallTraction(Input=src, **WT_PROPS)
        li = simple.LoadIntegration(Input=wt, **LI_PROPS)
        cw, cl = Capture(wt), Capture(li)
        tot = totals_of(li)
        out = T.output_of(wt)
        arrays = {name: np.array(T.cell_array(out, name)) for name in PER_FACE}
        fd = {name: T.field(out, name) for name in field_names(out)}
        runs[label] = (tot, arrays, fd, list(cw.warnings), list(cl.warnings), list(cw.errors) + list(cl.errors))
        delete(li, wt, src)

    tot, arrays, fd, wt_warn, li_warn, errors = runs["mixed"]
    expect("mixed: no errors", not errors, str(errors))
    for name, want in (("Skipped Non-Surface Cells", NV), ("Skipped Degenerate Faces", len(DEGENERATE)),
                       ("Skipped Non-Finite Faces", len(NAN_FACES))):
        expect("mixed: %s = %d" % (name, want), int(fd[name]) == want, "got %d" % int(fd[name]))
    print("    (orientation check of the mixed scene: Inconsistently Oriented Faces %d, Open Boundary Edges %d;"
          " faces skipped for NaN values keep their valid geometry in the check)"
          % (int(fd["Inconsistently Oriented Faces"]), int(fd["Open Boundary Edges"])))
    skipped = list(range(NV)) + [NV + k for k in NAN_FACES] + [NV + NS + k for k in range(len(DEGENERATE))]
    good = np.setdiff1d(np.arange(NV + n_polys), skipped)
    for name in PER_FACE:
        a = arrays[name]
        expect("mixed: %s is NaN on the %d skipped cells" % (name, len(skipped)), np.all(np.isnan(a[skipped])))
        expect("mixed: %s is finite on the %d faces" % (name, len(good)), np.all(np.isfinite(a[good])))
    expect("mixed: one Wall Traction warning", len(wt_warn) == 1, str(wt_warn))
    contains_all("mixed: the warning gives every count", wt_warn[0],
                 ["%d non-surface cells" % NV, "%d degenerate faces" % len(DEGENERATE),
                  "%d faces with NaN/Inf" % len(NAN_FACES)])
    # Load Integration counts faces without a finite load; vertices and lines
    # are not faces (Wall Traction already counted them) and are not listed.
    n_skip = len(DEGENERATE) + len(NAN_FACES)
    expect("mixed: Load Integration warns", len(li_warn) == 1, str(li_warn))
    contains_all("mixed: Load Integration warning counts", li_warn[0], ["%d faces" % n_skip])

    ctot, carrays, cfd, cwt_warn, cli_warn, cerrors = runs["clean"]
    expect("clean: no errors, no warnings", not cerrors and not cwt_warn and not cli_warn,
           str(cerrors + cwt_warn + cli_warn))
    T.check_close("mixed vs clean: Wetted Area", fd["Wetted Area"], cfd["Wetted Area"], rtol=1e-14)
    T.check_close("mixed: Faces", tot["Faces"], NS - len(NAN_FACES))
    T.check_close("mixed: Skipped Faces (every NaN cell)", tot["Skipped Faces"], n_skip,
                  source="Load Integration counts faces with non-finite load or area, not vertices or lines")
    T.check_close("clean: Skipped Faces", ctot["Skipped Faces"], 0)
    for name in TOTALS:
        T.check_close("mixed vs clean: %s" % name, tot[name], ctot[name], rtol=1e-13,
                      source="skipped faces carry no load")
    good_faces = NV + np.array([k for k in range(NS) if k not in NAN_FACES])
    for name in PER_FACE:
        T.check_close("mixed vs clean per face: %s" % name, np.max(np.abs(arrays[name][good_faces] - carrays[name])),
                      0.0, atol=0.0)


# ---------------------------------------------------------------------------
# (c) empty input
# ---------------------------------------------------------------------------

def check_empty():
    print("\n== (c) empty input ==")
    empty_with_arrays = S.polydata(np.zeros((0, 3)), [], cell_arrays={"p": np.zeros(0)})
    for label, pd, props in (("empty polydata with its (empty) pressure array", empty_with_arrays,
                              dict(Pressure=["CELLS", "p"])),
                             ("bare vtkPolyData, nothing selected", vtkPolyData(), {})):
        src = T.producer(pd)
        wt = simple.WallTraction(Input=src, **props)
        li = simple.LoadIntegration(Input=wt, ReferenceSpeed=10.0)
        cw, cl = Capture(wt), Capture(li)
        tot = totals_of(li)
        rows = T.table_rows(T.output_of(li, 1))
        out = T.output_of(wt)
        expect("%s: no errors" % label, not cw.errors and not cl.errors, str(cw.errors + cl.errors))
        expect("%s: Wall Traction warns" % label, len(cw.warnings) == 1 and "no wall faces" in cw.warnings[0],
               str(cw.warnings))
        expect("%s: Load Integration warns" % label, len(cl.warnings) == 1 and "no wall faces" in cl.warnings[0],
               str(cl.warnings))
        T.check_close("%s: Wetted Area" % label, T.field(out, "Wetted Area"), 0.0)
        for name in ["Faces", "Skipped Faces"] + TOTALS + ["Drag Coefficient", "Lift Coefficient"]:
            T.check_close("%s: %s" % (label, name), tot[name], np.zeros_like(tot[name]))
        expect("%s: Line Of Action Point is NaN (no force)" % label, np.all(np.isnan(tot["Line Of Action Point"])),
               str(tot["Line Of Action Point"]))
        expect("%s: Residual Couple is NaN (no force)" % label, np.isnan(tot["Residual Couple"]))
        expect("%s: table has Surface and Total rows" % label, sorted(rows) == ["Surface", "Total"], str(sorted(rows)))
        delete(li, wt, src)


# ---------------------------------------------------------------------------
# (d) the input is never modified
# ---------------------------------------------------------------------------

def snapshot(ds):
    snap = {"class": ds.GetClassName(), "cells": ds.GetNumberOfCells(), "npoints": ds.GetNumberOfPoints()}
    if ds.GetPoints() is not None:
        snap["points"] = vtk_to_numpy(ds.GetPoints().GetData()).copy()
    for tag, attrs in (("point", ds.GetPointData()), ("cell", ds.GetCellData()), ("field", ds.GetFieldData())):
        names = [attrs.GetAbstractArray(i).GetName() for i in range(attrs.GetNumberOfArrays())]
        snap[tag + " names"] = names
        for i, name in enumerate(names):
            snap["%s:%s" % (tag, name)] = vtk_to_numpy(attrs.GetAbstractArray(i)).copy()
        if tag != "field":
            for attr in ("Scalars", "Vectors", "Normals", "Tensors"):
                a = getattr(attrs, "Get" + attr)()
                snap["%s active %s" % (tag, attr)] = a.GetName() if a is not None else None
    if isinstance(ds, vtkPolyData):
        for kind in ("Verts", "Lines", "Polys", "Strips"):
            ca = getattr(ds, "Get" + kind)()
            snap[kind + " offsets"] = vtk_to_numpy(ca.GetOffsetsArray()).copy()
            snap[kind + " connectivity"] = vtk_to_numpy(ca.GetConnectivityArray()).copy()
    return snap


def same_snapshot(label, before, after):
    expect("%s: same keys" % label, sorted(before) == sorted(after),
           "added %s, removed %s" % (sorted(set(after) - set(before)), sorted(set(before) - set(after))))
    for key in before:
        b, a = before[key], after[key]
        if isinstance(b, np.ndarray):
            ok = b.shape == a.shape and b.dtype == a.dtype and np.array_equal(b, a, equal_nan=b.dtype.kind == "f")
        else:
            ok = b == a
        assert ok, "%s: input '%s' changed: %r -> %r" % (label, key, b, a)
    print("%-62s ok (%d items compared bitwise, names and order included)" % (label + ": input unchanged", len(before)))


def check_input_untouched():
    print("\n== (d) the input is never modified ==")
    mixed, _, n_polys = mixed_scene()
    n_all = mixed.GetNumberOfCells()
    # extra arrays an unwary filter might overwrite or re-activate
    wn = numpy_to_vtk(np.tile([0.0, 0.0, 1.0], (n_all, 1)), deep=1)
    wn.SetName("Wall Normal")                        # same name as an output array
    mixed.GetCellData().AddArray(wn)
    mixed.GetCellData().SetActiveScalars("p")
    G = numpy_to_vtk(RNG.normal(size=(mixed.GetNumberOfPoints(), 9)), deep=1)
    G.SetName("G")
    mixed.GetPointData().AddArray(G)
    mu = numpy_to_vtk(np.full(mixed.GetNumberOfPoints(), 1e-3), deep=1)
    mu.SetName("mu")
    mixed.GetPointData().AddArray(mu)
    tag = numpy_to_vtk(np.array([3.0, 1.0, 4.0]), deep=1)
    tag.SetName("Case Tag")
    mixed.GetFieldData().AddArray(tag)
    before = snapshot(mixed)
    src = T.producer(mixed)
    configs = [
        ("wall shear stress", WT_PROPS),
        ("point gradient + viscosity, Wall Normal orientation",
         dict(Pressure=["CELLS", "p"], ShearSource="Velocity gradient", VelocityGradient=["POINTS", "G"],
              ViscosityArray=["POINTS", "mu"], Orientation="Use Wall Normal array", ReferenceSpeed=5.0,
              IncludeNormalViscousStress=1)),
    ]
    for label, props in configs:
        wt = simple.WallTraction(Input=src, **props)
        li = simple.LoadIntegration(Input=wt, **LI_PROPS)
        cap = Capture(wt)
        T.output_of(li, 0)
        expect("%s: ran without error" % label, not cap.errors, str(cap.errors))
        out = T.output_of(wt)
        expect("%s: output has its own Wall Normal" % label,
               not np.array_equal(T.cell_array(out, "Wall Normal")[NV:NV + 3], before["cell:Wall Normal"][NV:NV + 3]))
        same_snapshot("%s: Wall Traction input" % label, before, snapshot(mixed))
        # and Load Integration leaves its input (the Wall Traction output) alone
        wt_before = snapshot(out)
        li.MomentCentre = [1.0, 2.0, 3.0]        # re-execute Load Integration only
        T.output_of(li, 0)
        expect("%s: Wall Traction output object unchanged" % label, T.output_of(wt) is out)
        same_snapshot("%s: Load Integration input" % label, wt_before, snapshot(out))
        delete(li, wt)
    same_snapshot("after all runs", before, snapshot(mixed))
    delete(src)


# ---------------------------------------------------------------------------
# (e) orientation check
# ---------------------------------------------------------------------------

def check_orientation_report():
    print("\n== (e) orientation check ==")
    flip = [13, 50, 80]
    corners = [set(SF[k]) for k in flip]
    assert all(not (corners[i] & corners[j]) for i in range(3) for j in range(i + 1, 3)), "faces must not touch"
    F = [tuple(f[::-1]) if k in flip else f for k, f in enumerate(SF)]
    pd = S.polydata(SP, F, cell_arrays={"p": np.ones(NS)})
    src = T.producer(pd)
    wt = simple.WallTraction(Input=src, Pressure=["CELLS", "p"], Orientation=INTO_FLUID)
    cap = Capture(wt)
    out = T.output_of(wt)
    T.check_close("closed sphere, 3 faces flipped: Inconsistently Oriented Faces",
                  T.field(out, "Inconsistently Oriented Faces"), 3)
    T.check_close("closed sphere, 3 faces flipped: Open Boundary Edges", T.field(out, "Open Boundary Edges"), 0)
    expect("closed sphere, 3 faces flipped: warned", any("3 faces are oriented against" in w for w in cap.warnings),
           str(cap.warnings))
    wt.CheckOrientation = 0
    out = T.output_of(wt)
    expect("CheckOrientation off: no orientation counts",
           "Inconsistently Oriented Faces" not in field_names(out) and "Open Boundary Edges" not in field_names(out),
           str(field_names(out)))
    delete(wt, src)

    # two adjacent flipped faces still form the minority of the patch
    k0 = 30
    k1 = next(k for k in range(NS) if k != k0 and len(set(SF[k]) & set(SF[k0])) == 2)
    F = [tuple(f[::-1]) if k in (k0, k1) else f for k, f in enumerate(SF)]
    src = T.producer(S.polydata(SP, F, cell_arrays={"p": np.ones(NS)}))
    wt = simple.WallTraction(Input=src, Pressure=["CELLS", "p"])
    T.check_close("closed sphere, 2 adjacent faces flipped: Inconsistently Oriented Faces",
                  T.field(T.output_of(wt), "Inconsistently Oriented Faces"), 2)
    delete(wt, src)

    npol, naz = 8, 12
    P, F, rows = S.uv_sphere(1.0, npol, naz, ordering="into_wall")
    F = [f for f, r in zip(F, rows) if r < npol // 2]
    src = T.producer(S.polydata(P, F, cell_arrays={"p": np.ones(len(F))}))
    wt = simple.WallTraction(Input=src, Pressure=["CELLS", "p"])
    out = T.output_of(wt)
    T.check_close("open hemisphere: Open Boundary Edges = rim edges", T.field(out, "Open Boundary Edges"), naz)
    T.check_close("open hemisphere: Inconsistently Oriented Faces", T.field(out, "Inconsistently Oriented Faces"), 0)
    delete(wt, src)


# ---------------------------------------------------------------------------
# (f) multiblock with a block missing the pressure array
# ---------------------------------------------------------------------------

def check_multiblock():
    print("\n== (f) multiblock, one block without the pressure ==")

    def scene(rudder_pressure_name):
        mb = vtkMultiBlockDataSet()
        mb.SetNumberOfBlocks(2)
        hull = S.polydata(SP, SF, cell_arrays={"p": RNG.normal(size=NS)})
        P2, F2 = S.box((0.3, 0.2, 0.5), center=(2.0, 0.0, 0.0))
        rudder = S.polydata(P2, F2, cell_arrays={rudder_pressure_name: np.ones(len(F2)), "T": np.ones(len(F2))})
        for i, (name, block) in enumerate((("hull", hull), ("rudder", rudder))):
            mb.SetBlock(i, block)
            mb.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), name)
        return mb

    src = T.producer(scene("pressure"))
    wt = simple.WallTraction(Input=src, Pressure=["CELLS", "p"], Orientation=INTO_FLUID)
    cap = Capture(wt)
    out = T.output_of(wt)
    expect("multiblock: one error", len(cap.errors) == 1, "%d errors" % len(cap.errors))
    contains_all("multiblock: names the block and its arrays", cap.errors[0],
                 ["'p'", "block 'rudder'", "'pressure' (1)", "'T' (1)"])
    expect("multiblock: no output blocks", out.GetNumberOfBlocks() == 0, "%d blocks" % out.GetNumberOfBlocks())
    delete(wt, src)

    # with the array present on both blocks it runs, one region per block
    src = T.producer(scene("p"))
    wt = simple.WallTraction(Input=src, Pressure=["CELLS", "p"], Orientation=INTO_FLUID)
    li = simple.LoadIntegration(Input=wt)
    cap, capl = Capture(wt), Capture(li)
    rows = T.table_rows(T.output_of(li, 1))
    expect("multiblock, both blocks valid: no errors", not cap.errors and not capl.errors,
           str(cap.errors + capl.errors))
    expect("multiblock, both blocks valid: regions named by the blocks", sorted(rows) == ["Total", "hull", "rudder"],
           str(sorted(rows)))
    delete(li, wt, src)


check_missing_and_wrong_width()
check_skipped_faces()
check_empty()
check_input_untouched()
check_orientation_report()
check_multiblock()
T.done(__file__)
