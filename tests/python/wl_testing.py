"""Shared helpers for the pvpython tests: load the plugin, feed in-memory
datasets through the proxies, and read back field data and tables.

Every check is an assertion with its tolerance and the source of the expected
value stated beside it; a test prints what it measured so that CTest logs show
the numbers."""
import math
import os
import sys

import numpy as np

from paraview import servermanager as sm
from paraview import simple

_loaded = False


def load_plugin():
    """Load the WallLoads plugin once into paraview.simple's namespace."""
    global _loaded
    if not _loaded:
        simple.LoadPlugin(os.environ["WALLLOADS_PLUGIN"], remote=False, ns=vars(simple))
        import wallloads.WallLoadsFilters  # noqa: F401  (real classes for client-side objects)
        _loaded = True
    return simple


def producer(data):
    """A source proxy holding an in-memory VTK data object."""
    src = simple.TrivialProducer()
    src.GetClientSideObject().SetOutput(data)
    src.UpdatePipeline()
    return src


def output_of(proxy, port=0):
    """The data object a proxy produced (client side, builtin session)."""
    proxy.UpdatePipeline()
    return proxy.GetClientSideObject().GetOutputDataObject(port)


def field(data, name):
    """A field-data array of `data` as a numpy vector (or scalar)."""
    arr = data.GetFieldData().GetArray(name)
    assert arr is not None, "field data has no '%s'; has %s" % (
        name, [data.GetFieldData().GetArrayName(i) for i in range(data.GetFieldData().GetNumberOfArrays())])
    values = np.array([arr.GetComponent(0, k) for k in range(arr.GetNumberOfComponents())])
    return values[0] if values.size == 1 else values


def table_rows(table):
    """Rows of a vtkTable as {region name: {column: value or vector}}."""
    names = table.GetColumnByName("Region")
    rows = {}
    for r in range(table.GetNumberOfRows()):
        row = {}
        for c in range(table.GetNumberOfColumns()):
            col = table.GetColumn(c)
            if col.GetName() == "Region":
                continue
            n = col.GetNumberOfComponents()
            vals = np.array([col.GetComponent(r, k) for k in range(n)])
            row[col.GetName()] = vals[0] if n == 1 else vals
        rows[names.GetValue(r)] = row
    return rows


def cell_array(data, name):
    from vtkmodules.util.numpy_support import vtk_to_numpy
    arr = data.GetCellData().GetArray(name)
    assert arr is not None, "no cell array '%s'" % name
    return vtk_to_numpy(arr)


def check_close(label, got, expected, rtol=0.0, atol=0.0, source=""):
    """Assert |got - expected| <= atol + rtol |expected| (elementwise) and print it."""
    got = np.asarray(got, dtype=float)
    expected = np.asarray(expected, dtype=float)
    err = np.max(np.abs(got - expected)) if got.size else 0.0
    scale = np.max(np.abs(expected)) if expected.size else 0.0
    ok = err <= atol + rtol * scale
    print("%-55s got %s expected %s |err| %.3e (tol %.1e rel, %.1e abs) %s" % (
        label, np.array2string(got, precision=10), np.array2string(expected, precision=10),
        err, rtol, atol, ("[" + source + "]") if source else ""))
    assert ok, "%s: |%s - %s| = %g exceeds tolerance" % (label, got, expected, err)


def observed_order(h, errors):
    """Least-squares slope of log(error) against log(h)."""
    return float(np.polyfit(np.log(np.asarray(h)), np.log(np.asarray(errors)), 1)[0])


def done(name):
    print("%s: all checks passed" % name)
    sys.stdout.flush()
