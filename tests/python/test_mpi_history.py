"""Load History under mpirun pvbatch (1, 2 and 3 ranks): the history and
statistics tables equal those of a serial run of the same series to 1e-12.

Each rank reads its own .pvd series holding its share of the sphere's faces
(with 3 ranks the last one holds none: an empty rank), so Wall Traction and
Load Integration reduce across ranks at every step while Load History drives
every rank through the same steps. The serial reference runs in the same
process with a one-process controller on the whole sphere's series. Tables
are on rank 0 only (DESIGN section 4)."""
import os
import sys
import tempfile

import numpy as np

import wl_testing as T
import history_scenes as H
from vtkmodules.vtkParallelCore import vtkMultiProcessController, vtkDummyController


simple, controller, rank, ranks = T.mpi_start()
import wallloads.WallLoadsFilters as W  # noqa: E402
from paraview.modules.vtkPVVTKExtensionsIOCore import vtkPVDReader  # noqa: E402


out = os.path.join(os.environ.get("WALLLOADS_TEST_OUTPUT", tempfile.gettempdir()), "history_mpi_np%d" % ranks)
t = H.times()[:120]  # 120 uneven steps: the transient and ~5 cycles
g = H.signal(t)
n_faces = len(H.sphere()[1])
owners = 1 if ranks == 1 else (2 if ranks == 2 else ranks - 1)
share = np.array_split(np.arange(n_faces), owners)[rank] if rank < owners else np.zeros(0, dtype=int)
mine = H.write_series(out, "rank%d" % rank, t, g, face_subset=share)
if rank == 0:
    whole = H.write_series(out, "whole", t, g)
controller.Barrier()
print("rank %d of %d: %d of %d faces" % (rank, ranks, share.size, n_faces))


def chain(path, table_port):
    reader = vtkPVDReader()
    reader.SetFileName(path)
    wt = W.vtkWallTraction()
    wt.SetInputConnection(reader.GetOutputPort())
    wt.SetInputArrayToProcess(0, 0, 0, 1, "p")
    wt.SetShearSource(0)
    li = W.vtkLoadIntegration()
    li.SetInputConnection(wt.GetOutputPort())
    lh = W.vtkLoadHistory()
    lh.SetInputConnection(li.GetOutputPort(table_port))
    lh.SetReferenceLength(0.3)
    lh.SetReferenceSpeed(2.0)
    lh.Update()
    return lh.GetOutputDataObject(0), lh.GetOutputDataObject(1)


def columns_of(table):
    from vtkmodules.util.numpy_support import vtk_to_numpy
    result = {}
    for i in range(table.GetNumberOfColumns()):
        a = table.GetColumn(i)
        result[table.GetColumnName(i)] = vtk_to_numpy(a) if a.IsNumeric() else \
            [a.GetValue(k) for k in range(a.GetNumberOfValues())]
    return result


for port, label in ((1, "Load Table input"), (0, "field-data input")):
    history, stats = chain(mine, port)
    if rank != 0:
        T.expect("rank %d: tables on rank 0 only (%s)" % (rank, label),
                 history.GetNumberOfRows() == 0 and stats.GetNumberOfRows() == 0)
        continue
    vtkMultiProcessController.SetGlobalController(vtkDummyController())
    try:
        ref_history, ref_stats = chain(whole, port)
    finally:
        vtkMultiProcessController.SetGlobalController(controller)
    got, ref = columns_of(history), columns_of(ref_history)
    T.expect("%s: same history columns" % label, list(got) == list(ref), str(list(got)[:4]))
    T.expect("%s: %d steps" % (label, t.size), history.GetNumberOfRows() == t.size)
    worst = 0.0
    for name in ref:
        scale = max(np.max(np.abs(ref[name])), 1e-300)
        worst = max(worst, np.max(np.abs(got[name] - ref[name])) / scale)
    T.expect("%s: history equals serial to 1e-12 (relative to each column's size)" % label,
             worst <= 1e-12, "worst %.2e" % worst)
    # Statistics. Values in the quantity's unit (mean, deviation, extrema,
    # standard error, amplitude) are compared on the scale of all history
    # columns of that unit (a moment that is zero but for round-off is
    # compared on the scale of the moments); the times and the frequency on
    # their own scale, for the quantities that are more than round-off (the
    # statistics of pure round-off depend on the summation order, which the
    # ranks change: those rows are counted and left out of that comparison).
    units = {}
    for i in range(1, ref_history.GetNumberOfColumns()):
        a = ref_history.GetColumn(i)
        unit = a.GetInformation().Get(a.UNITS_LABEL()) or ""
        units[ref_history.GetColumnName(i)] = unit
    unit_scale = {}
    for name, unit in units.items():
        unit_scale[unit] = max(unit_scale.get(unit, 0.0), float(np.max(np.abs(ref[name]))))
    got, ref_s = columns_of(stats), columns_of(ref_stats)
    T.expect("%s: same statistics rows" % label, got["Quantity"] == ref_s["Quantity"])
    valued = ("Mean", "Standard Deviation", "Minimum", "Maximum", "Standard Error Of Mean", "Amplitude")
    worst, where, roundoff = 0.0, "", 0
    for row, quantity in enumerate(ref_s["Quantity"]):
        scale = max(unit_scale[units[quantity]], 1e-300)
        real = float(np.max(np.abs(ref[quantity]))) > 1e-9 * scale
        roundoff += 0 if real else 1
        for name in ref_s:
            if name == "Quantity" or (name not in valued and not real):
                continue
            a, b = got[name][row], ref_s[name][row]
            if np.isnan(b) and np.isnan(a):
                continue
            err = abs(a - b) / (scale if name in valued else max(abs(b), 1e-300))
            if not err <= worst:
                worst, where = err, "%s of %s" % (name, quantity)
    print("%s: %d of %d quantities are zero but for round-off" % (label, roundoff, len(ref_s["Quantity"])))
    T.expect("%s: statistics equal serial to 1e-12" % label, worst <= 1e-12,
             "worst %.2e (%s)" % (worst, where))

controller.Barrier()
if rank == 0:
    T.done(__file__)
