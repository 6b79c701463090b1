"""Bad and awkward input for Shear Projection: no velocity selected, a
velocity array that is missing (or of the wrong width, or on the wrong
block), walls that do not touch the volume, degenerate (collapsed) cells,
empty volume pieces, and a composite volume that mixes a 3D block with a 2D
boundary patch.

Every case must end in a clear error (named array, the arrays that do
exist, the block) or in NaN on the faces concerned with a warning that
counts them, never in a crash or in wrong numbers on the other faces.  The
good faces are checked against plane Couette flow, u = U y/h between a wall
at rest at y = 0 and the lid, tau_w = mu U/h (White, Viscous Fluid Flow,
§3-2; section recalled from memory), which every method reproduces to
round-off (test_shear_couette.py); tolerance 1e-12 relative, a round-off
bound.

Errors and warnings are captured with observers on the client-side VTK
objects (vtkErrorMacro / vtkWarningMacro invoke ErrorEvent / WarningEvent
with the message as call data).
"""
import numpy as np

from vtkmodules.vtkCommonDataModel import (vtkCompositeDataSet, vtkDataObject,
                                           vtkMultiBlockDataSet, vtkPolyData, vtkUnstructuredGrid)

import wl_testing as T
import scenes as S

simple = T.load_plugin()

MU = 1.0e-3
U_LID = 1.0
HGT = 1.0
TAU = MU * U_LID / HGT
RTOL = 1e-12
METHODS = ["Near-wall difference", "Gradient tensor", "Wall fit", "Wall law"]
OUT_ARRAYS = ["Wall Shear Stress", "Wall Normal", "Wall Distance", "Friction Velocity", "y+"]

X = np.linspace(0.0, 1.0, 4)
Y = np.linspace(0.0, HGT, 5)
Z = np.linspace(0.0, 1.0, 3)


Capture = T.Capture


expect = T.expect


contains_all = T.contains_all


def last_line(messages):
    return messages[-1].strip().splitlines()[-1] if messages else ""


def multiblock(named):
    mb = vtkMultiBlockDataSet()
    mb.SetNumberOfBlocks(len(named))
    for i, (name, ds) in enumerate(named):
        mb.SetBlock(i, ds)
        mb.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), name)
    return mb


def leaves(out):
    """[(name, dataset)] of the leaves of a composite output."""
    res = []
    it = out.NewTreeIterator()
    it.VisitOnlyLeavesOn()
    it.InitTraversal()
    while not it.IsDoneWithTraversal():
        name = it.GetCurrentMetaData().Get(vtkCompositeDataSet.NAME()) if it.HasCurrentMetaData() else None
        res.append((name, it.GetCurrentDataObject()))
        it.GoToNextItem()
    return res


def couette_box(x=X, with_extra=True):
    """Hexahedra on x * Y * Z with u = U y/h (cell, at the vertex mean) and a scalar 'p'."""
    P, hexes, _ = S.hex_grid(x, Y, Z)
    C = P[hexes].mean(axis=1)
    U = np.zeros_like(C)
    U[:, 0] = U_LID * C[:, 1] / HGT
    arrays = {"velocity": U, "p": C[:, 0]} if with_extra else {"velocity": U}
    return S.mixed_unstructured_grid(P, [(S.VTK_HEXAHEDRON, hexes)], cell_arrays=arrays), P, hexes, U


def bottom_wall(x=X, y0=0.0, **arrays):
    wp, wf = S.grid_boundary_patch(x, Y + y0, Z, 1, 0)
    return S.polydata(wp, wf, cell_arrays=arrays or None)


def check_good(label, ds, mask=None):
    tau = T.cell_array(ds, "Wall Shear Stress")
    sel = np.ones(len(tau), bool) if mask is None else mask
    err = np.max(np.abs(tau[sel] - [TAU, 0.0, 0.0])) if np.any(sel) else np.inf
    expect(label + ": good faces exact (tau = mu U/h)", err <= RTOL * TAU, "max err %.2e" % err)


def all_nan(ds, rows):
    ok = True
    for name in OUT_ARRAYS:
        a = T.cell_array(ds, name)[rows]
        ok = ok and bool(np.all(np.isnan(a)))
    reg = T.cell_array(ds, "Near-Wall Regime")[rows]
    return ok and bool(np.all(reg == -1))


def quiet(proxy):
    """Keep the executive's 'returned failure' report out of the log."""
    proxy.GetClientSideObject().GetExecutive().AddObserver("ErrorEvent", lambda *a: None)


# ---------------------------------------------------------------------------
# (a) no velocity selected
# ---------------------------------------------------------------------------

def check_no_velocity():
    print("\n== (a) no velocity array selected: the default, or an error naming what exists ==")
    from wallloads.WallLoadsFilters import vtkShearProjection
    vol, _, _, _ = couette_box()
    f = vtkShearProjection()
    f.SetInputData(vol)
    f.SetViscosity(MU)
    cap = Capture(f)
    f.Update()
    # Velocity defaults to the first 3-component array of the volume (issue 8:
    # a script may create the filter before its input has data); an earlier
    # build failed here with "needs a Velocity array".
    expect("VTK class, nothing selected: the first 3-component array is used, no error",
           not cap.errors and f.GetOutputDataObject(0).GetNumberOfCells() > 0, str(cap.errors))
    check_good("VTK class, nothing selected", f.GetOutputDataObject(0),
               T.cell_array(f.GetOutputDataObject(0), "Wall Normal")[:, 1] > 0.5)

    src = T.producer(vol)
    sp = simple.ShearProjection(Input=src, Velocity=["CELLS", ""], Viscosity=MU)
    cap = Capture(sp)
    out = T.output_of(sp)
    expect("proxy, Velocity set to '': the default array, no error", not cap.errors and out.GetNumberOfCells() > 0,
           str(cap.errors))
    simple.Delete(sp)

    # A volume with no 3-component array at all: the property has nothing to select.
    P, hexes, _ = S.hex_grid(X, Y, Z)
    novec = S.mixed_unstructured_grid(P, [(S.VTK_HEXAHEDRON, hexes)],
                                      cell_arrays={"u": np.zeros(len(hexes)), "v": np.zeros(len(hexes))})
    src2 = T.producer(novec)
    sp = simple.ShearProjection(Input=src2)
    cap = Capture(sp)
    quiet(sp)
    out = T.output_of(sp)
    print("   (Velocity property as ParaView set it: %r)" % (list(sp.Velocity),))
    expect("no 3-component array on the volume: one error", len(cap.errors) == 1, str(len(cap.errors)))
    contains_all("no 3-component array: lists what exists", cap.errors[0], ["Velocity", "'u' (1)", "'v' (1)"])
    expect("no 3-component array: no output cells", out.GetNumberOfCells() == 0)
    for p in (sp, src2, src):
        simple.Delete(p)


# ---------------------------------------------------------------------------
# (b) velocity array missing, wrong width, missing on one block
# ---------------------------------------------------------------------------

def check_missing_velocity():
    print("\n== (b) velocity array missing ==")
    vol, _, _, _ = couette_box()
    src = T.producer(vol)
    sp = simple.ShearProjection(Input=src, Velocity=["CELLS", "velocty"], Viscosity=MU)
    cap = Capture(sp)
    quiet(sp)
    out = T.output_of(sp)
    expect("missing velocity: one error", len(cap.errors) == 1, str(len(cap.errors)))
    contains_all("missing velocity: names it, where it looked, and what exists", cap.errors[0],
                 ["'velocty'", "not found", "cell data", "'velocity' (3)", "'p' (1)"])
    expect("missing velocity: no output cells", out.GetNumberOfCells() == 0)
    expect("missing velocity: no Wall Shear Stress array",
           out.GetCellData().GetArray("Wall Shear Stress") is None)
    expect("missing velocity: no warnings besides", not cap.warnings, str(cap.warnings))

    sp.Velocity = ["CELLS", "p"]
    cap.errors[:] = []
    T.output_of(sp)
    expect("velocity of 1 component: one error", len(cap.errors) == 1, str(len(cap.errors)))
    contains_all("velocity of 1 component: clear message", cap.errors[0], ["'p'", "1 components", "3 expected"])
    simple.Delete(sp)

    # asked on points while it is cell data: through the VTK class (a proxy would let
    # ParaView convert cell data to point data before the filter sees it)
    from wallloads.WallLoadsFilters import vtkShearProjection
    f = vtkShearProjection()
    f.SetInputData(vol)
    f.SetInputArrayToProcess(0, 0, 0, vtkDataObject.FIELD_ASSOCIATION_POINTS, "velocity")
    capf = Capture(f)
    f.GetExecutive().AddObserver("ErrorEvent", lambda *a: None)
    f.Update()
    expect("velocity asked on points (VTK class): one error", len(capf.errors) == 1, str(len(capf.errors)))
    contains_all("velocity asked on points: says where it looked", capf.errors[0], ["'velocity'", "point data"])

    # missing on one block of a composite volume: the message names the block
    P2, h2, _ = S.hex_grid(X + 1.0, Y, Z)
    solid = S.mixed_unstructured_grid(P2, [(S.VTK_HEXAHEDRON, h2)], cell_arrays={"V": np.zeros((len(h2), 3))})
    src2 = T.producer(multiblock([("fluid", vol), ("solid", solid)]))
    sp = simple.ShearProjection(Input=src2, Velocity=["CELLS", "velocity"], Viscosity=MU)
    cap = Capture(sp)
    quiet(sp)
    T.output_of(sp)
    expect("missing on one block: one error", len(cap.errors) == 1, str(len(cap.errors)))
    contains_all("missing on one block: names the block and its arrays", cap.errors[0],
                 ["'velocity'", "block 'solid'", "'V' (3)"])
    simple.Delete(sp)

    # the wall velocity missing on one wall block
    walls = multiblock([("bottom", bottom_wall(Uw=np.zeros((6, 3)))), ("lid", bottom_wall(y0=HGT))])
    wsrc = T.producer(walls)
    sp = simple.ShearProjection(Input=src, Walls=wsrc, Velocity=["CELLS", "velocity"], WallVelocity=["CELLS", "Uw"],
                                Viscosity=MU)
    cap = Capture(sp)
    quiet(sp)
    T.output_of(sp)
    expect("wall velocity missing on a wall block: one error", len(cap.errors) == 1, str(len(cap.errors)))
    contains_all("wall velocity missing: names array and block", cap.errors[0], ["'Uw'", "block 'lid'"])
    for p in (sp, wsrc, src2, src):
        simple.Delete(p)


# ---------------------------------------------------------------------------
# (c) walls that do not touch the volume
# ---------------------------------------------------------------------------

def check_walls_not_touching():
    print("\n== (c) walls that do not touch the volume ==")
    vol, _, _, _ = couette_box()
    src = T.producer(vol)
    walls = multiblock([("bottom", bottom_wall()), ("far", bottom_wall(y0=5.0))])
    wsrc = T.producer(walls)
    sp = simple.ShearProjection(Input=src, Walls=wsrc, Velocity=["CELLS", "velocity"], Viscosity=MU)
    for method in METHODS:
        sp.Method = method
        cap = Capture(sp)
        out = T.output_of(sp)
        blocks = dict(leaves(out))
        expect(method + ": no error", not cap.errors, str(cap.errors))
        expect(method + ": one warning", len(cap.warnings) == 1, str(len(cap.warnings)))
        contains_all(method + ": warning counts the faces and names the block", cap.warnings[0],
                     ["6 of 12 wall faces", "match no boundary face", "6 of 6 faces of 'far'"])
        expect(method + ": every output of 'far' is NaN, regime -1",
               all_nan(blocks["far"], np.arange(blocks["far"].GetNumberOfCells())))
        if method != "Wall law":
            check_good(method + " 'bottom'", blocks["bottom"])
        else:
            expect("Wall law 'bottom': finite", np.all(np.isfinite(T.cell_array(blocks["bottom"], "Wall Shear Stress"))))
    simple.Delete(sp)
    # a plain polydata that misses entirely
    wsrc2 = T.producer(bottom_wall(y0=-0.5))
    sp = simple.ShearProjection(Input=src, Walls=wsrc2, Velocity=["CELLS", "velocity"], Viscosity=MU)
    cap = Capture(sp)
    out = T.output_of(sp)
    expect("walls all apart: one warning, no error", len(cap.warnings) == 1 and not cap.errors,
           str(cap.errors + cap.warnings))
    contains_all("walls all apart: counted, named 'walls'", cap.warnings[0], ["6 of 6 wall faces", "of 'walls'"])
    expect("walls all apart: all NaN", all_nan(out, np.arange(out.GetNumberOfCells())))
    # a wall just off the boundary by more than the matching tolerance (1e-4 of the face size)
    size = np.sqrt((X[1] - X[0]) * (Z[1] - Z[0]))
    for off, matched in ((0.5e-4 * size, True), (2e-4 * size, False)):
        wsrc2.GetClientSideObject().SetOutput(bottom_wall(y0=off))
        wsrc2.MarkModified(wsrc2)
        cap = Capture(sp)
        out = T.output_of(sp)
        tau = T.cell_array(out, "Wall Shear Stress")
        expect("wall offset %.1e x face size: %s" % (off / size, "matched" if matched else "unmatched (NaN)"),
               bool(np.all(np.isfinite(tau))) == matched and bool(np.all(np.isnan(tau))) != matched,
               "%d NaN faces" % np.count_nonzero(np.isnan(tau[:, 0])))
    for p in (sp, wsrc2, wsrc, src):
        simple.Delete(p)


# ---------------------------------------------------------------------------
# (d) degenerate cells
# ---------------------------------------------------------------------------

def collapsed_scene(kind):
    """The Couette box plus one hexahedron of zero height on the wall y = 0 beside it,
    x in [1, 1.25], z in [0, 0.5]: 'coincident' gives its top four points the
    coordinates of the bottom four (distinct ids); 'repeated' uses the bottom ids twice.
    Its centre lies on the wall.  Returns the volume and the wall (the box's bottom
    faces, then the collapsed cell's bottom face)."""
    vol, P, hexes, U = couette_box(with_extra=False)
    base = np.array([[1.0, 0, 0], [1.25, 0, 0], [1.25, 0, 0.5], [1.0, 0, 0.5]])
    if kind == "coincident":
        extra_p = np.vstack([base, base])
        conn = np.arange(8)[None, :] + len(P)
    else:
        extra_p = base
        conn = np.array([[0, 1, 2, 3, 0, 1, 2, 3]]) + len(P)
    Pall = np.vstack([P, extra_p])
    vol = S.mixed_unstructured_grid(Pall, [(S.VTK_HEXAHEDRON, hexes), (S.VTK_HEXAHEDRON, conn)],
                                    cell_arrays={"velocity": np.vstack([U, np.zeros((1, 3))])})
    wp, wf = S.grid_boundary_patch(X, Y, Z, 1, 0)
    wp = np.vstack([wp, base])
    n0 = len(wp) - 4
    wf = list(wf) + [(n0, n0 + 1, n0 + 2, n0 + 3)]
    return vol, S.polydata(wp, wf)


def check_degenerate_cells():
    print("\n== (d) degenerate cells: a collapsed hexahedron with its centre on the wall ==")
    for kind in ("coincident", "repeated"):
        vol, wall = collapsed_scene(kind)
        vsrc, wsrc = T.producer(vol), T.producer(wall)
        nf = wall.GetNumberOfCells()
        sp = simple.ShearProjection(Input=vsrc, Walls=wsrc, Velocity=["CELLS", "velocity"], Viscosity=MU)
        for method in METHODS:
            sp.Method = method
            cap = Capture(sp)
            out = T.output_of(sp)
            label = "%s, %s" % (kind, method)
            expect(label + ": no error", not cap.errors, str(cap.errors))
            expect(label + ": the collapsed cell's face is NaN everywhere", all_nan(out, [nf - 1]))
            if method != "Wall law":
                check_good(label, out, np.arange(nf) < nf - 1)
            text = " ".join(cap.warnings)
            # 'coincident': its bottom and top faces are both boundary faces with the same
            # centroid; 'repeated': its bottom and top faces have the same ids, and as no
            # other cell has them both are boundary faces of this cell (WallAdjacency finds
            # the neighbour across a face by the cells that hold all its corners; an earlier
            # extraction cancelled them and reported the face as unmatched, the wrong
            # reason). Either way the wall face matches, and the cell centre is on the wall.
            contains_all(label + ": counted as degenerate", text,
                         ["1 faces whose adjacent cell centre is not off the wall"])
        simple.Delete(sp)
        # no Walls: the collapsed cell's own boundary faces (zero-area sides, and for
        # 'coincident' its bottom and top) carry NaN and are counted; the box's bottom is exact
        sp = simple.ShearProjection(Input=vsrc, Velocity=["CELLS", "velocity"], Viscosity=MU, Method="Wall fit")
        cap = Capture(sp)
        out = T.output_of(sp)
        tau = T.cell_array(out, "Wall Shear Stress")
        n = T.cell_array(out, "Wall Normal")
        nan_faces = int(np.count_nonzero(np.isnan(tau[:, 0])))
        counted = 0
        for w in cap.warnings:
            line = w.strip().splitlines()[-1]
            if "match no boundary face" in line:
                counted += int(line.split("Shear Projection: ")[1].split(" of ")[0])
            if "not off the wall" in line:
                counted += int(line.split("Shear Projection: ")[1].split(" faces")[0])
            if "degenerate wall faces" in line:
                # "... N wall cells that are not faces ..., M degenerate wall faces (zero area) and K faces ..."
                counted += int(line.split(" wall cells that are not faces")[0].split()[-1])
                counted += int(line.split(" degenerate wall faces")[0].split()[-1])
                counted += int(line.split(" faces shared by two volume blocks")[0].split()[-1])
        expect("%s, no walls: NaN faces all counted in the warnings" % kind, nan_faces == counted and nan_faces > 0,
               "%d NaN, %d counted: %s" % (nan_faces, counted, [last_line([w]) for w in cap.warnings]))
        bottom = np.isfinite(n[:, 1]) & (n[:, 1] > 0.5)
        expect("%s, no walls: the box's 6 bottom faces are finite" % kind, np.count_nonzero(bottom) == 6)
        check_good("%s, no walls, bottom" % kind, out, bottom)
        for p in (sp, wsrc, vsrc):
            simple.Delete(p)


# ---------------------------------------------------------------------------
# (e) empty pieces
# ---------------------------------------------------------------------------

def check_empty_pieces():
    print("\n== (e) empty volume pieces ==")
    vol, _, _, _ = couette_box()
    empty = vtkUnstructuredGrid()            # no points, no cells, no arrays
    src = T.producer(multiblock([("empty", empty), ("fluid", vol)]))
    sp = simple.ShearProjection(Input=src, Velocity=["CELLS", "velocity"], Viscosity=MU, Method="Wall fit")
    cap = Capture(sp)
    out = T.output_of(sp)
    names = [n for n, _ in leaves(out)]
    expect("empty + fluid, no walls: no error, no warning but the default-walls note (empty piece "
           "needs no arrays)", not cap.errors and not cap.unexpected(T.NOTE_DEFAULT_WALLS),
           str(cap.errors + cap.warnings))
    expect("empty + fluid, no walls: one output block, the fluid's boundary", names == ["fluid boundary"], str(names))
    b = leaves(out)[0][1]
    n = T.cell_array(b, "Wall Normal")
    check_good("empty + fluid, no walls, bottom", b, n[:, 1] > 0.5)
    wsrc = T.producer(bottom_wall())
    sp2 = simple.ShearProjection(Input=src, Walls=wsrc, Velocity=["CELLS", "velocity"], Viscosity=MU)
    cap = Capture(sp2)
    out = T.output_of(sp2)
    expect("empty + fluid, walls: no error or warning", not cap.errors and not cap.warnings)
    check_good("empty + fluid, walls", out)
    for p in (sp2, sp, src):
        simple.Delete(p)

    # A volume with no 3-D cells at all is an error that says so (issue 7 item 14;
    # this build gave an empty output and no message), with or without walls.
    for label, volume in (("plain empty grid", empty), ("multiblock of an empty grid", multiblock([("e", empty)]))):
        src = T.producer(volume)
        for walls in (None, wsrc):
            sp = simple.ShearProjection(Input=src, Velocity=["CELLS", "velocity"], Viscosity=MU)
            if walls is not None:
                sp.Walls = walls
            cap = Capture(sp)
            out = T.output_of(sp)
            tag = label + (", walls" if walls is not None else ", no walls")
            expect(tag + ": one error, empty output", len(cap.errors) == 1 and out.GetNumberOfPoints() == 0,
                   str(cap.errors + cap.warnings))
            contains_all(tag + ": the error says there is no volume", cap.errors[0], ["no 3-D cells"])
            simple.Delete(sp)
        simple.Delete(src)
    # empty walls
    src = T.producer(vol)
    ew = T.producer(vtkPolyData())
    sp = simple.ShearProjection(Input=src, Walls=ew, Velocity=["CELLS", "velocity"], Viscosity=MU)
    cap = Capture(sp)
    out = T.output_of(sp)
    expect("empty walls: no error or warning, no faces", not cap.errors and not cap.warnings
           and out.GetNumberOfCells() == 0, str(cap.errors + cap.warnings))
    for p in (sp, ew, src, wsrc):
        simple.Delete(p)


# ---------------------------------------------------------------------------
# (f) composite volume: a volume block and a 2D patch block
# ---------------------------------------------------------------------------

def check_composite_volume():
    print("\n== (f) composite volume: 3D block + 2D patch block ==")
    vol, _, _, _ = couette_box()
    patch = bottom_wall()                     # no velocity array on it: it is not a volume
    comp = multiblock([("fluid", vol), ("bottom", patch)])
    src = T.producer(comp)
    sp = simple.ShearProjection(Input=src, Velocity=["CELLS", "velocity"], Viscosity=MU, Method="Wall fit")
    cap = Capture(sp)
    out = T.output_of(sp)
    lv = leaves(out)
    nx, ny, nz = len(X) - 1, len(Y) - 1, len(Z) - 1
    expect("patch ignored as a volume: no error, one warning (walls default to the whole boundary)",
           not cap.errors and len(cap.warnings) == 1, str(cap.errors + cap.warnings))
    contains_all("default walls: the warning counts the faces and names the patch blocks", cap.warnings[0],
                 [T.NOTE_DEFAULT_WALLS, "all %d boundary faces" % (2 * ((len(X) - 1) * (len(Y) - 1)
                                                                     + (len(Y) - 1) * (len(Z) - 1)
                                                                     + (len(Z) - 1) * (len(X) - 1))),
                  "Wall Blocks", "'bottom'"])
    expect("patch ignored as a volume: one output block 'fluid boundary'", [n for n, _ in lv] == ["fluid boundary"],
           str([n for n, _ in lv]))
    expect("patch ignored as a volume: the fluid's boundary faces only",
           lv[0][1].GetNumberOfCells() == 2 * (nx * ny + ny * nz + nz * nx), "%d" % lv[0][1].GetNumberOfCells())
    eb = simple.ExtractBlock(Input=src, Selectors=["/Root/bottom"])
    for method in METHODS[:3]:
        sp2 = simple.ShearProjection(Input=src, Walls=eb, Velocity=["CELLS", "velocity"], Viscosity=MU, Method=method)
        cap = Capture(sp2)
        out = T.output_of(sp2)
        lv = leaves(out)
        expect(method + ", walls = the patch block: no error or warning", not cap.errors and not cap.warnings,
               str(cap.errors + cap.warnings))
        expect(method + ", walls = the patch block: output keeps its name", [n for n, _ in lv] == ["bottom"],
               str([n for n, _ in lv]))
        check_good(method + ", walls = the patch block", lv[0][1])
        simple.Delete(sp2)
    for p in (eb, sp, src):
        simple.Delete(p)


def main():
    check_no_velocity()
    check_missing_velocity()
    check_walls_not_touching()
    check_degenerate_cells()
    check_empty_pieces()
    check_composite_volume()
    T.done(__file__)


if __name__ == "__main__":
    main()
