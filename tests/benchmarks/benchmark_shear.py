"""Benchmark: Shear Projection against the gradient-on-the-whole-volume route.

Run by hand (not a test):

    source scripts/env.sh
    pvpython tests/benchmarks/benchmark_shear.py [--cells 1 8]

A box of n^3 hexahedra (about 6 % of the cells touch the boundary) with a
cell-centred velocity. In one run it times:

  * Shear Projection (near-wall difference, and wall fit) on its first
    execution (which builds the face-to-cell adjacency) and on a
    re-execution with a changed velocity (adjacency reused);
  * the stock route: vtkGradientFilter over the whole volume (cell data),
    then vtkDataSetSurfaceFilter to the boundary and an array calculator for
    mu (G + G^T) n, i.e. work proportional to the volume;

and prints the times, the ratios and the time per wall face.
"""
import argparse
import time

import numpy as np
from vtkmodules.util.numpy_support import numpy_to_vtk, vtk_to_numpy
from vtkmodules.vtkCommonCore import vtkSMPTools
from vtkmodules.vtkCommonDataModel import vtkImageData
from vtkmodules.vtkFiltersCore import vtkAppendFilter, vtkArrayCalculator, vtkCellCenters, vtkPolyDataNormals
from vtkmodules.vtkFiltersGeneral import vtkGradientFilter
from vtkmodules.vtkFiltersGeometry import vtkDataSetSurfaceFilter

from wallloads.WallLoadsFilters import vtkShearProjection

MU = 1.0e-3


def box(n):
    img = vtkImageData()
    img.SetDimensions(n + 1, n + 1, n + 1)
    img.SetSpacing(1.0 / n, 1.0 / n, 1.0 / n)
    app = vtkAppendFilter()
    app.SetInputData(img)
    app.Update()
    ug = app.GetOutput()
    cc = vtkCellCenters()
    cc.SetInputData(ug)
    cc.Update()
    x = vtk_to_numpy(cc.GetOutput().GetPoints().GetData())
    u = np.stack([np.sin(3 * x[:, 1]) * x[:, 2], x[:, 0] * x[:, 2], np.cos(x[:, 0] + x[:, 1])], -1)
    arr = numpy_to_vtk(u, deep=1)
    arr.SetName("velocity")
    ug.GetCellData().AddArray(arr)
    return ug


def best(fn, repeat):
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def stock(ug):
    grad = vtkGradientFilter()
    grad.SetInputData(ug)
    grad.SetInputArrayToProcess(0, 0, 0, 1, "velocity")
    grad.SetResultArrayName("G")
    surf = vtkDataSetSurfaceFilter()
    surf.SetInputConnection(grad.GetOutputPort())
    normals = vtkPolyDataNormals()
    normals.SetInputConnection(surf.GetOutputPort())
    normals.ComputeCellNormalsOn()
    normals.ComputePointNormalsOff()
    normals.SplittingOff()
    calc = vtkArrayCalculator()
    calc.SetInputConnection(normals.GetOutputPort())
    calc.SetAttributeTypeToCellData()
    for k in range(9):
        calc.AddScalarVariable("g%d" % k, "G", k)
    for k, c in enumerate("xyz"):
        calc.AddScalarVariable("n" + c, "Normals", k)
    rows = ["%g*(%s)" % (MU, "+".join("(g%d+g%d)*n%s" % (3 * i + j, 3 * j + i, "xyz"[j]) for j in range(3)))
            for i in range(3)]
    calc.SetFunction("iHat*(%s)+jHat*(%s)+kHat*(%s)" % tuple(rows))
    calc.SetResultArrayName("tau")
    calc.Update()
    return calc.GetOutput().GetNumberOfCells()


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--cells", type=float, nargs="+", default=[1.0, 8.0], help="millions of cells")
    ap.add_argument("--repeat", type=int, default=2)
    args = ap.parse_args()
    vtkSMPTools.SetBackend("STDThread")
    for millions in args.cells:
        n = int(round((millions * 1e6) ** (1.0 / 3.0)))
        ug = box(n)
        walls = 6 * n * n
        print("\n== %d cells, %d wall faces (%.1f %% of the cells touch a wall) ==" % (
            ug.GetNumberOfCells(), walls, 100.0 * (n ** 3 - (n - 2) ** 3) / n ** 3))
        for method, label in ((vtkShearProjection.NEAR_WALL_DIFFERENCE, "near-wall difference"),
                              (vtkShearProjection.WALL_FIT, "wall fit")):
            sp = vtkShearProjection()
            sp.SetInputData(ug)
            sp.SetInputArrayToProcess(0, 0, 0, 1, "velocity")
            sp.SetMethod(method)
            sp.SetViscosity(MU)
            t0 = time.perf_counter()
            sp.Update()
            first = time.perf_counter() - t0

            def again():
                sp.Modified()
                sp.Update()
            t = best(again, args.repeat)
            print("Shear Projection, %-22s first %7.3f s (with adjacency), again %7.3f s = %6.2f us/wall face"
                  " (adjacency builds: %d)" % (label, first, t, 1e6 * t / walls, sp.GetNumberOfAdjacencyBuilds()))
            if method == vtkShearProjection.NEAR_WALL_DIFFERENCE:
                t_sp = t
        t_stock = best(lambda: stock(ug), 1)
        print("stock route (gradient on the volume, surface, calculator) %7.3f s" % t_stock)
        print("ratio stock / Shear Projection (re-execution, near-wall difference): %.1fx" % (t_stock / t_sp))
        del ug


if __name__ == "__main__":
    main()
