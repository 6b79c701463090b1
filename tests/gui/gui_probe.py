"""Application-state recorder for the user-level GUI test (tests/gui/gui_user.py).

Run inside the ParaView application at start-up (`paraview --script=...`). It
acts on nothing: it observes the session (sources registered, pipelines
updated, views rendered, active source changed) and after each such event
writes a snapshot of the application state to $WALLLOADS_GUI_STATE (JSON,
replaced atomically): every source with its inputs and the properties of the
WallLoads filters, the active source, the Load Integration tables, and every
view with what it shows (for spreadsheet views, the columns in the order the
view displays them). The test drives the window with xdotool and waits on
these snapshots.
"""
import json
import math
import os
import traceback

from paraview import servermanager as sm
from paraview import simple

OUT = os.environ["WALLLOADS_GUI_STATE"]
OURS = ("WallTraction", "LoadIntegration", "ShearProjection")
_seq = [0]
_observed = set()


def _number(x):
    x = float(x)
    return x if math.isfinite(x) else repr(x)


def _table(table):
    if table is None:
        return None
    out = {}
    for c in range(table.GetNumberOfColumns()):
        col = table.GetColumn(c)
        name = col.GetName()
        if hasattr(col, "GetComponent"):
            n = col.GetNumberOfComponents()
            out[name] = [[_number(col.GetComponent(r, k)) for k in range(n)] if n > 1
                         else _number(col.GetComponent(r, 0)) for r in range(table.GetNumberOfRows())]
        else:
            out[name] = [col.GetValue(r) for r in range(table.GetNumberOfRows())]
    return {"columns": [table.GetColumnName(c) for c in range(table.GetNumberOfColumns())], "values": out}


def _name_of(proxy, sources):
    for (name, _), p in sources.items():
        if p.SMProxy is proxy or p is proxy:
            return name
    return None


def _source_entry(name, proxy, sources):
    entry = {"name": name, "xml": proxy.GetXMLName(), "inputs": {}}
    for port_name in ("Input", "Walls"):
        prop = proxy.GetProperty(port_name)
        if prop is None:
            continue
        helper = prop.SMProperty
        entry["inputs"][port_name] = [_name_of(helper.GetProxy(i), sources)
                                      for i in range(helper.GetNumberOfProxies())]
    if proxy.GetXMLName() in OURS:
        props = {}
        for key in proxy.ListProperties():
            if key in ("Input", "Walls"):
                continue
            try:
                value = proxy.GetPropertyValue(key)
                props[key] = value if isinstance(value, (int, float, str)) else [str(v) for v in value]
            except Exception:  # noqa: BLE001 - a property the recorder cannot read is left out
                pass
        entry["properties"] = props
    entry["cells"] = proxy.GetDataInformation().GetNumberOfCells()
    if proxy.GetXMLName() == "LoadIntegration":
        algo = proxy.GetClientSideObject()
        entry["load_table"] = _table(algo.GetOutputDataObject(1))
        entry["load_summary"] = _table(algo.GetOutputDataObject(2))
    return entry


def _view_entry(view, sources):
    entry = {"type": view.GetXMLName(), "shows": []}
    for rep in view.Representations:
        try:
            if rep.GetPropertyValue("Visibility"):
                inp = rep.GetProperty("Input").SMProperty
                entry["shows"].append([_name_of(inp.GetProxy(0), sources), inp.GetOutputPortForConnection(0)])
        except Exception:  # noqa: BLE001 - representations without an input
            pass
    if view.GetXMLName() == "SpreadSheetView":
        sheet = view.GetClientSideObject()
        entry["columns"] = [sheet.GetColumnName(i) for i in range(sheet.GetNumberOfColumns())
                            if sheet.GetColumnVisibility(i)]
        entry["labels"] = [sheet.GetColumnLabel(i) for i in range(sheet.GetNumberOfColumns())
                           if sheet.GetColumnVisibility(i)]
        entry["rows"] = sheet.GetNumberOfRows()
    return entry


def snapshot(*_args):
    _observe_all()
    state = {}
    try:
        sources = simple.GetSources()
        state["sources"] = [_source_entry(name, proxy, sources) for (name, _), proxy in sorted(sources.items())]
        active = simple.GetActiveSource()
        state["active"] = _name_of(active, sources) if active is not None else None
        state["views"] = [_view_entry(v, sources) for v in simple.GetViews()]
    except Exception:  # noqa: BLE001 - the snapshot says what went wrong instead
        state["error"] = traceback.format_exc()
    _seq[0] += 1
    state["seq"] = _seq[0]
    tmp = OUT + ".tmp"
    with open(tmp, "w") as handle:
        json.dump(state, handle)
    os.replace(tmp, OUT)


def _observe_all():
    for _, proxy in simple.GetSources().items():
        key = proxy.SMProxy.GetGlobalIDAsString()
        if key not in _observed:
            _observed.add(key)
            proxy.SMProxy.AddObserver("UpdateDataEvent", snapshot)
    for view in simple.GetViews():
        key = view.SMProxy.GetGlobalIDAsString()
        if key not in _observed:
            _observed.add(key)
            view.SMProxy.AddObserver("EndEvent", snapshot)


def _on_register(*_args):
    _observe_all()


sm.ProxyManager().SMProxyManager.AddObserver("RegisterEvent", _on_register)
selection = sm.ProxyManager().SMProxyManager.GetSelectionModel("ActiveSources")
if selection is not None:
    selection.AddObserver("CurrentChangedEvent", snapshot)
snapshot()
