"""Files of the report: a staging folder per case, atomic placement, CSV and
JSON writers with units.

Every output is first written into a hidden staging folder next to its final
place; when a case succeeds each file is moved into place with os.replace
(atomic on one file system), so an interrupted run never leaves a
half-written file, and a failed case leaves nothing at all.
"""
import csv
import io
import json
import math
import os
import shutil
import tempfile

__all__ = ["Staging", "write_atomic", "fmt", "rows_to_csv", "table_to_csv", "json_text"]


def write_atomic(path, data):
    """Write bytes or text to `path` through a temporary file and a rename."""
    folder = os.path.dirname(os.path.abspath(path))
    os.makedirs(folder, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix="." + os.path.basename(path) + ".", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data.encode("utf-8") if isinstance(data, str) else data)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


class Staging:
    """A hidden folder in which one case's outputs are made.

    commit() moves every file into `final` (each with os.replace) and removes
    the files of an earlier run that this run did not make; discard() removes
    the staging folder and leaves `final` as it was."""

    #: Names an earlier run may have left in a case folder.
    KNOWN = ("loads.csv", "loads.json", "history.csv", "statistics.csv", "distribution.csv",
             "surface.png", "history.png", "distribution.png", "report.html")

    def __init__(self, final):
        self.final = os.path.abspath(final)
        parent = os.path.dirname(self.final)
        os.makedirs(parent, exist_ok=True)
        self.folder = tempfile.mkdtemp(prefix="." + os.path.basename(self.final) + ".partial-", dir=parent)
        self.files = []

    def path(self, name):
        if name not in self.files:
            self.files.append(name)
        return os.path.join(self.folder, name)

    def write(self, name, data):
        with open(self.path(name), "wb") as handle:
            handle.write(data.encode("utf-8") if isinstance(data, str) else data)

    def commit(self):
        os.makedirs(self.final, exist_ok=True)
        for name in self.files:
            os.replace(os.path.join(self.folder, name), os.path.join(self.final, name))
        for name in self.KNOWN:
            stale = os.path.join(self.final, name)
            if name not in self.files and os.path.exists(stale):
                os.unlink(stale)
        shutil.rmtree(self.folder, ignore_errors=True)

    def discard(self):
        shutil.rmtree(self.folder, ignore_errors=True)


#: Columns that count things: written as integers.
COUNTS = ("Faces", "Skipped Faces", "Region Id", "Bin", "Samples")


def fmt(value, integer=False):
    """A number as text that reads back exactly (repr), NaN as 'nan'."""
    if isinstance(value, float):
        if math.isnan(value):
            return "nan"
        if integer and value.is_integer():
            return str(int(value))
        return repr(value)
    return str(value)


def _expand(name, value, unit):
    if isinstance(value, (tuple, list)):
        return ["%s %s [%s]" % (name, axis, unit) for axis in "XYZ"[:len(value)]]
    return ["%s [%s]" % (name, unit)]


def rows_to_csv(rows, units, first="Region"):
    """Load table rows {region: {column: value or tuple}} as CSV text with the
    unit of every column in the header; one column per component."""
    out = io.StringIO()
    w = csv.writer(out, lineterminator="\n")
    columns = list(next(iter(rows.values())).items())
    header = [first]
    for name, value in columns:
        header += _expand(name, value, units.get(name, ""))
    w.writerow(header)
    for region, row in rows.items():
        line = [region]
        for name, _ in columns:
            v = row.get(name, float("nan"))
            line += [fmt(x) for x in v] if isinstance(v, (tuple, list)) else [fmt(v, name in COUNTS)]
        w.writerow(line)
    return out.getvalue()


def table_to_csv(table, units):
    """A vtkTable as CSV text (numeric and string columns, components split)."""
    out = io.StringIO()
    w = csv.writer(out, lineterminator="\n")
    cols = [table.GetColumn(c) for c in range(table.GetNumberOfColumns())]
    header = []
    for col in cols:
        name = col.GetName()
        unit = units.get(name, "")
        ncomp = col.GetNumberOfComponents() if hasattr(col, "GetNumberOfComponents") else 1
        suffix = (" [%s]" % unit) if unit else ""
        if ncomp == 1:
            header.append(name + suffix)
        else:
            header += ["%s %s%s" % (name, "XYZ"[k] if ncomp == 3 else str(k), suffix) for k in range(ncomp)]
    w.writerow(header)
    for r in range(table.GetNumberOfRows()):
        line = []
        for col in cols:
            if hasattr(col, "IsNumeric") and col.IsNumeric():
                line += [fmt(float(col.GetComponent(r, k)), col.GetName() in COUNTS)
                         for k in range(col.GetNumberOfComponents())]
            else:
                line.append(str(col.GetValue(r)))
        w.writerow(line)
    return out.getvalue()


def statistics_csv(columns, fixed_units, unit_of):
    """The statistics table as CSV with a Unit column: the unit of each row's
    quantity, which its mean, deviation, extremes, standard error and amplitude
    share; columns of a fixed unit carry it in the header."""
    out = io.StringIO()
    w = csv.writer(out, lineterminator="\n")
    names = [c for c in columns if c != "Quantity"]
    w.writerow(["Quantity", "Unit"] + ["%s [%s]" % (c, fixed_units[c]) if c in fixed_units else c for c in names])
    for r, q in enumerate(columns.get("Quantity", [])):
        w.writerow([q, unit_of(q)] + [fmt(columns[c][r], c in COUNTS) for c in names])
    return out.getvalue()


def table_columns(table):
    """{column: [values]} of a vtkTable (numeric columns: lists of floats or tuples)."""
    out = {}
    for c in range(table.GetNumberOfColumns()):
        col = table.GetColumn(c)
        n = table.GetNumberOfRows()
        if hasattr(col, "IsNumeric") and col.IsNumeric():
            k = col.GetNumberOfComponents()
            if k == 1:
                out[col.GetName()] = [float(col.GetComponent(r, 0)) for r in range(n)]
            else:
                out[col.GetName()] = [tuple(float(col.GetComponent(r, j)) for j in range(k)) for r in range(n)]
        else:
            out[col.GetName()] = [str(col.GetValue(r)) for r in range(n)]
    return out


def _clean(obj):
    """JSON-safe: NaN and infinities become null, tuples lists."""
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else None
    if isinstance(obj, dict):
        return {str(k): _clean(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_clean(v) for v in obj]
    return obj


def json_text(obj):
    return json.dumps(_clean(obj), indent=2, allow_nan=False) + "\n"
