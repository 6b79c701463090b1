"""Shear Projection on inputs that broke it, and its behaviour in the panel
and in scripts. Each case failed in an earlier build (stated beside it).

1. Quadratic and higher-order 3-D cells (two quadratic hexahedra; quadratic
   tetrahedra): the boundary is found from the cells' corners. An earlier
   build trusted VTK 9.2's surface extraction, whose original-cell ids are
   face indices for nonlinear cells, read out of bounds and aborted. Plane
   Couette flow on them is exact (White, Viscous Fluid Flow, §3-2).
2. A piece with a ghost layer and no Walls: only the true boundary faces of
   the owned cells are walls. An earlier build took the ghost layer's outer
   faces and the partition face as walls (more wetted area than the box has).
3. The adjacency cache follows the geometry: a rectilinear grid whose
   interior coordinates move, an image whose dimensions are permuted with
   the same bounds. An earlier build compared counts and bounds only and
   kept a stale adjacency (wall distance 0.5 instead of 0.05).
4. No volume (a surface, or nothing): a clear error; Density 0: an error
   naming it; a density array not positive on some cells: those faces NaN
   and a warning naming the array. An earlier build gave an empty output
   with no message, or infinite friction velocity and regime -1 silently.
5. The panel and scripts: creating the filter gives no message; Velocity
   defaults to the first 3-component array, also when the filter is made
   before its input has data; a whole case (volume and patches) with Wall
   Blocks ticked gives those patches' shear; without walls a warning says
   every boundary face is a wall and how many; progress is reported and an
   abort leaves NaN with a warning (quiet otherwise).
6. The wall fit on one layer of cells (no second distance from the wall)
   uses the near-wall difference and says so, with that reason.
"""
import numpy as np

import wl_testing as T
import scenes as S
from vtkmodules.util.numpy_support import numpy_to_vtk
from vtkmodules.vtkCommonCore import vtkOutputWindow, vtkStringOutputWindow
from vtkmodules.vtkCommonDataModel import (vtkCompositeDataSet, vtkDataSetAttributes, vtkImageData,
                                           vtkMultiBlockDataSet, vtkRectilinearGrid, vtkUnstructuredGrid)

simple = T.load_plugin()
MU = 1.0e-3
U_TOP, H = 0.6, 1.0


def box_hexes(nx, ny, nz, lx=1.0, ly=H, lz=1.0):
    P, C = S.hex_box(np.linspace(0, lx, nx + 1), np.linspace(0, ly, ny + 1), np.linspace(0, lz, nz + 1))
    return P, C


def run(src, method="Near-wall difference", walls=None, **props):
    sp = simple.ShearProjection(Input=src, Velocity=["CELLS", "velocity"], Viscosity=MU, Method=method)
    if walls is not None:
        sp.Walls = walls
    for k, v in props.items():
        setattr(sp, k, v)
    cap = T.Capture(sp)
    out = T.output_of(sp)
    return sp, cap, out


# ---------------------------------------------------------------------------
# 1. quadratic cells
# ---------------------------------------------------------------------------

def quadratic_hexahedra(ny):
    """Hexahedra [0,1] x [0,H] x [0,1] stacked in y as VTK_QUADRATIC_HEXAHEDRON
    (corners, then the 12 edge midpoints in VTK's order)."""
    P, C = box_hexes(1, ny, 1)
    pts = [tuple(p) for p in P]
    index = {p: i for i, p in enumerate(pts)}

    def mid(a, b):
        m = tuple((np.array(pts[a]) + np.array(pts[b])) / 2)
        if m not in index:
            index[m] = len(pts)
            pts.append(m)
        return index[m]

    edges = [(0, 1), (1, 2), (2, 3), (3, 0), (4, 5), (5, 6), (6, 7), (7, 4), (0, 4), (1, 5), (2, 6), (3, 7)]
    cells = np.array([list(c) + [mid(c[a], c[b]) for a, b in edges] for c in C])
    return np.array(pts), cells


def check_quadratic_cells():
    print("\n== 1. quadratic 3-D cells ==")
    for label, (P, cells, ctype, expect_faces) in {
            "two quadratic hexahedra": quadratic_hexahedra(2) + (25, 10),
            "four quadratic hexahedra": quadratic_hexahedra(4) + (25, 18)}.items():
        xc = P[cells[:, :8]].mean(axis=1)
        u = np.zeros_like(xc)
        u[:, 0] = U_TOP * xc[:, 1] / H
        vol = S.mixed_unstructured_grid(P, [(ctype, cells)], cell_arrays={"velocity": u})
        src = T.producer(vol)
        for method in ("Near-wall difference", "Wall fit", "Gradient tensor"):
            sp, cap, out = run(src, method)
            T.expect("%s, %s: no error, %d boundary faces" % (label, method, expect_faces),
                     not cap.errors and out.GetNumberOfCells() == expect_faces,
                     "%d faces; %s" % (out.GetNumberOfCells(), cap.errors))
            n = T.cell_array(out, "Wall Normal")
            bottom = n[:, 1] > 0.5
            T.close_worst("%s, %s: Couette tau on the bottom wall" % (label, method),
                          T.cell_array(out, "Wall Shear Stress")[bottom], [MU * U_TOP / H, 0, 0],
                          rtol=1e-10, source="White VFF §3-2; exact for a linear profile")
            simple.Delete(sp)
        simple.Delete(src)
    # Quadratic tetrahedra: the pipe of tetrahedra with mid-edge nodes added.
    m = S.pipe_volume(1.0, 1.0, 2, 8, 2, kind="tet")
    P = [tuple(p) for p in m["points"]]
    index = {p: i for i, p in enumerate(P)}
    tets = m["cells"][0][1]
    quad = []
    for t in tets:
        ids = list(t)
        for a, b in ((0, 1), (1, 2), (2, 0), (0, 3), (1, 3), (2, 3)):
            mp = tuple((np.array(P[t[a]]) + np.array(P[t[b]])) / 2)
            if mp not in index:
                index[mp] = len(P)
                P.append(mp)
            ids.append(index[mp])
        quad.append(ids)
    P, quad = np.array(P), np.array(quad)
    xc = P[quad[:, :4]].mean(axis=1)
    u = np.zeros_like(xc)
    u[:, 2] = 1.0 - xc[:, 0] ** 2 - xc[:, 1] ** 2
    src = T.producer(S.mixed_unstructured_grid(P, [(24, quad)], cell_arrays={"velocity": u}))
    sp, cap, out = run(src, "Wall fit")
    T.expect("quadratic tetrahedra: no error, the boundary of the linear pipe (%d faces)"
             % (len(m["wall"]) + m["caps"]),
             not cap.errors and out.GetNumberOfCells() == len(m["wall"]) + m["caps"],
             "%d; %s" % (out.GetNumberOfCells(), cap.errors))
    T.expect("quadratic tetrahedra: finite on every face",
             bool(np.all(np.isfinite(T.cell_array(out, "Wall Shear Stress")))))
    for p in (sp, src):
        simple.Delete(p)


# ---------------------------------------------------------------------------
# 2. a ghost layer without Walls
# ---------------------------------------------------------------------------

def check_ghost_layer():
    print("\n== 2. a piece with a ghost layer, no Walls ==")
    # The box [0,4] x [0,1] x [0,1] of 4 x 2 x 2 cells; this piece owns x < 2
    # and holds the next column of cells (x in [2, 3]) as a ghost layer.
    P, C = box_hexes(4, 2, 2, lx=4.0)
    xc = S.cell_vertex_means(P, C)
    keep = xc[:, 0] < 3.0
    ghosts = np.where(xc[keep, 0] > 2.0, vtkDataSetAttributes.DUPLICATECELL, 0).astype(np.uint8)
    u = np.zeros((keep.sum(), 3))
    u[:, 0] = U_TOP * xc[keep, 1] / H
    vol = S.mixed_unstructured_grid(P, [(S.VTK_HEXAHEDRON, C[keep])], cell_arrays={"velocity": u})
    g = numpy_to_vtk(ghosts, deep=1)
    g.SetName(vtkDataSetAttributes.GhostArrayName())
    vol.GetCellData().AddArray(g)
    src = T.producer(vol)
    sp, cap, out = run(src)
    wt = simple.WallTraction(Input=sp, Pressure=["CELLS", "None"], ShearSource="Wall shear stress array",
                             ShearStressArray=["CELLS", "Wall Shear Stress"], Orientation="Use Wall Normal array")
    li = simple.LoadIntegration(Input=wt)
    area = T.field(T.output_of(li, 0), "Area")
    # Owned part: x in [0, 2]: its outer boundary without the face x = 2:
    # 2 (2 x 1) + 2 (2 x 1) + 1 x 1 = 9 m^2.
    T.check_close("ghosted piece: wall area = outer boundary of the owned cells", area, 9.0, rtol=1e-14,
                  source="geometry: 2*2 + 2*2 + 1 m^2")
    T.expect("ghosted piece: %d wall faces (4 + 4 + 4 + 4 + 4 of the owned cells' outer sides)"
             % out.GetNumberOfCells(), out.GetNumberOfCells() == 20)
    for p in (li, wt, sp, src):
        simple.Delete(p)


# ---------------------------------------------------------------------------
# 3. the cache follows the geometry
# ---------------------------------------------------------------------------

def structured_velocity(ds):
    from vtkmodules.vtkFiltersCore import vtkCellCenters
    cc = vtkCellCenters()
    cc.SetInputData(ds)
    cc.Update()
    from vtkmodules.util.numpy_support import vtk_to_numpy
    x = vtk_to_numpy(cc.GetOutput().GetPoints().GetData())
    u = np.zeros_like(x)
    u[:, 0] = U_TOP * x[:, 1] / H
    arr = numpy_to_vtk(u, deep=1)
    arr.SetName("velocity")
    ds.GetCellData().AddArray(arr)


def bottom_distance(out):
    n = T.cell_array(out, "Wall Normal")
    return np.sort(T.cell_array(out, "Wall Distance")[n[:, 1] > 0.5])


def check_cache_keys():
    print("\n== 3. the adjacency cache follows the geometry ==")
    rg = vtkRectilinearGrid()
    rg.SetDimensions(3, 3, 2)
    coords = [np.array([0.0, 0.5, 1.0]), np.array([0.0, 0.1, 1.0]), np.array([0.0, 1.0])]
    arrays = [numpy_to_vtk(c, deep=1) for c in coords]
    rg.SetXCoordinates(arrays[0])
    rg.SetYCoordinates(arrays[1])
    rg.SetZCoordinates(arrays[2])
    structured_velocity(rg)
    src = T.producer(rg)
    wsrc = T.producer(S.polydata(*S.grid_boundary_patch(coords[0], coords[1], coords[2], 1, 0)))
    sp, cap, out = run(src, walls=wsrc)
    T.close_worst("rectilinear: first-cell wall distance 0.05", T.cell_array(out, "Wall Distance"), 0.05, atol=1e-15)
    # Move the interior coordinates in place (same counts, same bounds): the
    # wall faces move with them (x = 0.5 -> 0.3), the first cell grows (0.1 -> 0.5).
    arrays[0].SetValue(1, 0.3)
    arrays[1].SetValue(1, 0.5)
    for a in arrays:
        a.Modified()
    rg.GetCellData().RemoveArray("velocity")
    structured_velocity(rg)
    src.MarkModified(src)
    wsrc.GetClientSideObject().SetOutput(S.polydata(*S.grid_boundary_patch(
        np.array([0.0, 0.3, 1.0]), np.array([0.0, 0.5, 1.0]), coords[2], 1, 0)))
    wsrc.MarkModified(wsrc)
    cap = T.Capture(sp)
    out = T.output_of(sp)
    T.expect("rectilinear, coordinates moved: every moved wall face matched (no warning)",
             not cap.warnings and not cap.errors, str(cap.errors + cap.warnings))
    T.close_worst("rectilinear, coordinates moved: wall distance 0.25 (not the stale 0.05)",
                  T.cell_array(out, "Wall Distance"), 0.25, atol=1e-15)
    T.close_worst("rectilinear, moved: Couette tau still exact", T.cell_array(out, "Wall Shear Stress")[:, 0],
                  MU * U_TOP / H, rtol=1e-12)
    for p in (sp, wsrc, src):
        simple.Delete(p)
    # An image 4 x 2 x 1 cells over [0,1] x [0,1] x [0,1], then 2 x 4 x 1 over the same bounds.
    img = vtkImageData()
    img.SetDimensions(5, 3, 2)
    img.SetSpacing(0.25, 0.5, 1.0)
    structured_velocity(img)
    src = T.producer(img)
    sp, cap, out = run(src)
    T.close_worst("image 4x2: bottom wall distance 0.25", bottom_distance(out), 0.25, atol=1e-15)
    img2 = vtkImageData()
    img2.SetDimensions(3, 5, 2)
    img2.SetSpacing(0.5, 0.25, 1.0)
    structured_velocity(img2)
    src.GetClientSideObject().SetOutput(img2)
    src.MarkModified(src)
    out = T.output_of(sp)
    T.close_worst("image, dimensions permuted (same bounds): wall distance 0.125 (not the stale 0.25)",
                  bottom_distance(out), 0.125, atol=1e-15)
    T.expect("image: two bottom faces after the permutation", bottom_distance(out).size == 2)
    builds = sp.GetClientSideObject().GetNumberOfAdjacencyBuilds()
    T.expect("image: the adjacency was rebuilt (%d builds)" % builds, builds == 2)
    for p in (sp, src):
        simple.Delete(p)


# ---------------------------------------------------------------------------
# 4. no volume; density
# ---------------------------------------------------------------------------

def couette_volume(extra=None):
    P, C = box_hexes(2, 3, 2)
    xc = S.cell_vertex_means(P, C)
    arrays = {"velocity": np.stack([U_TOP * xc[:, 1] / H, 0 * xc[:, 0], 0 * xc[:, 0]], 1)}
    arrays.update(extra or {})
    return S.mixed_unstructured_grid(P, [(S.VTK_HEXAHEDRON, C)], cell_arrays=arrays), xc


def check_no_volume_and_density():
    print("\n== 4. no volume; density ==")
    P, F, _ = S.uv_sphere(1.0, 6, 12)
    surf = S.polydata(P, F, cell_arrays={"velocity": np.ones((len(F), 3))})
    src = T.producer(surf)
    sp, cap, out = run(src)
    T.expect("surface as Input: one error", len(cap.errors) == 1, str(cap.errors))
    T.contains_all("surface as Input: the error says what to connect", cap.errors[0],
                   ["no 3-D cell", "%d surface cells" % len(F), "Walls"])
    for p in (sp, src):
        simple.Delete(p)
    vol, xc = couette_volume()
    src = T.producer(vol)
    sp, cap, out = run(src, Density=0.0)
    T.expect("Density 0: one error", len(cap.errors) == 1, str(cap.errors))
    T.contains_all("Density 0: the error names it", cap.errors[0], ["Density is 0", "must be positive"])
    for p in (sp, src):
        simple.Delete(p)
    rho = np.where(xc[:, 0] < 0.5, -1.0, 1.2)
    vol, _ = couette_volume({"rho": rho})
    src = T.producer(vol)
    sp, cap, out = run(src, DensityArray=["CELLS", "rho"])
    tau = T.cell_array(out, "Wall Shear Stress")
    bad = np.isnan(tau[:, 0])
    n_bad = int(bad.sum())
    T.expect("density array negative on half the cells: those faces NaN (%d), the others finite" % n_bad,
             n_bad > 0 and bool(np.all(np.isfinite(tau[~bad]))))
    T.expect("density array: regime -1 only where NaN",
             bool(np.all((T.cell_array(out, "Near-Wall Regime") == -1) == bad)))
    T.contains_all("density array: a warning names it and counts the faces", " ".join(cap.warnings),
                   ["Density Array 'rho'", "%d wall faces" % n_bad])
    for p in (sp, src):
        simple.Delete(p)


# ---------------------------------------------------------------------------
# 5. the panel and scripts
# ---------------------------------------------------------------------------

def case_of(vol, patches):
    mb = vtkMultiBlockDataSet()
    mb.SetBlock(0, vol)
    mb.GetMetaData(0).Set(vtkCompositeDataSet.NAME(), "fluid")
    for i, (name, pd) in enumerate(patches.items()):
        mb.SetBlock(i + 1, pd)
        mb.GetMetaData(i + 1).Set(vtkCompositeDataSet.NAME(), name)
    return mb


def check_panel_and_scripts():
    print("\n== 5. the panel and scripts ==")
    vol, xc = couette_volume()
    X, Y, Z = np.linspace(0, 1, 3), np.linspace(0, H, 4), np.linspace(0, 1, 3)
    lower = S.polydata(*S.grid_boundary_patch(X, Y, Z, 1, 0), cell_arrays={"wall_velocity": np.zeros((4, 3))})
    upper = S.polydata(*S.grid_boundary_patch(X, Y, Z, 1, 1),
                       cell_arrays={"wall_velocity": np.tile([U_TOP, 0, 0], (4, 1))})
    inlet = S.polydata(*S.grid_boundary_patch(X, Y, Z, 0, 0))
    case = case_of(vol, {"lower_wall": lower, "upper_wall": upper, "inlet": inlet})
    src = T.producer(case)
    # Creating the filter: no message at all (an earlier build printed three errors).
    window = vtkStringOutputWindow()
    previous = vtkOutputWindow.GetInstance()
    vtkOutputWindow.SetInstance(window)
    try:
        sp = simple.ShearProjection(Input=src)
    finally:
        vtkOutputWindow.SetInstance(previous)
    T.expect("creating the filter: no message", window.GetOutput() == "", repr(window.GetOutput()))
    T.expect("Velocity defaults to the first 3-component array", list(sp.Velocity) == ["CELLS", "velocity"],
             str(sp.Velocity))
    T.expect("every optional picker starts at None", all(
        getattr(sp, p)[1] == "None" for p in ("WallVelocity", "VelocityGradient", "ViscosityArray",
                                              "TurbulentViscosityArray", "DensityArray")),
        str([getattr(sp, p) for p in ("WallVelocity", "VelocityGradient", "DensityArray")]))
    T.expect("Wall Blocks: none ticked by default", len(sp.WallBlocks) == 0, str(sp.WallBlocks))
    sp.Viscosity = MU
    cap = T.Capture(sp)
    out = T.output_of(sp)
    T.expect("no walls: one warning", len(cap.warnings) == 1 and not cap.errors, str(cap.errors + cap.warnings))
    T.contains_all("no walls: the warning counts the faces and names the patches", cap.warnings[0],
                   [T.NOTE_DEFAULT_WALLS, "all %d boundary faces" % out.GetBlock(0).GetNumberOfCells(),
                    "'lower_wall'", "'upper_wall'", "'inlet'"])
    # Wall Blocks: the two walls, with the upper one's own wall velocity.
    sp.WallBlocks = ["/Root/lower_wall", "/Root/upper_wall"]
    sp.WallVelocity = ["CELLS", "wall_velocity"]
    sp.Method = "Wall fit"
    cap = T.Capture(sp)
    out = T.output_of(sp)
    names = [out.GetMetaData(i).Get(vtkCompositeDataSet.NAME()) for i in range(out.GetNumberOfBlocks())]
    T.expect("Wall Blocks: the output holds the two walls, named", names == ["lower_wall", "upper_wall"], str(names))
    T.expect("Wall Blocks: no message", not cap.errors and not cap.warnings, str(cap.errors + cap.warnings))
    T.close_worst("Wall Blocks: lower wall tau = mu U/H e_x", T.cell_array(out.GetBlock(0), "Wall Shear Stress"),
                  [MU * U_TOP / H, 0, 0], rtol=1e-10, source="White VFF §3-2")
    T.close_worst("Wall Blocks: upper (moving) wall tau = -mu U/H e_x", T.cell_array(out.GetBlock(1), "Wall Shear Stress"),
                  [-MU * U_TOP / H, 0, 0], rtol=1e-10, source="White VFF §3-2")
    T.expect("Wall Blocks: the patch's own arrays pass through",
             out.GetBlock(1).GetCellData().GetArray("wall_velocity") is not None)
    from vtkmodules.vtkCommonCore import vtkDataArray
    units = {n: out.GetBlock(0).GetCellData().GetArray(n).GetInformation().Get(vtkDataArray.UNITS_LABEL())
             for n in ("Wall Shear Stress", "Wall Normal", "Wall Distance", "Friction Velocity", "y+",
                       "Near-Wall Regime")}
    T.expect("output arrays carry their units (WallLoadsColumns.h, as the help page lists them)",
             units == {"Wall Shear Stress": "Pa", "Wall Normal": "-", "Wall Distance": "m",
                       "Friction Velocity": "m/s", "y+": "-", "Near-Wall Regime": "-"}, str(units))
    sp.WallBlocks = ["/Root/fluid"]
    cap = T.Capture(sp)
    T.output_of(sp)
    T.expect("Wall Blocks on the volume block: one error", len(cap.errors) == 1, str(cap.errors))
    T.contains_all("Wall Blocks on the volume block: the error says why", cap.errors[0], ["'fluid'", "3-D cells"])
    simple.Delete(sp)
    # A filter made before its input has any data (a script's usual order):
    # ParaView leaves the Velocity name as "0"; the filter takes the default.
    from vtkmodules.vtkCommonDataModel import vtkUnstructuredGrid as UG
    late = T.producer(UG())
    sp2 = simple.ShearProjection(Input=late)
    late.GetClientSideObject().SetOutput(vol)
    late.MarkModified(late)
    sp2.Viscosity = MU
    cap = T.Capture(sp2)
    out = T.output_of(sp2)
    T.expect("made before its input had data: no error, the first 3-component array used",
             not cap.errors and out.GetNumberOfCells() > 0
             and bool(np.all(np.isfinite(T.cell_array(out, "Wall Shear Stress")))),
             "Velocity %s; %s" % (sp2.Velocity, cap.errors))
    # Progress and abort (on the VTK object: quiet unless observed).
    from wallloads.WallLoadsFilters import vtkShearProjection
    f = vtkShearProjection()
    f.SetInputData(vol)
    f.SetInputArrayToProcess(0, 0, 0, 1, "velocity")
    f.SetViscosity(MU)
    progress = []
    f.AddObserver("ProgressEvent", lambda o, e: progress.append(o.GetProgress()))
    cap = T.Capture(f)
    f.Update()
    T.expect("progress reported, rising to 1", len(progress) >= 3 and progress[-1] == 1.0
             and progress == sorted(progress), str(progress))
    g = vtkShearProjection()
    g.SetInputData(vol)
    g.SetInputArrayToProcess(0, 0, 0, 1, "velocity")
    g.AddObserver("ProgressEvent", lambda o, e: o.SetAbortExecute(1) if o.GetProgress() >= 0.3 else None)
    cap = T.Capture(g)
    g.Update()
    out = g.GetOutputDataObject(0)
    tau = T.cell_array(out, "Wall Shear Stress")
    T.expect("abort: every face NaN, a warning says so", bool(np.all(np.isnan(tau)))
             and any("aborted" in w and "%d wall faces" % out.GetNumberOfCells() in w for w in cap.warnings),
             str(cap.warnings))
    for p in (sp2, late, src):
        simple.Delete(p)


# ---------------------------------------------------------------------------
# 6. the wall fit's fallback, counted with its reason
# ---------------------------------------------------------------------------

def check_fit_fallback():
    print("\n== 6. the wall fit's fallback ==")
    # One layer of cells above the wall: no neighbour at a second distance.
    P, C = box_hexes(4, 1, 4)
    xc = S.cell_vertex_means(P, C)
    u = np.zeros_like(xc)
    u[:, 0] = U_TOP * xc[:, 1] / H
    src = T.producer(S.mixed_unstructured_grid(P, [(S.VTK_HEXAHEDRON, C)], cell_arrays={"velocity": u}))
    X, Y, Z = np.linspace(0, 1, 5), np.linspace(0, H, 2), np.linspace(0, 1, 5)
    wsrc = T.producer(S.polydata(*S.grid_boundary_patch(X, Y, Z, 1, 0)))
    sp, cap, out = run(src, "Wall fit", walls=wsrc)
    # The 4 corner cells have 3 neighbours (8 samples with the corners, fewer
    # than the 10 a quadratic needs); the 12 others have more, all at the
    # same distance from the wall.
    T.contains_all("one layer: the fallback is counted with its reasons", " ".join(cap.warnings),
                   ["used the near-wall difference", "4 faces whose adjacent cell has fewer neighbours",
                    "12 faces with no neighbour at a second distance"])
    T.close_worst("one layer: the fallback's values (near-wall difference, exact for Couette)",
                  T.cell_array(out, "Wall Shear Stress"), [MU * U_TOP / H, 0, 0], rtol=1e-12,
                  source="White VFF §3-2")
    for p in (sp, wsrc, src):
        simple.Delete(p)


def main():
    check_quadratic_cells()
    check_ghost_layer()
    check_cache_keys()
    check_no_volume_and_density()
    check_panel_and_scripts()
    check_fit_fallback()
    T.done(__file__)


if __name__ == "__main__":
    main()
