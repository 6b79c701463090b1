"""Batch helpers for WallLoads in pvpython and pvbatch scripts.

    from wallloads import batch
    simple = batch.load_plugin()          # loads the plugin into paraview.simple
    drag, lift = batch.flow_axes(4.0, 0)  # angle of attack, sideslip in degrees
    rows = batch.load_table(integration)  # {region: {column: value}} on rank 0

The plugin is found through WALLLOADS_PLUGIN (a path to WallLoads.so), or
PV_PLUGIN_PATH, or next to this package (build tree or installed prefix).
In a client-server session (pvpython connected to pvserver) a server that
auto-loaded the plugin (PV_PLUGIN_PATH on the server) is used as it is; the
plugin is loaded on the server only when it is not there yet.

Scripts fail loudly: `update`, `load_table` and `field_totals` raise
PipelineError with the reader's or filter's own message when the pipeline
failed (a missing file, an unknown array), instead of returning zeros.
"""
import math
import os
import re

__all__ = ["load_plugin", "flow_axes", "load_table", "table_rows", "field_totals", "write_csv",
           "use_threads", "update", "watch", "PipelineError", "column_units", "example_path",
           "UNITS"]

#: SI unit of every Load Integration column (3-vectors share one unit).
UNITS = {
    "Faces": "-", "Skipped Faces": "-", "Region Id": "-",
    "Area": "m^2",
    "Pressure Force": "N", "Viscous Force": "N", "Force": "N",
    "Pressure Moment": "N m", "Viscous Moment": "N m", "Moment": "N m",
    "Drag": "N", "Side Force": "N", "Lift": "N",
    "Rolling Moment": "N m", "Pitching Moment": "N m", "Yawing Moment": "N m",
    "Drag Coefficient": "-", "Side Force Coefficient": "-", "Lift Coefficient": "-",
    "Rolling Moment Coefficient": "-", "Pitching Moment Coefficient": "-",
    "Yawing Moment Coefficient": "-",
    "Line Of Action Point": "m", "Residual Couple": "N m",
}


def _package_dir():
    return os.path.dirname(os.path.abspath(__file__))


def _relative_locations():
    """Plugin locations relative to this package: build tree (build/python/wallloads)
    and installed prefix (<prefix>/lib/python3/dist-packages/wallloads)."""
    here = _package_dir()
    try:
        from . import _paths  # written by CMake: where the plugin sits relative to this package
        rel = [_paths.PLUGIN]
    except ImportError:
        rel = []
    rel += [os.path.join("..", "..", "lib", "paraview-plugins", "WallLoads", "WallLoads.so"),
            os.path.join("..", "..", "..", "paraview-plugins", "WallLoads", "WallLoads.so")]
    return [os.path.normpath(os.path.join(here, r)) for r in rel]


def _plugin_path():
    path = os.environ.get("WALLLOADS_PLUGIN")
    if path and os.path.exists(path):
        return path
    for folder in os.environ.get("PV_PLUGIN_PATH", "").split(os.pathsep):
        candidate = os.path.join(folder, "WallLoads.so")
        if folder and os.path.exists(candidate):
            return candidate
    for candidate in _relative_locations():
        if os.path.exists(candidate):
            return candidate
    raise RuntimeError("WallLoads plugin not found: set WALLLOADS_PLUGIN to the path of WallLoads.so "
                       "or PV_PLUGIN_PATH to its folder")


def _session_has_filters():
    """True when the session already knows the WallLoads proxies (plugin loaded
    here, or auto-loaded by the server of a client-server session)."""
    from paraview import servermanager
    pxm = servermanager.ProxyManager()
    if pxm is None:
        return False
    return bool(pxm.SMProxyManager.GetProxyDefinitionManager().HasDefinition("filters", "WallTraction"))


def _is_remote():
    from paraview import servermanager
    conn = servermanager.ActiveConnection
    return bool(conn is not None and conn.IsRemote())


def load_plugin(threads=True):
    """Load the plugin (once) and return paraview.simple with the filters in it.

    With threads=True (default) the per-face loops run on the STDThread SMP
    backend, unless VTK_SMP_BACKEND_IN_USE already chose one.  Connected to a
    pvserver that auto-loaded the plugin, the server's plugin is used (loading
    it there a second time fails in ParaView 5.11 with "Problem loading
    plugin"); otherwise it is loaded on the server too."""
    if threads and not os.environ.get("VTK_SMP_BACKEND_IN_USE"):
        use_threads("STDThread")
    from paraview import simple
    if not hasattr(simple, "WallTraction") or not _session_has_filters():
        if _session_has_filters():
            simple._add_functions(vars(simple))     # definitions came from the server
        elif _is_remote():
            simple.LoadPlugin(_plugin_path(), remote=True, ns=vars(simple))
        else:
            simple.LoadPlugin(_plugin_path(), remote=False, ns=vars(simple))
    try:
        from . import WallLoadsFilters  # noqa: F401  (real classes for client-side objects)
    except ImportError:
        if not _is_remote():
            raise
    return simple


def example_path(*parts):
    """Path of a file of the examples (the demo scenario): the source tree next
    to a build, or <prefix>/share/wallloads/examples when installed."""
    here = _package_dir()
    candidates = []
    try:
        from . import _paths
        candidates.append(os.path.join(here, _paths.EXAMPLES))
    except ImportError:
        pass
    candidates.append(os.path.join(here, "..", "..", "..", "..", "share", "wallloads", "examples"))
    for folder in candidates:
        path = os.path.normpath(os.path.join(folder, *parts))
        if os.path.exists(path):
            return path
    raise FileNotFoundError("example file %s not found (looked in %s)"
                            % (os.path.join(*parts), ", ".join(os.path.normpath(c) for c in candidates)))


def use_threads(backend="STDThread"):
    """Select the vtkSMPTools backend ('STDThread' or 'Sequential')."""
    from vtkmodules.vtkCommonCore import vtkSMPTools
    vtkSMPTools.SetBackend(backend)
    return vtkSMPTools.GetBackend()


def flow_axes(angle_of_attack_deg, sideslip_deg=0.0):
    """Drag and lift directions for an angle of attack and a sideslip angle.

    With x the free stream and z the lift direction at zero incidence, alpha
    turns the stream from x toward z and beta toward +y:
    e_D = (cos a cos b, sin b, sin a cos b), e_L = (-sin a, 0, cos a).
    Set them as LoadIntegration's DragDirection and LiftDirection.
    """
    a = math.radians(angle_of_attack_deg)
    b = math.radians(sideslip_deg)
    drag = [math.cos(a) * math.cos(b), math.sin(b), math.sin(a) * math.cos(b)]
    lift = [-math.sin(a), 0.0, math.cos(a)]
    return drag, lift


class PipelineError(RuntimeError):
    """A reader or filter failed: the message holds their own error text."""


_MESSAGE = re.compile(r"^(?:ERROR|Warning): In [^\n]*\n(?P<who>\w+) \(0x[0-9a-f]+\): (?P<text>.*)$", re.S)
_FAILURE = re.compile(r"Algorithm (?P<who>\w+) ?\(0x[0-9a-f]+\) returned failure")


def _is_vtk_message(message, kind):
    """A message of vtkErrorMacro / vtkWarningMacro (or an executive's failure)."""
    text = message.lstrip()
    return text.startswith(kind + ": In ") or bool(_FAILURE.search(text)) or bool(
        re.match(r"^\w+ \(0x[0-9a-f]+\): ", text))


def clean_message(message):
    """'Class: text' from a VTK error or warning message (file, line and
    object address dropped; an executive's failure report shortened)."""
    text = message.strip()
    m = _MESSAGE.match(text)
    if m:
        text = "%s: %s" % (m.group("who"), m.group("text").strip())
    f = _FAILURE.search(text)
    if f:
        return "%s failed" % f.group("who")
    return text


class watch:
    """Collects the VTK errors and warnings printed while it is active.

        with batch.watch() as w:
            proxy.UpdatePipeline()
        w.errors, w.warnings          # cleaned messages, in order

    Observes the process's vtkOutputWindow, so it sees every reader and filter
    (and their internal readers) of this process; messages are still printed.
    """

    def __init__(self):
        self.errors, self.warnings = [], []

    def __enter__(self):
        from vtkmodules.util.misc import calldata_type
        from vtkmodules.util.vtkConstants import VTK_STRING
        from vtkmodules.vtkCommonCore import vtkOutputWindow

        # Only VTK's own messages: in pvbatch and pvpython, Python's sys.stderr
        # is also routed through the output window as error text.
        @calldata_type(VTK_STRING)
        def on_error(obj, event, message):
            if _is_vtk_message(message, "ERROR"):
                self.errors.append(clean_message(message))

        @calldata_type(VTK_STRING)
        def on_warning(obj, event, message):
            if _is_vtk_message(message, "Warning"):
                self.warnings.append(clean_message(message))

        self._window = vtkOutputWindow.GetInstance()
        self._tags = [self._window.AddObserver("ErrorEvent", on_error),
                      self._window.AddObserver("WarningEvent", on_warning)]
        self._keep = (on_error, on_warning)
        return self

    def __exit__(self, *exc):
        for tag in self._tags:
            self._window.RemoveObserver(tag)
        return False

    def message(self):
        """The errors, failures of executives last, duplicates removed."""
        seen, first, last = set(), [], []
        for e in self.errors:
            if e in seen:
                continue
            seen.add(e)
            (last if e.endswith(" failed") else first).append(e)
        return "; ".join(first + last)


def _label(proxy):
    try:
        return proxy.GetXMLLabel()
    except AttributeError:
        return type(proxy).__name__


def update(proxy, time=None):
    """UpdatePipeline, raising PipelineError when a reader or filter upstream
    reported an error (its message included)."""
    with watch() as w:
        if time is None:
            proxy.UpdatePipeline()
        else:
            proxy.UpdatePipeline(time)
    if w.errors:
        raise PipelineError("%s failed: %s" % (_label(proxy), w.message()))
    return w


def _table_of(integration, time=None):
    update(integration, time)
    if _is_remote():
        from paraview import servermanager
        table = servermanager.Fetch(integration, 0, idx=1)     # rank 0's table
    else:
        table = integration.GetClientSideObject().GetOutputDataObject(1)
    return table


def table_rows(table):
    """Rows of a Load Integration vtkTable: {region: {column: float or tuple}}."""
    rows = {}
    regions = table.GetColumnByName("Region")
    if regions is None:
        return rows
    for r in range(table.GetNumberOfRows()):
        row = {}
        for c in range(table.GetNumberOfColumns()):
            col = table.GetColumn(c)
            if col.GetName() == "Region" or not hasattr(col, "GetNumberOfComponents") \
                    or not col.IsNumeric():
                continue
            n = col.GetNumberOfComponents()
            vals = tuple(float(col.GetComponent(r, k)) for k in range(n))
            row[col.GetName()] = vals[0] if n == 1 else vals
        rows[regions.GetValue(r)] = row
    return rows


def column_units(table):
    """{column: unit} of a table: the unit attached to each array
    (vtkDataArray.UNITS_LABEL) where present, else :data:`UNITS`."""
    from vtkmodules.vtkCommonCore import vtkDataArray
    out = {}
    for c in range(table.GetNumberOfColumns()):
        col = table.GetColumn(c)
        name = col.GetName()
        unit = None
        info = col.GetInformation() if hasattr(col, "GetInformation") else None
        if info is not None and info.Has(vtkDataArray.UNITS_LABEL()):
            unit = info.Get(vtkDataArray.UNITS_LABEL())
        out[name] = unit if unit is not None else UNITS.get(name, "")
    return out


def load_table(integration, time=None):
    """Rows of a Load Integration proxy's table: {region: {column: float or tuple}}.

    Filled on rank 0 only (empty on other ranks of a symmetric MPI run).
    Raises PipelineError when the pipeline failed or gave no table."""
    rows = table_rows(_table_of(integration, time))
    if not rows:
        from vtkmodules.vtkParallelCore import vtkMultiProcessController
        controller = vtkMultiProcessController.GetGlobalController()
        satellite = controller is not None and controller.GetLocalProcessId() > 0
        if not satellite:
            raise PipelineError("%s gave no table: no wall faces reached it (check the reader and "
                                "the walls)" % _label(integration))
    return rows


def field_totals(integration, time=None):
    """The Total row as field data of port 0 (global on every rank)."""
    update(integration, time)
    if _is_remote():
        from paraview import servermanager
        data = servermanager.Fetch(integration, 0)
    else:
        data = integration.GetClientSideObject().GetOutputDataObject(0)
    fd = data.GetFieldData()
    out = {}
    for i in range(fd.GetNumberOfArrays()):
        a = fd.GetArray(i)
        if a is None:
            continue
        vals = tuple(float(a.GetComponent(0, k)) for k in range(a.GetNumberOfComponents()))
        out[a.GetName()] = vals[0] if len(vals) == 1 else vals
    return out


def write_csv(rows, path, units=None):
    """Write table rows to CSV, one column per component, units in the header
    (`units`: {column: unit}, e.g. from :func:`column_units`; default :data:`UNITS`)."""
    import csv
    if not rows:
        raise ValueError("no rows to write")
    units = units or UNITS
    first = next(iter(rows.values()))
    header = ["Region"]
    for name, value in first.items():
        unit = units.get(name, UNITS.get(name, ""))
        if isinstance(value, tuple):
            header += ["%s %s [%s]" % (name, axis, unit) for axis in "XYZ"[:len(value)]]
        else:
            header.append("%s [%s]" % (name, unit))
    with open(path, "w", newline="") as handle:
        writer = csv.writer(handle)
        writer.writerow(header)
        for region, row in rows.items():
            line = [region]
            for value in row.values():
                line += list(value) if isinstance(value, tuple) else [value]
            writer.writerow(["%.12g" % v if isinstance(v, float) else v for v in line])
