"""The automatic choices and whole cases under mpirun pvbatch (1, 2 and 3 ranks).

Every rank must take the same arrays even when it holds no data (rank 0 is
empty at 2 and 3 ranks, its piece has no arrays at all) and a volume block
sits on one rank only: the totals of the default pipeline (Pressure
"Automatic", Shear Source, Orientation Automatic, Load Integration's
reference values from Wall Traction) equal the serial totals of the same
pipeline with every setting explicit, to 1e-12 relative (compensated sums:
DESIGN §4), and nobody hangs.
"""
import os
import sys

import numpy as np

import wl_testing as T
import scenes as sc
from vtkmodules.vtkCommonDataModel import vtkCompositeDataSet, vtkMultiBlockDataSet, vtkPolyData
from vtkmodules.vtkParallelCore import vtkDummyController, vtkMultiProcessController


simple, controller, rank, ranks = T.mpi_start()
import wallloads.WallLoadsFilters as W  # noqa: E402


R, mu, U = 0.4, 3.0e-3, np.array([0.2, -0.1, 0.05])
pts, faces, _ = sc.uv_sphere(R, 24, 48, ordering="into_wall")
f = sc.stokes_sphere(sc.face_centroids(pts, faces), R, U, mu)
rng = np.random.default_rng(5)
arrays = {"zone_id": np.arange(len(faces), dtype=np.int32) % 4, "temperature": rng.normal(300, 3, len(faces)),
          "static_pressure": f["p"] + 11.0, "wall_shear": rng.normal(size=(len(faces), 3))}


def piece(r, n):
    """Faces of rank r out of n; rank 0 holds nothing (no arrays either) when n > 1."""
    if n > 1 and r == 0:
        return vtkPolyData()
    owners = np.arange(len(faces)) % (n - 1 if n > 1 else 1) + (1 if n > 1 else 0)
    keep = np.nonzero(owners == r)[0]
    return sc.polydata(pts, [faces[i] for i in keep], cell_arrays={k: v[keep] for k, v in arrays.items()})


def case(r, n):
    """Block 0: a volume, on the last rank only; block 1: the wall."""
    mb = vtkMultiBlockDataSet()
    if r == n - 1:
        hp, hc = sc.hex_box(np.linspace(-1, 1, 3), np.linspace(-1, 1, 3), np.linspace(-1, 1, 3))
        mb.SetBlock(0, sc.unstructured_grid(hp, hc, [12] * len(hc)))
    else:
        mb.SetBlock(0, None)
    mb.SetBlock(1, piece(r, n))
    for i, name in enumerate(("volume", "bead")):
        mb.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), name)
    return mb


def run(data, automatic):
    wt, li = W.vtkWallTraction(), W.vtkLoadIntegration()
    wt.SetInputData(data)
    wt.SetDensity(1.1)
    wt.SetReferenceSpeed(3.0)
    wt.SetLoadDirection(0, 1, 0)
    if automatic:
        wt.SetInputArrayToProcess(0, 0, 0, 1, "Automatic")
        wt.SetShearSource(W.vtkWallTraction.AUTOMATIC_SHEAR)
        wt.SetOrientation(W.vtkWallTraction.AUTOMATIC_ORIENTATION)
    else:
        wt.SetInputArrayToProcess(0, 0, 0, 1, "static_pressure")
        wt.SetInputArrayToProcess(2, 0, 0, 1, "wall_shear")
        wt.SetShearSource(W.vtkWallTraction.WALL_SHEAR_STRESS)
        li.SetReferenceDensity(1.1)
        li.SetReferenceSpeed(3.0)
        li.SetDragDirection(0, 1, 0)
        li.SetLiftDirection(0, 0, 1)
    li.SetInputConnection(wt.GetOutputPort())
    li.Update()
    fd = li.GetOutputDataObject(0).GetFieldData()
    return {k: np.array([fd.GetArray(k).GetComponent(0, c) for c in range(fd.GetArray(k).GetNumberOfComponents())])
            for k in ("Force", "Moment", "Drag", "Drag Coefficient", "Dynamic Pressure")}, li


got, li = run(case(rank, ranks), automatic=True)
table = li.GetOutputDataObject(1)
if rank == 0:
    regions = [table.GetColumnByName("Region").GetValue(r) for r in range(table.GetNumberOfRows())]
    T.expect("rank 0: rows for the wall and Total only (the volume on another rank left out)",
             regions == ["bead", "Total"], str(regions))

vtkMultiProcessController.SetGlobalController(vtkDummyController())
try:
    whole = vtkMultiBlockDataSet()
    whole.SetBlock(0, piece(0, 1))
    ref, _ = run(whole, automatic=False)
finally:
    vtkMultiProcessController.SetGlobalController(controller)
for key, value in ref.items():
    T.close_arrays("rank %d of %d: %s, automatic == serial explicit" % (rank, ranks, key), got[key], value,
                   rtol=1e-12, atol=1e-300, source="DESIGN §4")
controller.Barrier()
if rank == 0:
    T.done("test_mpi_defaults")
