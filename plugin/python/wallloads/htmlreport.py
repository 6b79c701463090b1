"""The HTML pages of the report: one self-contained page per case (tables and
pictures embedded as data: URIs; no script, no network) and an index page
over all cases.  Plain Python."""
import base64
import html
import math
import os

__all__ = ["case_page", "index_page"]

STYLE = """
body{font-family:"DejaVu Sans",Helvetica,Arial,sans-serif;margin:24px auto;max-width:1180px;color:#1a1a1a;
line-height:1.4;padding:0 16px}
h1{font-size:1.6em;margin-bottom:0.2em}h2{font-size:1.2em;margin-top:1.6em;border-bottom:1px solid #ccc}
.meta{color:#555;font-size:0.9em}
.caution{background:#fff7e0;border-left:4px solid #e0a800;padding:8px 12px;margin:12px 0;font-size:0.92em}
.warn{background:#fdecea;border-left:4px solid #c0392b;padding:6px 12px;margin:6px 0;font-size:0.92em}
.note{background:#f3f5f8;border-left:4px solid #9aa5b1;padding:6px 12px;margin:6px 0;font-size:0.92em}
table{border-collapse:collapse;margin:8px 0;font-size:0.86em}
th,td{border:1px solid #d0d0d0;padding:3px 7px;text-align:right;white-space:nowrap}
th{background:#f0f3f7;text-align:center}td.l,th.l{text-align:left}
tr.total td{font-weight:bold;background:#f7f7f7}
figure{margin:12px 0}figure img{max-width:100%;border:1px solid #ddd}
figcaption{color:#555;font-size:0.88em}
.scroll{overflow-x:auto}
code{background:#f3f3f3;padding:0 3px}
"""


def _e(text):
    return html.escape(str(text), quote=True)


def num(v):
    """A number for a table cell: 6 significant digits, NaN as a dash."""
    if v is None:
        return "&ndash;"
    if isinstance(v, float):
        if math.isnan(v):
            return "&ndash;"
        if v == 0:
            return "0"
        if 1e-3 <= abs(v) < 1e6:
            return "%.6g" % v
        return "%.5e" % v
    return _e(v)


def _png(folder, name):
    with open(os.path.join(folder, name), "rb") as handle:
        return "data:image/png;base64," + base64.b64encode(handle.read()).decode("ascii")


def _page(title, body):
    return ("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
            "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">"
            "<title>%s</title><style>%s</style></head><body>\n%s\n</body></html>\n" % (_e(title), STYLE, body))


def _table(header, rows, total_row=None, left=1):
    out = ["<div class=\"scroll\"><table><thead><tr>"]
    out += ["<th class=\"l\">%s</th>" % h if i < left else "<th>%s</th>" % h for i, h in enumerate(header)]
    out.append("</tr></thead><tbody>")
    for r in rows:
        cls = " class=\"total\"" if total_row is not None and r[0] == total_row else ""
        out.append("<tr%s>" % cls + "".join(
            "<td class=\"l\">%s</td>" % _e(c) if i < left else "<td>%s</td>" % num(c) for i, c in enumerate(r))
            + "</tr>")
    out.append("</tbody></table></div>")
    return "".join(out)


def _unit(units, name):
    u = units.get(name, "")
    return "%s [%s]" % (_e(name), _e(u)) if u else _e(name)


def _load_tables(rows, units):
    """Two tables from the Load Integration rows: forces and moments; axes,
    coefficients and line of action."""
    first = next(iter(rows.values()))
    groups = [
        ("In the load axes", ["Faces", "Area", "Drag", "Side Force", "Lift", "Rolling Moment",
                              "Pitching Moment", "Yawing Moment"]),
        ("Forces", ["Pressure Force", "Viscous Force", "Force"]),
        ("Moments about the moment centre", ["Pressure Moment", "Viscous Moment", "Moment"]),
        ("Coefficients", ["Drag Coefficient", "Side Force Coefficient", "Lift Coefficient",
                          "Rolling Moment Coefficient", "Pitching Moment Coefficient",
                          "Yawing Moment Coefficient"]),
        ("Line of action", ["Line Of Action Point", "Residual Couple"]),
    ]
    shown = set()
    out = []
    for title, cols in groups:
        cols = [c for c in cols if c in first]
        if not cols or (title != "In the load axes" and cols == [c for c in cols if c in shown]):
            continue
        shown.update(cols)
        header, body = ["Region"], []
        for c in cols:
            if isinstance(first[c], tuple):
                header += ["%s %s [%s]" % (_e(c), a, _e(units.get(c, ""))) for a in "XYZ"]
            else:
                header.append(_unit(units, c))
        for region, row in rows.items():
            line = [region]
            for c in cols:
                v = row.get(c)
                line += list(v) if isinstance(v, tuple) else [str(int(v)) if c == "Faces" and v == v else v]
            body.append(line)
        out.append("<h3>%s</h3>" % _e(title) + _table(header, body, total_row="Total"))
    rest = [c for c in first if c not in shown and c not in ("Region Id", "Skipped Faces")]
    if rest:
        header = ["Region"] + [_unit(units, c) for c in rest]
        body = [[region] + [row.get(c) if not isinstance(row.get(c), tuple) else str(row.get(c)) for c in rest]
                for region, row in rows.items()]
        out.append("<h3>Other columns</h3>" + _table(header, body, total_row="Total"))
    return "\n".join(out)


def _settings_table(record):
    c = record["config"]
    ch = record["choices"]
    sh = ch.get("shear", {})
    p = ch.get("pressure", {})

    def vec(v):
        return "(%s)" % ", ".join("%.4g" % (x + 0.0) for x in v) if v else "&ndash;"

    items = [
        ("Walls", ", ".join(ch.get("walls", []))),
        ("Volume", ", ".join(ch.get("volume", [])) or "none"),
        ("Pressure", "%s (%s data, %s%s); datum p_ref = %g Pa" % (
            p.get("array") or "none", "cell" if p.get("association") == "CELLS" else "point",
            c["pressure"]["kind"], ", found automatically" if p.get("how") == "auto" else "",
            c["pressure"]["reference"])),
        ("Wall shear stress", {"array": "array %s (%s)" % (sh.get("array"), c["shear"]["kind"]),
                               "gradient": "from the velocity gradient %s" % sh.get("gradient"),
                               "volume": "reconstructed from the volume velocity %s (%s)"
                                         % (sh.get("velocity"), sh.get("method")),
                               "none": "none (no viscous load)"}.get(sh.get("source"), "?")
         + ("; chosen automatically" if sh.get("how") == "auto" else "")),
        ("Orientation of stored normals", ch.get("orientation")),
        ("Fluid", "density %g kg/m^3, viscosity %g (%s)%s%s" % (
            c["fluid"]["density"], c["fluid"]["viscosity"], c["fluid"]["viscosity_kind"],
            ", viscosity array %s" % c["fluid"]["viscosity_array"] if c["fluid"]["viscosity_array"] else "",
            ", turbulent viscosity array %s" % c["fluid"]["turbulent_viscosity_array"]
            if c["fluid"]["turbulent_viscosity_array"] else "")),
        ("Reference values", "rho_ref %g kg/m^3, U_ref %g m/s, A_ref %g m^2, L_ref %g m, span %g m" % (
            ch.get("reference_density"), c["reference"]["speed"], c["reference"]["area"],
            c["reference"]["length"], c["reference"]["span"])),
        ("Load axes", "drag %s, lift %s, moment centre %s m" % (
            vec(ch.get("drag_direction")), vec(ch.get("lift_direction")), vec(c["axes"]["moment_centre"]))),
        ("Time", "steady (one state)" if not record["case"]["time_steps"] else
         "%s of %d steps; loads at t = %g s" % (record["case"]["selected_time_steps"],
                                                record["case"]["time_steps"], record["case"]["report_time"])),
    ]
    return ("<table>" + "".join("<tr><th class=\"l\">%s</th><td class=\"l\">%s</td></tr>" % (_e(k), v if "&" in str(v)
                                                                                        else _e(v))
                                for k, v in items) + "</table>")


def case_page(title, record, rows, units, extras, images, folder, caution):
    case = record["case"]
    sw = record["software"]
    parts = ["<h1>Wall loads: %s</h1>" % _e(title),
             "<p class=\"meta\">Case <code>%s</code> (%s) &middot; made %s by WallLoads %s on ParaView %s</p>"
             % (_e(case["file"]), _e(case["format"]), _e(record["created"]), _e(sw["version"]),
                _e(sw["paraview"])),
             "<div class=\"caution\">%s</div>" % _e(caution)]
    for w in record.get("warnings", []):
        parts.append("<div class=\"warn\">%s</div>" % _e(w))
    for n in record.get("left_out", []):
        parts.append("<div class=\"note\">%s</div>" % _e(n))
    parts.append("<h2>Settings used</h2>" + _settings_table(record))
    tables = _load_tables(rows, units)
    first, _, rest = tables.partition("\n")
    parts.append("<h2>Loads per region</h2><p class=\"meta\">Forces exerted by the fluid on the walls; "
                 "SI units. The same numbers, at full precision, are in <code>loads.csv</code> and "
                 "<code>loads.json</code>.</p>")
    parts.append(first)
    if images:
        parts.append("<h2>Pictures</h2>")
        for name, caption in images:
            parts.append("<figure><img src=\"%s\" alt=\"%s\" data-file=\"%s\"><figcaption>%s</figcaption></figure>"
                         % (_png(folder, name), _e(caption), _e(name), _e(caption)))
    if rest:
        parts.append("<h2>All loads</h2>" + rest)
    hist = extras.get("history")
    if hist:
        parts.append("<h2>History and statistics</h2><p class=\"meta\">%d time steps; the full history is in "
                     "<code>history.csv</code>, the statistics of every quantity in "
                     "<code>statistics.csv</code>.</p>" % hist["steps"])
        stats = hist["statistics"]
        keys = [q for q in stats if q.startswith("Total: ")] or list(stats)[:12]
        cols = [c for c in ("Mean", "Standard Deviation", "Minimum", "Maximum", "Standard Error Of Mean",
                            "Dominant Frequency", "Amplitude", "Strouhal Number") if keys and c in stats[keys[0]]]
        body = [[q] + [stats[q][c]["value"] for c in cols] for q in keys]
        header = ["Quantity"] + ["%s [%s]" % (_e(c), _e(stats[keys[0]][c]["unit"])) if c in (
            "Dominant Frequency", "Strouhal Number") else _e(c) for c in cols]
        parts.append(_table(header, body))
    dist = extras.get("distribution")
    if dist:
        cols = dist["columns"]
        show = [c for c in ("Centre", "Area", "Drag Per Length", "Side Force Per Length", "Lift Per Length")
                if c in cols]
        if show:
            n = len(cols[show[0]])
            body = [[str(int(cols["Bin"][i])) if "Bin" in cols else str(i)] + [cols[c][i] for c in show]
                    for i in range(n)]
            parts.append("<h2>Distribution along %s</h2><details><summary>%d bins (table; also in "
                         "<code>distribution.csv</code>)</summary>%s</details>" % (
                             _e("(%s)" % ", ".join("%.3g" % x for x in dist["axis"])), n,
                             _table(["Bin"] + [_unit(dist["units"], c) for c in show], body)))
    parts.append("<h2>Input</h2>")
    parts.append(_table(["File", "Bytes", "SHA-256"],
                        [[f["path"], str(f["bytes"]), f["sha256"]] for f in case["files"]], left=3))
    blocks = case.get("blocks", [])
    if blocks:
        parts.append(_table(["Block", "Kind", "Cells"], [[b["path"] or b["name"], b["kind"], str(b["cells"])]
                                                        for b in blocks], left=3))
    parts.append("<p class=\"meta\">Every setting, choice and value is recorded in <code>loads.json</code>. "
                 "%s</p>" % _e(caution))
    return _page("Wall loads: %s" % title, "\n".join(parts))


def index_page(title, results, study, caution, version):
    parts = ["<h1>%s</h1>" % _e(title),
             "<p class=\"meta\">%d case(s) reported by WallLoads %s</p>" % (len(results), _e(version)),
             "<div class=\"caution\">%s</div>" % _e(caution)]
    cols = ["Drag", "Side Force", "Lift", "Rolling Moment", "Pitching Moment", "Yawing Moment",
            "Drag Coefficient", "Lift Coefficient"]
    present = [c for c in cols if any(c in r.rows.get("Total", {}) for r in results)]
    units = {}
    for r in results:
        units.update(r.units)
    header = ["Case", "Status"] + [_unit(units, c) for c in present] + ["Report"]
    out = ["<div class=\"scroll\"><table><thead><tr>"] + ["<th>%s</th>" % h for h in header] + \
        ["</tr></thead><tbody>"]
    for r in results:
        total = r.rows.get("Total", {})
        cells = ["<td class=\"l\">%s</td>" % _e(r.name),
                 "<td class=\"l\">%s</td>" % (_e(r.status) if r.status == "done"
                                              else "failed: %s" % _e(r.error))]
        cells += ["<td>%s</td>" % num(total.get(c)) for c in present]
        cells.append("<td class=\"l\">%s</td>" % ("<a href=\"%s/report.html\">report</a>" % _e(r.name)
                                                   if r.status == "done" else ""))
        out.append("<tr>" + "".join(cells) + "</tr>")
    out.append("</tbody></table></div>")
    parts.append("<h2>Cases</h2>" + "".join(out))
    parts.append("<p class=\"meta\">One row per case in <code>summary.csv</code>.</p>")
    if study:
        parts.append("<h2>Mesh convergence</h2><p class=\"meta\">%s; representative cell size from the %s: "
                     "%s. Full table in <code>convergence.csv</code>.</p>" % (
                         _e(study["method"]), _e(study["cell_size"]),
                         ", ".join("%s h = %.4g m" % (_e(c["name"]), c["h"]) for c in study["cases"])))
        rows = []
        for q, res in study["quantities"].items():
            if res["behaviour"] == "zero":
                continue
            rows.append([q, res["unit"], res["phi"][0], res["phi"][1], res["phi"][2], res["order"], res["phi_ext"],
                         100 * res["gci"] if math.isfinite(res["gci"]) else float("nan"), res["behaviour"]])
        body = "".join("<tr>%s</tr>" % "".join(
            ("<td class=\"l\">%s</td>" % _e(v)) if i in (0, 1, 8) else "<td>%s</td>" % num(v)
            for i, v in enumerate(r)) for r in rows)
        parts.append("<div class=\"scroll\"><table><thead><tr>%s</tr></thead><tbody>%s</tbody></table></div>" % (
            "".join("<th>%s</th>" % h for h in ["Quantity", "Unit", "Fine", "Medium", "Coarse", "Order",
                                                "Extrapolated", "GCI fine [%]", "Behaviour"]), body))
    return _page(title, "\n".join(parts))
