"""`mpirun -np 3 wallloads-report` gives the same files as a serial run: every
number of loads.csv, loads.json, summary.csv (and of history, statistics and
distribution CSV where this build makes them) equal to 1e-12 relative to the
largest value of its unit in the file (components that are zero up to
round-off, e.g. 1e-19 N beside forces of 1e-4 N, are not compared to
themselves), apart from the creation time; the same files are made.  Cases: the demo bead
(three blocks spread over the ranks), appended-mode channel walls (two
blocks) and a .pvd time series.  Refused under mpirun, with the reason
(checked at the end): CGNS (ParaView 5.11's CGNS reader loads no boundary
patches on more than one rank) and Exodus II (its reader gives every block to
the first rank and none to the others)."""
import os

import report_testing as R
import scenes.formats as F

W = R.workdir("mpi")
case = F.channel()
cases = [os.path.join(R.SOURCE, "examples", "demo", "bead.vtm"),
         F.write_vtm_appended(F.channel_blocks(F.channel(nx=24, ny=12, nz=2)), os.path.join(W, "walls.vtm")),
         F.write_pvd([(t, F.channel_blocks(case, U)) for t, U in ((0.0, 0.3), (0.5, 0.4), (1.0, 0.5))],
                     os.path.join(W, "series.pvd"))]
exodus = F.write_exodus(os.path.join(W, "sidesets.exo"), case, times=[0.0, 0.5, 1.0], speeds=[0.3, 0.4, 0.5])
args = ["--images", "no", "--viscosity", "1.5e-3", "--wall-velocity", "wall_velocity", "--reference-speed", "0.5", "--moment-centre", "0.1,0.2,0.3",
        "--distribution-axis", "1,0,0", "--bins", "7"] + cases
serial, parallel = os.path.join(W, "serial"), os.path.join(W, "np3")
code, _, err = R.run(args + ["-o", serial])
R.expect("serial run: exit 0", code == 0, err[-800:] if code else "")
code, _, err = R.run(args + ["-o", parallel], mpi=3)
R.expect("mpirun -np 3: exit 0", code == 0, err[-3000:] if code else "")


def files_of(root):
    out = []
    for folder, _, names in os.walk(root):
        out += [os.path.relpath(os.path.join(folder, n), root) for n in names]
    return sorted(out)


R.expect("the same files", files_of(serial) == files_of(parallel), (files_of(serial), files_of(parallel)))
compared = 0
for rel in files_of(serial):
    a, b = os.path.join(serial, rel), os.path.join(parallel, rel)
    if rel.endswith(".csv"):
        diffs = R.same_csv(a, b)
    elif rel.endswith(".json"):
        diffs = R.same_json(R.read_json(a), R.read_json(b), skip=("created", "directory"))
    else:
        continue
    compared += 1
    R.expect("%s: numbers equal to 1e-12" % rel, not diffs, diffs[:5])
R.expect("compared every CSV and JSON (%d files)" % compared, compared >= 7)

cgns = F.write_cgns(os.path.join(W, "patches.cgns"), case)
code, _, err = R.run(["--images", "no", "-o", os.path.join(W, "cgns"), cgns], mpi=2)
R.expect("CGNS on 2 ranks: exit 1 naming the reader's limit", code == 1
         and "loads no boundary patches when it runs on more than one rank" in err, err[-400:])
code, _, err = R.run(["--images", "no", "-o", os.path.join(W, "exodus"), exodus], mpi=2)
R.expect("Exodus on 2 ranks: exit 1 naming the reader's layout (every block on the first rank)", code == 1
         and "cannot run on more than one rank" in err and "none to the others" in err, err[-400:])
R.done(__file__)
