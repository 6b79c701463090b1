"""Benchmark: per-step cost of Wall Traction + Load Integration + Load History
on a time series whose mesh does not change, against re-executing the stock
VTK filter chain at every step.

Run by hand (not a test), on an otherwise idle machine:

    source scripts/env.sh
    pvpython tests/benchmarks/benchmark_history.py [--faces 2] [--steps 10] [--stock-steps 3]

The series is made in memory by a small temporal source (the same mesh
objects at every step, a pressure p(t) = p0 (1 + 0.1 sin t) and a fixed
velocity gradient per face; the quad sphere and the stock chain are those of
benchmark_loads.py). Timed, each in the same run:

  * source alone: the source re-executed at every step (the "reader" cost,
    subtracted from the others);
  * WallLoads by hand: for each step, source + vtkWallTraction +
    vtkLoadIntegration updated at that time;
  * WallLoads with Load History: one vtkLoadHistory Update that visits every
    step (the same chain upstream) and builds the history and statistics;
    its bookkeeping is the difference to the loop by hand;
  * stock: for each step, the source then the stock chain (cell normals,
    array calculators, vtkIntegrateAttributes) re-executed on that step.

Prints seconds per step, faces per second and the ratio stock / WallLoads.
"""
import argparse
import os
import sys
import time

import numpy as np
from vtkmodules.util.numpy_support import numpy_to_vtk, vtk_to_numpy
from vtkmodules.util.vtkAlgorithm import VTKPythonAlgorithmBase
from vtkmodules.vtkCommonCore import vtkSMPTools
from vtkmodules.vtkCommonDataModel import vtkPolyData
from vtkmodules.vtkCommonExecutionModel import vtkStreamingDemandDrivenPipeline as SDDP

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from benchmark_loads import MU, quad_sphere, stock_chain  # noqa: E402
from wallloads.WallLoadsFilters import vtkLoadHistory, vtkLoadIntegration, vtkWallTraction  # noqa: E402


class SeriesSource(VTKPythonAlgorithmBase):
    """The same mesh at every step with a pressure that varies in time."""

    def __init__(self, mesh, times):
        VTKPythonAlgorithmBase.__init__(self, nInputPorts=0, nOutputPorts=1, outputType="vtkPolyData")
        self.mesh, self.times = mesh, list(times)
        self.p0 = vtk_to_numpy(mesh.GetCellData().GetArray("p")).copy()
        self.executions = 0

    def RequestInformation(self, request, inInfo, outInfo):
        info = outInfo.GetInformationObject(0)
        info.Set(SDDP.TIME_STEPS(), self.times, len(self.times))
        info.Set(SDDP.TIME_RANGE(), [self.times[0], self.times[-1]], 2)
        return 1

    def RequestData(self, request, inInfo, outInfo):
        info = outInfo.GetInformationObject(0)
        t = info.Get(SDDP.UPDATE_TIME_STEP()) if info.Has(SDDP.UPDATE_TIME_STEP()) else self.times[0]
        out = vtkPolyData.GetData(outInfo)
        out.ShallowCopy(self.mesh)  # the same points and cells: an unchanged mesh
        p = numpy_to_vtk(self.p0 * (1 + 0.1 * np.sin(t)), deep=1)
        p.SetName("p")
        out.GetCellData().AddArray(p)
        out.GetInformation().Set(out.DATA_TIME_STEP(), t)
        self.executions += 1
        return 1


def wallloads_chain(source, check):
    wt = vtkWallTraction()
    wt.SetCheckOrientation(check)
    wt.SetInputConnection(source.GetOutputPort())
    wt.SetInputArrayToProcess(0, 0, 0, 1, "p")
    wt.SetInputArrayToProcess(3, 0, 0, 1, "grad")
    wt.SetShearSource(vtkWallTraction.VELOCITY_GRADIENT)
    wt.SetViscosity(MU)
    wt.SetOrientation(vtkWallTraction.STORED_INTO_FLUID)
    li = vtkLoadIntegration()
    li.SetInputConnection(wt.GetOutputPort())
    return wt, li


def best_of(fn, repeat):
    best = float("inf")
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--faces", type=float, default=2.0, help="million faces (default 2)")
    ap.add_argument("--steps", type=int, default=10, help="time steps for WallLoads (default 10)")
    ap.add_argument("--stock-steps", type=int, default=3, help="time steps for the stock chain (default 3)")
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--threads", action="store_true", help="STDThread backend (default Sequential)")
    ap.add_argument("--no-orientation-check", action="store_true",
                    help="Wall Traction's orientation check off (default on, as in the filter)")
    args = ap.parse_args()
    vtkSMPTools.SetBackend("STDThread" if args.threads else "Sequential")
    mesh, _, _, _ = quad_sphere(int(args.faces * 1e6))
    nf = mesh.GetNumberOfCells()
    times = np.cumsum(np.r_[0.0, np.random.default_rng(3).uniform(0.5, 1.5, args.steps - 1)]) * 0.01
    print("%d faces, %d steps (uneven), SMP backend %s, orientation check %s, best of %d" % (
        nf, args.steps, vtkSMPTools.GetBackend(), "off" if args.no_orientation_check else "on",
        args.repeat))

    source = SeriesSource(mesh, times)
    wt, li = wallloads_chain(source, not args.no_orientation_check)
    li.UpdateTimeStep(times[0])  # first execution (allocations) left out of the per-step figures

    def source_only():
        for t in times:
            source.Modified()
            source.UpdateTimeStep(t)

    def by_hand():
        for t in times:
            li.UpdateTimeStep(t)

    history = vtkLoadHistory()
    history.SetInputConnection(li.GetOutputPort(1))

    def with_history():
        history.Modified()
        history.Update()

    # Interleaved, best of --repeat each: the machine's load drifts.
    t_src = t_hand = t_hist = float("inf")
    runs = 0
    for _ in range(args.repeat):
        t_src = min(t_src, best_of(source_only, 1) / args.steps)
        t_hand = min(t_hand, best_of(by_hand, 1) / args.steps)
        before = source.executions
        t_hist = min(t_hist, best_of(with_history, 1) / args.steps)
        runs += source.executions - before
    per_update = runs / args.repeat
    assert per_update == args.steps, "the source ran %g times per history update" % per_update
    rows = history.GetOutputDataObject(0).GetNumberOfRows()
    assert rows == args.steps, rows

    stock_times = times[:args.stock_steps]
    stock_source = SeriesSource(mesh, stock_times)

    def stock():
        for t in stock_times:
            stock_source.UpdateTimeStep(t)
            step = vtkPolyData()
            step.ShallowCopy(stock_source.GetOutputDataObject(0))
            stock_chain(step)

    t_stock = best_of(stock, 1) / args.stock_steps - t_src

    wl = t_hand - t_src
    print("source alone (the 'reader'):           %8.4f s/step" % t_src)
    print("Wall Traction + Load Integration:       %8.4f s/step  %6.1f M faces/s" % (wl, nf / wl / 1e6))
    print("  + Load History (one Update, %d steps): %8.4f s/step, bookkeeping %+.4f s/step (%.1f%%)" % (
        args.steps, t_hist - t_src, t_hist - t_hand, 100 * (t_hist - t_hand) / wl))
    print("stock VTK chain re-executed:            %8.4f s/step  %6.2f M faces/s" % (t_stock, nf / t_stock / 1e6))
    print("ratio stock / (WallLoads + Load History): %.0fx" % (t_stock / (t_hist - t_src)))


if __name__ == "__main__":
    main()
