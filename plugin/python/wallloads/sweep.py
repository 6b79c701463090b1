"""Over several cases: summary.csv, index.html and the mesh-convergence study
of `wallloads-report` (one row per case; Celik et al. 2008 over three)."""
import csv
import io
import math
import os
import sys

from . import batch, convergence, htmlreport, outputs

SUMMARY_COLUMNS = ["Faces", "Area", "Force", "Moment", "Drag", "Side Force", "Lift", "Rolling Moment",
                   "Pitching Moment", "Yawing Moment", "Drag Coefficient", "Side Force Coefficient",
                   "Lift Coefficient", "Rolling Moment Coefficient", "Pitching Moment Coefficient",
                   "Yawing Moment Coefficient"]


def summary_csv(results):
    """One row per case: status, file, report time, the Total row with units, the error."""
    units = {}
    present = []
    for r in results:
        total = r.rows.get("Total", {})
        for c in SUMMARY_COLUMNS:
            if c in total and c not in present:
                present.append(c)
                units[c] = r.units.get(c, batch.UNITS.get(c, ""))
    width = {c: 3 if any(isinstance(r.rows.get("Total", {}).get(c), tuple) for r in results) else 1
             for c in present}
    out = io.StringIO()
    w = csv.writer(out, lineterminator="\n")
    header = ["Case", "Status", "File", "Report Time [s]"]
    for c in present:
        header += (["%s %s [%s]" % (c, a, units[c]) for a in "XYZ"] if width[c] == 3
                   else ["%s [%s]" % (c, units[c])])
    w.writerow(header + ["Error"])
    for r in results:
        total = r.rows.get("Total", {})
        rt = r.record.get("case", {}).get("report_time") if r.record else None
        line = [r.name, r.status, r.path, outputs.fmt(rt) if rt is not None else ""]
        for c in present:
            v = total.get(c)
            if v is None:
                line += [""] * width[c]
            else:
                line += [outputs.fmt(x) for x in v] if isinstance(v, tuple) \
                    else [outputs.fmt(v, c in outputs.COUNTS)]
        w.writerow(line + [r.error])
    return out.getvalue()


def write_index(settings, results, study_result, out_dir, caution, version):
    """summary.csv and index.html of all cases, each written atomically."""
    outputs.write_atomic(os.path.join(out_dir, "summary.csv"), summary_csv(results))
    outputs.write_atomic(os.path.join(out_dir, "index.html"),
                         htmlreport.index_page(settings["output.title"] or "Wall loads", results,
                                               study_result, caution, version))


def _stderr(text):
    sys.stdout.flush()
    os.write(2, text.encode("utf-8", "replace"))


def _err(text):
    _stderr("wallloads-report: error: %s\n" % text)


def convergence_study(settings, results, out_dir):
    """Observed order, Richardson extrapolation and GCI of every total load and
    coefficient from the fine, medium and coarse cases."""
    if any(r.status != "done" for r in results):
        _err("mesh convergence needs all three cases; %s failed"
             % ", ".join(r.name for r in results if r.status != "done"))
        return None
    mode = settings["convergence.cell_size"]
    have_volume = all(r.cell_size.get("volume") for r in results)
    if mode == "volume" and not have_volume:
        _err("convergence.cell_size = 'volume' but the cases hold no volume")
        return None
    use_volume = mode == "volume" or (mode == "auto" and have_volume)
    sizes = []
    for r in results:
        cs = r.cell_size
        if use_volume:
            sizes.append(convergence.cell_size(cs["volume"], cs["cells"], 3))
        else:
            sizes.append(convergence.cell_size(cs["area"], cs["faces"], 2))
    if not sizes[0] < sizes[1] < sizes[2]:
        _err("the cases are not ordered FINE MEDIUM COARSE: representative cell sizes %s"
             % ", ".join("%s %.4g m" % (r.name, h) for r, h in zip(results, sizes)))
        return None
    values, units = {}, {}
    skip = {"Faces", "Skipped Faces", "Region Id", "Area", "Line Of Action Point", "Residual Couple"}
    total = results[0].rows["Total"]
    for col, v in total.items():
        if col in skip:
            continue
        per_case = [r.rows["Total"].get(col) for r in results]
        if any(x is None for x in per_case):
            continue
        if isinstance(v, tuple):
            for k, axis in enumerate("XYZ"[:len(v)]):
                values["%s %s" % (col, axis)] = [x[k] for x in per_case]
                units["%s %s" % (col, axis)] = results[0].units.get(col, "")
        else:
            values[col] = per_case
            units[col] = results[0].units.get(col, "")
    study = convergence.study(values, sizes, units, settings["convergence.safety_factor"])
    record = {"method": "Celik et al. 2008, J. Fluids Eng. 130(7):078001; factor of safety %g (Roache 1998)"
                        % settings["convergence.safety_factor"],
              "cell_size": "volume" if use_volume else "area",
              "cases": [{"name": r.name, "file": r.path, "h": h} for r, h in zip(results, sizes)],
              "quantities": study}
    text = io.StringIO()
    w = csv.writer(text, lineterminator="\n")
    w.writerow(["Quantity", "Unit", "Fine", "Medium", "Coarse", "h1 [m]", "h2 [m]", "h3 [m]", "r21", "r32",
                "Observed Order", "Extrapolated", "Approximate Relative Error", "Extrapolated Relative Error",
                "GCI Fine", "GCI Fine Absolute", "Behaviour", "Note"])
    for q, res in study.items():
        w.writerow([q, res["unit"]] + [outputs.fmt(x) for x in res["phi"]] + [outputs.fmt(x) for x in res["h"]]
                   + [outputs.fmt(res[k]) for k in ("r21", "r32", "order", "phi_ext", "e_a", "e_ext", "gci",
                                                    "gci_abs")] + [res["behaviour"], res["note"]])
    outputs.write_atomic(os.path.join(out_dir, "convergence.csv"), text.getvalue())
    outputs.write_atomic(os.path.join(out_dir, "convergence.json"), outputs.json_text(record))
    _stderr("wallloads-report: mesh convergence (%s cell size): h = %s m\n"
            % (record["cell_size"], ", ".join("%.4g" % h for h in sizes)))
    for q in ("Drag", "Lift", "Force Z"):
        if q in study and math.isfinite(study[q]["order"]):
            _stderr("  %s: order %.3f, extrapolated %.6g %s, GCI %.3g %% (%s)\n" % (
                q, study[q]["order"], study[q]["phi_ext"], study[q]["unit"], 100 * study[q]["gci"],
                study[q]["behaviour"]))
    return record
