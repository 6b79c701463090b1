"""Hostile input for Wall Traction and Load Integration (issue 7): each check
reproduces one defect that crashed, misled or stayed silent before, and
asserts the behaviour the project promises instead: a clear error naming the
array or block, or NaN with a warning, never a crash or a plausible number
from garbage.

Runs the wrapped classes directly (no proxies), so that an input reaches the
filter exactly as built. `pvpython test_hostile_input.py item4` runs one
check (a crash then names the item).

Expected values are derived in the checks: a square of side s has area s^2
(its Newell area vector is (0, 0, s^2)), a uniform gauge pressure p on it
gives the force -p A n with n the outward (into-the-wall) normal.
"""
import math
import sys

import numpy as np
from vtkmodules.util.misc import calldata_type
from vtkmodules.util.numpy_support import numpy_to_vtk
from vtkmodules.util.vtkConstants import VTK_STRING
from vtkmodules.vtkCommonCore import (vtkDoubleArray, vtkIdTypeArray, vtkPoints, vtkStringArray,
                                      vtkTypeInt64Array, vtkUnsignedCharArray)
from vtkmodules.vtkCommonDataModel import (vtkCellArray, vtkCompositeDataSet, vtkImageData,
                                           vtkMultiBlockDataSet, vtkPolyData, vtkStructuredGrid)
from vtkmodules.vtkCommonExecutionModel import vtkTrivialProducer

import wl_testing as T

T.load_plugin()
from wallloads.WallLoadsFilters import vtkLoadIntegration, vtkWallTraction  # noqa: E402

CELLS, POINTS = 1, 0


class Run:
    """A filter run on an in-memory input, with its errors and warnings."""

    def __init__(self, alg, data=None, upstream=None):
        self.errors, self.warnings = [], []

        @calldata_type(VTK_STRING)
        def on_error(obj, event, text):
            self.errors.append(str(text))

        @calldata_type(VTK_STRING)
        def on_warning(obj, event, text):
            self.warnings.append(str(text))

        alg.AddObserver("ErrorEvent", on_error)
        alg.AddObserver("WarningEvent", on_warning)
        if upstream is not None:
            alg.SetInputConnection(upstream.GetOutputPort())
        else:
            src = vtkTrivialProducer()
            src.SetOutput(data)
            alg.SetInputConnection(src.GetOutputPort())
            self.source = src
        self.ok = alg.GetExecutive().Update() == 1
        self.alg = alg
        self.output = alg.GetOutputDataObject(0)

    def text(self):
        return " | ".join(self.errors + self.warnings)


def expect_error(run, *words):
    msg = " | ".join(run.errors)
    assert run.errors, "expected an error containing %s; got none (warnings: %s)" % (words, run.warnings)
    assert not run.ok, "an error was reported but the execution succeeded"
    for w in words:
        assert w in msg, "error %r does not contain %r" % (msg, w)
    print("   error as expected:", msg[:300])


def squares(n=2, side=1.0, origin=(0.0, 0.0, 0.0), npoints=None):
    """n x n unit squares in the plane z = origin_z (normals +z by the stored order)."""
    xs = np.arange(n + 1) * side
    X, Y = np.meshgrid(xs, xs, indexing="ij")
    pts = np.c_[X.ravel(), Y.ravel(), np.zeros(X.size)] + np.asarray(origin)
    faces = []
    for i in range(n):
        for j in range(n):
            a = i * (n + 1) + j
            faces.append([a, a + n + 1, a + n + 2, a + 1])
    pd = vtkPolyData()
    p = vtkPoints()
    p.SetDataTypeToDouble()
    p.SetData(numpy_to_vtk(pts if npoints is None else pts[:npoints], deep=1))
    pd.SetPoints(p)
    cells = vtkCellArray()
    for f in faces:
        cells.InsertNextCell(len(f), f)
    pd.SetPolys(cells)
    return pd


def cell_scalar(ds, name, values, kind=vtkDoubleArray):
    a = kind()
    a.SetName(name)
    for v in values:
        a.InsertNextValue(v)
    ds.GetCellData().AddArray(a)
    return a


def wall_traction(data=None, pressure="p", assoc=CELLS, upstream=None, **settings):
    wt = vtkWallTraction()
    if pressure:
        wt.SetInputArrayToProcess(vtkWallTraction.PRESSURE_ARRAY, 0, 0, assoc, pressure)
    wt.SetShearSource(vtkWallTraction.NO_SHEAR)
    wt.SetOrientation(vtkWallTraction.STORED_INTO_FLUID)
    for k, v in settings.items():
        getattr(wt, "Set" + k)(v)
    return Run(wt, data, upstream)


def load_integration(data=None, upstream=None, region=None, **settings):
    li = vtkLoadIntegration()
    if region:
        li.SetInputArrayToProcess(vtkLoadIntegration.REGION_ARRAY, 0, 0, CELLS, region)
    for k, v in settings.items():
        getattr(li, "Set" + k)(*v) if isinstance(v, tuple) else getattr(li, "Set" + k)(v)
    return Run(li, data, upstream)


def field(ds, name):
    a = ds.GetFieldData().GetArray(name)
    assert a is not None, "no field value %r" % name
    return np.array([a.GetComponent(0, k) for k in range(a.GetNumberOfComponents())])


def traction_output(pressure=1.0, n=2, side=1.0, origin=(0, 0, 0)):
    """Wall Traction's output on n x n squares with uniform pressure."""
    pd = squares(n, side, origin)
    cell_scalar(pd, "p", [pressure] * pd.GetNumberOfCells())
    run = wall_traction(pd)
    assert not run.errors, run.errors
    out = run.output.NewInstance()
    out.DeepCopy(run.output)
    return out


# --- item 2: a selected array's length is checked (all filters) -------------------------
def item2():
    pd = squares(2)
    cell_scalar(pd, "p", [5.0])  # one tuple for four quads
    expect_error(wall_traction(pd), "'p'", "holds 1 values for 4 cells")
    pd = squares(2)
    a = cell_scalar(pd, "p", [5.0] * 3)
    pd.GetPointData().AddArray(a)  # 3 values for 9 points
    expect_error(wall_traction(pd, assoc=POINTS), "'p'", "holds 3 values for 9 points")
    out = traction_output()
    short = vtkDoubleArray()
    short.SetName("Pressure Force")
    short.SetNumberOfComponents(3)
    short.SetNumberOfTuples(1)
    short.Fill(1.0)
    out.GetCellData().AddArray(short)
    expect_error(load_integration(out), "'Pressure Force'", "holds 1 values for 4 cells")


# --- item 3: region values near the integer limits ---------------------------------------
def item3():
    for values in ([2**63 - 1, -2**63, 0, 5], [2**62, 2**62 + 1, 2**62, 2**62 + 1],
                   [2**53, 2**53 + 1, 0, 1], [-2**63, -2**63, -2**63, -2**63]):
        out = traction_output()
        cell_scalar(out, "zone", values, vtkTypeInt64Array)
        run = load_integration(out, region="zone")
        expect_error(run, "Region Array 'zone'")
    # A large span within the limits: refused by the span limit, not by a crash.
    out = traction_output()
    cell_scalar(out, "zone", [-2**40, 2**40, 0, 0], vtkTypeInt64Array)
    expect_error(load_integration(out, region="zone"), "Region Array 'zone'", "spans")
    # Large but exact values with a small span work, one row each.
    out = traction_output(pressure=2.0)
    base = 2**52
    cell_scalar(out, "zone", [base, base + 1, base, base + 1], vtkTypeInt64Array)
    run = load_integration(out, region="zone")
    assert not run.errors, run.errors
    rows = T.table_rows(run.alg.GetOutputDataObject(1))
    assert set(rows) == {"zone %d" % base, "zone %d" % (base + 1), "Total"}, sorted(rows)
    # Uniform gauge pressure 2 on 2 of the unit squares each (stored normal +z
    # into the fluid): force -p A n = (0, 0, -4) per region.
    T.check_close("region force near 2^52", rows["zone %d" % base]["Force"], [0, 0, -4.0], atol=1e-12,
                  source="uniform pressure on a plane: F = -p A n")


# --- item 4: point ids past the last point -----------------------------------------------
def item4():
    pd = squares(2)
    cell_scalar(pd, "p", [1.0] * 4)
    pd.GetPolys().GetConnectivityArray().SetValue(5, 1000)
    expect_error(wall_traction(pd), "refer to point 1000", "9 points")
    pd = squares(2)
    cell_scalar(pd, "p", [1.0] * 4)
    pd.GetPolys().GetConnectivityArray().SetValue(2, -7)
    expect_error(wall_traction(pd), "refer to point -7")
    out = traction_output()
    bad = out.NewInstance()
    bad.DeepCopy(out)
    bad.GetPolys().GetConnectivityArray().SetValue(3, 12345)
    expect_error(load_integration(bad), "refer to point 12345")


# --- item 4, the cell arrays themselves: offsets past the connectivity, short type arrays ---
def item4_cells():
    from vtkmodules.vtkCommonDataModel import vtkUnstructuredGrid
    from vtkmodules.util.numpy_support import numpy_to_vtk as n2v
    pd = squares(2)
    cell_scalar(pd, "p", [1.0] * 4)
    conn = pd.GetPolys().GetConnectivityArray()
    offsets = n2v(np.array([0, 4, 8, 12, 4000], dtype=np.int64), deep=1)
    polys = vtkCellArray()
    polys.SetData(offsets, conn)  # the last cell ends far past the connectivity
    pd.SetPolys(polys)
    expect_error(wall_traction(pd), "offsets")
    pd = squares(2)
    cell_scalar(pd, "p", [1.0] * 4)
    offsets = n2v(np.array([0, 8, 4, 12, 16], dtype=np.int64), deep=1)
    polys = vtkCellArray()
    polys.SetData(offsets, pd.GetPolys().GetConnectivityArray())  # decreasing offsets
    pd.SetPolys(polys)
    expect_error(wall_traction(pd), "offsets")
    # A decrease at every position of a small offsets array, and deep in a
    # large one (checked in threaded chunks whose bounds depend on the backend).
    for n, positions in ((4, range(1, 16)), (300, (40000, 65537, 89999))):
        for at in positions:
            pd = squares(n)
            cell_scalar(pd, "p", [1.0] * (n * n))
            offsets = np.arange(n * n + 1, dtype=np.int64) * 4
            offsets[at] = offsets[at - 1] - 1
            polys = vtkCellArray()
            polys.SetData(n2v(offsets, deep=1), pd.GetPolys().GetConnectivityArray())
            pd.SetPolys(polys)
            expect_error(wall_traction(pd), "offsets")
    # An unstructured grid with fewer cell types than cells.
    src = squares(2)
    ug = vtkUnstructuredGrid()
    ug.SetPoints(src.GetPoints())
    types = vtkUnsignedCharArray()
    types.SetNumberOfTuples(1)
    types.SetValue(0, 9)  # VTK_QUAD
    ug.SetCells(types, src.GetPolys())
    cell_scalar(ug, "p", [1.0] * 4)
    expect_error(wall_traction(ug), "cell types")


# --- item 10: cells without points, image blocks -----------------------------------------
def item10():
    pd = squares(2)
    pd.SetPoints(None)
    cell_scalar(pd, "p", [1.0] * 4)
    run = wall_traction(pd)
    if not run.errors:
        area = T.cell_array(run.output, "Face Area")
        assert np.all(np.isnan(area)), "faces without points must carry NaN, got %s" % area
    else:
        expect_error(run, "point")
    mb = vtkMultiBlockDataSet()
    good = squares(2)
    cell_scalar(good, "p", [1.0] * 4)
    mb.SetBlock(0, good)
    img = vtkImageData()
    img.SetDimensions(3, 3, 1)
    cell_scalar(img, "p", [1.0] * 4)
    mb.SetBlock(1, img)
    mb.GetMetaData(1).Set(vtkCompositeDataSet.NAME(), "picture")
    expect_error(wall_traction(mb), "picture", "vtkImageData")


# --- item 11: coordinates near 1e77, extreme directions ----------------------------------
def item11():
    side = 1e77
    out_run = None
    pd = squares(2, side=side, origin=(3e77, -2e77, 1e77))
    cell_scalar(pd, "p", [1.0] * 4)
    out_run = wall_traction(pd)
    assert not out_run.errors, out_run.errors
    area = T.cell_array(out_run.output, "Face Area")
    # Each face is a square of side s: area s^2 = 1e154 (finite in double).
    T.check_close("face area at 1e77", area, [side * side] * 4, rtol=1e-14,
                  source="area of a square, s^2")
    T.check_close("wetted area at 1e77", field(out_run.output, "Wetted Area"), 4 * side * side, rtol=1e-14,
                  source="four squares")
    assert not out_run.warnings, out_run.warnings
    li = load_integration(upstream=out_run.alg)
    assert not li.errors, li.errors
    T.check_close("force at 1e77", field(li.output, "Force"), [0, 0, -4 * side * side], rtol=1e-14,
                  source="uniform pressure 1: F = -p A n")
    # Directions of huge and tiny size are valid directions.
    pd = squares(1)
    cell_scalar(pd, "p", [1.0])
    run = wall_traction(pd, LoadDirection=(1e200, 1e200, 0.0))
    assert not run.errors, run.errors
    T.check_close("load direction (1e200,1e200,0)", field(run.output, "Load Direction"),
                  [math.sqrt(0.5), math.sqrt(0.5), 0], rtol=1e-15, source="unit vector along (1, 1, 0)")
    run = wall_traction(pd, LoadDirection=(1e-200, 0.0, 0.0))
    assert not run.errors, run.errors
    T.check_close("load direction (1e-200,0,0)", field(run.output, "Load Direction"), [1, 0, 0], rtol=0,
                  source="unit vector along x")
    up = traction_output()
    li = load_integration(up, DragDirection=(0.0, 1e-200, 0.0), LiftDirection=(1e-200, 0.0, 1e-200))
    assert not li.errors, li.errors
    T.check_close("drag axis from (0,1e-200,0)", field(li.output, "Drag Direction"), [0, 1, 0], rtol=0,
                  source="unit vector along y")
    T.check_close("lift axis from (1e-200,0,1e-200)", field(li.output, "Lift Direction"),
                  [math.sqrt(0.5), 0, math.sqrt(0.5)], rtol=1e-15, source="unit vector along (1, 0, 1)")
    li = load_integration(up, DragDirection=(1e200, 1e200, 0.0), LiftDirection=(0.0, 0.0, 1e300))
    assert not li.errors, li.errors
    T.check_close("drag axis from (1e200,1e200,0)", field(li.output, "Drag Direction"),
                  [math.sqrt(0.5), math.sqrt(0.5), 0], rtol=1e-15, source="unit vector along (1, 1, 0)")


# --- item 12: non-finite totals are warned --------------------------------------------------
def item12():
    up = traction_output()
    li = load_integration(up, MomentCentre=(float("nan"), 0.0, 0.0))
    assert li.errors or any("not finite" in w for w in li.warnings), \
        "NaN moment centre: no error or warning (%s)" % li.text()
    print("   NaN moment centre:", li.text()[:300])
    li = load_integration(up, ReferenceSpeed=10.0, ReferenceArea=1.0, ReferenceLength=0.0, ReferenceSpan=0.0)
    assert any("not finite" in w for w in li.warnings), "zero reference length: no warning (%s)" % li.text()
    cm = field(li.output, "Pitching Moment Coefficient")
    assert np.isnan(cm).all(), "pitching moment coefficient with zero length must be NaN, got %s" % cm
    print("   zero reference length:", li.text()[:300])
    # Finite face forces whose sum overflows.
    up = traction_output(pressure=1e308)
    li = load_integration(up)
    assert any("not finite" in w for w in li.warnings), "overflowing sum: no warning (%s)" % li.text()
    print("   overflowing sums:", li.text()[:300])
    # Wall Traction: finite face areas whose sum overflows. Squares of side
    # 0.9e154 have area 0.81e308 (finite, and so is the Newell vector 1.62e308);
    # four of them sum past the largest double (1.8e308).
    pd = squares(2, side=0.9e154)
    cell_scalar(pd, "p", [0.0] * 4)
    run = wall_traction(pd)
    area = T.cell_array(run.output, "Face Area")
    T.check_close("face area at side 0.9e154", area, [0.81e308] * 4, rtol=1e-14, source="area of a square, s^2")
    assert any("Wetted Area" in w and "not finite" in w for w in run.warnings), \
        "overflowing wetted area: no warning (%s)" % run.text()
    print("   overflowing wetted area:", run.text()[:300])
    # A clean case gives no such warning.
    li = load_integration(traction_output())
    assert not any("not finite" in w for w in li.warnings), li.warnings


# --- item 13: a failed Wall Traction leaves no totals behind -------------------------------
def item13():
    up = traction_output()  # carries Wetted Area and Wall Traction's arrays
    wt = wall_traction(up, LoadDirection=(0.0, 0.0, 0.0))
    expect_error(wt, "Load Direction")
    out = wt.output
    assert out.GetFieldData().GetArray("Wetted Area") is None, \
        "a failed Wall Traction passes on the input's Wetted Area"
    assert out.GetNumberOfCells() == 0, "a failed Wall Traction passes on its input"
    li = load_integration(upstream=wt.alg)
    assert li.errors and not li.ok, "Load Integration after a failed Wall Traction reported success: %s" % li.text()
    print("   Load Integration after the failure:", li.text()[:300])
    # The same after a shear source without its array.
    wt = wall_traction(up, ShearSource=vtkWallTraction.WALL_SHEAR_STRESS)
    expect_error(wt, "Wall Shear Stress")
    assert wt.output.GetFieldData().GetArray("Wetted Area") is None
    li = load_integration(upstream=wt.alg)
    assert li.errors and not li.ok, li.text()


# --- item 15: a string array named like the selection -----------------------------------
def item15():
    pd = squares(2)
    s = vtkStringArray()
    s.SetName("p")
    for _ in range(4):
        s.InsertNextValue("x")
    pd.GetCellData().AddArray(s)
    run = wall_traction(pd)
    expect_error(run, "'p'", "not numeric")
    assert "not found" not in " ".join(run.errors), run.errors
    out = traction_output()
    out.GetCellData().AddArray(s)
    s.SetName("zone")
    run = load_integration(out, region="zone")
    expect_error(run, "'zone'", "not numeric")


# --- vtkGhostType shorter than the cells of a structured grid --------------------------
def ghosts():
    for length in (0, 1):
        sg = vtkStructuredGrid()
        sg.SetDimensions(3, 3, 1)
        p = vtkPoints()
        for j in range(3):
            for i in range(3):
                p.InsertNextPoint(i, j, 0)
        sg.SetPoints(p)
        g = vtkUnsignedCharArray()
        g.SetName("vtkGhostType")
        g.SetNumberOfTuples(length)
        g.Fill(0)
        sg.GetCellData().AddArray(g)
        mb = vtkMultiBlockDataSet()
        mb.SetBlock(0, sg)
        mb.GetMetaData(0).Set(vtkCompositeDataSet.NAME(), "grid")
        expect_error(wall_traction(mb), "vtkGhostType", "grid")
        expect_error(load_integration(mb), "vtkGhostType", "grid")


ITEMS = {"item2": item2, "item3": item3, "item4": item4, "item4_cells": item4_cells, "item10": item10, "item11": item11,
         "item12": item12, "item13": item13, "item15": item15, "ghosts": ghosts}

if __name__ == "__main__":
    chosen = sys.argv[1:] or list(ITEMS)
    failed = []
    for name in chosen:
        print("==", name, flush=True)
        try:
            ITEMS[name]()
            print("   PASS", name, flush=True)
        except AssertionError as e:
            print("   FAIL", name, e, flush=True)
            failed.append(name)
    assert not failed, "failed: %s" % failed
    print("all passed")
