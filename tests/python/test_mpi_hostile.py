"""Hostile pieces on one rank only (issue 7 items 6 and 7), under mpirun
pvbatch at 1, 2 and 3 ranks. The bad piece sits on the last rank; every rank
must reach the same verdict and none may wait forever (CTest's timeout turns
a hang into a failure; a Python error ends every rank at once).

- item 6: every piece empty, and the last rank's input lacks 'Wetted Area'
  (it did not come from Wall Traction): Load Integration fails on every rank.
- item 7: a multiblock with one leaf more on the last rank: Wall Traction
  and Load Integration do not abort the job. By blocks, the ranks hold
  different blocks, so Load Integration refuses on every rank with a message
  (at one rank the input is consistent and is summed); by a Region Array the
  structure does not matter and the totals are exact.
- a multiblock on one rank and a partitioned dataset collection on the others
  (the MPI fuzz's seed 200): the same verdict everywhere.

Expected totals: unit squares in the plane z = 0 under a uniform gauge
pressure p, stored normals into the fluid (+z): each face carries -p A n =
(0, 0, -p) (pressure on a plane, derived in test_hostile_input.py).
"""

import numpy as np
from vtkmodules.vtkCommonDataModel import (vtkCompositeDataSet, vtkMultiBlockDataSet, vtkPartitionedDataSet,
                                           vtkPartitionedDataSetCollection, vtkPolyData)
from vtkmodules.vtkParallelCore import vtkCommunicator

import wl_testing as T  # noqa: E402

simple, controller, rank, ranks = T.mpi_start()
import test_hostile_input as H  # noqa: E402
last = ranks - 1


def all_ranks(value, op):
    from vtkmodules.vtkCommonCore import vtkDoubleArray
    send, recv = vtkDoubleArray(), vtkDoubleArray()
    send.SetNumberOfTuples(1)
    send.SetValue(0, float(value))
    recv.SetNumberOfTuples(1)
    controller.AllReduce(send, recv, op)
    return recv.GetValue(0)


def same_verdict(run, what):
    ok = 1 if run.ok else 0
    lo = all_ranks(ok, vtkCommunicator.MIN_OP)
    hi = all_ranks(ok, vtkCommunicator.MAX_OP)
    assert lo == hi, "%s: ranks disagree (rank %d ok=%d)" % (what, rank, ok)
    if not ok:
        assert all_ranks(len(run.errors), vtkCommunicator.SUM_OP) > 0
    return bool(ok)


def piece(pressure, faces_x):
    """Wall Traction's input on this rank: unit squares at x offset by rank."""
    pd = H.squares(1, origin=(2.0 * rank + faces_x, 0.0, 0.0))
    H.cell_scalar(pd, "p", [pressure])
    H.cell_scalar(pd, "zone", [faces_x])
    return pd


# --- item 6 ---------------------------------------------------------------------------
empty = vtkPolyData()
wetted = H.traction_output().GetFieldData().GetArray("Wetted Area")  # a collective: on every rank
if rank != last:
    empty.GetFieldData().AddArray(wetted)
run = H.load_integration(empty)
assert not same_verdict(run, "item 6: empty pieces, one without Wetted Area"), "item 6 must fail"
if rank == last:
    H.expect_error(run, "Wetted Area")
print("rank %d: item 6 ok (%s)" % (rank, run.text()[:200]), flush=True)

# --- item 7 ---------------------------------------------------------------------------
mb = vtkMultiBlockDataSet()
names = ["upper", "lower"] + (["extra"] if rank == last else [])
for i, name in enumerate(names):
    mb.SetBlock(i, piece(1.0 + i, i))
    mb.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), name)
wt = H.wall_traction(mb)
assert same_verdict(wt, "item 7: Wall Traction"), "Wall Traction must take the blocks: %s" % wt.text()
# Wetted area: 2 squares per rank and one more on the last rank.
H.T.check_close("item 7 wetted area", H.field(wt.output, "Wetted Area"), 2 * ranks + 1, rtol=1e-14,
                source="unit squares")
li = H.load_integration(upstream=wt.alg)
ok = same_verdict(li, "item 7: Load Integration by blocks")
if ranks == 1:
    assert ok, li.text()
    H.T.check_close("item 7 force (1 rank)", H.field(li.output, "Force"), [0, 0, -6.0], rtol=1e-14,
                    source="pressures 1 + 2 + 3 on unit squares")
else:
    assert not ok, "different blocks on the ranks must be refused: %s" % li.text()
    if rank == last:
        H.expect_error(li, "blocks")
li = H.load_integration(upstream=wt.alg, region="zone")
assert same_verdict(li, "item 7: Load Integration by Region Array"), li.text()
# Per rank: zone 0 pressure 1, zone 1 pressure 2; the last rank also zone 2 pressure 3.
H.T.check_close("item 7 force by zone", H.field(li.output, "Force"), [0, 0, -(3.0 * ranks + 3.0)], rtol=1e-14,
                source="uniform pressures on unit squares")
print("rank %d: item 7 ok" % rank, flush=True)

# --- a multiblock on one rank, a partitioned collection on the others -----------------
if rank == last:
    data = vtkMultiBlockDataSet()
    data.SetBlock(0, piece(1.0, 0))
else:
    data = vtkPartitionedDataSetCollection()
    pds = vtkPartitionedDataSet()
    pds.SetPartition(0, piece(1.0, 0))
    data.SetPartitionedDataSet(0, pds)
wt = H.wall_traction(data)
if same_verdict(wt, "mixed composites: Wall Traction"):
    li = H.load_integration(upstream=wt.alg)
    if same_verdict(li, "mixed composites: Load Integration"):
        H.T.check_close("mixed composites force", H.field(li.output, "Force"), [0, 0, -1.0 * ranks],
                        rtol=1e-14, source="pressure 1 on one unit square per rank")
print("rank %d: mixed composites ok" % rank, flush=True)
