"""Shear Projection -> Wall Traction -> Load Integration under mpirun pvbatch
(1, 2 and 3 ranks).

Plane Couette flow u = U y/h in a box of hexahedra, split into slabs along x
as a partitioner would, one slab per rank (with 3 ranks the last rank holds
nothing). Each rank's walls (the fixed wall y = 0 of its slab, with their own
points) sit with their cells. The total wall shear force is exact,
tau_w = mu U / h over the wall area (plane Couette flow, e.g. White, Viscous
Fluid Flow, §3-2), and equal to the serial result on every rank.
A further wall patch that touches no rank's volume is reported as unmatched,
counted over all ranks.
"""
import os
import sys

import numpy as np

import wl_testing as T
import scenes as sc
from vtkmodules.vtkParallelCore import vtkMultiProcessController


def _abort_all(kind, value, tb):
    import traceback
    traceback.print_exception(kind, value, tb)
    sys.stdout.flush()
    os._exit(1)


sys.excepthook = _abort_all
simple = T.load_plugin()
controller = vtkMultiProcessController.GetGlobalController()
rank, ranks = controller.GetLocalProcessId(), controller.GetNumberOfProcesses()
assert ranks == int(os.environ.get("WALLLOADS_RANKS", ranks))

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
                         WallShearStress=["CELLS", "Wall Shear Stress"], Orientation="Use Wall Normal array")
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
controller.Barrier()
if rank == 0:
    T.done(__file__)
