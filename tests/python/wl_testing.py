"""Shared helpers for the pvpython tests: load the plugin, feed in-memory
datasets through the proxies, and read back field data and tables.

Every check is an assertion with its tolerance and the source of the expected
value stated beside it; a test prints what it measured so that CTest logs show
the numbers."""
import os
import sys

import numpy as np

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


def _abort_all(kind, value, tb):
    # An exception on one rank must end every rank (the others would wait in
    # a collective forever): print it and leave with a failure code.
    import traceback
    traceback.print_exception(kind, value, tb)
    sys.stdout.flush()
    sys.stderr.flush()
    os._exit(1)


def mpi_start():
    """For tests run by `mpirun pvbatch --symmetric`: an exception on any rank
    ends every rank, the plugin is loaded, and the rank count is the one CTest
    asked for (WALLLOADS_RANKS). Returns (simple, controller, rank, ranks)."""
    from vtkmodules.vtkParallelCore import vtkMultiProcessController
    sys.excepthook = _abort_all
    load_plugin()
    controller = vtkMultiProcessController.GetGlobalController()
    rank, ranks = controller.GetLocalProcessId(), controller.GetNumberOfProcesses()
    expected = int(os.environ.get("WALLLOADS_RANKS", ranks))
    assert ranks == expected, "running on %d ranks, expected %d" % (ranks, expected)
    return simple, controller, rank, ranks


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
    """Rows of a vtkTable as {region name: {column: value or numpy vector}}."""
    from wallloads.batch import table_rows as rows_of
    return {region: {name: (np.array(v) if isinstance(v, tuple) else v) for name, v in row.items()}
            for region, row in rows_of(table).items()}


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


def expect(label, condition, detail=""):
    """Assert a condition, printing the label and the outcome."""
    print("%-70s %s %s" % (label, "ok" if condition else "FAILED", detail))
    assert condition, "%s: %s" % (label, detail)


def contains_all(label, message, parts):
    """Assert that a message holds every one of `parts`."""
    missing = [p for p in parts if p not in message]
    text = message.strip().splitlines()[-1] if message else message
    print("%-70s message: %r" % (label, text))
    assert not missing, "%s: message lacks %s" % (label, missing)


def close_worst(label, got, expected, rtol=0.0, atol=0.0, source=""):
    """|got - expected| <= atol + rtol max|expected| elementwise (expected
    broadcast to got), every value finite; prints the worst error only."""
    got = np.asarray(got, dtype=float)
    expected = np.broadcast_to(np.asarray(expected, dtype=float), got.shape)
    err = float(np.max(np.abs(got - expected))) if got.size else 0.0
    scale = float(np.max(np.abs(expected))) if got.size else 0.0
    tol = atol + rtol * scale
    ok = got.size > 0 and err <= tol and bool(np.all(np.isfinite(got)))
    print("%-74s |err| %.3e = %.2e rel (tol %.1e abs) %s %s" % (label, err, err / scale if scale else err, tol,
                                                            "ok" if ok else "FAILED",
                                                            ("[" + source + "]") if source else ""))
    assert ok, "%s: max error %g exceeds %g (or no values / non-finite)" % (label, err, tol)


def close_arrays(label, got, expected, rtol=0.0, atol=0.0, source=""):
    """check_close for small vectors; for per-face arrays (same shape) the
    worst error only."""
    got = np.asarray(got, dtype=float)
    expected = np.asarray(expected, dtype=float)
    if got.size <= 6:
        check_close(label, got, expected, rtol=rtol, atol=atol, source=source)
        return
    assert got.shape == expected.shape, "%s: shape %s != %s" % (label, got.shape, expected.shape)
    err = np.max(np.abs(got - expected))
    scale = np.max(np.abs(expected))
    print("%-55s %s: max |err| %.3e, max |expected| %.3e (tol %.1e rel, %.1e abs) %s" % (
        label, "x".join(map(str, got.shape)), err, scale, rtol, atol, ("[" + source + "]") if source else ""))
    assert err <= atol + rtol * scale, "%s: |err| = %g exceeds tolerance" % (label, err)


# Warnings Shear Projection gives by design (vtkShearProjection.h), which a
# test that uses the setting expects: a gradient array taken on the volume is
# not a wall gradient; without Walls every boundary face is a wall.
NOTE_GRADIENT_ARRAY = "is taken from the volume"
NOTE_DEFAULT_WALLS = "no walls chosen"


class Capture:
    """ErrorEvent and WarningEvent messages of a VTK object (or of a proxy's)."""

    def unexpected(self, *notes):
        """The warnings that hold none of the given documented notes."""
        return [w for w in self.warnings if not any(n in w for n in notes)]

    def __init__(self, obj):
        from vtkmodules.util.misc import calldata_type
        from vtkmodules.util.vtkConstants import VTK_STRING
        self.errors, self.warnings = [], []

        @calldata_type(VTK_STRING)
        def on_error(o, event, message):
            self.errors.append(message)

        @calldata_type(VTK_STRING)
        def on_warning(o, event, message):
            self.warnings.append(message)

        self._keep = (on_error, on_warning)  # the observers hold weak references
        obj = obj.GetClientSideObject() if hasattr(obj, "GetClientSideObject") else obj
        obj.AddObserver("ErrorEvent", on_error)
        obj.AddObserver("WarningEvent", on_warning)
