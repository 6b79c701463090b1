"""WallLoads demo: loads on a spinning glass bead settling through a viscous oil.

Runs Wall Traction and Load Integration on examples/demo/bead.vtm (three named
wall regions), prints the per-region table with units next to the exact
Stokes-flow loads (examples/demo/analytic.json), writes the table as CSV and,
when a display is available, a PNG of the surface coloured by Directional
Traction (the traction along the settling axis); then the drag along the
settling axis in slices (Load Distribution) next to the exact values, and a
line chart of it (PNG); then Load History on the bead's short time series
(examples/demo/series): statistics of the drag and the rolling moment next to
their exact values, and a PNG of the history.

    pvbatch examples/bead_loads.py [output folder]      (default: out/)

The results support, and do not replace, engineering judgement, local codes
and licensed practice.
"""
import json
import math
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.abspath(sys.argv[1] if len(sys.argv) > 1 else os.path.join(HERE, "..", "out"))

from wallloads import batch  # noqa: E402

simple = batch.load_plugin()
batch.use_threads("STDThread")

with open(os.path.join(HERE, "demo", "analytic.json")) as handle:
    exact = json.load(handle)
par = exact["parameters"]
R, rho, mu = par["radius"], par["density"], par["dynamic_viscosity"]
U = par["stream_velocity"][2]

reader = simple.XMLMultiBlockDataReader(FileName=[os.path.join(HERE, "demo", "bead.vtm")])
traction = simple.WallTraction(Input=reader)
traction.Pressure = ["POINTS", "static_pressure"]
traction.ReferencePressure = par["p_inf"]
traction.ShearSource = "Wall shear stress array"
traction.ShearStressArray = ["CELLS", "wall_shear"]
traction.Orientation = "Stored normals point into the wall"   # as the solver exported them
traction.LoadDirection = [0.0, 0.0, 1.0]                       # settling axis
traction.Density = rho
traction.ReferenceSpeed = U

loads = simple.LoadIntegration(Input=traction)
loads.MomentCentre = [0.0, 0.0, 0.0]
loads.DragDirection = [0.0, 0.0, 1.0]     # along the oil stream past the bead
loads.LiftDirection = [1.0, 0.0, 0.0]
loads.ReferenceDensity = rho
loads.ReferenceSpeed = U
loads.ReferenceArea = math.pi * R * R     # frontal area
loads.ReferenceLength = 2 * R
loads.ReferenceSpan = 2 * R

rows = batch.load_table(loads)
print("Spinning bead settling in oil: R = %g m, U = %g m/s, mu = %g Pa s, rho = %g kg/m^3, Re = %.4f"
      % (R, U, mu, rho, par["reynolds_number"]))
print("Loads per wall region (SI units; z is the settling axis, exact values from Stokes flow):")
header = "%-14s %12s %14s %14s %14s %14s %14s %9s" % (
    "Region", "Area [m^2]", "Fp_z [N]", "Fv_z [N]", "F_z [N]", "exact F_z [N]", "M_z [N m]", "dF [%]")
print(header)
print("-" * len(header))
worst = 0.0
for name, row in rows.items():
    ref = exact["regions"][name]
    fz = row["Force"][2]
    fz_exact = ref["total_force"][2]
    rel = 100.0 * (fz - fz_exact) / abs(fz_exact)
    worst = max(worst, abs(rel))
    print("%-14s %12.5e %14.6e %14.6e %14.6e %14.6e %14.6e %9.3f" % (
        name, row["Area"], row["Pressure Force"][2], row["Viscous Force"][2], fz, fz_exact,
        row["Moment"][2], rel))
total = rows["Total"]
print()
print("Total drag %.6e N (Stokes drag 6 pi mu R U = %.6e N plus buoyancy rho g V = %.6e N)"
      % (total["Drag"], exact["reference_totals"]["stokes_drag_z"], exact["reference_totals"]["buoyancy_z"]))
print("Rolling moment (about the settling axis) %.6e N m (exact -8 pi mu R^3 Omega = %.6e N m)"
      % (total["Rolling Moment"], exact["reference_totals"]["torque_z"]))
print("Drag coefficient %.4f (q = 0.5 rho U^2, A_ref = pi R^2)" % total["Drag Coefficient"])
print("Line of action passes through (%.3e, %.3e, %.3e) m; residual couple %.4e N m"
      % (total["Line Of Action Point"] + (total["Residual Couple"],)))
print("Largest per-region deviation from the exact loads: %.3f %% (faceted 36 x 72 sphere)" % worst)

# --- The volume path: the same loads from the fluid volume around the bead,
# with the wall shear stress reconstructed by Shear Projection from the
# cell-centred velocity (what a finite-volume solver writes).
omega = par["angular_velocity"]
volume = simple.XMLUnstructuredGridReader(FileName=[os.path.join(HERE, "demo", "bead_volume.vtu")])
spinning = simple.Calculator(Input=reader)      # the wall velocity, Omega x r, at the bead's points
spinning.AttributeType = "Point Data"
spinning.ResultArrayName = "Wall Velocity"
spinning.Function = ("(%r*coordsZ-%r*coordsY)*iHat+(%r*coordsX-%r*coordsZ)*jHat+(%r*coordsY-%r*coordsX)*kHat"
                     % (omega[1], omega[2], omega[2], omega[0], omega[0], omega[1]))
shear = simple.ShearProjection(Input=volume, Walls=spinning)
shear.Velocity = ["CELLS", "velocity"]
shear.WallVelocity = ["POINTS", "Wall Velocity"]
shear.Method = "Near-wall difference"
shear.Viscosity = mu
shear.Density = rho
from_volume = simple.WallTraction(Input=shear)
from_volume.Pressure = ["POINTS", "static_pressure"]
from_volume.ReferencePressure = par["p_inf"]
from_volume.ShearSource = "Wall shear stress array"
from_volume.ShearStressArray = ["CELLS", "Wall Shear Stress"]
from_volume.Orientation = "Use Wall Normal array"   # decided by the adjacent fluid cell
from_volume.LoadDirection = [0.0, 0.0, 1.0]
volume_loads = simple.LoadIntegration(Input=from_volume)
volume_loads.DragDirection = [0.0, 0.0, 1.0]
volume_loads.LiftDirection = [1.0, 0.0, 0.0]
vtotal = batch.load_table(volume_loads)["Total"]
shear.UpdatePipeline()
yplus = shear.GetCellDataInformation().GetArray("y+").GetRange(0)
print()
print("From the fluid volume (Shear Projection, near-wall difference on the first cell, %d cells):"
      % volume.GetDataInformation().GetNumberOfCells())
print("  friction drag %.6e N (surface path %.6e N, exact 4 pi mu R U = %.6e N)"
      % (vtotal["Viscous Force"][2], total["Viscous Force"][2], exact["regions"]["Total"]["viscous_force"][2]))
print("  total drag    %.6e N, rolling moment %.6e N m" % (vtotal["Drag"], vtotal["Rolling Moment"]))
print("  y+ on the bead from %.2e to %.2e: viscous sublayer everywhere (creeping flow);"
      " the first-order near-wall difference is %.1f %% low on this mesh"
      % (yplus[0], yplus[1], 100.0 * (1 - vtotal["Viscous Force"][2] / exact["regions"]["Total"]["viscous_force"][2])))

os.makedirs(OUT, exist_ok=True)
csv_path = os.path.join(OUT, "bead_loads.csv")
batch.write_csv(rows, csv_path)
print("Table written to", csv_path)

# --- Load Distribution: where along the settling axis the drag builds up.
# Exact bin means (derived here): the Stokes traction on a translating sphere
# is uniform, 3 mu U / (2 R) along the stream (Batchelor 1967, sec. 4.9; from
# memory), and a sphere's area per unit height is 2 pi R (Archimedes' hat-box
# theorem): 3 pi mu U per length. The hydrostatic pressure rho g z (g along
# -z) pushes with -p n, n_z = z / R: 2 pi rho g z^2 per length. The spin adds
# nothing along z. Mean over a bin [z0, z1]:
# 3 pi mu U + 2 pi rho g (z1^3 - z0^3) / (3 (z1 - z0)).
from vtkmodules.util.numpy_support import vtk_to_numpy  # noqa: E402
distribution = simple.LoadDistribution(Input=traction, AxisDirection=[0.0, 0.0, 1.0], NumberOfBins=10,
                                       DragDirection=[0.0, 0.0, 1.0], LiftDirection=[1.0, 0.0, 0.0])
batch.update(distribution)
table = distribution.GetClientSideObject().GetOutputDataObject(0)
column = {name: vtk_to_numpy(table.GetColumnByName(name)) for name in ("Start", "End", "Drag Per Length")}
g = abs(par["gravity"][2])
print()
print("Drag along the settling axis (Load Distribution, 10 bins; exact from Stokes flow and hydrostatics):")
print("%12s %12s %16s %16s %8s" % ("z from [m]", "z to [m]", "drag/len [N/m]", "exact [N/m]", "d [%]"))
for z0, z1, d in zip(column["Start"], column["End"], column["Drag Per Length"]):
    ref = 3 * math.pi * mu * U + 2 * math.pi * rho * g * (z1 ** 3 - z0 ** 3) / (3 * (z1 - z0))
    print("%12.4e %12.4e %16.6e %16.6e %8.3f" % (z0, z1, d, ref, 100 * (d - ref) / ref))
if os.environ.get("DISPLAY"):
    from wallloads import render  # noqa: E402
    chart_png = os.path.join(OUT, "bead_distribution.png")
    render.line_chart(simple, distribution, "Centre", ["Drag Per Length", "Lift Per Length"], chart_png,
                      [900, 500], "Drag along the settling axis", "z [m]", "Force per length [N/m]")
    print("Distribution chart written to", chart_png)

if os.environ.get("DISPLAY"):
    view = simple.CreateRenderView()
    view.ViewSize = [900, 700]
    view.OrientationAxesVisibility = 1
    shown = simple.Show(traction, view)
    simple.ColorBy(shown, ("CELLS", "Directional Traction"))
    shown.RescaleTransferFunctionToDataRange(True, False)
    shown.SetScalarBarVisibility(view, True)
    bar = simple.GetScalarBar(simple.GetColorTransferFunction("Directional Traction"), view)
    bar.Title = "Traction along z [Pa]"
    bar.ComponentTitle = ""
    view.CameraPosition = [4.0 * R, -3.0 * R, 1.5 * R]
    view.CameraFocalPoint = [0.0, 0.0, 0.0]
    view.CameraViewUp = [0.0, 0.0, 1.0]
    simple.Render(view)
    png = os.path.join(OUT, "bead_directional_traction.png")
    simple.SaveScreenshot(png, view, ImageResolution=[900, 700])
    print("Picture written to", png)
else:
    print("No display: picture skipped (run under scripts/with-xvfb.sh to get it)")
# --- Load History: the bead's short time series (examples/demo/series) -------------
series = exact["series"]
s_reader = simple.PVDReader(FileName=os.path.join(HERE, "demo", "series", "bead_series.pvd"))
s_traction = simple.WallTraction(Input=s_reader, Pressure=["POINTS", "static_pressure"],
                                 ReferencePressure=par["p_inf"], ShearSource="Wall shear stress array",
                                 ShearStressArray=["CELLS", "wall_shear"],
                                 Orientation="Stored normals point into the wall",
                                 LoadDirection=[0.0, 0.0, 1.0], Density=rho)
s_loads = simple.LoadIntegration(Input=s_traction, DragDirection=[0.0, 0.0, 1.0], LiftDirection=[1.0, 0.0, 0.0])
history = simple.LoadHistory(Input=simple.OutputPort(s_loads, 1), ReferenceLength=2 * R, ReferenceSpeed=U)
history.UpdatePipeline()
s_stats = history.GetClientSideObject().GetOutputDataObject(1)
s_names = [s_stats.GetValue(r, 0).ToString() for r in range(s_stats.GetNumberOfRows())]


def statistic(quantity, column):
    return s_stats.GetColumnByName(column).GetValue(s_names.index(quantity))


print()
print("Time series (%d uneven steps over %g s: the stream starts up, the spin oscillates at %g Hz):"
      % (series["steps"], series["duration"], series["spin_frequency"]))
print("  %-22s %12s %12s %12s %10s %12s" % ("quantity", "mean", "std. error", "amplitude", "freq. [Hz]",
                                          "window from"))
for q in ("Total: Drag", "Total: Rolling Moment"):
    print("  %-22s %12.5e %12.3e %12.4e %10.4f %10.3f s" % (
        q, statistic(q, "Mean"), statistic(q, "Standard Deviation"), statistic(q, "Amplitude"),
        statistic(q, "Dominant Frequency"), statistic(q, "Statistics Start")))
print("  exact: steady drag %.5e N (after the start-up); rolling moment mean %.5e N m, amplitude %.4e N m"
      " at %g Hz (faceted 12 x 24 bead)" % (series["drag_steady"], series["rolling_moment_mean"],
                                           series["rolling_moment_amplitude"], series["spin_frequency"]))
if os.environ.get("DISPLAY"):
    chart = simple.CreateView("XYChartView")
    chart.ViewSize = [900, 500]
    chart.LeftAxisTitle = "Rolling moment [N m]"
    chart.BottomAxisTitle = "Time [s]"
    line = simple.Show(simple.OutputPort(history, 0), chart)
    line.UseIndexForXAxis = 0
    line.XArrayName = "Time"
    line.SeriesVisibility = ["Total: Rolling Moment"]
    simple.Render(chart)
    png = os.path.join(OUT, "bead_history.png")
    simple.SaveScreenshot(png, chart, ImageResolution=[900, 500])
    print("History plot written to", png)
print("These results support, and do not replace, engineering judgement, local codes and licensed practice.")
