"""MPI fuzz: random pieces on every rank, hostile on some, through the filters.

    mpirun -np 3 pvbatch --mpi --symmetric tests/fuzz/fuzz_mpi.py --seeds 0:300

Each rank builds its own piece from (seed, rank): well formed on most ranks,
hostile (fuzz_inputs) on one or more, sometimes empty, sometimes a composite
with a different number of leaves than the other ranks. Every rank runs the
same filters with the same settings (taken from the seed alone). Checks:

- nothing hangs (a watchdog ends the run with the stack after 60 s) or crashes;
- every rank reaches the same verdict (all succeed or all fail), and a failing
  run carries an error message on at least one rank;
- the global field-data totals are the same on every rank;
- Load Distribution: the table on rank 0 only, one row per bin.

A failed check prints the seed and exits 1 on every rank.
"""
import argparse
import faulthandler
import os
import sys

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import fuzz_filters as F  # noqa: E402
import fuzz_inputs as I  # noqa: E402

from vtkmodules.vtkCommonCore import vtkDoubleArray  # noqa: E402
from vtkmodules.vtkParallelCore import vtkCommunicator, vtkMultiProcessController  # noqa: E402

CONTROLLER = vtkMultiProcessController.GetGlobalController()
RANK = CONTROLLER.GetLocalProcessId() if CONTROLLER else 0
SIZE = CONTROLLER.GetNumberOfProcesses() if CONTROLLER else 1


def all_reduce(values, op):
    send, recv = vtkDoubleArray(), vtkDoubleArray()
    send.SetNumberOfTuples(len(values))
    for i, v in enumerate(values):
        send.SetValue(i, float(v))
    recv.SetNumberOfTuples(len(values))
    if SIZE > 1:
        CONTROLLER.AllReduce(send, recv, op)
        return [recv.GetValue(i) for i in range(len(values))]
    return list(values)


def agree(ok, msgs, what):
    """Every rank must reach the same verdict; a failure carries a message somewhere."""
    lo = all_reduce([1 if ok else 0], vtkCommunicator.MIN_OP)[0]
    hi = all_reduce([1 if ok else 0], vtkCommunicator.MAX_OP)[0]
    errs = all_reduce([len(msgs.errors)], vtkCommunicator.SUM_OP)[0]
    F.check(lo == hi, "%s: ranks disagree (some succeeded, some failed)" % what)
    if not ok:
        F.check(errs > 0, "%s failed on every rank without an error message" % what)
    return bool(lo)


def same_on_all_ranks(obj, names, what):
    for name in names:
        v = F.field_value(obj, name)
        local = [np.nan] * 3 if v is None else list(np.resize(v, 3))
        finite = [x if np.isfinite(x) else 1e300 for x in local]
        lo = all_reduce(finite, vtkCommunicator.MIN_OP)
        hi = all_reduce(finite, vtkCommunicator.MAX_OP)
        for a, b in zip(lo, hi):
            F.check(abs(a - b) <= 1e-12 * max(abs(a), abs(b), 1e-300),
                    "%s: field '%s' differs between ranks (%r vs %r)" % (what, name, a, b))


def piece(rng_case, rng_rank, kind):
    """This rank's piece: same shape of tree on most ranks, not all."""
    # Draw from rng_case unconditionally: the settings that follow come from
    # it and must be the same on every rank whatever this rank's piece is.
    composite = rng_case.random() >= 0.5
    hostile = rng_rank.random() < 0.3
    if rng_rank.random() < 0.15:
        return None if kind == "volume" else I.random_surface(rng_rank, False) if hostile else F.vtkPolyData()
    make = (lambda: I.random_volume(rng_rank, not hostile)) if kind == "volume" else \
        (lambda: I.random_surface(rng_rank, not hostile))
    if not composite:
        return make()
    return I.random_composite(rng_rank, make, not hostile)


def run_case(seed, stats):
    rng_case = np.random.default_rng(seed)          # the same on every rank: settings
    rng_rank = np.random.default_rng([seed, RANK])  # this rank's data
    kind = "volume" if rng_case.random() < 0.3 else "surface"
    data = piece(rng_case, rng_rank, kind)
    if kind == "surface":
        if data is None:
            data = F.vtkPolyData()
        ws = F.wall_traction_settings(rng_case, data, clean=False)
        # settings come from the case; array selections must not depend on the local piece
        ok, outs, msgs = F.execute(F.make_wall_traction(ws), [data])
        ok = agree(ok, msgs, "Wall Traction")
        stats["wt_ok" if ok else "wt_fail"] += 1
        if not ok:
            return
        same_on_all_ranks(outs[0], ["Wetted Area", "Skipped Non-Surface Cells"], "Wall Traction")
        ls = F.load_integration_settings(rng_case, data, clean=False)
        ok2, outs2, msgs2 = F.execute(F.make_load_integration(ls), [outs[0]])
        ok2 = agree(ok2, msgs2, "Load Integration")
        stats["li_ok" if ok2 else "li_fail"] += 1
        if ok2:
            same_on_all_ranks(outs2[0], F.TOTAL_NAMES, "Load Integration")
        # Load Distribution on the same Wall Traction output; its settings from
        # a stream of their own, the same on every rank.
        ds = F.load_distribution_settings(np.random.default_rng([seed, 1 << 30]), clean=False)
        ok3, outs3, msgs3 = F.execute(F.make_load_distribution(ds), [outs[0]])
        ok3 = agree(ok3, msgs3, "Load Distribution")
        stats["ld_ok" if ok3 else "ld_fail"] += 1
        if ok3:
            rows = outs3[0].GetNumberOfRows()
            F.check(rows in (0, ds["NumberOfBins"]) if RANK == 0 else rows == 0,
                    "Load Distribution: %d rows on rank %d for %d bins (the table is on rank 0 only)"
                    % (rows, RANK, ds["NumberOfBins"]))
    else:
        if data is None:
            data = F.vtkPolyData()
        ss = F.shear_projection_settings(rng_case, data, clean=False)
        ok, outs, msgs = F.execute(F.make_shear_projection(ss), [data, None])
        ok = agree(ok, msgs, "Shear Projection")
        stats["sp_ok" if ok else "sp_fail"] += 1


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seeds", default="0:100")
    ap.add_argument("--hang-seconds", type=float, default=60.0)
    ap.add_argument("--verbose", action="store_true", help="rank 0 prints each seed before running it")
    args = ap.parse_args()
    err = os.fdopen(2, "w", closefd=False)  # pvbatch replaces sys.stderr with an object without a file
    # pvbatch routes print() through VTK's output window, which the driver
    # replaces to catch messages: write the verdicts to the real stdout.
    out = os.fdopen(1, "w", closefd=False)
    faulthandler.enable(file=err)
    from collections import Counter
    stats = Counter()
    a, b = (int(x) for x in args.seeds.split(":"))
    for seed in range(a, b):
        faulthandler.dump_traceback_later(args.hang_seconds, exit=True, file=err)
        if args.verbose and RANK == 0:
            err.write("seed %d\n" % seed)
            err.flush()
        try:
            run_case(seed, stats)
        except F.CheckFailed as exc:
            out.write("rank %d: FUZZ FAILURE at seed %d: %s\n" % (RANK, seed, exc))
            out.flush()
            faulthandler.cancel_dump_traceback_later()
            sys.exit(1)
    faulthandler.cancel_dump_traceback_later()
    if RANK == 0:
        out.write("fuzz (MPI, %d ranks): %d cases, no failure; %s\n" % (SIZE, b - a, dict(sorted(stats.items()))))
        out.flush()


main()
