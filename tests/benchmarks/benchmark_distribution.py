"""Benchmark: Load Distribution against Load Integration on the same faces.

Run by hand (not a test), on an otherwise idle machine:

    source scripts/env.sh
    pvpython tests/benchmarks/benchmark_distribution.py [--size 2] [--repeat 5]

On a closed quad sphere of about --size million faces (the surface of
benchmark_loads.py), after one Wall Traction execution, it times (best of
--repeat, Sequential and STDThread backends) vtkLoadIntegration and
vtkLoadDistribution with 50, 1000 and 20000 bins along an oblique axis (the
more bins, the more faces are cut by a bin plane and clipped exactly), and
prints faces per second and the ratio to Load Integration.
"""
import argparse
import os
import sys
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from benchmark_loads import quad_sphere  # noqa: E402

from vtkmodules.vtkCommonCore import vtkSMPTools  # noqa: E402
from wallloads.WallLoadsFilters import vtkLoadDistribution, vtkLoadIntegration, vtkWallTraction  # noqa: E402


def best_of(alg, repeat):
    best = float("inf")
    for _ in range(repeat):
        alg.Modified()
        t0 = time.perf_counter()
        alg.Update()
        best = min(best, time.perf_counter() - t0)
    return best


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--size", type=float, default=2.0, help="million faces")
    ap.add_argument("--repeat", type=int, default=5)
    args = ap.parse_args()
    pd = quad_sphere(int(args.size * 1e6))[0]
    nf = pd.GetNumberOfCells()
    wt = vtkWallTraction()
    wt.SetInputData(pd)
    wt.SetInputArrayToProcess(0, 0, 0, 1, "p")
    wt.Update()
    surface = wt.GetOutputDataObject(0)
    print("%d faces" % nf)
    for backend in ("Sequential", "STDThread"):
        vtkSMPTools.SetBackend(backend)
        li = vtkLoadIntegration()
        li.SetInputData(surface)
        t_li = best_of(li, args.repeat)
        print("%-10s Load Integration            %7.3f s  %6.1f M faces/s" % (backend, t_li, nf / t_li / 1e6))
        for bins in (50, 1000, 20000):
            ld = vtkLoadDistribution()
            ld.SetInputData(surface)
            ld.SetAxisDirection(1.0, 2.0, 2.0)
            ld.SetNumberOfBins(bins)
            t_ld = best_of(ld, args.repeat)
            print("%-10s Load Distribution %5d bins %7.3f s  %6.1f M faces/s  (%.2f x Load Integration's time)"
                  % (backend, bins, t_ld, nf / t_ld / 1e6, t_ld / t_li))


if __name__ == "__main__":
    main()
