"""Batch helpers for WallLoads in pvpython and pvbatch scripts.

    from wallloads import batch
    simple = batch.load_plugin()          # loads the plugin into paraview.simple
    drag, lift = batch.flow_axes(4.0, 0)  # angle of attack, sideslip in degrees
    rows = batch.load_table(integration)  # {region: {column: value}} on rank 0

The plugin is found through WALLLOADS_PLUGIN (a path to WallLoads.so), or
PV_PLUGIN_PATH, or next to this package in a build tree.
"""
import math
import os

__all__ = ["load_plugin", "flow_axes", "load_table", "table_rows", "field_totals", "write_csv",
           "use_threads", "UNITS"]

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


def _plugin_path():
    path = os.environ.get("WALLLOADS_PLUGIN")
    if path and os.path.exists(path):
        return path
    for folder in os.environ.get("PV_PLUGIN_PATH", "").split(os.pathsep):
        candidate = os.path.join(folder, "WallLoads.so")
        if folder and os.path.exists(candidate):
            return candidate
    here = os.path.dirname(os.path.abspath(__file__))
    candidate = os.path.join(here, "..", "..", "lib", "paraview-plugins", "WallLoads", "WallLoads.so")
    if os.path.exists(candidate):
        return os.path.normpath(candidate)
    raise RuntimeError("WallLoads plugin not found: set WALLLOADS_PLUGIN to the path of WallLoads.so "
                       "or PV_PLUGIN_PATH to its folder")


def load_plugin(threads=True):
    """Load the plugin (once) and return paraview.simple with the filters in it.

    With threads=True (default) the per-face loops run on the STDThread SMP
    backend, unless VTK_SMP_BACKEND_IN_USE already chose one."""
    if threads and not os.environ.get("VTK_SMP_BACKEND_IN_USE"):
        use_threads("STDThread")
    from paraview import simple
    if not hasattr(simple, "WallTraction"):
        simple.LoadPlugin(_plugin_path(), remote=False, ns=vars(simple))
    from . import WallLoadsFilters  # noqa: F401  (real classes for client-side objects)
    return simple


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


def _table_of(integration):
    integration.UpdatePipeline()
    return integration.GetClientSideObject().GetOutputDataObject(1)


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
            if col.GetName() == "Region":
                continue
            n = col.GetNumberOfComponents()
            vals = tuple(float(col.GetComponent(r, k)) for k in range(n))
            row[col.GetName()] = vals[0] if n == 1 else vals
        rows[regions.GetValue(r)] = row
    return rows


def load_table(integration):
    """Rows of a Load Integration proxy's table: {region: {column: float or tuple}}.

    Filled on rank 0 only (empty on other ranks under MPI)."""
    return table_rows(_table_of(integration))


def field_totals(integration):
    """The Total row as field data of port 0 (global on every rank)."""
    integration.UpdatePipeline()
    fd = integration.GetClientSideObject().GetOutputDataObject(0).GetFieldData()
    out = {}
    for i in range(fd.GetNumberOfArrays()):
        a = fd.GetArray(i)
        if a is None:
            continue
        vals = tuple(float(a.GetComponent(0, k)) for k in range(a.GetNumberOfComponents()))
        out[a.GetName()] = vals[0] if len(vals) == 1 else vals
    return out


def write_csv(rows, path):
    """Write table rows to CSV, one column per component, units in the header."""
    import csv
    if not rows:
        raise ValueError("no rows to write")
    first = next(iter(rows.values()))
    header = ["Region"]
    for name, value in first.items():
        unit = UNITS.get(name, "")
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
