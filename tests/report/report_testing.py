"""Helpers of the report tests: run the `wallloads-report` command as a user
does (a subprocess), read its CSV and JSON back, compare numbers.

Environment (set by tests/report/CMakeLists.txt): WALLLOADS_REPORT (the
launcher), WALLLOADS_SOURCE_DIR, WALLLOADS_TEST_OUTPUT, PYTHONPATH with
tests/python (the scene library).
"""
import csv
import json
import math
import os
import shutil
import subprocess
import sys

REPORT = os.environ.get("WALLLOADS_REPORT", "wallloads-report")
SOURCE = os.environ.get("WALLLOADS_SOURCE_DIR", os.path.join(os.path.dirname(__file__), "..", ".."))
OUT = os.environ.get("WALLLOADS_TEST_OUTPUT", "/tmp/wallloads-test-output")


def workdir(name):
    """A fresh folder for one test's files."""
    d = os.path.join(OUT, "report", name)
    shutil.rmtree(d, ignore_errors=True)
    os.makedirs(d)
    return d


def run(args, env=None, mpi=0, timeout=600):
    """Run the command; returns (exit code, stdout, stderr) and echoes stderr."""
    cmd = [REPORT] + [str(a) for a in args]
    if mpi:
        cmd = ["mpirun", "-np", str(mpi), "--oversubscribe"] + cmd
    # pvpython, which runs these tests, starts MPI as a singleton and leaves its
    # job variables in the environment: a child mpirun (or the launcher's MPI
    # check) must not see them.
    keep = ("OMPI_ALLOW_RUN_AS_ROOT", "OMPI_ALLOW_RUN_AS_ROOT_CONFIRM", "OMPI_MCA_rmaps_base_oversubscribe")
    full_env = {k: v for k, v in os.environ.items()
                if not (k.startswith(("OMPI_", "PMIX_", "PMI_")) and k not in keep)}
    full_env.update(env or {})
    proc = subprocess.run(cmd, capture_output=True, text=True, env=full_env, timeout=timeout)
    sys.stdout.write("$ %s\n  -> exit %d\n" % (" ".join(cmd), proc.returncode))
    if proc.returncode not in (0, 1, 2):
        sys.stdout.write(proc.stdout[-2000:] + proc.stderr[-2000:])
    for line in proc.stderr.splitlines():
        if line.startswith("[") or line.startswith("wallloads-report"):
            sys.stdout.write("  | %s\n" % line)
    sys.stdout.flush()
    return proc.returncode, proc.stdout, proc.stderr


def read_csv(path):
    """(header, rows as lists) of a CSV file."""
    with open(path, newline="") as handle:
        rows = list(csv.reader(handle))
    return rows[0], rows[1:]


def csv_table(path, key=0):
    """{first column: {header: value as float when it parses}}."""
    header, rows = read_csv(path)
    out = {}
    for r in rows:
        out[r[key]] = {h: _num(v) for h, v in zip(header, r)}
    return out


def _num(v):
    try:
        return float(v)
    except ValueError:
        return v


def read_json(path):
    with open(path) as handle:
        return json.load(handle)


def expect(label, condition, detail=""):
    print("%-72s %s %s" % (label, "ok" if condition else "FAILED", detail))
    sys.stdout.flush()
    assert condition, "%s: %s" % (label, detail)


def close(label, got, expected, rtol=0.0, atol=0.0, source=""):
    err = abs(got - expected)
    ok = math.isfinite(got) and err <= atol + rtol * abs(expected)
    print("%-60s got %.12g expected %.12g |err| %.2e (tol %.0e rel, %.0e abs)%s %s" % (
        label, got, expected, err, rtol, atol, (" [" + source + "]") if source else "", "ok" if ok else "FAILED"))
    sys.stdout.flush()
    assert ok, "%s: %r vs %r" % (label, got, expected)


def _unit_scales(obj, scales=None):
    """{unit: largest magnitude} over every {"value": v, "unit": u} in a JSON value."""
    scales = {} if scales is None else scales
    if isinstance(obj, dict):
        if "value" in obj and "unit" in obj:
            vals = obj["value"] if isinstance(obj["value"], list) else [obj["value"]]
            for v in vals:
                if isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v):
                    scales[obj["unit"]] = max(scales.get(obj["unit"], 0.0), abs(v))
        for v in obj.values():
            _unit_scales(v, scales)
    elif isinstance(obj, list):
        for v in obj:
            _unit_scales(v, scales)
    return scales


def same_json(a, b, rtol=1e-12, skip=("created",)):
    """same_numbers for two loads.json: a value with a unit is compared to rtol
    of the largest value of that unit in the file (a component that is zero up
    to round-off is not compared to itself), other numbers relative."""
    return same_numbers(a, b, rtol, skip=skip, scales=_unit_scales(a))


def same_csv(path_a, path_b, rtol=1e-12):
    """Two CSV files: the same header and text; numbers to rtol of the largest
    value in the file of the same unit (the unit in the header's [...]), counts
    relative to themselves."""
    ha, ra = read_csv(path_a)
    hb, rb = read_csv(path_b)
    if ha != hb or len(ra) != len(rb):
        return ["headers or row counts differ"]
    units = [h[h.rfind("[") + 1:-1] if h.endswith("]") and "[" in h else None for h in ha]
    scale = {}
    for rows in (ra, rb):
        for r in rows:
            for u, v in zip(units, r):
                x = _num(v)
                if u and isinstance(x, float) and math.isfinite(x):
                    scale[u] = max(scale.get(u, 0.0), abs(x))
    diffs = []
    for i, (x_row, y_row) in enumerate(zip(ra, rb)):
        for j, (x, y) in enumerate(zip(x_row, y_row)):
            x, y = _num(x), _num(y)
            if isinstance(x, float) and isinstance(y, float):
                if math.isnan(x) and math.isnan(y):
                    continue
                ref = max(abs(x), abs(y), scale.get(units[j], 0.0) if units[j] is not None else 0.0)
                if not abs(x - y) <= rtol * ref:
                    diffs.append("row %d %s: %r != %r" % (i + 1, ha[j], x, y))
            elif x != y:
                diffs.append("row %d %s: %r != %r" % (i + 1, ha[j], x, y))
    return diffs


def same_numbers(a, b, rtol=1e-12, path="", skip=("created",), scales=None, unit=None):
    """Compare two JSON-like values: numbers to rtol (relative to the larger, or
    to scales[unit] for values with a unit), everything else equal.  Returns
    the list of differences."""
    diffs = []
    if isinstance(a, dict) and isinstance(b, dict) and "value" in a and "unit" in a and scales is not None:
        return same_numbers(a.get("value"), b.get("value"), rtol, path + "/value", skip, scales, a["unit"])
    if isinstance(a, dict) and isinstance(b, dict):
        for k in sorted(set(a) | set(b)):
            if k in skip:
                continue
            if k not in a or k not in b:
                diffs.append("%s/%s only in one" % (path, k))
            else:
                diffs += same_numbers(a[k], b[k], rtol, "%s/%s" % (path, k), skip, scales, unit)
    elif isinstance(a, list) and isinstance(b, list):
        if len(a) != len(b):
            diffs.append("%s: lengths %d and %d" % (path, len(a), len(b)))
        else:
            for i, (x, y) in enumerate(zip(a, b)):
                diffs += same_numbers(x, y, rtol, "%s[%d]" % (path, i), skip, scales, unit)
    elif isinstance(a, (int, float)) and isinstance(b, (int, float)) and not isinstance(a, bool):
        ref = max(abs(a), abs(b), (scales or {}).get(unit, 0.0) if unit is not None else 0.0)
        if not (math.isnan(a) and math.isnan(b)) and abs(a - b) > rtol * ref:
            diffs.append("%s: %r != %r" % (path, a, b))
    elif a != b:
        diffs.append("%s: %r != %r" % (path, a, b))
    return diffs


def csv_numbers(path):
    """The CSV as a list of rows with numbers parsed (for same_numbers)."""
    header, rows = read_csv(path)
    return [header] + [[_num(v) for v in r] for r in rows]


def done(name):
    print("%s: all checks passed" % name)
    sys.stdout.flush()
