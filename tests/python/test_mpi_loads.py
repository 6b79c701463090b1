"""Wall Traction + Load Integration under mpirun pvbatch (1, 2 and 3 ranks).

Checks (DESIGN §4): totals with the data distributed (RedistributeDataSet,
then GhostCellsGenerator so ghost faces exist) equal the serial totals of the
same pipeline to 1e-12 relative; ghost faces are not counted; a multiblock
whose blocks sit on different ranks (XML multiblock reader) gives the same
per-region table; field-data totals are global on every rank; the table is
on rank 0 only. The serial reference runs in the same process with a dummy
controller, i.e. the same code on the whole data set.
"""
import os
import sys
import tempfile

import numpy as np

import wl_testing as T
import scenes as sc
from vtkmodules.vtkParallelCore import vtkMultiProcessController, vtkDummyController
from vtkmodules.vtkIOXML import vtkXMLPolyDataWriter, vtkXMLMultiBlockDataReader
from vtkmodules.vtkCommonCore import vtkSMPTools

simple, controller, rank, ranks = T.mpi_start()
import wallloads.WallLoadsFilters as W  # noqa: E402

vtkSMPTools.SetBackend("STDThread")

# The same surface on every rank (deterministic): Stokes flow past a sphere.
R, mu, U = 0.4, 3.0e-3, np.array([0.2, -0.1, 0.05])
pts, faces, _ = sc.uv_sphere(R, 40, 80, ordering="into_wall")
c = sc.face_centroids(pts, faces)
f = sc.stokes_sphere(c, R, U, mu)
surface = sc.polydata(pts, faces, cell_arrays={"p": f["p"] + 7.0, "grad": f["grad"]})

out_dir = os.environ.get("WALLLOADS_TEST_OUTPUT", tempfile.gettempdir())
path = os.path.join(out_dir, "mpi_sphere_np%d.vtp" % ranks)
if rank == 0:
    os.makedirs(out_dir, exist_ok=True)
    w = vtkXMLPolyDataWriter()
    w.SetDataModeToBinary()  # inline: appended files read back empty on this platform
    w.SetFileName(path)
    w.SetInputData(surface)
    assert w.Write() == 1
controller.Barrier()


def configure(wt, li):
    wt.SetInputArrayToProcess(0, 0, 0, 1, "p")
    wt.SetInputArrayToProcess(3, 0, 0, 1, "grad")
    wt.SetShearSource(2)
    wt.SetViscosity(mu)
    wt.SetReferencePressure(7.0)
    li.SetMomentCentre(0.1, 0.2, -0.3)
    li.SetDragDirection(*(U / np.linalg.norm(U)))
    li.SetLiftDirection(0.0, 0.0, 1.0)


def serial_totals(data):
    """The same filters on the whole data with a one-process controller."""
    vtkMultiProcessController.SetGlobalController(vtkDummyController())
    try:
        wt = W.vtkWallTraction()
        li = W.vtkLoadIntegration()
        wt.SetInputData(data)
        li.SetInputConnection(wt.GetOutputPort())
        configure(wt, li)
        li.Update()
        return li.GetOutputDataObject(0), li.GetOutputDataObject(1)
    finally:
        vtkMultiProcessController.SetGlobalController(controller)


def compare(label, got, ref):
    """Totals agree to 1e-12 relative to the size of the quantity they belong
    to (a near-zero lift is compared on the scale of the whole force)."""
    force = np.linalg.norm(T.field(ref, "Force"))
    moment = np.linalg.norm(T.field(ref, "Moment")) + force * R
    scales = {"Area": T.field(ref, "Area"), "Pressure Force": force, "Viscous Force": force,
              "Force": force, "Drag": force, "Side Force": force, "Lift": force,
              "Moment": moment, "Rolling Moment": moment, "Pitching Moment": moment,
              "Line Of Action Point": R, "Faces": 1.0}
    for name, scale in scales.items():
        g, r = np.atleast_1d(T.field(got, name)), np.atleast_1d(T.field(ref, name))
        T.check_close("rank %d %s: %s" % (rank, label, name), g, r, atol=1e-12 * scale)


# --- 1a. one surface, distributed by the redistribution filter -------------
reader = simple.XMLPolyDataReader(FileName=[path])
dist = simple.RedistributeDataSet(Input=reader)
wt = simple.WallTraction(Input=dist)
li = simple.LoadIntegration(Input=wt)
configure(wt.GetClientSideObject(), li.GetClientSideObject())
li.UpdatePipeline()
got0 = li.GetClientSideObject().GetOutputDataObject(0)
got_table = li.GetClientSideObject().GetOutputDataObject(1)
ref0, _ = serial_totals(surface)
local_faces = dist.GetClientSideObject().GetOutputDataObject(0).GetNumberOfCells()
print("rank %d of %d holds %d of %d faces after redistribution"
      % (rank, ranks, local_faces, surface.GetNumberOfCells()))
compare("redistributed surface", got0, ref0)
T.check_close("rank %d faces counted" % rank, T.field(got0, "Faces"), surface.GetNumberOfCells())
if rank == 0:
    assert got_table.GetNumberOfRows() == 2, got_table.GetNumberOfRows()  # "Surface" and "Total"
else:
    assert got_table.GetNumberOfRows() == 0, "table must be on rank 0 only"

# --- 1b. partitions with a ghost layer, and an empty rank --------------------
# The 5.11 ghost generator adds no ghosts to surfaces of 2D cells, and the
# redistribution filter's duplicating mode leaves duplicates unmarked, so
# the partition is made here as a partitioner would: each rank owns a sector
# of azimuth columns and also holds the neighbouring column on each side,
# marked DUPLICATECELL. With 3 ranks the last one holds nothing.
from vtkmodules.vtkCommonDataModel import vtkDataSetAttributes  # noqa: E402
from vtkmodules.vtkCommonCore import vtkUnsignedCharArray  # noqa: E402
n_az = 80
owners = 1 if ranks == 1 else (2 if ranks == 2 else ranks - 1)
column = np.arange(surface.GetNumberOfCells()) % n_az
sector = column * owners // n_az
if rank < owners:
    owned = sector == rank
    near = np.zeros_like(owned)
    for shift in (-1, 1):
        near |= np.isin((column + shift) % n_az, column[owned])
    ghost = near & ~owned
    keep = np.nonzero(owned | ghost)[0]
else:
    keep = np.zeros(0, dtype=int)
    ghost = np.zeros(surface.GetNumberOfCells(), dtype=bool)
piece = sc.polydata(pts, [faces[i] for i in keep],
                    cell_arrays={"p": (f["p"] + 7.0)[keep], "grad": f["grad"][keep]})
marks = vtkUnsignedCharArray()
marks.SetName(vtkDataSetAttributes.GhostArrayName())
for i in keep:
    marks.InsertNextValue(vtkDataSetAttributes.DUPLICATECELL if ghost[i] else 0)
piece.GetCellData().AddArray(marks)
local_ghosts = int(np.count_nonzero(ghost[keep])) if keep.size else 0
print("rank %d of %d: %d faces here, %d of them ghosts" % (rank, ranks, keep.size, local_ghosts))
wt_b = simple.WallTraction(Input=T.producer(piece))
li_b = simple.LoadIntegration(Input=wt_b)
configure(wt_b.GetClientSideObject(), li_b.GetClientSideObject())
li_b.UpdatePipeline()
got_b = li_b.GetClientSideObject().GetOutputDataObject(0)
compare("ghosted partitions", got_b, ref0)
T.check_close("rank %d faces counted (ghosts left out)" % rank, T.field(got_b, "Faces"),
              surface.GetNumberOfCells())
T.check_close("rank %d wetted area (ghosts left out)" % rank,
              T.field(wt_b.GetClientSideObject().GetOutputDataObject(0), "Wetted Area"),
              T.field(ref0, "Area"), rtol=1e-12)

# --- 2. a multiblock whose blocks sit on different ranks ------------------
vtm = os.path.join(os.environ["WALLLOADS_SOURCE_DIR"], "examples", "demo", "bead.vtm")
blocks = simple.XMLMultiBlockDataReader(FileName=[vtm])
wt2 = simple.WallTraction(Input=blocks)
li2 = simple.LoadIntegration(Input=wt2)
for proxy_wt, proxy_li in ((wt2.GetClientSideObject(), li2.GetClientSideObject()),):
    proxy_wt.SetInputArrayToProcess(0, 0, 0, 0, "static_pressure")
    proxy_wt.SetInputArrayToProcess(2, 0, 0, 1, "wall_shear")
    proxy_wt.SetShearSource(1)
    proxy_wt.SetReferencePressure(1.0e5)
li2.UpdatePipeline()
mine = blocks.GetClientSideObject().GetOutputDataObject(0)
held = sum(1 for i in range(mine.GetNumberOfBlocks()) if mine.GetBlock(i) is not None
           and mine.GetBlock(i).GetNumberOfCells() > 0)
print("rank %d holds %d of %d blocks" % (rank, held, mine.GetNumberOfBlocks()))
full_reader = vtkXMLMultiBlockDataReader()
full_reader.SetFileName(vtm)
full_reader.Update()
vtkMultiProcessController.SetGlobalController(vtkDummyController())
try:
    swt = W.vtkWallTraction()
    swt.SetInputData(full_reader.GetOutputDataObject(0))
    swt.SetInputArrayToProcess(0, 0, 0, 0, "static_pressure")
    swt.SetInputArrayToProcess(2, 0, 0, 1, "wall_shear")
    swt.SetShearSource(1)
    swt.SetReferencePressure(1.0e5)
    sli = W.vtkLoadIntegration()
    sli.SetInputConnection(swt.GetOutputPort())
    sli.Update()
    ref_table = T.table_rows(sli.GetOutputDataObject(1))
    ref2 = sli.GetOutputDataObject(0)
finally:
    vtkMultiProcessController.SetGlobalController(controller)
compare("multiblock", li2.GetClientSideObject().GetOutputDataObject(0), ref2)
if rank == 0:
    rows = T.table_rows(li2.GetClientSideObject().GetOutputDataObject(1))
    assert sorted(rows) == sorted(ref_table), (sorted(rows), sorted(ref_table))
    for name in rows:
        for col in ("Area", "Force", "Moment"):
            r = np.atleast_1d(ref_table[name][col])
            T.check_close("region %s %s" % (name, col), rows[name][col], r,
                          atol=1e-12 * max(np.max(np.abs(r)), 1e-300))

controller.Barrier()
if rank == 0:
    T.done(__file__)
