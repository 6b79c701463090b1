"""Shear Projection -> Wall Traction -> Load Integration under mpirun pvbatch
(1, 2 and 3 ranks).

Plane Couette flow u = U y/h in a box of hexahedra, split into slabs along x
as a partitioner would, one slab per rank (with 3 ranks the last rank holds
nothing). Each rank's walls (the fixed wall y = 0 of its slab, with their own
points) sit with their cells. The total wall shear force is exact,
tau_w = mu U / h over the wall area (plane Couette flow, e.g. White, Viscous
Fluid Flow, §3-2), and equal to the serial result on every rank.
A further wall patch that touches no rank's volume is reported as unmatched,
counted over all ranks. Then a wall block without the selected wall
velocity on the last rank only: every rank fails together (no hang); and
pieces with a ghost layer, without Walls: only the box's true boundary is
wall, its area the same at 1, 2 and 3 ranks.
"""
import os
import sys

import numpy as np

import wl_testing as T
import scenes as sc
from vtkmodules.vtkParallelCore import vtkMultiProcessController


simple, controller, rank, ranks = T.mpi_start()

H, U, MU, LX, LZ = 0.5, 3.0, 0.02, 2.0, 1.0
NX, NY, NZ = 12, 4, 3
owners = 1 if ranks == 1 else (2 if ranks == 2 else ranks - 1)
x_all = np.linspace(0.0, LX, NX + 1)
y = np.linspace(0.0, H, NY + 1)
z = np.linspace(0.0, LZ, NZ + 1)
if rank < owners:
    lo, hi = rank * NX // owners, (rank + 1) * NX // owners
    x = x_all[lo:hi + 1]
    pts, hexes, _ = sc.hex_grid(x, y, z)
    xc = sc.cell_vertex_means(pts, hexes)
    u = np.zeros_like(xc)
    u[:, 0] = U * xc[:, 1] / H
    volume = sc.unstructured_grid(pts, hexes, 12, cell_arrays={"velocity": u})
    wpts, wfaces = sc.grid_boundary_patch(x, y, z, axis=1, side=0)
    walls = sc.polydata(wpts, wfaces)
else:
    from vtkmodules.vtkCommonDataModel import vtkPolyData, vtkUnstructuredGrid
    volume, walls = vtkUnstructuredGrid(), vtkPolyData()
# A patch far from every volume, on rank 0 only: it must be reported.
if rank == 0:
    fpts, ffaces = sc.grid_boundary_patch(np.array([10.0, 11.0]), np.array([0.0, 1.0]), np.array([0.0, 1.0]),
                                          axis=1, side=0)
    stray = sc.polydata(fpts, ffaces)
else:
    from vtkmodules.vtkCommonDataModel import vtkPolyData
    stray = vtkPolyData()
from vtkmodules.vtkCommonDataModel import vtkMultiBlockDataSet, vtkCompositeDataSet  # noqa: E402
blocks = vtkMultiBlockDataSet()
blocks.SetBlock(0, walls)
blocks.GetMetaData(0).Set(vtkCompositeDataSet.NAME(), "bottom")
blocks.SetBlock(1, stray)
blocks.GetMetaData(1).Set(vtkCompositeDataSet.NAME(), "stray")

sp = simple.ShearProjection(Input=T.producer(volume), Walls=T.producer(blocks))
sp.Velocity = ["CELLS", "velocity"]
sp.Method = "Wall fit"
sp.Viscosity = MU
warnings = []
sp.GetClientSideObject().AddObserver("WarningEvent", lambda o, e: warnings.append(e))
wt = simple.WallTraction(Input=sp, ShearSource="Wall shear stress array",
                         ShearStressArray=["CELLS", "Wall Shear Stress"], Orientation="Use Wall Normal array")
wt.Pressure = ["CELLS", "None"]
li = simple.LoadIntegration(Input=wt)
li.UpdatePipeline()
out = li.GetClientSideObject().GetOutputDataObject(0)
area = LX * LZ
T.check_close("rank %d: wetted area (global)" % rank, T.field(out, "Area"), area, rtol=1e-14)
T.check_close("rank %d: wall shear force mu U/h A along x" % rank, T.field(out, "Viscous Force"),
              [MU * U / H * area, 0.0, 0.0], atol=1e-13 * MU * U / H * area,
              source="plane Couette flow, White, Viscous Fluid Flow, §3-2")
T.check_close("rank %d: the stray patch's face is skipped (NaN), counted globally" % rank,
              T.field(out, "Skipped Faces"), 1)
if rank == 0:
    assert any(True for _ in warnings), "no unmatched-face warning on rank 0"
for p in (li, wt):
    simple.Delete(p)

# --- A bad wall block on the last rank only -----------------------------------------
# The last rank's wall block lacks the selected wall velocity array (the
# others have it). Every rank must fail, with one collective agreeing on it:
# an earlier build returned on that rank before its collective and the
# others waited forever (the CTest TIMEOUT turns a regression into a failure).
bad = rank == ranks - 1
wall_velocity = np.zeros((walls.GetNumberOfCells(), 3))
w2 = sc.polydata(wpts, wfaces, cell_arrays=None if bad else {"wall_velocity": wall_velocity}) \
    if rank < owners else walls
if bad and rank >= owners:
    # An empty rank that still holds a (one-face) wall block without the array.
    fpts, ffaces = sc.grid_boundary_patch(np.array([20.0, 21.0]), np.array([0.0, 1.0]), np.array([0.0, 1.0]), 1, 0)
    w2 = sc.polydata(fpts, ffaces)
sp.Walls = T.producer(w2)
sp.WallVelocity = ["CELLS", "wall_velocity"]
errors = []
sp.GetClientSideObject().AddObserver("ErrorEvent", lambda o, e: errors.append(e))
sp.UpdatePipeline()
failed = sp.GetClientSideObject().GetOutputDataObject(0).GetNumberOfCells() == 0
T.expect("rank %d: the bad block on rank %d fails every rank (no hang)" % (rank, ranks - 1), failed)
if bad:
    T.expect("rank %d (the bad one): an error names the array" % rank, len(errors) >= 1)
elif rank == 0:
    T.expect("rank 0: an error says another rank's input is bad", len(errors) >= 1)
simple.Delete(sp)

# --- A ghost layer, no Walls: only the true boundary is wall ------------------------------
# Each owning rank holds its slab of cells plus the neighbouring slabs' first
# column as DUPLICATECELL ghosts (what a ghost-cell generator gives). Without
# Walls, only the outer boundary of the owned cells is wall: the box's
# surface area in total, 2 (LX H + H LZ + LZ LX), not more (an earlier build
# took partition and ghost-layer faces as walls).
from vtkmodules.util.numpy_support import numpy_to_vtk  # noqa: E402
from vtkmodules.vtkCommonDataModel import vtkDataSetAttributes, vtkUnstructuredGrid  # noqa: E402
if rank < owners:
    lo, hi = rank * NX // owners, (rank + 1) * NX // owners
    glo, ghi = max(lo - 1, 0), min(hi + 1, NX)
    x = x_all[glo:ghi + 1]
    pts, hexes, ijk = sc.hex_grid(x, y, z)
    xc = sc.cell_vertex_means(pts, hexes)
    u = np.zeros_like(xc)
    u[:, 0] = U * xc[:, 1] / H
    ghost_vol = sc.unstructured_grid(pts, hexes, 12, cell_arrays={"velocity": u})
    i_global = ijk[:, 0] + glo
    g = numpy_to_vtk(np.where((i_global < lo) | (i_global >= hi), vtkDataSetAttributes.DUPLICATECELL, 0)
                     .astype(np.uint8), deep=1)
    g.SetName(vtkDataSetAttributes.GhostArrayName())
    ghost_vol.GetCellData().AddArray(g)
else:
    ghost_vol = vtkUnstructuredGrid()
sp = simple.ShearProjection(Input=T.producer(ghost_vol), Velocity=["CELLS", "velocity"], Viscosity=MU)
wt = simple.WallTraction(Input=sp, ShearSource="Wall shear stress array", Pressure=["CELLS", "None"],
                         ShearStressArray=["CELLS", "Wall Shear Stress"], Orientation="Use Wall Normal array")
li = simple.LoadIntegration(Input=wt)
li.UpdatePipeline()
out = li.GetClientSideObject().GetOutputDataObject(0)
T.check_close("rank %d: ghosted pieces, no Walls: wall area = the box's surface" % rank, T.field(out, "Area"),
              2 * (LX * H + H * LZ + LZ * LX), rtol=1e-14, source="geometry")
# The bottom wall's shear force is exact (Couette), the top's opposite; the
# side walls carry tau = 0 (u normal to x = const) or along x on z = const
# walls (tangential u, near-wall difference mu u_P/d, not zero): only the
# y-walls' sum is checked through symmetry: the total along y is zero.
T.check_close("rank %d: ghosted pieces: no force along y" % rank, T.field(out, "Viscous Force")[1], 0.0,
              atol=1e-13 * MU * U / H * LX * LZ)
controller.Barrier()
if rank == 0:
    T.done(__file__)
