"""Every case format through `wallloads-report`, end to end, in one sweep:

- VTK XML written in appended mode (ParaView's default): a .vtm of wall
  surfaces, the same walls as a .vtpc partitioned collection, and a .pvd time
  series; read whole (the launcher preloads the expat fix);
- CGNS: a hexahedral channel with six named boundary patches (walls = two of
  them, chosen by name), the shear reconstructed from the cell velocity;
- Exodus II: the same channel with side sets as walls and three time steps.

The channel carries plane Couette flow and hydrostatic pressure, whose wall
loads are exact on any hexahedral mesh (scenes/formats.py): the floor's
viscous force mu U / H A along x (White, Viscous Fluid Flow, 3rd ed., sec.
3-2.1), the pressure forces -(p0 - p_ref) A and (p0 - rho g H - p_ref) A along
z. The near-wall difference is exact for a linear profile, so the only error
is round-off (double) or the single-precision coordinates of the Exodus
reader (1e-6).

Then the sweep's index.html and summary.csv, the units in every header, and
what loads.json records (config, choices, software version, checksums).
"""
import hashlib
import os

import report_testing as R
import scenes.formats as F

W = R.workdir("formats")
case = F.channel()
big = F.channel(nx=48, ny=24, nz=2)         # walls of 1152 faces each: files of ~100 kB
speeds = [0.3, 0.45, 0.6]
times = [0.0, 0.5, 1.0]
files = {
    "walls": F.write_vtm_appended(F.channel_blocks(big), os.path.join(W, "walls.vtm")),
    "collection": F.write_vtpc_appended(F.channel_blocks(big), os.path.join(W, "collection.vtpc")),
    "series": F.write_pvd([(t, F.channel_blocks(case, U)) for t, U in zip(times, speeds)],
                          os.path.join(W, "series.pvd")),
    "patches": F.write_cgns(os.path.join(W, "patches.cgns"), case),
    "sidesets": F.write_exodus(os.path.join(W, "sidesets.exo"), case, times=times, speeds=speeds),
}
par = case["params"]
P_REF = 0.99e5
config = os.path.join(W, "sweep.toml")
with open(config, "w") as handle:
    handle.write("""
cases = [%s]
[walls]
blocks = ["floor", "lid"]
[pressure]
reference = %r
[fluid]
density = %r
viscosity = %r
[shear]
wall_velocity = "wall_velocity"
[reference]
speed = 0.5
area = 2.0
[output]
images = "no"
title = "Channel sweep"
""" % (", ".join('"%s"' % os.path.basename(f) for f in files.values()), P_REF, par["rho"], par["mu"]))

out = os.path.join(W, "out")
code, _, err = R.run(["--config", config, "-o", out])
R.expect("sweep of five formats: exit code 0", code == 0, err[-2000:] if code else "")
R.expect("summary line on stderr", "5 cases, 5 done, 0 failed" in err, err[-300:])
for name in files:
    R.expect("progress of case '%s' on stderr" % name, "%s: done in" % name in err)

for name, path in files.items():
    folder = os.path.join(out, name)
    got = sorted(os.listdir(folder))
    R.expect("%s: loads.csv, loads.json, report.html" % name,
             {"loads.csv", "loads.json", "report.html"} <= set(got), got)
    rows = R.csv_table(os.path.join(folder, "loads.csv"))
    U = speeds[-1] if name in ("series", "sidesets") else par["U"]
    c = big if name in ("walls", "collection") else case
    exact = F.channel_exact(c, p_ref=P_REF, U=U)
    rtol = 1e-6 if name == "sidesets" else 1e-12     # the Exodus reader gives float coordinates
    for wall in ("floor", "lid"):
        fp, fv = exact[wall]
        R.close("%s %s: viscous force x" % (name, wall), rows[wall]["Viscous Force X [N]"], fv[0], rtol=rtol,
                source="Couette: mu U / H A")
        R.close("%s %s: pressure force z" % (name, wall), rows[wall]["Pressure Force Z [N]"], fp[2], rtol=rtol,
                source="hydrostatic pressure")
        faces = c["params"]["nx"] * c["params"]["ny"]
        R.expect("%s %s: every face read (%d)" % (name, wall, faces), rows[wall]["Faces [-]"] == faces,
                 rows[wall]["Faces [-]"])
    rec = R.read_json(os.path.join(folder, "loads.json"))
    R.expect("%s: json has units of every column" % name,
             rec["regions"]["Total"]["Force"]["unit"] == "N" and rec["regions"]["Total"]["Area"]["unit"] == "m^2")
    R.expect("%s: json records the config" % name, rec["config"]["fluid"]["viscosity"] == par["mu"]
             and rec["config"]["walls"]["blocks"] == ["floor", "lid"])
    R.expect("%s: json records the software version" % name, rec["software"]["name"] == "WallLoads"
             and rec["software"]["version"] not in ("", "unknown"), rec["software"])
    with open(path, "rb") as handle:
        digest = hashlib.sha256(handle.read()).hexdigest()
    R.expect("%s: json records the input's sha256" % name, rec["case"]["files"][0]["sha256"] == digest)
    if name in ("walls", "collection", "series"):
        R.expect("%s: checksums cover the referenced pieces" % name, len(rec["case"]["files"]) > 1,
                 len(rec["case"]["files"]))
    expected_source = "array" if name in ("walls", "collection", "series") else "volume"
    R.expect("%s: shear source chosen automatically: %s" % (name, expected_source),
             rec["choices"]["shear"]["source"] == expected_source, rec["choices"]["shear"])
    if name in ("series", "sidesets"):
        R.close("%s: loads at the last time step" % name, rec["case"]["report_time"], times[-1])
        R.expect("%s: three time steps" % name, rec["case"]["time_steps"] == 3)

# History, statistics and distribution, when this build has Load History and
# Load Distribution (the command makes them then; checked against the exact
# Couette loads of every step and against the loads table).
from wallloads import batch  # noqa: E402
simple = batch.load_plugin()
if hasattr(simple, "LoadHistory"):
    for name in ("series", "sidesets"):
        folder = os.path.join(out, name)
        R.expect("%s: history and statistics written" % name,
                 all(os.path.exists(os.path.join(folder, f)) for f in ("history.csv", "statistics.csv")))
        hist = R.csv_table(os.path.join(folder, "history.csv"))
        R.expect("%s: one history row per step" % name, sorted(hist) == ["0.0", "0.5", "1.0"], sorted(hist))
        rtol = 1e-6 if name == "sidesets" else 1e-12
        for t, U in zip(times, speeds):
            R.close("%s: history floor viscous force x at t = %g" % (name, t),
                    hist[repr(t)]["floor: Viscous Force X [N]"], F.channel_exact(case, U=U)["floor"][1][0],
                    rtol=rtol, source="Couette")
        stats = R.csv_table(os.path.join(folder, "statistics.csv"))
        R.expect("%s: statistics carry the quantity's unit" % name,
                 stats["floor: Viscous Force X"]["Unit"] == "N", stats["floor: Viscous Force X"])
        if not hasattr(simple, "LoadDistribution"):
            continue
        R.expect("%s: distribution written" % name, os.path.exists(os.path.join(folder, "distribution.csv")))
        dist_header, dist_rows = R.read_csv(os.path.join(folder, "distribution.csv"))
        col = {h: i for i, h in enumerate(dist_header)}
        total = sum((float(r[col["End [m]"]]) - float(r[col["Start [m]"]])) * float(r[col["Force Per Length Z [N/m]"]])
                    for r in dist_rows)
        loads = R.csv_table(os.path.join(folder, "loads.csv"))
        R.close("%s: distribution adds up to the total force z" % name, total, loads["Total"]["Force Z [N]"],
                rtol=1e-12, source="bins split faces exactly")
else:
    print("this build has no Load History: history and distribution not checked")

header, _ = R.read_csv(os.path.join(out, "walls", "loads.csv"))
R.expect("loads.csv header carries units", "Force X [N]" in header and "Moment X [N m]" in header
         and "Area [m^2]" in header, header[:8])
R.expect("CGNS walls are the named patches", R.read_json(os.path.join(out, "patches", "loads.json"))
         ["choices"]["walls"] == ["Base/fluid/Patches/floor", "Base/fluid/Patches/lid"]
         or all(w.endswith(("floor", "lid")) for w in R.read_json(os.path.join(out, "patches", "loads.json"))
                ["choices"]["walls"]))
R.expect("Exodus walls are side sets", R.read_json(os.path.join(out, "sidesets", "loads.json"))
         ["choices"]["walls"] == ["Side Sets/floor", "Side Sets/lid"])

summary = R.csv_table(os.path.join(out, "summary.csv"))
R.expect("summary.csv: one row per case", sorted(summary) == sorted(files), sorted(summary))
R.expect("summary.csv: all done", all(r["Status"] == "done" for r in summary.values()))
R.expect("summary.csv header carries units", "Drag [N]" in next(iter(summary.values())))
with open(os.path.join(out, "index.html")) as handle:
    index = handle.read()
for name in files:
    R.expect("index.html links %s/report.html" % name, 'href="%s/report.html"' % name in index)
leftovers = [f for f in os.listdir(out) if f.startswith(".")]
R.expect("no staging folders or temporary files left", not leftovers, leftovers)
R.done(__file__)

# Time selection: the loads at the step nearest a requested time, and a range
# that holds no step refused by name.
out2 = os.path.join(W, "out-time")
code, _, err = R.run(["--images", "no", "--walls", "floor,lid", "--viscosity", repr(par["mu"]), "--wall-velocity",
                      "wall_velocity", "--report-time", "0.4", "-o", out2, files["sidesets"]])
R.expect("--report-time 0.4: exit 0", code == 0, err[-800:] if code else "")
rows = R.csv_table(os.path.join(out2, "sidesets", "loads.csv"))
R.close("--report-time 0.4: loads of the nearest step (t = 0.5, U = 0.45)", rows["floor"]["Viscous Force X [N]"],
        F.channel_exact(case, U=speeds[1])["floor"][1][0], rtol=1e-6, source="Couette")
code, _, err = R.run(["--images", "no", "--time-range", "2,3", "-o", os.path.join(W, "out-range"), files["sidesets"]])
R.expect("--time-range outside the steps: exit 1 naming the range and the steps", code == 1
         and "time.range [2, 3] s holds none of the case's 3 time steps (0 to 1 s)" in err, err[-300:])
R.done(__file__ + " (time selection)")

# A wall across the distribution axis spans no length along it (the floor
# alone, axis along z): the loads are still reported, and the distribution
# is left out with Load Distribution's reason.
out3 = os.path.join(W, "out-flat")
code, _, err = R.run(["--images", "no", "--walls", "floor", "--distribution-axis", "0,0,1", "-o", out3,
                      files["walls"]])
R.expect("floor across the distribution axis: exit 0", code == 0, err[-800:] if code else "")
R.expect("floor across the distribution axis: loads written, no distribution.csv",
         os.path.exists(os.path.join(out3, "walls", "loads.csv"))
         and not os.path.exists(os.path.join(out3, "walls", "distribution.csv")))
record = R.read_json(os.path.join(out3, "walls", "loads.json"))
reasons = [r for r in record.get("left_out", []) if r.startswith("no distribution")]
R.expect("floor across the distribution axis: the reason is recorded",
         len(reasons) == 1 and "span no length along the axis" in reasons[0], record.get("left_out"))
R.done(__file__ + " (distribution left out)")
