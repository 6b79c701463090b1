"""Load History on a synthetic transient run (tests/python/history_scenes.py):
a .pvd series of surfaces with uneven time steps, through Wall Traction ->
Load Integration -> Load History, as a user scripts it with paraview.simple.

The truth is the signal the series was written from: the drag is C g(t),
g = mean + start-up transient + sine + small noise (C fixed by the mesh,
measured once with g = 1). Sources and tolerances beside each check."""
import os
import tempfile

import numpy as np

import wl_testing as T
import history_scenes as H

simple = T.load_plugin()
from vtkmodules.vtkCommonCore import vtkCommand  # noqa: E402

out = os.path.join(os.environ.get("WALLLOADS_TEST_OUTPUT", tempfile.gettempdir()), "history")
t = H.times()
g = H.signal(t)
pvd = H.write_series(out, "series", t, g)
print("series: %d steps, t in [%g, %g] s, dt in [%.4f, %.4f] s" % (
    t.size, t[0], t[-1], np.diff(t).min(), np.diff(t).max()))

reader = simple.PVDReader(FileName=pvd)
wt = simple.WallTraction(Input=reader, Pressure=["CELLS", "p"], ShearSource="None")
li = simple.LoadIntegration(Input=wt)

# C: the drag of g = 1 at one step (Load Integration is linear in p).
pts, faces = H.sphere()
x = H.sc.face_centroids(pts, faces)[:, 0]
unit = T.producer(H.sc.polydata(pts, faces, cell_arrays={"p": -x}))
li_unit = simple.LoadIntegration(Input=simple.WallTraction(Input=unit, Pressure=["CELLS", "p"],
                                                           ShearSource="None"))
C = float(T.field(T.output_of(li_unit), "Drag"))
print("drag per unit g: C = %.15g N" % C)
T.expect("C is the sphere's volume to faceting error (p = -x: F = V e_x, Gauss)",
         abs(C - 4 / 3 * np.pi * H.RADIUS ** 3) < 0.1 * C)

# Count the upstream's executions: each visited step executes it once.
executions = []
li.GetClientSideObject().AddObserver(vtkCommand.EndEvent, lambda o, e: executions.append(1))
progress = []
lh = simple.LoadHistory(Input=simple.OutputPort(li, 1), ReferenceLength=0.3, ReferenceSpeed=2.0)
lh.GetClientSideObject().AddObserver(vtkCommand.ProgressEvent,
                                     lambda o, e: progress.append(o.GetProgress()))
capture = T.Capture(lh)
lh.UpdatePipeline()
history = lh.GetClientSideObject().GetOutputDataObject(0)
stats = lh.GetClientSideObject().GetOutputDataObject(1)
T.expect("the upstream executed once per step", len(executions) == t.size,
         "%d executions for %d steps" % (len(executions), t.size))
T.expect("progress reported per step", sum(1 for p in progress if 0 < p <= 1) >= t.size,
         "%d progress events" % len(progress))


def column(table, name):
    from vtkmodules.util.numpy_support import vtk_to_numpy
    a = table.GetColumnByName(name)
    assert a is not None, "no column '%s' in %s" % (
        name, [table.GetColumnName(i) for i in range(table.GetNumberOfColumns())])
    return vtk_to_numpy(a) if not hasattr(a, "GetValue") or a.IsNumeric() else \
        [a.GetValue(i) for i in range(a.GetNumberOfValues())]


def stat_row(table, quantity):
    q = column(table, "Quantity")
    assert quantity in q, "no statistics row '%s'" % quantity
    i = q.index(quantity)
    names = [table.GetColumnName(k) for k in range(table.GetNumberOfColumns())]
    return {n: table.GetColumnByName(n).GetVariantValue(i).ToDouble() for n in names if n != "Quantity"}


# Layout (issue 10): Time, then "<Region>: <Column>" with vectors split X/Y/Z.
names = [history.GetColumnName(i) for i in range(history.GetNumberOfColumns())]
T.expect("history starts with Time", names[0] == "Time", str(names[:3]))
for n in ("Total: Drag", "Total: Force X", "Total: Force Y", "Total: Force Z", "Total: Area"):
    T.expect("history has '%s'" % n, n in names)
T.expect("identifiers and reference values are left out",
         not any(n.endswith(("Region Id", "Reference Density", "Moment Centre X")) for n in names))
stat_names = [stats.GetColumnName(i) for i in range(stats.GetNumberOfColumns())]
T.expect("statistics columns as specified", stat_names == [
    "Quantity", "Samples", "Statistics Start", "Mean", "Standard Deviation", "Minimum", "Maximum",
    "Standard Error Of Mean", "Integrated Autocorrelation Time", "Dominant Frequency", "Amplitude",
    "Strouhal Number"], str(stat_names))
T.expect("units on the history columns",
         history.GetColumnByName("Total: Drag").GetInformation().Get(
             __import__("vtkmodules.vtkCommonCore", fromlist=["vtkDataArray"]).vtkDataArray.UNITS_LABEL()) == "N")

# The history is the series, exactly: times as written, drag C g(t_i)
# (linearity; round-off of the face sums).
T.close_worst("Time column = the written (uneven) times", column(history, "Time"), t, atol=1e-12 * t[-1])
T.close_worst("Total: Drag = C g(t_i)", column(history, "Total: Drag"), C * g, rtol=1e-12)

# Statistics over the automatic window (MSER-5). Truth, in units of C:
# mean MEAN; semi-amplitude AMPLITUDE at FREQUENCY. Tolerances:
# - mean: the sine's contribution over a window of ~29 incomplete-phase
#   cycles is at most A / (pi N) = 0.0055, the noise's SEM 0.02/sqrt(400)
#   = 0.001, the left-over transient 3 exp(-t0/0.5) 0.5/T: 1% of the mean
#   (0.02) covers all three with margin;
# - frequency: Cramer-Rao sd sqrt(12/n) sigma / (2 pi A T) = 6.5e-5 Hz
#   (Rife & Boorstyn 1974), tolerance 1e-3 Hz (15 sd; 1/7 of the 8x grid
#   spacing 1/(8 T), so the refinement is what meets it);
# - semi-amplitude: sd sigma sqrt(2/n) = 0.0014, tolerance 0.01 (7 sd).
drag = stat_row(stats, "Total: Drag")
print("Total: Drag statistics:", {k: round(v, 6) for k, v in drag.items()})
T.check_close("mean / C", drag["Mean"] / C, H.MEAN, atol=0.01 * H.MEAN, source="signal written")
T.check_close("dominant frequency (Hz)", drag["Dominant Frequency"], H.FREQUENCY, atol=1e-3,
              source="signal written; Lomb 1976, Scargle 1982")
T.check_close("semi-amplitude / C", drag["Amplitude"] / C, H.AMPLITUDE, atol=0.01, source="signal written")
# Strouhal number f L / U with L = 0.3 m, U = 2 m/s (definition).
T.check_close("Strouhal = f L / U", drag["Strouhal Number"], drag["Dominant Frequency"] * 0.3 / 2.0,
              rtol=1e-12, source="definition")
T.expect("standard error of the mean finite and below the standard deviation",
         0 < drag["Standard Error Of Mean"] < drag["Standard Deviation"], str(drag["Standard Error Of Mean"]))
T.expect("autocorrelation time (s) positive, below the window",
         0 < drag["Integrated Autocorrelation Time"] < t[-1] - drag["Statistics Start"])

# Truncation removes the transient. Untruncated, the transient biases the
# mean by TRANSIENT TAU / DURATION = 0.075 (3.75%); the truncated mean must
# be closer to the truth by a factor 5 or more, and start after 2 time
# constants (where the transient is 0.4, 20 noise sd) but in the first half.
start = drag["Statistics Start"]
T.expect("MSER-5 start after 2 time constants, in the first half", 2 * H.TAU <= start <= t[-1] / 2,
         "start %.3f s" % start)
lh_all = simple.LoadHistory(Input=simple.OutputPort(li, 1), UseCustomStatisticsStart=1,
                            StatisticsStart=t[0])
lh_all.UpdatePipeline()
untruncated = stat_row(lh_all.GetClientSideObject().GetOutputDataObject(1), "Total: Drag")
err_all = abs(untruncated["Mean"] / C - H.MEAN)
err_cut = abs(drag["Mean"] / C - H.MEAN)
print("mean error: untruncated %.5f, truncated %.5f (ratio %.1f)" % (err_all, err_cut, err_all / err_cut))
T.expect("truncated mean closer to the truth by a factor >= 5", err_cut * 5 <= err_all)
T.expect("custom start keeps every sample", untruncated["Samples"] == t.size)

# TimeRange and Stride select steps by time (not index).
lh_part = simple.LoadHistory(Input=simple.OutputPort(li, 1), UseCustomTimeRange=1,
                             TimeRange=[5.0, 15.0], Stride=3)
del executions[:]
lh_part.UpdatePipeline()
part = lh_part.GetClientSideObject().GetOutputDataObject(0)
chosen = t[(t >= 5.0) & (t <= 15.0)][::3]
T.close_worst("TimeRange [5, 15] s, Stride 3: the times", column(part, "Time"), chosen, atol=1e-12)
T.expect("upstream executed once per visited step", len(executions) == chosen.size,
         "%d for %d" % (len(executions), chosen.size))

# Field-data input (Load Integration's port 0): "<Array>" names.
lh_fd = simple.LoadHistory(Input=simple.OutputPort(li, 0))
lh_fd.UpdatePipeline()
fd_hist = lh_fd.GetClientSideObject().GetOutputDataObject(0)
T.close_worst("field-data input: Drag = C g(t_i)", column(fd_hist, "Drag"), C * g, rtol=1e-12)
T.expect("field-data input: Force split into X/Y/Z", fd_hist.GetColumnByName("Force X") is not None)
fd_drag = stat_row(lh_fd.GetClientSideObject().GetOutputDataObject(1), "Drag")
T.check_close("field-data input: same statistics as the table", fd_drag["Mean"], drag["Mean"], rtol=1e-14)
T.expect("no Strouhal number without reference values", np.isnan(fd_drag["Strouhal Number"]))

# Undefined statistics: a constant quantity (the area of an unchanged mesh)
# has NaN standard error, frequency and amplitude, with one warning.
area = stat_row(stats, "Total: Area")
T.expect("constant quantity: NaN SEM, frequency, amplitude",
         all(np.isnan(area[k]) for k in ("Standard Error Of Mean", "Dominant Frequency", "Amplitude")))
T.expect("constant quantity: mean = the area (round-off)", abs(area["Mean"] - area["Minimum"]) <= 1e-14 * area["Minimum"])
T.expect("a warning names the constant quantities",
         any("Constant over the statistics window" in w and "Surface: Area" in w for w in capture.warnings),
         str(capture.warnings))

# Fewer than 8 samples: NaN with a warning.
lh_few = simple.LoadHistory(Input=simple.OutputPort(li, 1), UseCustomTimeRange=1, TimeRange=[0, 0.2])
few_capture = T.Capture(lh_few)
lh_few.UpdatePipeline()
few = stat_row(lh_few.GetClientSideObject().GetOutputDataObject(1), "Total: Drag")
T.expect("fewer than 8 samples: NaN frequency and SEM, mean defined",
         np.isnan(few["Dominant Frequency"]) and np.isnan(few["Standard Error Of Mean"]) and
         np.isfinite(few["Mean"]), str(few))
T.expect("fewer than 8 samples: a warning", any("Fewer than 8" in w for w in few_capture.warnings))

# A second update without changes does not revisit the steps; a changed
# property does.
del executions[:]
lh.UpdatePipeline()
T.expect("no re-execution without changes", len(executions) == 0, str(len(executions)))
from vtkmodules.vtkCommonExecutionModel import vtkStreamingDemandDrivenPipeline as SDDP  # noqa: E402
T.expect("the output is not time dependent (no time steps in its information)",
         not lh.GetClientSideObject().GetOutputInformation(0).Has(SDDP.TIME_STEPS()))
lh.UpdatePipeline(time=float(t[100]))
T.expect("another animation time does not revisit the steps", len(executions) == 0, str(len(executions)))
# Standard error of the mean through the whole chain, on an AR(1) series
# g_i = MEAN + x_i, x_i = phi x_{i-1} + e_i, e_i ~ N(0, s^2), started
# stationary (derivation as in tests/kernels/TimeSeriesStatisticsTest.cxx:
# rho(k) = phi^k, tau_int = 1 + 2 sum phi^k = (1 + phi)/(1 - phi), so
# Var(mean) = tau_int Var(x) / n = s^2 / ((1 - phi)^2 n)), phi = 0.8, s = 0.05,
# n = 1000 uneven steps. The estimate's relative scatter is about
# (1/2) sqrt(2 (2M + 1) / n) = 24 % with Sokal's window M ~ 5 tau = 45
# (Sokal 1997 eq. 3.19): within a factor 1.5 of the analytic value (about 2
# sd), on the samples of the statistics window (n_w of them).
rng = np.random.default_rng(31)
phi, s_e, n_ar = 0.8, 0.05, 1000
x = np.empty(n_ar)
x[0] = rng.normal(0.0, s_e / np.sqrt(1 - phi * phi))
for i in range(1, n_ar):
    x[i] = phi * x[i - 1] + rng.normal(0.0, s_e)
t_ar = np.cumsum(np.r_[0.0, rng.uniform(0.5, 1.5, n_ar - 1)]) * 0.01
ar_pvd = H.write_series(out, "ar1", t_ar, H.MEAN + x)
ar_li = simple.LoadIntegration(Input=simple.WallTraction(Input=simple.PVDReader(FileName=ar_pvd),
                                                         Pressure=["CELLS", "p"], ShearSource="None"))
ar_lh = simple.LoadHistory(Input=simple.OutputPort(ar_li, 1))
ar_lh.UpdatePipeline()
ar = stat_row(ar_lh.GetClientSideObject().GetOutputDataObject(1), "Total: Drag")
n_w = ar["Samples"]
sem_exact = C * s_e / ((1 - phi) * np.sqrt(n_w))
print("AR(1): SEM %.4e, analytic %.4e (ratio %.3f), tau %.4f s (mean step %.4f s, analytic %.1f steps)" % (
    ar["Standard Error Of Mean"], sem_exact, ar["Standard Error Of Mean"] / sem_exact,
    ar["Integrated Autocorrelation Time"], np.diff(t_ar).mean(), (1 + phi) / (1 - phi)))
T.expect("AR(1) through the chain: SEM within a factor 1.5 of s / ((1 - phi) sqrt(n))",
         sem_exact / 1.5 <= ar["Standard Error Of Mean"] <= 1.5 * sem_exact)
T.expect("AR(1): the true mean within 3 standard errors",
         abs(ar["Mean"] / C - H.MEAN) <= 3 * ar["Standard Error Of Mean"] / C)

# Sequential and STDThread SMP backends (the statistics are computed per
# quantity in a vtkSMPTools loop): the same tables to the last bit.
from vtkmodules.vtkCommonCore import vtkSMPTools  # noqa: E402
tables = {}
for backend in ("Sequential", "STDThread"):
    vtkSMPTools.SetBackend(backend)
    lh_b = simple.LoadHistory(Input=simple.OutputPort(li, 1), ReferenceLength=0.3, ReferenceSpeed=2.0)
    lh_b.UpdatePipeline()
    st = lh_b.GetClientSideObject().GetOutputDataObject(1)
    tables[backend] = np.array([[st.GetValue(r, c).ToDouble() for c in range(1, st.GetNumberOfColumns())]
                                for r in range(st.GetNumberOfRows())])
T.expect("Sequential and STDThread give the same statistics",
         np.array_equal(tables["Sequential"], tables["STDThread"], equal_nan=True))

# Abort between steps (as the GUI's progress bar does): no output, a
# warning; the next update visits every step again.
algo = lh_part.GetClientSideObject()


def abort_early(o, e):
    if o.GetProgress() > 0.3:
        o.SetAbortExecute(1)


tag = algo.AddObserver(vtkCommand.ProgressEvent, abort_early)
abort_capture = T.Capture(lh_part)
algo.Modified()
algo.Update()
T.expect("abort: no output and a warning", algo.GetOutputDataObject(0).GetNumberOfRows() == 0 and
         any("aborted at step" in w for w in abort_capture.warnings))
algo.RemoveObserver(tag)
algo.SetAbortExecute(0)
algo.Modified()
algo.Update()
T.expect("after an abort the next update is complete", algo.GetOutputDataObject(0).GetNumberOfRows() == chosen.size)

# Bad input: nothing numeric to record (a plain surface without field data)
# is a clear error, no crash, empty tables.
lh_bad = simple.LoadHistory(Input=simple.Sphere())
bad_capture = T.Capture(lh_bad)
lh_bad.UpdatePipeline()
T.contains_all("no numeric quantity: an error that says what is expected", " ".join(bad_capture.errors),
               ["holds no numeric quantity", "Load Integration"])
T.expect("no numeric quantity: empty tables",
         lh_bad.GetClientSideObject().GetOutputDataObject(0).GetNumberOfRows() == 0)

# In the GUI the history opens in a line chart (Time on the x axis) and the
# statistics in a spreadsheet (the XML's view hints).
from paraview.modules.vtkRemotingViews import vtkSMParaViewPipelineControllerWithRendering  # noqa: E402
controller = vtkSMParaViewPipelineControllerWithRendering()
T.expect("history opens in a line chart view, statistics in a spreadsheet",
         (controller.GetPreferredViewType(lh.SMProxy, 0), controller.GetPreferredViewType(lh.SMProxy, 1))
         == ("XYChartView", "SpreadSheetView"))
import wallloads.WallLoadsFilters as W  # noqa: E402
T.expect("the wrapped Python module has vtkLoadHistory", W.vtkLoadHistory().GetNumberOfOutputPorts() == 2)
T.done("test_load_history")
