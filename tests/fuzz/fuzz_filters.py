"""Fuzz driver: random surfaces and volumes through the WallLoads filters.

    python3 tests/fuzz/fuzz_filters.py --seeds 0:2000        # a bounded run (CTest)
    python3 tests/fuzz/fuzz_filters.py --seeds 0:200000 --progress 5000   # a long run

Needs the wrapped filter classes on PYTHONPATH (build/python) and runs in a
plain python3 (no ParaView), so that a sanitizer build can preload its runtime.
Each seed makes one case: a random input (well formed or hostile: random cell
kinds, NaN/Inf and extreme coordinates, ids past the last point, arrays of the
wrong kind, width or length, string arrays, odd ghost arrays, empty and nested
blocks, image blocks) and random settings, through Wall Traction -> Load
Integration (and Load Distribution), or Shear Projection (-> Wall Traction
-> Load Integration), or Load Integration on input that did not come from
Wall Traction, or Load History over a random number of time steps of random
tables or field data (NaN, Inf, huge and constant values, columns that come
and go, no region column, random range, stride and statistics start). After
every filter it checks:

- no crash and no hang (a watchdog ends the run with the stack after 60 s);
- the input is unchanged (a digest of every point, cell and array);
- a failed execution carries an error message; a successful one has every
  per-face array with one tuple per cell;
- Wall Traction: the faces carrying NaN are exactly the counted skipped faces;
- Load Integration: totals finite, or a warning was given;
- Load Distribution: one row per bin, values finite or a warning, and over
  the faces' own extent the bins add up to Load Integration's area and force;
- Sequential and STDThread backends give the same output to 1e-12;
- clean cases: per-face forces and totals equal an independent numpy
  computation (fuzz_oracle.py) to 1e-9 of their scale;
- large surfaces (1 % of the seeds, beside the case drawn; --chains
  large-surface for these alone): a surface above the 32 MiB at which Wall
  Traction writes its per-face arrays with streaming stores, well formed or
  with degenerate faces, NaN values and ghost flags sprinkled: the checks
  above, output arrays 64-byte aligned, and every per-face value equal (NaN
  where NaN) to what Wall Traction gives on pieces of it small enough for
  plain stores;
- re-execution: one Wall Traction run over three steps of the same input,
  each step unchanged, handed over as new objects with the same content, or
  edited in place and marked Modified() (a face reversed, a point moved, an
  offset or a point id broken) gives what a fresh filter gives on a copy
  (its caches: the orientation check's result, the validated offsets, the
  output arrays).

A failed check prints the seed and exits 1; `--seed N` replays one case.
"""
import argparse
import faulthandler
import hashlib
import os
import sys
import time

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import fuzz_inputs as I  # noqa: E402
import fuzz_oracle as O  # noqa: E402

from vtkmodules.util.misc import calldata_type  # noqa: E402
from vtkmodules.util.numpy_support import vtk_to_numpy  # noqa: E402
from vtkmodules.util.vtkConstants import VTK_STRING  # noqa: E402
from vtkmodules.vtkCommonCore import (vtkDataArray, vtkOutputWindow, vtkSMPTools,  # noqa: E402
                                      vtkStringArray, vtkStringOutputWindow)
from vtkmodules.vtkCommonDataModel import (vtkCompositeDataSet, vtkDataObjectTree,  # noqa: E402
                                           vtkDataSet, vtkPointSet, vtkPolyData,
                                           vtkRectilinearGrid, vtkUnstructuredGrid)
from vtkmodules.vtkCommonExecutionModel import vtkTrivialProducer  # noqa: E402
from wallloads.WallLoadsFilters import (vtkLoadDistribution, vtkLoadHistory, vtkLoadIntegration,  # noqa: E402
                                        vtkShearProjection, vtkWallTraction)

RTOL_BACKENDS = 1e-12
RTOL_ORACLE = 1e-9


class CheckFailed(Exception):
    pass


def check(cond, what):
    if not cond:
        raise CheckFailed(what)


# --- digests of data objects ---------------------------------------------------------
def leaves(obj):
    """(path, dataset) for a dataset or every leaf of a composite."""
    if obj is None:
        return []
    if isinstance(obj, vtkDataSet):
        return [("", obj)]
    out = []
    if isinstance(obj, vtkDataObjectTree):
        it = obj.NewTreeIterator()
        it.VisitOnlyLeavesOn()
        it.SkipEmptyNodesOn()
        it.InitTraversal()
        while not it.IsDoneWithTraversal():
            ds = it.GetCurrentDataObject()
            if isinstance(ds, vtkDataSet):
                out.append((str(it.GetCurrentFlatIndex()), ds))
            it.GoToNextItem()
    return out


def array_bytes(a):
    if a is None:
        return b"<none>"
    if isinstance(a, vtkStringArray):
        return "\x00".join(a.GetValue(i) for i in range(a.GetNumberOfValues())).encode()
    if isinstance(a, vtkDataArray):
        return (a.GetClassName() + str(a.GetNumberOfComponents())).encode() + \
            vtk_to_numpy(a).tobytes() if a.GetNumberOfTuples() else b"<empty>"
    return a.GetClassName().encode()


def attrs_digest(h, attrs):
    for i in range(attrs.GetNumberOfArrays()):
        a = attrs.GetAbstractArray(i)
        h.update(str(a.GetName()).encode())
        h.update(array_bytes(a))


def digest(obj):
    """A digest of everything a filter must not modify."""
    h = hashlib.sha256()
    if obj is None:
        return "none"
    h.update(obj.GetClassName().encode())
    attrs_digest(h, obj.GetFieldData())
    for path, ds in leaves(obj):
        h.update(path.encode() + ds.GetClassName().encode())
        if isinstance(ds, vtkPointSet) and ds.GetPoints() is not None:
            h.update(array_bytes(ds.GetPoints().GetData()))
        if isinstance(ds, vtkPolyData):
            for ca in (ds.GetVerts(), ds.GetLines(), ds.GetPolys(), ds.GetStrips()):
                h.update(array_bytes(ca.GetOffsetsArray()) + array_bytes(ca.GetConnectivityArray()))
        elif isinstance(ds, vtkUnstructuredGrid) and ds.GetCells() is not None:
            h.update(array_bytes(ds.GetCellTypesArray()))
            h.update(array_bytes(ds.GetCells().GetOffsetsArray()))
            h.update(array_bytes(ds.GetCells().GetConnectivityArray()))
        elif isinstance(ds, vtkRectilinearGrid):
            for c in (ds.GetXCoordinates(), ds.GetYCoordinates(), ds.GetZCoordinates()):
                h.update(array_bytes(c))
        attrs_digest(h, ds.GetPointData())
        attrs_digest(h, ds.GetCellData())
        attrs_digest(h, ds.GetFieldData())
    return h.hexdigest()


def numeric_output(obj):
    """{path/association/name: float array} of every numeric array of an output."""
    out = {}
    if obj is None:
        return out
    for i in range(obj.GetFieldData().GetNumberOfArrays()):
        a = obj.GetFieldData().GetArray(i)
        if a is not None:
            out["field/" + str(a.GetName())] = vtk_to_numpy(a).astype(np.float64).ravel()
    if hasattr(obj, "GetNumberOfColumns"):  # a table
        for i in range(obj.GetNumberOfColumns()):
            a = obj.GetColumn(i)
            if isinstance(a, vtkDataArray):
                out["table/" + str(a.GetName())] = vtk_to_numpy(a).astype(np.float64).ravel()
        return out
    for path, ds in leaves(obj):
        for assoc, attrs in (("cell", ds.GetCellData()), ("point", ds.GetPointData())):
            for i in range(attrs.GetNumberOfArrays()):
                a = attrs.GetArray(i)
                if a is not None and a.GetNumberOfTuples():
                    out["%s/%s/%s" % (path, assoc, a.GetName())] = vtk_to_numpy(a).astype(np.float64).ravel()
    return out


def same_numbers(a, b):
    if a.keys() != b.keys():
        return "arrays differ: %s" % sorted(set(a) ^ set(b))
    for k in a:
        x, y = a[k], b[k]
        if x.shape != y.shape:
            return "%s: shapes %s vs %s" % (k, x.shape, y.shape)
        fin = np.isfinite(x) & np.isfinite(y)
        if not np.array_equal(np.isfinite(x), np.isfinite(y)) or \
                not np.array_equal(np.isnan(x), np.isnan(y)) or \
                not np.array_equal(x[~np.isfinite(x) & ~np.isnan(x)], y[~np.isfinite(y) & ~np.isnan(y)]):
            return "%s: non-finite values differ" % k
        if fin.any():
            scale = np.abs(x[fin]).max()
            if not np.allclose(x[fin], y[fin], rtol=RTOL_BACKENDS, atol=RTOL_BACKENDS * scale):
                return "%s: differ by %.3g (scale %.3g)" % (k, np.abs(x[fin] - y[fin]).max(), scale)
    return ""


# --- running a filter with its messages captured ------------------------------------
class Messages:
    def __init__(self):
        self.errors, self.warnings = [], []

    def observe(self, obj):
        @calldata_type(VTK_STRING)
        def on_error(_o, _e, text):
            self.errors.append(str(text))

        @calldata_type(VTK_STRING)
        def on_warning(_o, _e, text):
            self.warnings.append(str(text))
        obj.AddObserver("ErrorEvent", on_error)
        obj.AddObserver("WarningEvent", on_warning)


def execute(alg, inputs):
    """Run `alg` on `inputs` (one data object per port); (ok, output(s), messages)."""
    msgs = Messages()
    msgs.observe(alg)
    msgs.observe(alg.GetExecutive())
    producers = []
    for port, data in enumerate(inputs):
        if data is None:
            continue
        tp = vtkTrivialProducer()
        tp.SetOutput(data)
        alg.SetInputConnection(port, tp.GetOutputPort())
        producers.append(tp)
    window = vtkStringOutputWindow()  # messages no observer caught (from other objects)
    vtkOutputWindow.SetInstance(window)
    ok = alg.GetExecutive().Update() == 1
    text = window.GetOutput()
    if text:
        (msgs.errors if "ERROR" in text.upper() else msgs.warnings).append(text)
    outputs = [alg.GetOutputDataObject(p) for p in range(alg.GetNumberOfOutputPorts())]
    return ok, outputs, msgs


def run_both_backends(make_alg, inputs):
    """Execute under Sequential and STDThread; the outputs must agree."""
    results = []
    for backend in ("Sequential", "STDThread"):
        vtkSMPTools.SetBackend(backend)
        alg = make_alg()
        ok, outs, msgs = execute(alg, inputs)
        results.append((ok, outs, msgs, [numeric_output(o) for o in outs]))
    (ok1, _, _, n1), (ok2, _, _, n2) = results
    check(ok1 == ok2, "backends disagree on success: Sequential %s, STDThread %s" % (ok1, ok2))
    if ok1:
        for a, b in zip(n1, n2):
            diff = same_numbers(a, b)
            check(not diff, "Sequential vs STDThread: " + diff)
    return results[1][:3]


# --- settings ----------------------------------------------------------------------
def available(ds_or_tree):
    """{name: (on_points, components)} of numeric arrays on the first leaf that has them."""
    out = {}
    for _, ds in leaves(ds_or_tree):
        for on_points, attrs in ((1, ds.GetPointData()), (0, ds.GetCellData())):
            for i in range(attrs.GetNumberOfArrays()):
                a = attrs.GetArray(i)
                if a is not None and a.GetName() != "vtkGhostType":
                    out.setdefault(a.GetName(), (on_points, a.GetNumberOfComponents()))
    return out


def as_stored(have, name):
    """The selection of array `name` where it is stored: (association, name)
    for SetInputArrayToProcess, 0 points, 1 cells (`available` gives whether
    it is on points)."""
    return (0 if have[name][0] else 1, name)


def wall_traction_settings(rng, data, clean):
    have = available(data)
    s = {"PressureKind": int(rng.integers(0, 2)), "ReferencePressure": float(rng.normal() * 1e5),
         "Density": float(rng.uniform(0.5, 1500.0)), "ShearSource": int(rng.integers(0, 3)),
         "ShearStressKind": int(rng.integers(0, 2)), "Viscosity": float(rng.uniform(1e-5, 1.0)),
         "ViscosityKind": int(rng.integers(0, 2)), "IncludeNormalViscousStress": int(rng.integers(0, 2)),
         "Orientation": int(rng.integers(0, 2 if clean else 3)), "CheckOrientation": int(rng.integers(0, 2)),
         "LoadDirection": list(rng.normal(size=3)), "ReferenceSpeed": float(pick_speed(rng)),
         "PerFaceArrays": int(rng.integers(0, 2))}
    roles = [("Pressure", "pressure", 0.9), ("DensityArray", "density", 0.3),
             ("ShearStressArray", "wall_shear", 1.0), ("VelocityGradient", "velocity_gradient", 1.0),
             ("ViscosityArray", "viscosity", 0.3), ("TurbulentViscosityArray", "eddy_viscosity", 0.3)]
    for prop, name, p in roles:
        if clean:
            if name in have and rng.random() < p:
                s[prop] = as_stored(have, name)
        elif rng.random() < p:
            s[prop] = I.selection(rng, name, clean)
    if clean:
        need = {1: "ShearStressArray", 2: "VelocityGradient"}.get(s["ShearSource"])
        if need and need not in s:
            s["ShearSource"] = 0
    else:
        for key in ("ReferencePressure", "Density", "Viscosity", "ReferenceSpeed"):
            if rng.random() < 0.15:
                s[key] = float(I.hostile_number(rng, s[key] or 1.0))
        s["LoadDirection"] = I.hostile_vector(rng, s["LoadDirection"])
    return s


def pick_speed(rng):
    return rng.choice([0.0, 1.0, 30.0])


ARRAY_INDEX = {"Pressure": 0, "DensityArray": 1, "ShearStressArray": 2, "VelocityGradient": 3,
               "ViscosityArray": 4, "TurbulentViscosityArray": 5}


def make_wall_traction(s):
    wt = vtkWallTraction()
    for key, value in s.items():
        if key in ARRAY_INDEX:
            wt.SetInputArrayToProcess(ARRAY_INDEX[key], 0, 0, value[0] if value[0] in (0, 1) else 1, value[1])
        else:
            getattr(wt, "Set" + key)(*value) if isinstance(value, list) else getattr(wt, "Set" + key)(value)
    return wt


def load_integration_settings(rng, data, clean):
    s = {"MomentCentre": list(rng.normal(size=3)), "DragDirection": list(rng.normal(size=3)),
         "LiftDirection": list(rng.normal(size=3)), "ReferenceDensity": float(rng.uniform(0.5, 1500)),
         "ReferenceSpeed": float(pick_speed(rng)), "ReferenceArea": float(rng.uniform(0.1, 10)),
         "ReferenceLength": float(rng.uniform(0.1, 10)), "ReferenceSpan": float(rng.uniform(0.1, 10))}
    have = available(data)
    if rng.random() < 0.4:
        if clean and "zone" in have and have["zone"][0] == 0:
            s["RegionArray"] = (0, "zone")
        elif not clean:
            s["RegionArray"] = I.selection(rng, "zone", clean)
    if not clean:
        for key in ("MomentCentre", "DragDirection", "LiftDirection"):
            s[key] = I.hostile_vector(rng, s[key])
        for key in ("ReferenceDensity", "ReferenceSpeed", "ReferenceArea", "ReferenceLength", "ReferenceSpan"):
            if rng.random() < 0.1:
                s[key] = float(I.hostile_number(rng, s[key] or 1.0))
    return s


def make_load_integration(s):
    li = vtkLoadIntegration()
    for key, value in s.items():
        if key == "RegionArray":
            li.SetInputArrayToProcess(0, 0, 0, 1, value[1])
        elif isinstance(value, list):
            getattr(li, "Set" + key)(*value)
        else:
            getattr(li, "Set" + key)(value)
    return li


def load_distribution_settings(rng, clean):
    s = {"AxisOrigin": list(rng.normal(size=3)), "AxisDirection": list(rng.normal(size=3)),
         "NumberOfBins": int(rng.choice([1, 2, 7, 50, 333])), "UseCustomRange": int(rng.random() < 0.3),
         "Range": sorted(float(x) for x in rng.normal(size=2)), "MomentCentre": list(rng.normal(size=3)),
         "DragDirection": list(rng.normal(size=3)), "LiftDirection": list(rng.normal(size=3))}
    if not clean:
        for key in ("AxisOrigin", "AxisDirection", "MomentCentre", "DragDirection", "LiftDirection"):
            s[key] = I.hostile_vector(rng, s[key])
        if rng.random() < 0.2:
            s["NumberOfBins"] = int(rng.choice([0, -1, 100001, 2 ** 31 - 1]))
        if rng.random() < 0.2:
            s["Range"] = [float(I.hostile_number(rng, v)) for v in s["Range"]][::int(rng.choice([1, -1]))]
    return s


def make_load_distribution(s):
    ld = vtkLoadDistribution()
    for key, value in s.items():
        getattr(ld, "Set" + key)(*value) if isinstance(value, list) else getattr(ld, "Set" + key)(value)
    return ld


def check_load_distribution(s, outs, msgs, li_out):
    table = outs[0]
    n = table.GetNumberOfRows()
    check(n in (0, s["NumberOfBins"]), "Load Distribution: %d rows for %d bins" % (n, s["NumberOfBins"]))
    check(n > 0 or msgs.warnings, "Load Distribution: an empty table without a warning")
    cols = numeric_output(table)
    check(all(np.isfinite(v).all() for v in cols.values()) or msgs.warnings,
          "Load Distribution: non-finite values without a warning")
    if n == 0 or s["UseCustomRange"] or li_out is None:
        return
    width = cols["table/End"] - cols["table/Start"]
    forces = cols["table/Force Per Length"].reshape(-1, 3) * width[:, None]
    area, force = field_value(li_out, "Area")[0], field_value(li_out, "Force")
    if not (np.isfinite(forces).all() and np.isfinite(force).all() and np.isfinite(area)):
        return
    scale = np.abs(forces).sum() + np.abs(force).sum()
    check(abs(cols["table/Area"].sum() - area) <= RTOL_ORACLE * max(abs(area), 1e-300),
          "Load Distribution: bin areas add up to %r, Load Integration %r" % (cols["table/Area"].sum(), area))
    check(np.all(np.abs(forces.sum(axis=0) - force) <= RTOL_ORACLE * scale + 1e-300),
          "Load Distribution: bin forces add up to %s, Load Integration %s" % (forces.sum(axis=0), force))


def shear_projection_settings(rng, volume, clean):
    have = available(volume)
    s = {"Method": int(rng.integers(0, 4)), "Viscosity": float(rng.uniform(1e-5, 1.0)),
         "ViscosityKind": int(rng.integers(0, 2)), "Density": float(rng.uniform(0.5, 1500)),
         "WallLawKappa": 0.41, "WallLawB": 5.0}
    for idx, name, p in ((0, "velocity", 1.0), (1, "wall_velocity", 0.2), (2, "velocity_gradient", 0.2),
                         (3, "viscosity", 0.2), (4, "eddy_viscosity", 0.2), (5, "density", 0.2)):
        if rng.random() < p:
            if clean and name in have:
                s["array%d" % idx] = as_stored(have, name)
            elif not clean:
                s["array%d" % idx] = I.selection(rng, name, clean)
    if not clean:
        for key in ("Viscosity", "Density", "WallLawKappa", "WallLawB"):
            if rng.random() < 0.1:
                s[key] = float(I.hostile_number(rng, s[key]))
    return s


def make_shear_projection(s):
    sp = vtkShearProjection()
    for key, value in s.items():
        if key.startswith("array"):
            idx = int(key[5:])
            sp.SetInputArrayToProcess(idx, 1 if idx == 1 else 0, 0, value[0], value[1])
        else:
            getattr(sp, "Set" + key)(value)
    return sp


# --- checks after each filter -------------------------------------------------------
def check_failure_reported(name, ok, msgs):
    if not ok:
        check(msgs.errors, "%s failed without an error message" % name)


def check_lengths(name, out):
    for path, ds in leaves(out):
        for attrs, n in ((ds.GetCellData(), ds.GetNumberOfCells()), (ds.GetPointData(), ds.GetNumberOfPoints())):
            for i in range(attrs.GetNumberOfArrays()):
                a = attrs.GetAbstractArray(i)
                if a.GetName() in ("vtkGhostType",):
                    continue
                # arrays the filter made must fit; inputs' own arrays pass through as they were
                if a.GetName() in MADE_ARRAYS:
                    check(a.GetNumberOfTuples() == n, "%s: '%s' on leaf %s has %d tuples for %d elements" % (
                        name, a.GetName(), path, a.GetNumberOfTuples(), n))


MADE_ARRAYS = {"Wall Normal", "Face Area", "Pressure Traction", "Viscous Traction", "Traction",
               "Pressure Force", "Viscous Force", "Force", "Normal Viscous Stress", "Pressure Coefficient",
               "Skin Friction Coefficient", "Directional Traction", "Wall Shear Stress", "Wall Distance",
               "Friction Velocity", "y+", "Near-Wall Regime"}


def field_value(obj, name):
    a = obj.GetFieldData().GetArray(name)
    return None if a is None else vtk_to_numpy(a).astype(np.float64)


def check_wall_traction(out, msgs):
    check_lengths("Wall Traction", out)
    skipped = sum(float(field_value(out, k)[0]) for k in
                  ("Skipped Non-Surface Cells", "Skipped Degenerate Faces", "Skipped Non-Finite Faces")
                  if field_value(out, k) is not None)
    nan_faces = 0
    for _, ds in leaves(out):
        area = ds.GetCellData().GetArray("Face Area")
        if area is None:
            continue
        a = vtk_to_numpy(area)
        g = ds.GetCellData().GetArray("vtkGhostType")
        counted = np.ones(len(a), bool) if g is None else (vtk_to_numpy(g) & 33) == 0
        nan_faces += int(np.count_nonzero(np.isnan(a) & counted))
    check(nan_faces == skipped, "Wall Traction: %d counted faces carry NaN but %d are counted skipped"
          % (nan_faces, skipped))
    wetted = field_value(out, "Wetted Area")
    check(wetted is not None, "Wall Traction output has no 'Wetted Area'")
    check(np.isfinite(wetted).all() or msgs.warnings, "Wetted Area %s without a warning" % wetted)


TOTAL_NAMES = ("Area", "Pressure Force", "Viscous Force", "Force", "Moment")


def check_load_integration(outs, msgs):
    out, table, summary = outs  # port 2: the Load Summary (same rows as the table)
    check(summary.GetNumberOfRows() == table.GetNumberOfRows(),
          "Load Summary has %d rows, Load Table %d" % (summary.GetNumberOfRows(), table.GetNumberOfRows()))
    for name in TOTAL_NAMES:
        v = field_value(out, name)
        check(v is not None, "Load Integration: no field '%s'" % name)
        check(np.isfinite(v).all() or msgs.warnings, "Load Integration: '%s' = %s without a warning" % (name, v))
    regions = table.GetColumnByName("Region")
    check(regions is not None and regions.GetNumberOfValues() >= 1
          and regions.GetValue(regions.GetNumberOfValues() - 1) == "Total", "table has no Total row")


def check_against_oracle(data, ws, ls, wt_out, li_out):
    """Clean case: per-face forces and totals against fuzz_oracle."""
    rows_all = []
    for (path, ds_in), (_, ds_out) in zip(leaves(data), leaves(wt_out)):
        if ds_in.GetNumberOfCells() == 0:
            continue
        rows = O.wall_traction(ds_in, ws)
        rows_all += rows
        area = vtk_to_numpy(ds_out.GetCellData().GetArray("Face Area"))
        fp = vtk_to_numpy(ds_out.GetCellData().GetArray("Pressure Force"))
        fv = vtk_to_numpy(ds_out.GetCellData().GetArray("Viscous Force"))
        ref_a = np.array([r[0] for r in rows])
        ref_p = np.array([r[1] for r in rows])
        ref_v = np.array([r[2] for r in rows])
        for label, got, ref in (("Face Area", area, ref_a), ("Pressure Force", fp, ref_p),
                                ("Viscous Force", fv, ref_v)):
            scale = np.abs(ref).max() if ref.size else 0.0
            check(np.allclose(got, ref, rtol=RTOL_ORACLE, atol=RTOL_ORACLE * scale + 1e-300),
                  "oracle: %s on leaf %s off by %.3g (scale %.3g)" % (label, path, np.abs(got - ref).max(), scale))
    r0 = np.array(ls["MomentCentre"])
    area, force, moment, scale, mscale = O.totals(rows_all, r0)
    got_area = field_value(li_out, "Area")[0]
    got_force = field_value(li_out, "Force")
    got_moment = field_value(li_out, "Moment")
    check(abs(got_area - area) <= RTOL_ORACLE * max(area, 1e-300), "oracle: Area %r vs %r" % (got_area, area))
    check(np.all(np.abs(got_force - force) <= RTOL_ORACLE * scale + 1e-300),
          "oracle: Force %s vs %s (scale %.3g)" % (got_force, force, scale))
    check(np.all(np.abs(got_moment - moment) <= RTOL_ORACLE * mscale + 1e-300),
          "oracle: Moment %s vs %s (scale %.3g)" % (got_moment, moment, mscale))


# --- one case ------------------------------------------------------------------------
def surface_input(rng, clean):
    if rng.random() < 0.5:
        return I.random_surface(rng, clean)
    return I.random_composite(rng, lambda: I.random_surface(rng, clean), clean)


def volume_input(rng, clean):
    if rng.random() < 0.6:
        return I.random_volume(rng, clean)
    return I.random_composite(rng, lambda: I.random_volume(rng, clean), clean)


def checked_wall_traction(ws, data, before, stats, tally):
    """Wall Traction with settings `ws` on both backends, with the checks
    after it (input unchanged against the digest `before`, a failure
    reported, the output's own checks); its output, or None if it failed.
    Counts tally_ok or tally_fail."""
    ok, outs, msgs = run_both_backends(lambda: make_wall_traction(ws), [data])
    check(digest(data) == before, "Wall Traction modified its input")
    check_failure_reported("Wall Traction", ok, msgs)
    stats[tally + ("_ok" if ok else "_fail")] += 1
    if not ok:
        return None
    check_wall_traction(outs[0], msgs)
    return outs[0]


def run_surface_chain(rng, clean, stats):
    data = surface_input(rng, clean)
    before = digest(data)
    ws = wall_traction_settings(rng, data, clean)
    wt_out = checked_wall_traction(ws, data, before, stats, "wt")
    if wt_out is None:
        return
    ls = load_integration_settings(rng, data, clean)
    before_li = digest(wt_out)
    ok2, outs2, msgs2 = run_both_backends(lambda: make_load_integration(ls), [wt_out])
    check(digest(wt_out) == before_li, "Load Integration modified its input")
    check_failure_reported("Load Integration", ok2, msgs2)
    stats["li_ok" if ok2 else "li_fail"] += 1
    if ok2:
        check_load_integration(outs2, msgs2)
        if clean and "RegionArray" not in ls:
            check_against_oracle(data, ws, ls, wt_out, outs2[0])
            stats["oracle"] += 1
    # Load Distribution on the same Wall Traction output, its settings drawn
    # from a child of the case's random stream (the other draws, and so the
    # cases of every seed, stay as they were).
    seq = getattr(rng.bit_generator, "seed_seq", None) or rng.bit_generator._seed_seq  # numpy < 1.25
    rng_ld = np.random.default_rng(seq.spawn(1)[0])
    ds = load_distribution_settings(rng_ld, clean)
    ok3, outs3, msgs3 = run_both_backends(lambda: make_load_distribution(ds), [wt_out])
    check(digest(wt_out) == before_li, "Load Distribution modified its input")
    check_failure_reported("Load Distribution", ok3, msgs3)
    stats["ld_ok" if ok3 else "ld_fail"] += 1
    if ok3:
        check_load_distribution(ds, outs3, msgs3, outs2[0] if ok2 else None)
    # Re-executions of one Wall Traction (a second child stream).
    run_reexecutions(np.random.default_rng(seq.spawn(1)[0]), "Wall Traction",
                     lambda: make_wall_traction(ws), data, stats)
    # Re-executions of one Load Integration summing the faces of a copy of
    # Wall Traction's output itself (new objects: nothing handed over), from a
    # third child stream.
    if ok2:
        run_reexecutions(np.random.default_rng(seq.spawn(1)[0]), "Load Integration",
                         lambda: make_load_integration(ls), wt_out, stats)


def piece_of(ds, begin, end):
    """Cells [begin, end) of a polydata or unstructured grid as a dataset of
    their own: the same points object, the cells' ids and cell arrays copied."""
    cells = ds.GetPolys() if isinstance(ds, vtkPolyData) else ds.GetCells()
    offsets = vtk_to_numpy(cells.GetOffsetsArray()).astype(np.int64)
    conn = vtk_to_numpy(cells.GetConnectivityArray()).astype(np.int64)
    wide = cells.IsStorage64Bit()
    part = I.cell_array_from(offsets[begin:end + 1] - offsets[begin], conn[offsets[begin]:offsets[end]], wide)
    piece = ds.NewInstance()
    piece.SetPoints(ds.GetPoints())
    if isinstance(ds, vtkPolyData):
        piece.SetPolys(part)
    else:
        piece.SetCells(I.cell_types_of(vtk_to_numpy(ds.GetCellTypesArray())[begin:end]), part)
    for k in range(ds.GetCellData().GetNumberOfArrays()):
        a = ds.GetCellData().GetArray(k)
        values = vtk_to_numpy(a).reshape(ds.GetNumberOfCells(), -1)[begin:end]
        b = a.NewInstance()
        b.SetName(a.GetName())
        b.SetNumberOfComponents(a.GetNumberOfComponents())
        b.SetNumberOfTuples(end - begin)
        vtk_to_numpy(b).reshape(end - begin, -1)[:] = values
        piece.GetCellData().AddArray(b)
    return piece


def run_large_surface(rng, clean, stats):
    """A surface above the streaming threshold (fuzz_inputs.large_surface),
    where Wall Traction writes its per-face arrays with streaming stores:
    the checks of any surface (input unchanged, both backends agree, NaN
    faces are the counted skipped ones), output arrays 64-byte aligned (else
    the loop would not stream), and every per-face value equal (NaN where
    NaN) to what Wall Traction gives on pieces of the same surface small enough
    to be written with plain stores (cut at random faces)."""
    data, forces_only = I.large_surface(rng, clean)
    before = digest(data)
    ws = wall_traction_settings(rng, data, True)  # the arrays it has, as stored
    ws["PerFaceArrays"] = int(forces_only)  # vtkWallTraction.FORCES_ONLY is 1
    if not clean:
        for key in ("ReferencePressure", "Density", "Viscosity"):
            if rng.random() < 0.15:
                ws[key] = float(I.hostile_number(rng, ws[key] or 1.0))
    out = checked_wall_traction(ws, data, before, stats, "large")
    if out is None:
        return
    made = [out.GetCellData().GetArray(name) for name in sorted(MADE_ARRAYS)]
    made = [a for a in made if a is not None]
    total = sum(a.GetNumberOfValues() * a.GetDataTypeSize() for a in made)
    check(total >= I.STREAM_BYTES, "large surface: %d bytes of per-face arrays, below the streaming threshold"
          % total)
    for a in made:
        address = vtk_to_numpy(a).__array_interface__["data"][0]
        check(address % 64 == 0, "large surface: '%s' is not 64-byte aligned (no streaming)" % a.GetName())
    n = data.GetNumberOfCells()
    cuts = np.unique(np.r_[0, rng.integers(1, n, size=n // 90000 + 2), n])
    cuts = np.unique(np.r_[cuts, np.arange(0, n, 150000), n])  # every piece below the threshold
    vtkSMPTools.SetBackend(str(rng.choice(["Sequential", "STDThread"])))
    piece_settings = dict(ws, CheckOrientation=0)
    for begin, end in zip(cuts[:-1], cuts[1:]):
        ok_p, outs_p, _ = execute(make_wall_traction(piece_settings), [piece_of(data, int(begin), int(end))])
        check(ok_p, "large surface: Wall Traction failed on faces %d-%d alone" % (begin, end))
        for a in made:
            whole = vtk_to_numpy(a).reshape(n, -1)[begin:end]
            alone = outs_p[0].GetCellData().GetArray(a.GetName())
            check(alone is not None, "large surface: no '%s' on a piece" % a.GetName())
            alone = vtk_to_numpy(alone).reshape(end - begin, -1)
            bad = np.flatnonzero(~((whole == alone) | (np.isnan(whole) & np.isnan(alone))).all(axis=1))
            check(len(bad) == 0, "large surface: '%s' of face %d differs from the same face in faces %d-%d"
                  " alone: %s vs %s" % (a.GetName(), begin + bad[0] if len(bad) else -1, begin, end,
                                        whole[bad[:1]], alone[bad[:1]]))
    stats["large pieces"] += len(cuts) - 1


def deep_copy(data):
    c = data.NewInstance()
    c.DeepCopy(data)
    return c


def mutate_mesh(rng, data):
    """Edit one leaf of `data` in place, as a script or a solver coupling
    might between two steps, and mark what changed Modified(). Returns what
    was done (for the failure message)."""
    meshes = [ds for _, ds in leaves(data) if isinstance(ds, (vtkPolyData, vtkUnstructuredGrid))
              and ds.GetNumberOfCells() > 0]
    if not meshes:
        return "nothing (no explicit mesh)"
    ds = meshes[int(rng.integers(0, len(meshes)))]
    cells = ds.GetPolys() if isinstance(ds, vtkPolyData) else ds.GetCells()
    conn = cells.GetConnectivityArray() if cells is not None else None
    offsets = cells.GetOffsetsArray() if cells is not None else None
    kind = str(rng.choice(["reverse", "move", "offsets", "ids", "none"]))
    if kind in ("reverse", "offsets", "ids") and (conn is None or conn.GetNumberOfValues() < 3
                                                  or offsets.GetNumberOfValues() < 3):
        kind = "move"
    if kind == "move" and ds.GetNumberOfPoints() == 0:
        kind = "none"
    if kind == "reverse":
        o = vtk_to_numpy(offsets)
        c = int(rng.integers(0, len(o) - 1))
        ids = vtk_to_numpy(conn)
        ids[o[c]:o[c + 1]] = ids[o[c]:o[c + 1]][::-1].copy()
        edited = conn
    elif kind == "move":
        pts = ds.GetPoints().GetData()
        k = int(rng.integers(0, ds.GetNumberOfPoints()))
        for j in range(pts.GetNumberOfComponents()):
            pts.SetComponent(k, j, pts.GetComponent(k, j) * 1.5 + 0.25)
        edited = pts
    elif kind == "offsets":
        o = vtk_to_numpy(offsets)
        k = int(rng.integers(1, len(o) - 1))
        o[k] = o[k - 1] - 1 if rng.random() < 0.5 else o[-1] + 5  # decreasing, or past the end
        edited = offsets
    elif kind == "ids":
        ids = vtk_to_numpy(conn)
        ids[int(rng.integers(0, len(ids)))] = ds.GetNumberOfPoints() + int(rng.integers(0, 3))
        edited = conn
    else:
        edited = None
    # Which objects are marked Modified(): any one of the edited array, its
    # cell array and the dataset must make the caches look again. (An edited
    # point id must mark its array: VTK's cached range of the ids, which the
    # point-id check reads, follows that array only.)
    marks = {"array": edited, "cells": cells, "dataset": ds}
    chosen = [name for name in marks if marks[name] is not None and rng.random() < 0.5]
    if kind == "ids" and "array" not in chosen:
        chosen.append("array")
    if not chosen:
        chosen = ["dataset"]
    for name in chosen:
        marks[name].Modified()
    return "%s, marked %s" % (kind, "+".join(chosen))


def run_reexecutions(rng, name, make_alg, data, stats):
    """One filter (made by `make_alg`) re-executed over a few steps of `data`
    (its caches: the orientation check's result, the validated cell offsets,
    the output arrays): unchanged, new objects with the same content, and a
    mesh edited in place. Every step must give, on every output, what a fresh
    filter gives on a copy of the same input."""
    alg = make_alg()
    current = deep_copy(data)
    for step in range(3):
        what = str(rng.choice(["again", "new objects", "edit"])) if step > 0 else "first"
        if what == "new objects":
            current = deep_copy(current)
        elif what == "edit":
            what = "edit (%s)" % mutate_mesh(rng, current)
        ok, outs, msgs = execute(alg, [current])
        fresh_ok, fresh_outs, _ = execute(make_alg(), [deep_copy(current)])
        check(ok == fresh_ok, "re-executed %s at step %d (%s): success %s, a fresh one %s"
              % (name, step, what, ok, fresh_ok))
        if ok:
            for port, (a, b) in enumerate(zip(outs, fresh_outs)):
                diff = same_numbers(numeric_output(a), numeric_output(b))
                check(not diff, "re-executed %s at step %d (%s), output %d, differs from a fresh one: %s"
                      % (name, step, what, port, diff))
        stats["%s reuse %s" % (name, "ok" if ok else "fail")] += 1


def run_raw_integration(rng, clean, stats):
    data = surface_input(rng, False)
    before = digest(data)
    ls = load_integration_settings(rng, data, False)
    ok, outs, msgs = run_both_backends(lambda: make_load_integration(ls), [data])
    check(digest(data) == before, "Load Integration modified its input")
    check_failure_reported("Load Integration", ok, msgs)
    stats["li_raw_ok" if ok else "li_raw_fail"] += 1
    if ok:
        check_load_integration(outs, msgs)


def run_volume_chain(rng, clean, stats):
    volume = volume_input(rng, clean)
    walls = None
    if rng.random() < 0.4:
        walls = surface_input(rng, clean)
    before = (digest(volume), digest(walls))
    ss = shear_projection_settings(rng, volume, clean)
    ok, outs, msgs = run_both_backends(lambda: make_shear_projection(ss), [volume, walls])
    check((digest(volume), digest(walls)) == before, "Shear Projection modified its inputs")
    check_failure_reported("Shear Projection", ok, msgs)
    stats["sp_ok" if ok else "sp_fail"] += 1
    if not ok:
        return
    check_lengths("Shear Projection", outs[0])
    for _, ds in leaves(outs[0]):
        wss = ds.GetCellData().GetArray("Wall Shear Stress")
        if wss is not None and np.isnan(vtk_to_numpy(wss)).any():
            check(msgs.warnings, "Shear Projection: NaN wall shear stress without a warning")


def random_step(seed, value_seed, as_table):
    """One step's input for Load History: a table (rows of regions) or a
    polydata with field data, numeric columns of 1, 2 or 3 components holding
    ordinary, constant, NaN, Inf or huge values. The layout comes from
    `seed`, the values from `value_seed`."""
    from vtkmodules.util.numpy_support import numpy_to_vtk
    from vtkmodules.vtkCommonDataModel import vtkTable
    rng = np.random.default_rng(seed)
    rng_v = np.random.default_rng(value_seed)
    out = vtkTable() if as_table else vtkPolyData()
    rows = int(rng.integers(0, 4)) if as_table else 1
    if as_table and rng.random() < 0.7:
        names = vtkStringArray()
        names.SetName("Region" if rng.random() < 0.8 else "Boundary")
        for r in range(rows):
            names.InsertNextValue(["Total", "Wing", "Wing", ""][int(rng.integers(0, 4))])
        out.AddColumn(names)
    for k in range(int(rng.integers(0, 5))):
        comps = int(rng.choice([1, 1, 3, 2]))
        kind = rng.random()
        values = rng_v.normal(0.0, 1.0, (rows if as_table else int(rng.integers(1, 3)), comps))
        if kind < 0.1:
            values[:] = np.nan
        elif kind < 0.2:
            values[:] = np.inf
        elif kind < 0.3:
            values *= 1e300
        elif kind < 0.4:
            values[:] = 2.5
        a = numpy_to_vtk(values, deep=1)
        a.SetName(["Drag", "Force", "Area", "Region Id", "Lift Coefficient"][k])
        (out.AddColumn if as_table else out.GetFieldData().AddArray)(a)
    if as_table and out.GetNumberOfColumns() > 1 and rng.random() < 0.1:
        out.GetColumn(out.GetNumberOfColumns() - 1).SetNumberOfTuples(max(0, rows - 1))  # malformed
    return out


def run_history(rng, clean, stats):
    from vtkmodules.util.vtkAlgorithm import VTKPythonAlgorithmBase
    from vtkmodules.vtkCommonExecutionModel import vtkStreamingDemandDrivenPipeline as SDDP
    as_table = rng.random() < 0.7
    n = int(rng.integers(1, 30))
    times = None if rng.random() < 0.1 else np.sort(rng.uniform(-1.0, 5.0, n))
    if times is not None and rng.random() < 0.3:
        times = np.arange(n) * 0.1
    seeds = rng.integers(0, 2**31, n)
    vary = rng.random() < 0.3  # the columns may change from step to step

    class Series(VTKPythonAlgorithmBase):
        def __init__(self):
            VTKPythonAlgorithmBase.__init__(self, nInputPorts=0, nOutputPorts=1,
                                            outputType="vtkTable" if as_table else "vtkPolyData")

        def RequestInformation(self, request, inInfo, outInfo):
            if times is not None:
                info = outInfo.GetInformationObject(0)
                info.Set(SDDP.TIME_STEPS(), list(times), len(times))
                info.Set(SDDP.TIME_RANGE(), [times[0], times[-1]], 2)
            return 1

        def RequestData(self, request, inInfo, outInfo):
            info = outInfo.GetInformationObject(0)
            k = 0
            if times is not None and info.Has(SDDP.UPDATE_TIME_STEP()):
                k = int(np.argmin(np.abs(times - info.Get(SDDP.UPDATE_TIME_STEP()))))
            out = self.GetOutputData(outInfo, 0)
            out.ShallowCopy(random_step(int(seeds[k] if vary else seeds[0]), int(seeds[k]), as_table))
            return 1

    settings = {"custom_range": rng.random() < 0.3, "range": sorted(rng.uniform(-1.0, 5.0, 2)),
                "stride": int(rng.integers(1, 5)), "custom_start": rng.random() < 0.3,
                "start": float(rng.uniform(-1.0, 5.0)), "length": float(rng.choice([0.0, 1.0, -1.0])),
                "speed": float(rng.choice([0.0, 2.0]))}
    keep = []

    def make():
        src = Series()
        lh = vtkLoadHistory()
        lh.SetInputConnection(src.GetOutputPort())
        lh.SetUseCustomTimeRange(settings["custom_range"])
        lh.SetTimeRange(*settings["range"])
        lh.SetStride(settings["stride"])
        lh.SetUseCustomStatisticsStart(settings["custom_start"])
        lh.SetStatisticsStart(settings["start"])
        lh.SetReferenceLength(settings["length"])
        lh.SetReferenceSpeed(settings["speed"])
        keep.append(src)
        return lh

    ok, outs, msgs = run_both_backends(make, [])
    check_failure_reported("Load History", ok, msgs)
    stats["lh_ok" if ok else "lh_fail"] += 1
    visited = 1
    if times is not None:
        sel = times if not settings["custom_range"] else \
            times[(times >= settings["range"][0]) & (times <= settings["range"][1])]
        visited = len(sel[::settings["stride"]])
        check(ok or visited == 0 or msgs.errors, "Load History failed without a reason")
        if visited == 0:
            check(not ok, "Load History: a time range with no step did not fail")
            return
    if not ok:
        return
    history, table = outs
    check(history.GetNumberOfRows() == visited,
          "Load History: %d history rows for %d visited steps" % (history.GetNumberOfRows(), visited))
    check(history.GetNumberOfColumns() >= 1 and history.GetColumnName(0) == "Time",
          "Load History: the history does not start with Time")
    check(table.GetNumberOfRows() == history.GetNumberOfColumns() - 1,
          "Load History: %d statistics rows for %d quantities" % (table.GetNumberOfRows(),
                                                                   history.GetNumberOfColumns() - 1))
    for r in range(table.GetNumberOfRows()):
        value = {table.GetColumnName(c): table.GetValue(r, c).ToDouble() for c in range(1, table.GetNumberOfColumns())}
        check(value["Samples"] <= history.GetNumberOfRows(), "Load History: more samples than steps")
        if all(np.isfinite([value["Minimum"], value["Mean"], value["Maximum"]])):
            big = max(abs(value["Minimum"]), abs(value["Maximum"]))
            check(value["Minimum"] - 1e-12 * big <= value["Mean"] <= value["Maximum"] + 1e-12 * big,
                  "Load History: mean outside [min, max]")
        check(not value["Standard Error Of Mean"] < 0, "Load History: negative standard error")
        check(not value["Dominant Frequency"] <= 0, "Load History: non-positive frequency")


CHAINS = {"surface": run_surface_chain, "raw-integration": run_raw_integration, "volume": run_volume_chain,
          "history": run_history, "large-surface": run_large_surface}
WEIGHTS = {"surface": 0.6, "raw-integration": 0.1, "volume": 0.3}
# Load History runs beside the chain drawn for a seed (in 10 % of the seeds,
# from a random stream of its own), so the cases the other chains draw for a
# seed stay those they drew before it was added.
HISTORY_SHARE = 0.1
# A surface above the streaming threshold (run_large_surface) runs beside the
# chain drawn for a seed in 1 % of the seeds, from a stream of its own, for the
# same reason; it takes a second or so.
LARGE_SHARE = 0.01


def run_case(seed, chains, stats):
    rng = np.random.default_rng(seed)
    clean = rng.random() < 0.3
    names = [n for n in chains if n in WEIGHTS]
    if names:
        p = np.array([WEIGHTS[n] for n in names])
        chain = names[int(rng.choice(len(names), p=p / p.sum()))]
        stats["clean" if clean else "hostile"] += 1
        CHAINS[chain](rng, clean, stats)
    large_rng = np.random.default_rng([seed, 11])
    if "large-surface" in chains and (large_rng.random() < LARGE_SHARE or names == []):
        run_large_surface(large_rng, large_rng.random() < 0.3, stats)
    history_rng = np.random.default_rng([seed, 10])
    if "history" in chains and (history_rng.random() < HISTORY_SHARE or names == []):
        run_history(history_rng, clean, stats)


def run_isolated(args, seeds):
    """Run the seeds in child processes, so that a crash (or a sanitizer abort)
    names its seed and the run goes on: each child records the seed it starts
    in a trace file; after a crash the next child starts at the seed after it."""
    import subprocess
    import tempfile
    trace = tempfile.NamedTemporaryFile(prefix="wallloads-fuzz-", suffix=".seed", delete=False).name
    base = [sys.executable, os.path.abspath(__file__), "--chains", args.chains, "--keep-going",
            "--hang-seconds", str(args.hang_seconds), "--trace", trace]
    crashes, failed_checks, start, done = [], 0, time.time(), seeds.start
    next_report = seeds.start + (args.progress or 0)
    while done < seeds.stop:
        with open(trace, "w"):
            pass
        # Children run at most --progress seeds each, so that a long run
        # reports its progress and failures as it goes.
        stop = min(seeds.stop, done + args.progress) if args.progress else seeds.stop
        r = subprocess.run(base + ["--seeds", "%d:%d" % (done, stop)], capture_output=True, text=True)
        lines = [line for line in r.stdout.splitlines() if line.startswith("FUZZ FAILURE")]
        failed_checks += len(lines)
        for line in lines:
            print(line, flush=True)
        if r.returncode in (0, 1) and "fuzz:" in r.stdout:
            done = stop
        else:
            with open(trace) as fh:
                text = fh.read().strip()
            seed = int(text) if text else done
            tail = r.stderr.strip().splitlines() or ["(no output)"]
            why = next((t for t in tail if "ERROR: AddressSanitizer" in t or "runtime error" in t
                        or "Fatal Python error" in t), tail[-1])
            crashes.append(seed)
            print("FUZZ CRASH at seed %d (exit %d): %s" % (seed, r.returncode, why.strip()), flush=True)
            print("replay: python3 %s --seed %d" % (sys.argv[0], seed), flush=True)
            done = seed + 1
        if args.progress and done >= next_report:
            print("%d cases, %.0f s, %d crashes, %d failed checks" % (done - seeds.start, time.time() - start,
                                                                       len(crashes), failed_checks), flush=True)
            next_report = done + args.progress
    os.unlink(trace)
    print("fuzz (isolated): %d cases in %.1f s, %d crashes, %d failed checks" % (
        len(seeds), time.time() - start, len(crashes), failed_checks))
    return 1 if crashes or failed_checks else 0


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--seeds", default="0:500", help="range A:B of seeds (B excluded)")
    ap.add_argument("--seed", type=int, help="replay one seed, verbosely")
    ap.add_argument("--chains", default=",".join(CHAINS), help="comma-separated: " + ", ".join(CHAINS))
    ap.add_argument("--progress", type=int, default=0, help="print a line every N cases")
    ap.add_argument("--keep-going", action="store_true", help="report every failing seed, not only the first")
    ap.add_argument("--isolate", action="store_true",
                    help="run in child processes: a crash names its seed and the run goes on")
    ap.add_argument("--trace", help=argparse.SUPPRESS)  # file holding the seed being run
    ap.add_argument("--hang-seconds", type=float, default=60.0, help="watchdog per case")
    args = ap.parse_args()
    faulthandler.enable()
    chains = [c for c in args.chains.split(",") if c]
    if args.seed is not None:
        seeds = range(args.seed, args.seed + 1)
    else:
        a, b = (int(x) for x in args.seeds.split(":"))
        seeds = range(a, b)
    if args.isolate:
        return run_isolated(args, seeds)
    from collections import Counter
    stats = Counter()
    failures = []
    start = time.time()
    for k, seed in enumerate(seeds):
        faulthandler.dump_traceback_later(args.hang_seconds, exit=True)
        if args.seed is not None:
            print("case %d" % seed, flush=True)
        if args.trace:
            with open(args.trace, "w") as fh:
                fh.write("%d\n" % seed)
        try:
            run_case(seed, chains, stats)
        except CheckFailed as exc:
            faulthandler.cancel_dump_traceback_later()
            failures.append((seed, str(exc)))
            print("FUZZ FAILURE at seed %d: %s" % (seed, exc), flush=True)
            print("replay: python3 %s --seed %d --chains %s" % (sys.argv[0], seed, args.chains), flush=True)
            if not args.keep_going:
                return 1
        if args.progress and (k + 1) % args.progress == 0:
            print("%d cases, %.0f s, %s" % (k + 1, time.time() - start, dict(stats)), flush=True)
    faulthandler.cancel_dump_traceback_later()
    print("fuzz: %d cases in %.1f s, %d failures; %s" % (len(seeds), time.time() - start, len(failures),
                                                       dict(sorted(stats.items()))))
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
