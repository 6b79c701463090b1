"""Benchmark: Shear Projection per wall face, and against the
gradient-on-the-whole-volume route.

Run by hand (not a test; the machine's other load makes timings noisy: the
script reports the best of several runs):

    source scripts/env.sh
    pvpython tests/benchmarks/benchmark_shear.py [--cells 1 8] [--kind hex tet] [--repeat 5]

A box of about N hexahedra (or the same box cut into tetrahedra) with a
cell-centred velocity, walls = its whole boundary. For every method it times,
on one thread (Sequential backend) and on all threads (STDThread):

  * the first execution, which builds the face-to-cell adjacency (a pass
    over the volume) and, for the wall fit, each face's weights;
  * a re-execution with the velocity changed (a time-step loop on a fixed
    mesh): the adjacency and weights are reused, the cost is per wall face;

and the stock route: vtkGradientFilter over the whole volume (cell data),
then the boundary surface and an array calculator for mu (G + G^T) n, i.e.
work proportional to the volume. Prints seconds and microseconds per wall
face.
"""
import argparse
import time

import numpy as np
from vtkmodules.util.numpy_support import numpy_to_vtk, vtk_to_numpy
from vtkmodules.vtkCommonCore import vtkObject, vtkSMPTools
from vtkmodules.vtkCommonDataModel import vtkImageData
from vtkmodules.vtkFiltersCore import vtkAppendFilter, vtkArrayCalculator, vtkCellCenters, vtkPolyDataNormals
from vtkmodules.vtkFiltersGeneral import vtkDataSetTriangleFilter, vtkGradientFilter
from vtkmodules.vtkFiltersGeometry import vtkDataSetSurfaceFilter

from wallloads.WallLoadsFilters import vtkShearProjection

MU = 1.0e-3
METHODS = ((vtkShearProjection.NEAR_WALL_DIFFERENCE, "near-wall difference"),
           (vtkShearProjection.GRADIENT_TENSOR, "least-squares gradient"),
           (vtkShearProjection.WALL_FIT, "wall fit"),
           (vtkShearProjection.WALL_LAW, "wall law"))


def velocity(ug, phase=0.0):
    cc = vtkCellCenters()
    cc.SetInputData(ug)
    cc.Update()
    x = vtk_to_numpy(cc.GetOutput().GetPoints().GetData())
    u = np.stack([np.sin(3 * x[:, 1] + phase) * x[:, 2], x[:, 0] * x[:, 2], np.cos(x[:, 0] + x[:, 1])], -1)
    arr = numpy_to_vtk(u, deep=1)
    arr.SetName("velocity")
    return arr


def box(n, kind):
    img = vtkImageData()
    img.SetDimensions(n + 1, n + 1, n + 1)
    img.SetSpacing(1.0 / n, 1.0 / n, 1.0 / n)
    if kind == "tet":
        tf = vtkDataSetTriangleFilter()
        tf.SetInputData(img)
        tf.Update()
        ug = tf.GetOutput()
    else:
        app = vtkAppendFilter()
        app.SetInputData(img)
        app.Update()
        ug = app.GetOutput()
    ug.GetCellData().AddArray(velocity(ug))
    return ug


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
    ap.add_argument("--cells", type=float, nargs="+", default=[1.0, 8.0], help="millions of cells (hexahedra)")
    ap.add_argument("--kind", nargs="+", default=["hex", "tet"], choices=["hex", "tet"])
    ap.add_argument("--repeat", type=int, default=5, help="re-executions timed (the best is kept)")
    ap.add_argument("--no-stock", action="store_true", help="skip the stock route")
    args = ap.parse_args()
    vtkObject.GlobalWarningDisplayOff()   # the default-walls warning is expected here
    for kind in args.kind:
        for millions in args.cells:
            n = int(round((millions * 1e6) ** (1.0 / 3.0)))
            ug = box(n, kind)
            faces = 6 * n * n * (2 if kind == "tet" else 1)
            print("\n== %s: %d cells, %d wall faces ==" % (kind, ug.GetNumberOfCells(), faces))
            t_nwd = None
            for method, label in METHODS:
                line = "  %-23s" % label
                for backend in ("Sequential", "STDThread"):
                    vtkSMPTools.SetBackend(backend)
                    sp = vtkShearProjection()
                    sp.SetInputData(ug)
                    sp.SetInputArrayToProcess(0, 0, 0, 1, "velocity")
                    sp.SetMethod(method)
                    sp.SetViscosity(MU)
                    t0 = time.perf_counter()
                    sp.Update()
                    first = time.perf_counter() - t0
                    times = []
                    for r in range(args.repeat):
                        # A new time step: the same mesh, a new velocity array.
                        ug.GetCellData().AddArray(velocity(ug, phase=0.1 * (r + 1)))
                        t0 = time.perf_counter()
                        sp.Modified()
                        sp.Update()
                        times.append(time.perf_counter() - t0)
                    best = min(times)
                    line += "  %s: first %6.2f s, again %7.4f s = %5.2f us/face (builds %d)" % (
                        "1 thread" if backend == "Sequential" else "%d threads" % vtkSMPTools.GetEstimatedNumberOfThreads(),
                        first, best, 1e6 * best / faces, sp.GetNumberOfAdjacencyBuilds())
                    if method == vtkShearProjection.NEAR_WALL_DIFFERENCE and backend == "STDThread":
                        t_nwd = best
                    del sp
                print(line)
            if not args.no_stock:
                vtkSMPTools.SetBackend("STDThread")
                t0 = time.perf_counter()
                stock(ug)
                t_stock = time.perf_counter() - t0
                print("  stock route (gradient on the volume, surface, calculator): %.3f s; ratio to the "
                      "near-wall difference re-run: %.0fx" % (t_stock, t_stock / t_nwd))
            del ug


if __name__ == "__main__":
    main()
