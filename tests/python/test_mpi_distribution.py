"""Load Distribution under mpirun pvbatch (1, 2 and 3 ranks).

Checks (DESIGN §4, issue 10): the table with the data distributed equals the
serial table of the same pipeline to 1e-12 relative (a surface split by the
redistribution filter; partitions with ghost faces and an empty rank; a
multiblock whose blocks sit on different ranks); the default range (the
extent of the faces) is agreed across ranks; the table is on rank 0 only;
bad input on one rank only makes every rank fail together, with no hang.
The serial reference runs in the same process with a dummy controller, i.e.
the same code on the whole data set.
"""
import os
import sys
import tempfile

import numpy as np

import wl_testing as T
import scenes as sc
from vtkmodules.util.numpy_support import vtk_to_numpy
from vtkmodules.vtkParallelCore import vtkMultiProcessController, vtkDummyController
from vtkmodules.vtkIOXML import vtkXMLPolyDataWriter, vtkXMLMultiBlockDataReader
from vtkmodules.vtkCommonCore import vtkSMPTools, vtkUnsignedCharArray
from vtkmodules.vtkCommonDataModel import vtkDataSetAttributes


simple, controller, rank, ranks = T.mpi_start()
import wallloads.WallLoadsFilters as W  # noqa: E402

vtkSMPTools.SetBackend("STDThread")

R, mu, U = 0.4, 3.0e-3, np.array([0.2, -0.1, 0.05])
pts, faces, _ = sc.uv_sphere(R, 40, 80, ordering="into_wall")
f = sc.stokes_sphere(sc.face_centroids(pts, faces), R, U, mu)
surface = sc.polydata(pts, faces, cell_arrays={"p": f["p"] + 7.0, "grad": f["grad"]})

out_dir = os.environ.get("WALLLOADS_TEST_OUTPUT", tempfile.gettempdir())
path = os.path.join(out_dir, "mpi_distribution_np%d.vtp" % ranks)
if rank == 0:
    os.makedirs(out_dir, exist_ok=True)
    w = vtkXMLPolyDataWriter()
    w.SetDataModeToBinary()  # inline: appended files read back empty on this platform
    w.SetFileName(path)
    w.SetInputData(surface)
    assert w.Write() == 1
controller.Barrier()

AXIS, ORIGIN, CENTRE, BINS = (0.3, -1.0, 0.6), (0.1, 0.0, -0.2), (0.1, 0.2, -0.3), 21


def configure(wt, ld):
    wt.SetInputArrayToProcess(0, 0, 0, 1, "p")
    wt.SetInputArrayToProcess(3, 0, 0, 1, "grad")
    wt.SetShearSource(2)
    wt.SetViscosity(mu)
    wt.SetReferencePressure(7.0)
    ld.SetAxisDirection(*AXIS)
    ld.SetAxisOrigin(*ORIGIN)
    ld.SetMomentCentre(*CENTRE)
    ld.SetNumberOfBins(BINS)
    ld.SetDragDirection(*(U / np.linalg.norm(U)))


def columns(table):
    return {table.GetColumnName(i): vtk_to_numpy(table.GetColumn(i)).astype(float)
            for i in range(table.GetNumberOfColumns())}


def serial_table(data, setup):
    """The same filters on the whole data with a one-process controller."""
    vtkMultiProcessController.SetGlobalController(vtkDummyController())
    try:
        wt = W.vtkWallTraction()
        ld = W.vtkLoadDistribution()
        wt.SetInputData(data)
        ld.SetInputConnection(wt.GetOutputPort())
        setup(wt, ld)
        ld.Update()
        return columns(ld.GetOutputDataObject(0))
    finally:
        vtkMultiProcessController.SetGlobalController(controller)


def compare(label, table, ref):
    """Rank 0 holds the table, equal to the serial one to 1e-12 relative to
    each column's scale; other ranks hold an empty table."""
    if rank != 0:
        T.expect("rank %d %s: no table off rank 0" % (rank, label), table.GetNumberOfRows() == 0)
        return
    got = columns(table)
    T.expect("%s: same columns and rows" % label, list(got) == list(ref) and
             all(got[k].shape == ref[k].shape for k in ref), str(list(got)))
    # Scales: per-length columns on the largest force per length; the
    # cumulative force and the moments on that times the range length (and
    # times the size of the body for a moment arm).
    force_scale = np.max(np.abs(ref["Force Per Length"]))
    length = ref["End"][-1] - ref["Start"][0]
    for name, values in ref.items():
        extra = {"Cumulative Force": force_scale * length, "Moment": force_scale * length * length}
        scale = max(np.max(np.abs(values)), force_scale if "Length" in name else extra.get(name, 0.0), 1e-300)
        T.close_worst("%s (%d ranks): %s" % (label, ranks, name), got[name], values, atol=1e-12 * scale,
                      source="DESIGN §4: 1, 2, 3 ranks agree to 1e-12")


ref = serial_table(surface, configure)

# --- 1a. one surface, distributed by the redistribution filter -------------
reader = simple.XMLPolyDataReader(FileName=[path])
dist = simple.RedistributeDataSet(Input=reader)
wt = simple.WallTraction(Input=dist)
ld = simple.LoadDistribution(Input=wt)
configure(wt.GetClientSideObject(), ld.GetClientSideObject())
ld.UpdatePipeline()
print("rank %d of %d holds %d of %d faces after redistribution" % (
    rank, ranks, dist.GetClientSideObject().GetOutputDataObject(0).GetNumberOfCells(), surface.GetNumberOfCells()))
compare("redistributed surface", ld.GetClientSideObject().GetOutputDataObject(0), ref)

# --- 1b. partitions with a ghost layer, and an empty rank --------------------
# As in test_mpi_loads.py: each rank owns a sector of azimuth columns and also
# holds the neighbouring column on each side, marked DUPLICATECELL; with 3
# ranks the last one holds nothing.
n_az = 80
owners = 1 if ranks == 1 else (2 if ranks == 2 else ranks - 1)
column_of = np.arange(surface.GetNumberOfCells()) % n_az
sector = column_of * owners // n_az
if rank < owners:
    owned = sector == rank
    near = np.zeros_like(owned)
    for shift in (-1, 1):
        near |= np.isin((column_of + shift) % n_az, column_of[owned])
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
print("rank %d of %d: %d faces here, %d of them ghosts" % (rank, ranks, keep.size,
                                                        int(np.count_nonzero(ghost[keep])) if keep.size else 0))
wt_b = simple.WallTraction(Input=T.producer(piece))
ld_b = simple.LoadDistribution(Input=wt_b)
configure(wt_b.GetClientSideObject(), ld_b.GetClientSideObject())
ld_b.UpdatePipeline()
compare("ghosted partitions", ld_b.GetClientSideObject().GetOutputDataObject(0), ref)

# --- 1c. a custom range, so that the bins are set before any reduction -----
def configure_range(wt_, ld_):
    configure(wt_, ld_)
    ld_.SetUseCustomRange(1)
    ld_.SetRange(-0.2, 0.3)


ref_range = serial_table(surface, configure_range)
ld_c = simple.LoadDistribution(Input=wt_b)
configure_range(wt_b.GetClientSideObject(), ld_c.GetClientSideObject())
ld_c.UpdatePipeline()
compare("ghosted partitions, custom range", ld_c.GetClientSideObject().GetOutputDataObject(0), ref_range)

# --- 2. a multiblock whose blocks sit on different ranks ------------------
vtm = os.path.join(os.environ["WALLLOADS_SOURCE_DIR"], "examples", "demo", "bead.vtm")


def configure_bead(wt_, ld_):
    wt_.SetInputArrayToProcess(0, 0, 0, 0, "static_pressure")
    wt_.SetInputArrayToProcess(2, 0, 0, 1, "wall_shear")
    wt_.SetShearSource(1)
    wt_.SetReferencePressure(1.0e5)
    ld_.SetAxisDirection(1.0, 0.0, 0.0)
    ld_.SetNumberOfBins(30)


blocks = simple.XMLMultiBlockDataReader(FileName=[vtm])
wt2 = simple.WallTraction(Input=blocks)
ld2 = simple.LoadDistribution(Input=wt2)
configure_bead(wt2.GetClientSideObject(), ld2.GetClientSideObject())
ld2.UpdatePipeline()
full_reader = vtkXMLMultiBlockDataReader()
full_reader.SetFileName(vtm)
full_reader.Update()
ref2 = serial_table(full_reader.GetOutputDataObject(0), configure_bead)
compare("multiblock", ld2.GetClientSideObject().GetOutputDataObject(0), ref2)

# --- 3. bad input on one rank only: every rank fails, none hangs ------------
# The last rank's piece did not go through Wall Traction (no force arrays).
# With the default range the ranks agree before the pass (with the extent);
# with a custom range in the one reduction after it.
wt3 = W.vtkWallTraction()
wt3.SetInputData(surface)
configure(wt3, W.vtkLoadDistribution())
wt3.Update()
mine = wt3.GetOutputDataObject(0)
if rank == ranks - 1:
    mine = surface
for custom in (0, 1):
    ld3 = W.vtkLoadDistribution()
    ld3.SetInputData(mine)
    ld3.SetUseCustomRange(custom)
    ld3.SetRange(-0.5, 0.5)
    cap = T.Capture(ld3)
    ld3.Update()
    # The failing rank gives its reason, rank 0 says that another rank failed
    # (ReportAgreedFailure); the others stay silent. All stop without output.
    speaks = rank in (0, ranks - 1)
    label = "rank %d, %s range: bad input on rank %d" % (rank, "custom" if custom else "default", ranks - 1)
    T.expect(label + (": one error" if speaks else ": no message"), len(cap.errors) == (1 if speaks else 0),
             str(cap.errors))
    if rank == ranks - 1:
        T.contains_all(label + ": the failing rank names the array", cap.errors[0], ["Pressure Force"])
    elif rank == 0:
        T.contains_all(label + ": rank 0 says another rank failed", cap.errors[0], ["another rank"])
    T.expect(label + ": no table", ld3.GetOutputDataObject(0).GetNumberOfRows() == 0)

controller.Barrier()
if rank == 0:
    T.done(__file__)
