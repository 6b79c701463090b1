"""Benchmark: Wall Traction + Load Integration against the stock VTK chain and numpy.

Run by hand (not a test), on an otherwise idle machine:

    source scripts/env.sh
    pvpython tests/benchmarks/benchmark_loads.py [--sizes 0.5 2 8] [--repeat 3]

Surfaces are closed quad spheres of about N million faces with a cell
pressure and a 9-component cell velocity gradient (random values, seeded). In
one run it times, best of --repeat:

  * WallLoads: vtkWallTraction (gradient path) + vtkLoadIntegration, with the
    orientation check off (totals only) and on (the default), on the
    Sequential backend and on STDThread;
  * the equivalent chain of stock VTK filters on the same data: cell normals
    (vtkPolyDataNormals), array calculators for p n, for mu (G + G^T) n from
    the gradient components and for its tangential part, and
    vtkIntegrateAttributes (which multiplies by the cell areas);
  * the same sums written with numpy on the VTK arrays;

and prints faces per second, the ratios, the thread speed-up, and memory:
the output arrays' size and the peak resident memory beyond the memory held
before the run (VmHWM after resetting it through /proc/self/clear_refs).
WallLoads is timed on its first execution (fresh output arrays) and on
re-executions of the same pipeline (a time-step loop), best of --repeat.
"""
import argparse
import os
import platform
import time

import numpy as np
from vtkmodules.util.numpy_support import numpy_to_vtk, numpy_to_vtkIdTypeArray, vtk_to_numpy
from vtkmodules.vtkCommonCore import vtkPoints, vtkSMPTools
from vtkmodules.vtkCommonDataModel import vtkCellArray, vtkPolyData
from vtkmodules.vtkFiltersCore import vtkArrayCalculator, vtkPolyDataNormals
from vtkmodules.vtkFiltersParallel import vtkIntegrateAttributes

from wallloads.WallLoadsFilters import vtkLoadIntegration, vtkWallTraction

MU = 1.8e-5


def quad_sphere(n_faces, seed=7):
    """A closed sphere of quads (poles capped by degenerate-free quad fans
    avoided: rows of quads on a cylinder mapped to the sphere, plus two
    polar caps of triangles)."""
    n_az = int(round(np.sqrt(2 * n_faces)))
    n_pol = max(2, int(round(n_faces / n_az)))
    t = np.pi * np.arange(1, n_pol) / n_pol
    p = 2 * np.pi * np.arange(n_az) / n_az
    tt, pp = np.meshgrid(t, p, indexing="ij")
    ring = np.stack([np.sin(tt) * np.cos(pp), np.sin(tt) * np.sin(pp), np.cos(tt)], -1).reshape(-1, 3)
    pts = np.vstack([[0, 0, 1], ring, [0, 0, -1]])
    south = len(pts) - 1

    def rid(i, j):
        return 1 + i * n_az + (j % n_az)

    j = np.arange(n_az)
    tri_n = np.stack([np.zeros(n_az, int), rid(0, j), rid(0, j + 1)], -1)
    i, jj = np.meshgrid(np.arange(n_pol - 2), j, indexing="ij")
    quads = np.stack([rid(i, jj), rid(i + 1, jj), rid(i + 1, jj + 1), rid(i, jj + 1)], -1).reshape(-1, 4)
    tri_s = np.stack([np.full(n_az, south), rid(n_pol - 2, j + 1), rid(n_pol - 2, j)], -1)
    conn = np.concatenate([tri_n.ravel(), quads.ravel(), tri_s.ravel()]).astype(np.int64)
    sizes = np.concatenate([np.full(n_az, 3), np.full(len(quads), 4), np.full(n_az, 3)])
    offsets = np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64)
    cells = vtkCellArray()
    cells.SetData(numpy_to_vtkIdTypeArray(offsets, deep=1), numpy_to_vtkIdTypeArray(conn, deep=1))
    points = vtkPoints()
    points.SetData(numpy_to_vtk(pts, deep=1))
    pd = vtkPolyData()
    pd.SetPoints(points)
    pd.SetPolys(cells)
    rng = np.random.default_rng(seed)
    nf = pd.GetNumberOfCells()
    p_arr = numpy_to_vtk(rng.standard_normal(nf) + 1e5, deep=1)
    p_arr.SetName("p")
    g_arr = numpy_to_vtk(rng.standard_normal((nf, 9)), deep=1)
    g_arr.SetName("grad")
    pd.GetCellData().AddArray(p_arr)
    pd.GetCellData().AddArray(g_arr)
    return pd, pts, offsets, conn


def rss_kib(field="VmRSS"):
    with open("/proc/self/status") as handle:
        for line in handle:
            if line.startswith(field + ":"):
                return int(line.split()[1])
    return 0


def reset_peak():
    try:
        with open("/proc/self/clear_refs", "w") as handle:
            handle.write("5")
        return True
    except OSError:
        return False


def timed(fn, repeat):
    best, result, peak = float("inf"), None, 0
    for _ in range(repeat):
        result = None
        base = rss_kib()
        reset_peak()
        t0 = time.perf_counter()
        result = fn()
        dt = time.perf_counter() - t0
        peak = max(peak, rss_kib("VmHWM") - base)
        best = min(best, dt)
    return best, result, peak


class WallLoadsPipeline:
    """vtkWallTraction + vtkLoadIntegration built once and re-executed, as a
    time-step loop or an interactive session does."""

    def __init__(self, pd, check, forces_only=False):
        self.pd = pd
        self.wt = wt = vtkWallTraction()
        wt.SetInputData(pd)
        wt.SetInputArrayToProcess(0, 0, 0, 1, "p")
        wt.SetInputArrayToProcess(3, 0, 0, 1, "grad")
        wt.SetShearSource(vtkWallTraction.VELOCITY_GRADIENT)
        wt.SetViscosity(MU)
        wt.SetOrientation(vtkWallTraction.STORED_INTO_FLUID)
        wt.SetCheckOrientation(check)
        wt.SetPerFaceArrays(vtkWallTraction.FORCES_ONLY if forces_only else vtkWallTraction.ALL_ARRAYS)
        self.li = li = vtkLoadIntegration()
        li.SetInputConnection(wt.GetOutputPort())

    def __call__(self):
        self.wt.Modified()
        self.li.Update()
        fd = self.li.GetOutputDataObject(0).GetFieldData()
        force = np.array([fd.GetArray("Force").GetComponent(0, k) for k in range(3)])
        out = self.wt.GetOutputDataObject(0)
        out_bytes = sum(out.GetCellData().GetArray(i).GetActualMemorySize() * 1024
                        for i in range(out.GetCellData().GetNumberOfArrays())
                        if out.GetCellData().GetArrayName(i) not in ("p", "grad"))
        return force, out_bytes


def stock_chain(pd):
    normals = vtkPolyDataNormals()
    normals.SetInputData(pd)
    normals.ComputeCellNormalsOn()
    normals.ComputePointNormalsOff()
    normals.SplittingOff()
    normals.ConsistencyOff()
    normals.AutoOrientNormalsOff()
    pressure = vtkArrayCalculator()
    pressure.SetInputConnection(normals.GetOutputPort())
    pressure.SetAttributeTypeToCellData()
    pressure.AddScalarVariable("p", "p", 0)
    pressure.AddVectorArrayName("Normals")
    pressure.SetFunction("-p*Normals")
    pressure.SetResultArrayName("tp")
    viscous = vtkArrayCalculator()
    viscous.SetInputConnection(pressure.GetOutputPort())
    viscous.SetAttributeTypeToCellData()
    for k in range(9):
        viscous.AddScalarVariable("g%d" % k, "grad", k)
    for k, c in enumerate("xyz"):
        viscous.AddScalarVariable("n" + c, "Normals", k)
    div = "(2/3)*(g0+g4+g8)"
    rows = []
    for i in range(3):
        terms = "+".join("(g%d+g%d)*n%s" % (3 * i + j, 3 * j + i, "xyz"[j]) for j in range(3))
        rows.append("%g*((%s)-%s*n%s)" % (MU, terms, div, "xyz"[i]))
    viscous.SetFunction("iHat*(%s)+jHat*(%s)+kHat*(%s)" % tuple(rows))
    viscous.SetResultArrayName("tv")
    shear = vtkArrayCalculator()  # tangential part: the wall shear stress
    shear.SetInputConnection(viscous.GetOutputPort())
    shear.SetAttributeTypeToCellData()
    shear.AddVectorArrayName("tv")
    shear.AddVectorArrayName("Normals")
    shear.SetFunction("tv-dot(tv,Normals)*Normals")
    shear.SetResultArrayName("tw")
    integrate = vtkIntegrateAttributes()
    integrate.SetInputConnection(shear.GetOutputPort())
    integrate.Update()
    out = integrate.GetOutput().GetCellData()
    tp = np.array([out.GetArray("tp").GetComponent(0, k) for k in range(3)])
    tv = np.array([out.GetArray("tw").GetComponent(0, k) for k in range(3)])
    return tp + tv, 0


def numpy_sums(pd, pts, offsets, conn, exact=False):
    p = vtk_to_numpy(pd.GetCellData().GetArray("p"))
    g = vtk_to_numpy(pd.GetCellData().GetArray("grad")).reshape(-1, 3, 3)
    sizes = np.diff(offsets)
    area_vec = np.zeros((len(sizes), 3))
    for n in (3, 4):
        sel = np.nonzero(sizes == n)[0]
        ids = conn[offsets[sel][:, None] + np.arange(n)]
        v = pts[ids] - pts[ids[:, :1]]
        acc = np.zeros((len(sel), 3))
        for k in range(1, n - 1):
            acc += np.cross(v[:, k], v[:, k + 1])
        area_vec[sel] = 0.5 * acc
    area = np.linalg.norm(area_vec, axis=1)
    nrm = area_vec / area[:, None]
    tp = -p[:, None] * nrm
    sym = g + np.transpose(g, (0, 2, 1))
    tr = np.trace(g, axis1=1, axis2=2)
    tv = MU * (np.einsum("fij,fj->fi", sym, nrm) - (2.0 / 3.0) * tr[:, None] * nrm)
    tv -= np.einsum("fi,fi->f", tv, nrm)[:, None] * nrm  # tangential part
    forces = (tp + tv) * area[:, None]
    if exact:
        import math
        return np.array([math.fsum(forces[:, k]) for k in range(3)]), 0
    return forces.sum(axis=0), 0


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--sizes", type=float, nargs="+", default=[0.5, 2.0, 8.0],
                    help="surface sizes in millions of faces")
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args()
    cpu = "unknown"
    try:
        with open("/proc/cpuinfo") as handle:
            cpu = next(line.split(":", 1)[1].strip() for line in handle if line.startswith("model name"))
    except (OSError, StopIteration):
        pass
    print("machine: %s, %d cores, %s" % (cpu, os.cpu_count(), platform.platform()))
    for millions in args.sizes:
        pd, pts, offsets, conn = quad_sphere(int(millions * 1e6))
        nf = pd.GetNumberOfCells()
        print("\n== %d faces ==" % nf)
        results = {}
        for backend in ("Sequential", "STDThread"):
            vtkSMPTools.SetBackend(backend)
            for check, forces_only in ((False, False), (True, False), (False, True)):
                key = "WallLoads %s%s%s" % (backend, ", orientation check" if check else "",
                                            ", forces only" if forces_only else "")
                run = WallLoadsPipeline(pd, check, forces_only)
                first, _, _ = timed(run, 1)  # fresh output arrays: first-touch page faults
                t, (force, out_bytes), peak = timed(run, args.repeat)  # re-executions
                results[key] = (t, force)
                print("%-50s first %7.3f s, again %7.3f s = %6.2f M faces/s   outputs %5.1f B/face,"
                      " peak new memory %5.1f B/face"
                      % (key, first, t, nf / t / 1e6, out_bytes / nf, peak * 1024.0 / nf))
                del run
        vtkSMPTools.SetBackend("Sequential")
        t, (force, _), peak = timed(lambda: stock_chain(pd), max(1, args.repeat - 2))
        results["stock"] = (t, force)
        print("%-50s          %7.3f s = %6.2f M faces/s   peak %6.1f B/face" % (
            "stock VTK chain (Sequential)", t, nf / t / 1e6, peak * 1024.0 / nf))
        t, (force, _), peak = timed(lambda: numpy_sums(pd, pts, offsets, conn), max(1, args.repeat - 1))
        results["numpy"] = (t, force)
        print("%-50s          %7.3f s = %6.2f M faces/s   peak %6.1f B/face" % (
            "numpy", t, nf / t / 1e6, peak * 1024.0 / nf))
        # Reference: the numpy per-face forces summed exactly (math.fsum), so
        # that the rounding of plain summation does not blur the comparison.
        ref = numpy_sums(pd, pts, offsets, conn, exact=True)[0]
        for key, (t, force) in results.items():
            rel = np.linalg.norm(force - ref) / np.linalg.norm(ref)
            print("    %-46s force %s   |diff| to exact sum %.1e" % (key, np.array2string(force, precision=6), rel))
        seq = results["WallLoads Sequential"][0]
        thr = results["WallLoads STDThread"][0]
        print("ratios: stock/WallLoads %.0fx (Sequential) %.0fx (STDThread); numpy/WallLoads %.1fx;"
              " thread speed-up %.2fx (%.2fx with orientation check)"
              % (results["stock"][0] / seq, results["stock"][0] / thr, results["numpy"][0] / seq, seq / thr,
                 results["WallLoads Sequential, orientation check"][0]
                 / results["WallLoads STDThread, orientation check"][0]))
        del pd


if __name__ == "__main__":
    main()
