"""Benchmark: Wall Traction + Load Integration against the stock VTK chain and numpy.

Run by hand (not a test), on an otherwise idle machine:

    source scripts/env.sh
    pvpython tests/benchmarks/benchmark_loads.py [--sizes 2 8] [--repeat 5] [--no-file]

Surfaces are closed quad spheres of about N million faces with a cell
pressure and a 9-component cell velocity gradient (random values, seeded). In
one run it times, best of --repeat, on the Sequential backend (one thread)
and on STDThread (all cores):

  * first execution: a new vtkWallTraction + vtkLoadIntegration pipeline
    (fresh output arrays, the orientation check on as by default), with all
    per-face arrays and with forces only; and, interleaved, with the check
    off, so that the check's own cost shows (the median of the differences
    of at least 15 pairs);
  * re-execution of the same pipeline on the unchanged mesh (a time-step
    loop: Wall Traction is modified, the check is reused, the output arrays
    are rewritten in place); Wall Traction and Load Integration separately;
  * re-execution on new objects with the same mesh (what a reader hands over
    every step: the mesh is recognised by its content hash);
  * a realistic step: reading the step from an uncompressed VTK XML file,
    inline binary (base64) and appended raw, then the loads (so that the
    share of each shows);
  * the equivalent chain of stock VTK filters on the same data: cell normals
    (vtkPolyDataNormals), array calculators for p n, for mu (G + G^T) n from
    the gradient components and for its tangential part, and
    vtkIntegrateAttributes (which multiplies by the cell areas);
  * the same sums written with numpy on the VTK arrays;
  * the machine's own thread scaling, by wallloads_thread_scaling (built
    with the tests, tests/benchmarks/thread_scaling.cxx): a loop that only
    computes and one that only streams the face loop's traffic, on one
    thread and on every core;
  * the thread speed-up of the re-execution on smaller spheres (forces
    only, --scaling-sizes, best of 30), whose data fit the last-level
    cache in part: where the second thread loses time, and whether the loss
    grows with the data moved;
  * the thread speed-up in pairs (--pairs, default 40): re-executions on
    one thread and on every core alternately, with the memory floor timed
    beside each, so that each ratio compares timings a few tens of
    milliseconds apart on a host whose memory bandwidth changes over
    seconds; with what a compute-plus-memory model predicts from them;
  * the memory floor of a loop on one thread and on all cores, in the same
    run: reading the inputs and rewriting arrays of the outputs' size with
    numpy, on one thread and split in equal parts between as many Python
    threads as cores (numpy's reductions and fills release the interpreter
    lock), so that the speed-up the memory system allows shows beside the
    filters';

and prints faces per second, the ratios, the thread speed-up, memory (output
arrays, peak resident memory beyond what was held before), the cache counters,
the share of CPU time the virtual machine's host took (steal) during the run,
and a summary table.
"""
import argparse
import os
import platform
import subprocess
import threading
import time

import numpy as np
from vtkmodules.util.numpy_support import numpy_to_vtk, numpy_to_vtkIdTypeArray, vtk_to_numpy
from vtkmodules.vtkCommonCore import vtkObject, vtkOutputWindow, vtkPoints, vtkSMPTools
from vtkmodules.vtkCommonDataModel import vtkCellArray, vtkPolyData
from vtkmodules.vtkFiltersCore import vtkArrayCalculator, vtkPolyDataNormals
from vtkmodules.vtkFiltersParallel import vtkIntegrateAttributes
from vtkmodules.vtkIOXML import vtkXMLPolyDataReader, vtkXMLPolyDataWriter

import wallloads
from wallloads.WallLoadsFilters import vtkLoadIntegration, vtkWallTraction

MU = 1.8e-5


def quad_sphere(n_faces, seed=7):
    """A closed sphere of quads (poles capped by degenerate-free quad fans
    avoided: rows of quads on a cylinder mapped to the sphere, plus two
    polar caps of triangles)."""
    n_az = int(round(np.sqrt(2 * n_faces)))
    n_pol = max(2, int(round(n_faces / n_az)))
    t = np.pi * np.arange(1, n_pol) / n_pol
    p = 2 * np.pi * np.arange(n_az) / n_az
    tt, pp = np.meshgrid(t, p, indexing="ij")
    ring = np.stack([np.sin(tt) * np.cos(pp), np.sin(tt) * np.sin(pp), np.cos(tt)], -1).reshape(-1, 3)
    pts = np.vstack([[0, 0, 1], ring, [0, 0, -1]])
    south = len(pts) - 1

    def rid(i, j):
        return 1 + i * n_az + (j % n_az)

    j = np.arange(n_az)
    tri_n = np.stack([np.zeros(n_az, int), rid(0, j), rid(0, j + 1)], -1)
    i, jj = np.meshgrid(np.arange(n_pol - 2), j, indexing="ij")
    quads = np.stack([rid(i, jj), rid(i + 1, jj), rid(i + 1, jj + 1), rid(i, jj + 1)], -1).reshape(-1, 4)
    tri_s = np.stack([np.full(n_az, south), rid(n_pol - 2, j + 1), rid(n_pol - 2, j)], -1)
    conn = np.concatenate([tri_n.ravel(), quads.ravel(), tri_s.ravel()]).astype(np.int64)
    sizes = np.concatenate([np.full(n_az, 3), np.full(len(quads), 4), np.full(n_az, 3)])
    offsets = np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64)
    cells = vtkCellArray()
    cells.SetData(numpy_to_vtkIdTypeArray(offsets, deep=1), numpy_to_vtkIdTypeArray(conn, deep=1))
    points = vtkPoints()
    points.SetData(numpy_to_vtk(pts, deep=1))
    pd = vtkPolyData()
    pd.SetPoints(points)
    pd.SetPolys(cells)
    rng = np.random.default_rng(seed)
    nf = pd.GetNumberOfCells()
    p_arr = numpy_to_vtk(rng.standard_normal(nf) + 1e5, deep=1)
    p_arr.SetName("p")
    g_arr = numpy_to_vtk(rng.standard_normal((nf, 9)), deep=1)
    g_arr.SetName("grad")
    pd.GetCellData().AddArray(p_arr)
    pd.GetCellData().AddArray(g_arr)
    return pd, pts, offsets, conn


def say(text):
    """Straight to stdout: pvpython routes print() through vtkOutputWindow,
    which is silenced below to keep Load Integration's notices out."""
    os.write(1, (text + "\n").encode())


def rss_kib(field="VmRSS"):
    with open("/proc/self/status") as handle:
        for line in handle:
            if line.startswith(field + ":"):
                return int(line.split()[1])
    return 0


def reset_peak():
    try:
        with open("/proc/self/clear_refs", "w") as handle:
            handle.write("5")
        return True
    except OSError:
        return False


def timed(fn, repeat):
    best, result, peak = float("inf"), None, 0
    for _ in range(repeat):
        result = None
        base = rss_kib()
        reset_peak()
        t0 = time.perf_counter()
        result = fn()
        dt = time.perf_counter() - t0
        peak = max(peak, rss_kib("VmHWM") - base)
        best = min(best, dt)
    return best, result, peak


class WallLoadsPipeline:
    """vtkWallTraction + vtkLoadIntegration built once and re-executed, as a
    time-step loop or an interactive session does."""

    def __init__(self, pd, check, forces_only=False):
        self.pd = pd
        self.wt = wt = vtkWallTraction()
        wt.SetInputData(pd)
        wt.SetInputArrayToProcess(0, 0, 0, 1, "p")
        wt.SetInputArrayToProcess(3, 0, 0, 1, "grad")
        wt.SetShearSource(vtkWallTraction.VELOCITY_GRADIENT)
        wt.SetViscosity(MU)
        wt.SetOrientation(vtkWallTraction.STORED_INTO_FLUID)
        wt.SetCheckOrientation(check)
        wt.SetPerFaceArrays(vtkWallTraction.FORCES_ONLY if forces_only else vtkWallTraction.ALL_ARRAYS)
        self.li = li = vtkLoadIntegration()
        li.SetInputConnection(wt.GetOutputPort())
        self.split = (0.0, 0.0)

    def __call__(self, pd=None):
        if pd is not None:
            self.wt.SetInputData(pd)
        self.wt.Modified()
        t0 = time.perf_counter()
        self.wt.Update()
        t1 = time.perf_counter()
        self.li.Update()
        self.split = (t1 - t0, time.perf_counter() - t1)
        fd = self.li.GetOutputDataObject(0).GetFieldData()
        force = np.array([fd.GetArray("Force").GetComponent(0, k) for k in range(3)])
        out = self.wt.GetOutputDataObject(0)
        out_bytes = sum(out.GetCellData().GetArray(i).GetActualMemorySize() * 1024
                        for i in range(out.GetCellData().GetNumberOfArrays())
                        if out.GetCellData().GetArrayName(i) not in ("p", "grad"))
        return force, out_bytes


def stock_chain(pd):
    normals = vtkPolyDataNormals()
    normals.SetInputData(pd)
    normals.ComputeCellNormalsOn()
    normals.ComputePointNormalsOff()
    normals.SplittingOff()
    normals.ConsistencyOff()
    normals.AutoOrientNormalsOff()
    pressure = vtkArrayCalculator()
    pressure.SetInputConnection(normals.GetOutputPort())
    pressure.SetAttributeTypeToCellData()
    pressure.AddScalarVariable("p", "p", 0)
    pressure.AddVectorArrayName("Normals")
    pressure.SetFunction("-p*Normals")
    pressure.SetResultArrayName("tp")
    viscous = vtkArrayCalculator()
    viscous.SetInputConnection(pressure.GetOutputPort())
    viscous.SetAttributeTypeToCellData()
    for k in range(9):
        viscous.AddScalarVariable("g%d" % k, "grad", k)
    for k, c in enumerate("xyz"):
        viscous.AddScalarVariable("n" + c, "Normals", k)
    div = "(2/3)*(g0+g4+g8)"
    rows = []
    for i in range(3):
        terms = "+".join("(g%d+g%d)*n%s" % (3 * i + j, 3 * j + i, "xyz"[j]) for j in range(3))
        rows.append("%g*((%s)-%s*n%s)" % (MU, terms, div, "xyz"[i]))
    viscous.SetFunction("iHat*(%s)+jHat*(%s)+kHat*(%s)" % tuple(rows))
    viscous.SetResultArrayName("tv")
    shear = vtkArrayCalculator()  # tangential part: the wall shear stress
    shear.SetInputConnection(viscous.GetOutputPort())
    shear.SetAttributeTypeToCellData()
    shear.AddVectorArrayName("tv")
    shear.AddVectorArrayName("Normals")
    shear.SetFunction("tv-dot(tv,Normals)*Normals")
    shear.SetResultArrayName("tw")
    integrate = vtkIntegrateAttributes()
    integrate.SetInputConnection(shear.GetOutputPort())
    integrate.Update()
    out = integrate.GetOutput().GetCellData()
    tp = np.array([out.GetArray("tp").GetComponent(0, k) for k in range(3)])
    tv = np.array([out.GetArray("tw").GetComponent(0, k) for k in range(3)])
    return tp + tv, 0


def numpy_sums(pd, pts, offsets, conn, exact=False):
    p = vtk_to_numpy(pd.GetCellData().GetArray("p"))
    g = vtk_to_numpy(pd.GetCellData().GetArray("grad")).reshape(-1, 3, 3)
    sizes = np.diff(offsets)
    area_vec = np.zeros((len(sizes), 3))
    for n in (3, 4):
        sel = np.nonzero(sizes == n)[0]
        ids = conn[offsets[sel][:, None] + np.arange(n)]
        v = pts[ids] - pts[ids[:, :1]]
        acc = np.zeros((len(sel), 3))
        for k in range(1, n - 1):
            acc += np.cross(v[:, k], v[:, k + 1])
        area_vec[sel] = 0.5 * acc
    area = np.linalg.norm(area_vec, axis=1)
    nrm = area_vec / area[:, None]
    tp = -p[:, None] * nrm
    sym = g + np.transpose(g, (0, 2, 1))
    tr = np.trace(g, axis1=1, axis2=2)
    tv = MU * (np.einsum("fij,fj->fi", sym, nrm) - (2.0 / 3.0) * tr[:, None] * nrm)
    tv -= np.einsum("fi,fi->f", tv, nrm)[:, None] * nrm  # tangential part
    forces = (tp + tv) * area[:, None]
    if exact:
        import math
        return np.array([math.fsum(forces[:, k]) for k in range(3)]), 0
    return forces.sum(axis=0), 0


def timed_split(run, repeat, arg=None):
    """Best of `repeat` executions of a WallLoadsPipeline: total, WT, LI."""
    best = (float("inf"), 0.0, 0.0)
    result = None
    for i in range(repeat):
        result = run(arg() if callable(arg) else arg)
        wt, li = run.split
        if wt + li < best[0]:
            best = (wt + li, wt, li)
    return best, result


def cpu_times():
    """The machine's CPU time counters (/proc/stat, all CPUs): (steal, total)."""
    try:
        with open("/proc/stat") as handle:
            fields = [int(v) for v in handle.readline().split()[1:9]]
        return fields[7], sum(fields)
    except (OSError, ValueError, IndexError):
        return 0, 0


def thread_scaling(faces):
    """The output of wallloads_thread_scaling (next to the tests in the
    build's bin directory), or why it is missing."""
    exe = os.path.join(os.path.dirname(os.path.abspath(wallloads.__file__)), "..", "..", "bin",
                       "wallloads_thread_scaling")
    if not os.path.exists(exe):
        return ["thread scaling: %s not built" % os.path.normpath(exe)]
    out = subprocess.run([exe, str(faces)], capture_output=True, text=True, timeout=600)
    return ["thread scaling, " + line for line in out.stdout.splitlines()]


def speed_up_by_size(millions, repeat=30):
    """Re-execution, forces only, best of `repeat` on one thread and on all
    cores; the time the threads take beyond half the one-thread time, per
    face (a fixed cost shows as a loss that shrinks per face with size)."""
    pd = quad_sphere(int(millions * 1e6))[0]
    nf = pd.GetNumberOfCells()
    best = {}
    for backend in ("Sequential", "STDThread"):
        vtkSMPTools.SetBackend(backend)
        run = WallLoadsPipeline(pd, True, True)
        best[backend] = timed_split(run, repeat)[0][1]
        del run
    one, more = best["Sequential"], best["STDThread"]
    say("%-34s %7d faces: one thread %.2f ms, %d threads %.2f ms, speed-up %.2fx; beyond half the"
        " one-thread time %.2f ns/face" % ("speed-up by size (WT, forces only)", nf, one * 1e3, os.cpu_count(),
                                          more * 1e3, one / more, (more - one / 2) / nf * 1e9))


def floor_inputs(pd, offsets, conn, pts):
    """The arrays Wall Traction reads, flat: pressure, gradient, offsets,
    connectivity, points."""
    return [a.ravel() for a in (vtk_to_numpy(pd.GetCellData().GetArray("p")),
                                vtk_to_numpy(pd.GetCellData().GetArray("grad")), offsets, conn, pts)]


def part(a, k, threads):
    """Part k of `threads` equal parts of a flat array."""
    return a[k * len(a) // threads:(k + 1) * len(a) // threads]


def on_threads(threads, work):
    """Wall-clock time of work(k) for k = 0..threads-1, each on its own
    Python thread (numpy releases the interpreter lock in the loops used)."""
    workers = [threading.Thread(target=work, args=(k,)) for k in range(1, threads)]
    t0 = time.perf_counter()
    for w in workers:
        w.start()
    work(0)
    for w in workers:
        w.join()
    return time.perf_counter() - t0


def read_once(inputs, threads):
    return on_threads(threads, lambda k: [np.add.reduce(part(a, k, threads)) for a in inputs])


def rewrite_once(out, threads):
    return on_threads(threads, lambda k: part(out, k, threads).fill(0.0))


OUTPUT_DOUBLES = {"forces only": 7, "all arrays": 24}


def memory_floor(pd, offsets, conn, pts, repeat, threads=1):
    """Same-run bound of a face loop on `threads` threads: the best time to
    read the arrays Wall Traction reads (pressure, gradient, offsets,
    connectivity, points) and to rewrite, in place, arrays of the size of its
    outputs (forces only: 7 doubles per face, all arrays: 24), measured with
    numpy; with several threads each Python thread takes an equal part of
    every array (numpy releases the interpreter lock in these loops)."""
    nf = pd.GetNumberOfCells()
    inputs = floor_inputs(pd, offsets, conn, pts)
    read_time = min(read_once(inputs, threads) for _ in range(repeat))
    writes = {}
    for label, per_face in OUTPUT_DOUBLES.items():
        out = np.ones(nf * per_face)
        writes[label] = min(rewrite_once(out, threads) for _ in range(repeat))
        del out
    return read_time, writes


def paired_speed_up(pd, offsets, conn, pts, forces_only, pairs):
    """The thread speed-up of the re-execution measured in pairs: Wall
    Traction + Load Integration on one thread (Sequential) and on every core
    (STDThread) alternately, `pairs` times, with the memory floor of the same
    outputs timed the same way beside them. Each ratio then compares two
    timings taken a few tens of milliseconds apart: the memory bandwidth a
    shared host leaves this machine changes over seconds, and a ratio of two
    best-of figures taken minutes apart measures that change as much as the
    second thread. Prints the medians, the median and spread of the pairs'
    ratios, and what the compute-plus-memory model says of them."""
    what = "forces only" if forces_only else "all arrays"
    nf = pd.GetNumberOfCells()
    threads = os.cpu_count()
    run = WallLoadsPipeline(pd, True, forces_only)
    for backend in ("Sequential", "STDThread"):
        vtkSMPTools.SetBackend(backend)
        timed_split(run, 2)  # both output buffers of the pool exist
    inputs = floor_inputs(pd, offsets, conn, pts)
    out = np.ones(nf * OUTPUT_DOUBLES[what])
    t1, t2, f1, f2 = [], [], [], []
    for _ in range(pairs):
        vtkSMPTools.SetBackend("Sequential")
        run()
        t1.append(sum(run.split))
        f1.append(read_once(inputs, 1) + rewrite_once(out, 1))
        vtkSMPTools.SetBackend("STDThread")
        run()
        t2.append(sum(run.split))
        f2.append(read_once(inputs, threads) + rewrite_once(out, threads))
    vtkSMPTools.SetBackend("Sequential")
    del run, out
    t1, t2, f1, f2 = (np.array(v) for v in (t1, t2, f1, f2))
    ratios, floor_ratios = t1 / t2, f1 / f2
    T1, T2, F1, F2 = (float(np.median(v)) for v in (t1, t2, f1, f2))
    # Model: the time beyond the floor is work that halves on two threads;
    # the floor is what the memory system takes on as many threads.
    predicted = (T1 - F1) / 2 + F2
    needed = 18 * F2 - 9 * F1  # one-thread time at which the model gives 1.8x
    label = "thread speed-up in pairs, " + what
    say("%-34s %d pairs: medians one thread %.2f ms, %d threads %.2f ms; pairs' ratios median %.2fx"
        " (quartiles %.2f-%.2fx, %d of %d at 1.8x or more); best times %.2fx"
        % (label, pairs, T1 * 1e3, threads, T2 * 1e3, np.median(ratios), np.percentile(ratios, 25),
           np.percentile(ratios, 75), int((ratios >= 1.8).sum()), pairs, t1.min() / t2.min()))
    say("%-34s memory floor in the same pairs: %.2f ms, %.2f ms, ratios median %.2fx; the loop on one"
        " thread at %.0f %% of its floor" % ("", F1 * 1e3, F2 * 1e3, np.median(floor_ratios), 100 * F1 / T1))
    say("%-34s model (T1 - F1)/2 + F2 = %.2f ms for %.2f ms measured (%+.0f %%); two threads at the floor"
        " would give %.2fx (T1/F2); 1.8x by the model needs a one-thread time of %.1f ms (%.1f M faces/s)"
        % ("", predicted * 1e3, T2 * 1e3, 100 * (T2 - predicted) / predicted, T1 / F2, needed * 1e3,
           nf / needed / 1e6 if needed > 0 else float("inf")))
    return dict(T1=T1, T2=T2, F1=F1, F2=F2, ratio=float(np.median(ratios)),
                floor_ratio=float(np.median(floor_ratios)), predicted=predicted, needed=needed,
                reached=int((ratios >= 1.8).sum()), pairs=pairs)


STEP_ENCODINGS = ("inline binary", "appended raw")


def write_step_file(pd, path, encoding):
    """A step as VTK XML, uncompressed: inline binary (base64 in the XML) or
    appended raw (bytes after the XML; read through the expat fix on Debian 12,
    which scripts/env.sh preloads)."""
    writer = vtkXMLPolyDataWriter()
    writer.SetInputData(pd)
    writer.SetFileName(path)
    writer.SetCompressorTypeToNone()
    if encoding == "inline binary":
        writer.SetDataModeToBinary()
    else:
        writer.SetDataModeToAppended()
        writer.SetEncodeAppendedData(False)
    writer.Write()


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--sizes", type=float, nargs="+", default=[2.0, 8.0],
                    help="surface sizes in millions of faces")
    ap.add_argument("--repeat", type=int, default=5)
    ap.add_argument("--no-file", action="store_true", help="skip the file step")
    ap.add_argument("--no-stock", action="store_true", help="skip the stock chain and numpy")
    ap.add_argument("--pairs", type=int, default=40,
                    help="pairs of one-thread and all-core re-executions for the thread speed-up (0: skip)")
    ap.add_argument("--scaling-sizes", type=float, nargs="*", default=[0.25, 0.5, 1.0],
                    help="smaller spheres (millions of faces) for the thread speed-up by size")
    args = ap.parse_args()
    vtkObject.GlobalWarningDisplayOff()
    vtkOutputWindow.GetInstance().SetDisplayModeToNever()  # Load Integration's notices
    cpu = "unknown"
    try:
        with open("/proc/cpuinfo") as handle:
            cpu = next(line.split(":", 1)[1].strip() for line in handle if line.startswith("model name"))
    except (OSError, StopIteration):
        pass
    say("machine: %s, %d cores, %s" % (cpu, os.cpu_count(), platform.platform()))
    say("load average at start: %s" % " ".join(open("/proc/loadavg").read().split()[:3]))
    steal0 = cpu_times()
    for line in thread_scaling(int(args.sizes[0] * 1e6)):
        say(line)
    for millions in args.scaling_sizes:
        speed_up_by_size(millions)
    summary, paired = [], []
    for millions in args.sizes:
        pd, pts, offsets, conn = quad_sphere(int(millions * 1e6))
        nf = pd.GetNumberOfCells()
        mf = lambda t: nf / t / 1e6
        say("\n== %d faces ==" % nf)
        vtkSMPTools.SetBackend("Sequential")
        floors = {}
        for threads, backend in ((1, "Sequential"), (os.cpu_count(), "STDThread")):
            read_floor, write_floor = memory_floor(pd, offsets, conn, pts, args.repeat, threads)
            for what, w in write_floor.items():
                floors[backend, what] = read_floor + w
                say("%-34s read inputs %.3f s + rewrite %s outputs %.3f s = %.3f s = %6.2f M faces/s (%s)"
                    % ("memory floor", read_floor, what, w, read_floor + w, mf(read_floor + w),
                       "one thread" if threads == 1 else "%d threads, %.2fx one thread"
                       % (threads, floors["Sequential", what] / floors[backend, what])))
        results = {}
        for backend in ("Sequential", "STDThread"):
            vtkSMPTools.SetBackend(backend)
            for forces_only in (False, True):
                what = "forces only" if forces_only else "all arrays"
                key = "%s, %s" % (backend, what)
                # First execution: a new pipeline (fresh arrays, the check
                # runs), interleaved with new pipelines without the check, so
                # that both see the same machine; first executions are
                # dominated by page faults and vary more than re-executions.
                # The check's cost is the median of the differences of Wall
                # Traction's time with and without it, pair by pair (15
                # pairs: a first execution's page faults vary by more than
                # the check costs, so a difference of two best-of figures is
                # mostly noise, and so was, on a busier host, a difference of
                # two medians of 7).
                firsts, first_split, checked, nocheck = [], None, [], []
                for _ in range(max(15, args.repeat)):
                    run = WallLoadsPipeline(pd, True, forces_only)
                    (t, wt_t, li_t), _ = timed_split(run, 1)
                    firsts.append(t)
                    checked.append(wt_t)
                    first_split = (wt_t, li_t) if t == min(firsts) else first_split
                    del run
                    run = WallLoadsPipeline(pd, False, forces_only)
                    (t, wt_t, li_t), _ = timed_split(run, 1)
                    nocheck.append(wt_t)
                    del run
                # Re-execution on the unchanged mesh (after two steps that
                # establish the two output buffers).
                run = WallLoadsPipeline(pd, True, forces_only)
                timed_split(run, 2)
                peak_base = rss_kib()
                reset_peak()
                (t, wt_t, li_t), (force, out_bytes) = timed_split(run, args.repeat)
                peak = rss_kib("VmHWM") - peak_base
                wt = run.wt
                results[key] = (t, force)
                results[key + " first"] = (min(firsts), force)
                check_cost = float(np.median(np.array(checked) - np.array(nocheck)))
                say("%-34s first %6.3f s (WT %.3f + LI %.3f) = %6.2f M faces/s; WT medians with check %.3f s,"
                      " without %.3f s" % (key, min(firsts), first_split[0], first_split[1], mf(min(firsts)),
                                           np.median(checked), np.median(nocheck)))
                say("%-34s again %6.3f s (WT %.3f + LI %.3f) = %6.2f M faces/s; outputs %5.1f B/face,"
                      " peak new memory %5.1f B/face" % ("", t, wt_t, li_t, mf(t), out_bytes / nf,
                                                         peak * 1024.0 / nf))
                say("%-34s check builds %d, hits %d; arrays allocated %d, reused %d; first-execution "
                      "check cost %+.3f s" % ("", wt.GetMeshCacheBuilds(), wt.GetMeshCacheHits(),
                                              wt.GetOutputArraysAllocated(), wt.GetOutputArraysReused(),
                                              check_cost))
                say("%-34s Load Integration: sums handed over by Wall Traction %d, summed itself %d;"
                      " %.0f%% of the memory floor on as many threads"
                      % ("", run.li.GetLeavesHandedOver(), run.li.GetLeavesSummed(), 100 * floors[backend, what] / t))
                summary.append((nf, key, min(firsts), t, wt_t, li_t, check_cost, float(np.median(nocheck))))
                if forces_only and millions <= 2.5:
                    # New objects with the same content each step (a reader).
                    copies = []
                    for _ in range(2):
                        c = vtkPolyData()
                        c.DeepCopy(pd)
                        copies.append(c)
                    steps = iter(copies * (args.repeat + 2))
                    timed_split(run, 2, lambda: next(steps))
                    (tc, wt_c, li_c), _ = timed_split(run, args.repeat, lambda: next(steps))
                    say("%-34s new objects, same mesh: %6.3f s (WT %.3f + LI %.3f) = %6.2f M faces/s;"
                          " content hits %d" % ("", tc, wt_c, li_c, mf(tc), wt.GetMeshCacheContentHits()))
                    results[key + " new objects"] = (tc, force)
                    # Release the copies (the iterator holds them too): memory
                    # held through the next first executions makes their page
                    # faults slower on this virtual machine (2M faces, two
                    # threads, forces only: 110 against 45 ms).
                    del copies, steps
                del run
        for forces_only in (False, True) if args.pairs > 0 else ():
            paired.append((nf, "forces only" if forces_only else "all arrays",
                           paired_speed_up(pd, offsets, conn, pts, forces_only, args.pairs)))
        vtkSMPTools.SetBackend("STDThread")
        for encoding in () if args.no_file else STEP_ENCODINGS:
            path = "/tmp/wallloads_benchmark_step_%d.vtp" % nf
            write_step_file(pd, path, encoding)
            size = os.path.getsize(path)
            reader = vtkXMLPolyDataReader()
            reader.SetFileName(path)
            run = WallLoadsPipeline(pd, True, True)
            run.wt.SetInputConnection(reader.GetOutputPort())
            read_best, loads_best = float("inf"), float("inf")
            for _ in range(max(2, args.repeat // 2)):
                reader.Modified()
                t0 = time.perf_counter()
                reader.Update()
                t1 = time.perf_counter()
                run.wt.Modified()
                run.li.Update()
                t2 = time.perf_counter()
                read_best, loads_best = min(read_best, t1 - t0), min(loads_best, t2 - t1)
            cells = reader.GetOutput().GetNumberOfCells()
            if cells != nf:
                say("%-34s %s: read %d of %d faces (appended XML without the expat fix? source"
                      " scripts/env.sh)" % ("step from a .vtp file", encoding, cells, nf))
            else:
                say("%-34s read %6.3f s (%.0f MB %s, %.0f MB/s) + loads %6.3f s (forces only,"
                      " STDThread) = %6.3f s per step; content hits %d"
                      % ("step from a .vtp file", read_best, size / 1e6, encoding, size / 1e6 / read_best,
                         loads_best, read_best + loads_best, run.wt.GetMeshCacheContentHits()))
                summary.append((nf, "file step, " + encoding, read_best, loads_best, 0, 0, 0, 0))
            del run, reader
            os.remove(path)
        if not args.no_stock:
            vtkSMPTools.SetBackend("Sequential")
            t, (force, _), peak = timed(lambda: stock_chain(pd), max(1, min(2, args.repeat - 2)))
            results["stock"] = (t, force)
            say("%-34s %6.3f s = %6.2f M faces/s   peak %6.1f B/face" % (
                "stock VTK chain (Sequential)", t, mf(t), peak * 1024.0 / nf))
            t, (force, _), peak = timed(lambda: numpy_sums(pd, pts, offsets, conn), max(1, min(2, args.repeat - 1)))
            results["numpy"] = (t, force)
            say("%-34s %6.3f s = %6.2f M faces/s   peak %6.1f B/face" % (
                "numpy", t, mf(t), peak * 1024.0 / nf))
            # Reference: the numpy per-face forces summed exactly (math.fsum).
            ref = numpy_sums(pd, pts, offsets, conn, exact=True)[0]
            for key, (t, force) in results.items():
                rel = np.linalg.norm(force - ref) / np.linalg.norm(ref)
                say("    %-40s force %s   |diff| to exact sum %.1e" % (key, np.array2string(force, precision=6), rel))
            stock, npy = results["stock"][0], results["numpy"][0]
            for mode in ("all arrays", "forces only"):
                seq = results["Sequential, " + mode][0]
                thr = results["STDThread, " + mode][0]
                say("ratios, %s: stock/WallLoads %.0fx (one thread, re-execution), %.0fx (first execution),"
                      " %.0fx (STDThread); numpy/WallLoads %.0fx; thread speed-up %.2fx (memory floor's %.2fx)"
                      % (mode, stock / seq, stock / results["Sequential, " + mode + " first"][0], stock / thr,
                         npy / seq, seq / thr, floors["Sequential", mode] / floors["STDThread", mode]))
        del pd
    steal1 = cpu_times()
    if steal1[1] > steal0[1]:
        say("\nsteal during the run: %.1f %% of the machine's CPU time (taken by the host)"
            % (100.0 * (steal1[0] - steal0[0]) / (steal1[1] - steal0[1])))
    say("\n| faces | backend, arrays | first execution | re-execution (WT + LI) | check cost, first |")
    say("|---|---|---|---|---|")
    for nf, key, first, again, wt_t, li_t, check, nocheck in summary:
        if key.startswith("file step, "):
            say("| %d | step from .vtp, %s (STDThread, forces only) | read %.3f s | loads %.3f s | |"
                  % (nf, key[len("file step, "):], first, again))
            continue
        say("| %d | %s | %.2f M faces/s | %.2f M faces/s (%.3f + %.3f s) | %.0f ms (%.0f%% of WT without check) |"
              % (nf, key, nf / first / 1e6, nf / again / 1e6, wt_t, li_t, check * 1e3, 100 * check / nocheck))


    if paired:
        say("\n| faces | arrays | one thread | %d threads | speed-up (median of pairs) | memory floor's |"
            " model | 1.8x needs one thread at |" % os.cpu_count())
        say("|---|---|---|---|---|---|---|---|")
        for nf, what, r in paired:
            say("| %d | %s | %.1f ms | %.1f ms | %.2fx (%d of %d pairs at 1.8x) | %.2fx | %.1f ms | %.1f ms |"
                % (nf, what, r["T1"] * 1e3, r["T2"] * 1e3, r["ratio"], r["reached"], r["pairs"],
                   r["floor_ratio"], r["predicted"] * 1e3, r["needed"] * 1e3))


if __name__ == "__main__":
    main()
