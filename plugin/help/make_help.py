"""Generate the WallLoads help pages shown in ParaView's help browser.

    python3 make_help.py OUTDIR COLUMNS_HEADER OVERVIEW_HTML XML...

Writes OUTDIR/filters.<Proxy>.html for every filter XML given (these replace
the pages ParaView generates from the same XML: ours state the real default of
every array picker, when a property is shown, its unit, and list the output
arrays and table columns with their units) and copies the overview page. The
output names, units and meanings come from filters/WallLoadsColumns.h, the one
list the filters themselves use, so the help cannot drift from the code.
Plain Python 3 standard library only.
"""
import html
import os
import re
import shutil
import sys
import xml.etree.ElementTree as ET

STRING = r'"((?:[^"\\]|\\.)*)"'


def parse_columns(header):
    """The X(...) lists of WallLoadsColumns.h: {macro: [tuple of fields]}."""
    text = open(header, encoding="utf-8").read()
    lists = {}
    for m in re.finditer(r"#define (WALLLOADS_\w+)\(X\)(.*?)(?:\n\n|\n/)", text, re.S):
        entries = []
        for line in m.group(2).split("\n"):
            e = re.search(r"^\s*X\((.*)\)\s*\\?\s*$", line)
            if not e:
                continue
            fields = []
            for token in re.finditer(r'\s*(' + STRING + r'|[^,]+)\s*(?:,|$)', e.group(1)):
                value = token.group(1).strip()
                fields.append(value[1:-1] if value.startswith('"') else value)
            entries.append(fields)
        lists[m.group(1)] = entries
    return lists


def pretty_label(name):
    """The panel label ParaView derives from a property name (no label set)."""
    out = ""
    for i, c in enumerate(name):
        if i > 0 and c.isupper() and (name[i - 1].islower() or
                                      (i + 1 < len(name) and name[i + 1].islower() and name[i - 1].isupper())):
            out += " "
        out += c
    return out


def text_of(elem):
    doc = elem.find("Documentation")
    if doc is None or doc.text is None:
        return ""
    return " ".join(doc.text.split())


def picker_default(prop, input_prop):
    """What an array picker holds after creation, in words."""
    delim = prop.get("default_values_delimiter")
    values = prop.get("default_values", "")
    ald = prop.find("ArrayListDomain")
    if delim and delim in values:
        name = values.split(delim)[-1]
        # A picker without a none_string cannot hold "None": its domain
        # takes the first array instead.
        if name and not (name == "None" and ald is not None and not ald.get("none_string")):
            return name
    comps = None
    if input_prop is not None and ald is not None:
        for iad in input_prop.findall("InputArrayDomain"):
            if iad.get("name") == ald.get("input_domain_name"):
                comps = iad.get("number_of_components")
    kind = "floating-point " if ald is not None and "VTK_FLOAT" in ald.get("data_type", "") else ""
    return "the first %s%sarray (the only one, when there is one)" % (
        ("%s-component " % comps) if comps else "", kind)


def picker_restriction(prop, input_prop):
    ald = prop.find("ArrayListDomain")
    if ald is None:
        return ""
    parts = []
    iad = None
    if input_prop is not None:
        for d in input_prop.findall("InputArrayDomain"):
            if d.get("name") == ald.get("input_domain_name"):
                iad = d
    where = "cell or point"
    if iad is not None and iad.get("attribute_type") == "cell":
        where = "cell"
    comps = iad.get("number_of_components") if iad is not None else None
    dtype = ald.get("data_type", "")
    if "VTK_FLOAT" in dtype:
        kind = "floating-point (float or double)"
    elif dtype:
        kind = "integer"
    else:
        kind = "numeric"
    parts.append("a %s%s %s data array" % (("%s-component " % comps) if comps else "", kind, where))
    if ald.get("none_string"):
        parts.append("or '%s'" % ald.get("none_string"))
    return " ".join(parts) + "."


def enum_entries(prop):
    dom = prop.find("EnumerationDomain")
    if dom is None:
        return []
    return [(e.get("value"), e.get("text")) for e in dom.findall("Entry")]


def visibility(prop, proxy):
    notes = []
    if prop.get("panel_visibility") == "advanced":
        notes.append("advanced (shown with the gear button)")
    for dec in prop.findall("Hints/PropertyWidgetDecorator"):
        other = proxy.find("*[@name='%s']" % dec.get("property"))
        values = (dec.get("value") or dec.get("values") or "").split()
        texts = dict(enum_entries(other)) if other is not None else {}
        if other is not None and other.find("BooleanDomain") is not None:
            texts = {"1": "on", "0": "off"}
        shown = " or ".join("'%s'" % texts.get(v, v) for v in values)
        notes.append("shown when %s is %s" % (pretty_label(dec.get("property")), shown))
    return "; ".join(notes)


def default_text(prop, input_prop):
    if prop.find("ArrayListDomain") is not None:
        return picker_default(prop, input_prop)
    values = prop.get("default_values", "")
    entries = enum_entries(prop)
    if entries:
        return dict(entries).get(values, values)
    if prop.find("BooleanDomain") is not None:
        return "on" if values == "1" else "off"
    return values


def restriction_text(prop, input_prop):
    if prop.find("ArrayListDomain") is not None:
        return picker_restriction(prop, input_prop)
    entries = enum_entries(prop)
    if entries:
        return "One of: " + ", ".join("'%s'" % t for _, t in entries) + "."
    if prop.find("BooleanDomain") is not None:
        return "On or off."
    rng = prop.find("DoubleRangeDomain")
    if rng is not None and rng.get("min") is not None:
        return "At least %s." % rng.get("min")
    return ""


def table(headers, rows):
    out = ['<table border="1" cellpadding="3" cellspacing="0" width="97%">',
           "<tr>" + "".join('<th bgcolor="#c8d8e8">%s</th>' % html.escape(h) for h in headers) + "</tr>"]
    for row in rows:
        out.append("<tr>" + "".join("<td>%s</td>" % c for c in row) + "</tr>")
    out.append("</table>")
    return "\n".join(out)


def esc(s):
    return html.escape(s, quote=False)


def unit_text(unit):
    return "-" if unit in ("", "-") else esc(unit)


def outputs_section(proxy_name, cols):
    parts = []
    if proxy_name == "WallTraction":
        parts.append("<h3>Output arrays (cell data, double)</h3>")
        parts.append(table(["Array", "Unit", "Components", "How it is computed"],
                           [[esc(n), unit_text(u), c, esc(m)] for n, u, c, m in cols["WALLLOADS_FACE_ARRAYS"]]))
        parts.append("<p>Skipped faces carry NaN in every array and no load.</p>")
        parts.append("<h3>Field data</h3>")
        parts.append(table(["Value", "Unit", "Components", "Meaning"],
                           [[esc(n), unit_text(u), c, esc(m)] for n, u, c, m in cols["WALLLOADS_TRACTION_FIELDS"]]))
    elif proxy_name == "LoadIntegration":
        loads = cols["WALLLOADS_LOAD_COLUMNS"]
        parts.append("<h3>Load Summary (port 2: opens in a spreadsheet view on Apply)</h3>")
        summary = [[esc("Boundary"), "-", "the region name (Total on the last row)"]]
        for member, name, unit, comps, flags, sname, meaning in loads:
            if sname != "nullptr":
                label = sname if unit == "-" else "%s [%s]" % (sname, unit)
                note = " (with a reference speed)" if "COEFFICIENT" in flags else ""
                summary.append([esc(label), unit_text(unit), esc(meaning) + note])
        summary.append([esc("Dynamic Pressure [Pa]"), "Pa", "q used for the coefficients (with a reference speed)"])
        parts.append("<p>ParaView 5.11's spreadsheet view orders the columns of a table by their names; "
                     "the summary's names are chosen so that the region ('Boundary') comes first and the "
                     "drag and lift next, with the unit in each name.</p>")
        parts.append(table(["Column", "Unit", "How it is computed"], summary))
        parts.append("<h3>Load Table (port 1: every column, the names scripts use) and port 0 field data</h3>")
        rows = [[esc(n), unit_text(u), c, esc(m)] for n, u, c, m in cols["WALLLOADS_REGION_COLUMNS"]]
        for member, name, unit, comps, flags, sname, meaning in loads:
            note = " (only with a reference speed)" if "COEFFICIENT" in flags else ""
            rows.append([esc(name), unit_text(unit), comps, esc(meaning) + note])
        for n, u, c, m in cols["WALLLOADS_REFERENCE_COLUMNS"]:
            rows.append([esc(n), unit_text(u), c, esc(m) + " (the value used; same on every row)"])
        parts.append(table(["Column", "Unit", "Components", "How it is computed"], rows))
        parts.append("<p>The Total row's values are also port 0's field data, with the same names. "
                     "Every column carries its unit as array information (UNITS_LABEL).</p>")
    elif proxy_name == "ShearProjection":
        parts.append("<h3>Output arrays (cell data on the wall faces)</h3>")
        parts.append(table(["Array", "Unit", "Components", "How it is computed"],
                           [[esc(n), unit_text(u), c, esc(m)] for n, u, c, m in cols["WALLLOADS_SHEAR_ARRAYS"]]))
        parts.append("<p>The wall faces keep their own arrays; without Walls (the whole boundary of the "
                     "volume) they carry the volume's point data and the adjacent cells' cell data. "
                     "Faces that are not computed carry NaN and Near-Wall Regime -1, and a warning "
                     "counts them by reason.</p>")
    elif proxy_name == "LoadHistory":
        parts.append("<h3>History (port 0: opens in a line chart view)</h3>")
        parts.append("<p><code>Time</code> (s), then one column per quantity with that quantity's unit: "
                     "<code>&lt;Region&gt;: &lt;Column&gt;</code> for Load Integration's Load Table "
                     "(for example <code>Total: Drag</code>, <code>Total: Force X</code>), or "
                     "<code>&lt;Array&gt;</code> for field data; 3-component values are split into "
                     "X, Y and Z. Identifiers, reference values and face counters are left out.</p>")
        parts.append("<h3>Statistics (port 1: opens in a spreadsheet view), one row per history column</h3>")
        parts.append(table(["Column", "Unit", "How it is computed"],
                           [[esc(n), unit_text(u), esc(m)] for n, u, c, m in cols["WALLLOADS_STATISTICS_COLUMNS"]]))
        parts.append("<p>Every statistic, the spectral ones included, is computed over the statistics "
                     "window. NaN where undefined (fewer than 8 samples, constant quantity), with a "
                     "warning.</p>")
    elif proxy_name == "LoadDistribution":
        parts.append("<h3>Output table (one row per bin; opens in a line chart view)</h3>")
        parts.append(table(["Column", "Unit", "Components", "How it is computed"],
                           [[esc(n), unit_text(u), c, esc(m)] for n, u, c, m in cols["WALLLOADS_DISTRIBUTION_COLUMNS"]]))
        parts.append("<p>Every face is cut exactly by the bin planes and its force shared in proportion "
                     "to the cut areas, so the bins add up to Load Integration's totals. Every column "
                     "carries its unit as array information (UNITS_LABEL).</p>")
        parts.append("<h3>Field data of the table</h3>")
        parts.append(table(["Value", "Unit", "Components", "Meaning"],
                           [[esc(n), unit_text(u), c, esc(m)] for n, u, c, m in cols["WALLLOADS_DISTRIBUTION_FIELDS"]]))
    return "\n".join(parts)


def filter_page(path, cols):
    root = ET.parse(path).getroot()
    pages = {}
    for proxy in root.iter("SourceProxy"):
        name, label = proxy.get("name"), proxy.get("label", proxy.get("name"))
        doc = proxy.find("Documentation")
        short = doc.get("short_help", "") if doc is not None else ""
        long_text = text_of(proxy)
        input_prop = proxy.find("InputProperty[@name='Input']")
        rows = []
        for prop in proxy:
            if prop.tag not in ("InputProperty", "StringVectorProperty", "IntVectorProperty",
                                "DoubleVectorProperty"):
                continue
            pname = prop.get("name")
            notes = visibility(prop, proxy)
            restr = restriction_text(prop, input_prop)
            if prop.tag == "InputProperty":
                types = [d.get("value") for d in prop.findall("DataTypeDomain/DataType")]
                restr = "Accepts %s, plain or composite." % " and ".join(types) if types else ""
            rows.append(["<b>%s</b><br/><code>%s</code>" % (esc(prop.get("label", pretty_label(pname))), esc(pname)),
                         esc(text_of(prop)) + ("<br/><i>%s</i>" % esc(notes) if notes else ""),
                         esc(default_text(prop, input_prop)) if prop.tag != "InputProperty" else "",
                         esc(restr)])
        body = [
            "<html><head><title>%s</title>" % esc(label),
            '<meta name="proxy_name" contents="filters.%s"/>' % esc(name),
            '<meta name="filename" contents="filters.%s.html"/></head><body>' % esc(name),
            "<h2>%s (%s)</h2>" % (esc(label), esc(name)),
            "<p><i>%s</i></p>" % esc(short),
            "<p>%s</p>" % esc(long_text),
            '<p>See <a href="wallloads_overview.html">WallLoads: overview and workflows</a> for the usual chains.</p>',
            "<h3>Properties</h3>",
            "<p>Panel label (bold) and scripting name (<code>paraview.simple</code>). SI units throughout.</p>",
            table(["Property", "Description", "Default", "Accepted values"], rows),
            outputs_section(name, cols),
            "<p><i>The results support, and do not replace, engineering judgement, local codes and "
            "licensed practice.</i></p>",
            "</body></html>"]
        pages["filters.%s.html" % name] = "\n".join(body)
    return pages


def main(argv):
    outdir, header, overview = argv[1], argv[2], argv[3]
    cols = parse_columns(header)
    for key in ("WALLLOADS_LOAD_COLUMNS", "WALLLOADS_REGION_COLUMNS", "WALLLOADS_REFERENCE_COLUMNS",
                "WALLLOADS_FACE_ARRAYS", "WALLLOADS_TRACTION_FIELDS", "WALLLOADS_SHEAR_ARRAYS",
                "WALLLOADS_STATISTICS_COLUMNS", "WALLLOADS_DISTRIBUTION_COLUMNS",
                "WALLLOADS_DISTRIBUTION_FIELDS"):
        if not cols.get(key):
            raise SystemExit("make_help.py: %s not found in %s" % (key, header))
    os.makedirs(outdir, exist_ok=True)
    for path in argv[4:]:
        for fname, text in filter_page(path, cols).items():
            with open(os.path.join(outdir, fname), "w", encoding="utf-8") as handle:
                handle.write(text)
    shutil.copyfile(overview, os.path.join(outdir, os.path.basename(overview)))


if __name__ == "__main__":
    main(sys.argv)
