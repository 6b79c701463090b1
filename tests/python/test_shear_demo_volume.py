"""End to end on the demo volume: the spinning bead settling in oil
(examples/generate_demo.py), loads from the fluid volume through Shear
Projection -> Wall Traction -> Load Integration, compared with the
surface-only path of examples/bead_loads.py and with the exact Stokes loads of
examples/demo/analytic.json.

Flow (creeping, Re = 0.0042): Stokes flow past the sphere in the stream U
(Stokes 1851; Batchelor, An Introduction to Fluid Dynamics, 1967, §4.9)
plus the flow of the sphere spinning at Omega (Landau & Lifshitz, Fluid
Mechanics, §20), superposed (linear equations). In the bead frame the wall
moves: U = Omega x x on the bead, so Shear Projection gets the wall velocity
as a point array (a Calculator on the bead surface: Omega x coords).
Exact totals (analytic.json): friction drag 4 pi mu R U, total drag 6 pi mu R
U + buoyancy (pressure with p_ref = p_inf), torque -8 pi mu R^3 Omega; the
torque is pure wall shear, t = -3 mu Omega x n.

Pipeline (the file level): XMLUnstructuredGridReader(bead_volume.vtu) as
Input; Walls = the three surface blocks of bead.vtm (+ Calculator for the
wall velocity); Wall Traction with the surface file's point 'static_pressure',
ReferencePressure p_inf and ShearSource 'Wall shear stress array' on the
projected 'Wall Shear Stress', Orientation 'Use Wall Normal array'; Load
Integration with bead_loads.py's settings.

Discretisation error: the file is level n = 36 of the family
generate_demo.build_volume(n, 2n, n/2) (spherical shell R..3R, stretch 2);
the test also runs n = 12, 18, 24 in memory (walls: uv_sphere(R, n, 2n) with
the same point p and wall velocity) and measures the order and constant of
each error. The tolerance at the file level is then 1.05 x C x h_36^p
(h = pi/n) with C the constant of n = 24 plus its change from n = 18 and p
the nominal order: 1 for the near-wall difference and the gradient tensor
(see test_shear_stokes_sphere.py: profile plus the sagitta of the flat
faces), 2 for the wall fit (no slip at the faces' corners, which lie on the
sphere; observed orders asserted within 1.7-3.5). The surface-only
path is second order (faceting, about 0.2 % here), so the two paths must
agree within the sum of the two measured errors.

The torque is where the moving wall matters: the wall shear stress is the
tangential part of mu (G + G^T) n. The near-wall difference and the wall
fit estimate the wall-normal derivative of the tangential velocity, the
tangential part of mu G n; on a stationary wall the G^T n part vanishes
(u = 0 along the wall), on the spinning sphere it is -mu Omega x n, a third
of the exact -3 mu Omega x n (rotating_sphere in scenes).
vtkShearProjection.h: that part is added from the gradient of a POINT-data
wall velocity in each face, as here. Without it (an earlier build) the
torque of both methods converged to 2/3 of the exact one (ratios
0.371/0.458/0.506/0.557, first-order extrapolation 0.655); the test keeps
that as a defect check. The least-squares gradient tensor includes G^T n.

Measured when written (ratio to exact at n = 12/18/24/36, observed order):
  near-wall difference: friction 0.689/0.780/0.830/0.883 (0.89), total drag
    0.888/0.925/0.943/0.962 (0.99), torque 0.695/0.787/0.837/0.889 (0.92);
  wall fit: friction 0.9544/0.9866/0.9948/0.9989 (3.37), total drag
    0.9699/0.9888/0.9944/0.9979 (2.42), torque 0.9420/0.9802/0.9907/0.9968
    (2.65): at the file level within 1e-8 of the surface-only path (an
    earlier wall fit on the cells stacked off the wall gave 0.878, 0.960 and
    0.876, first order);
  least-squares gradient: friction 0.577/0.708/0.781/0.857 (0.99), total
    0.853/0.902/0.928/0.954 (1.06), torque 0.626/0.748/0.814/0.881 (1.05).
  Extrapolations from n = 18 and 36 at the nominal order: 0.986-1.015.
  Surface-only path: errors 0.15 % (friction), 0.22 % (total), 0.32 % (torque).
  y+ on the bead 5.2e-4 .. 2.2e-3 (near-wall difference; first cell centres
  1.84e-5 m from the wall).
"""
import json
import math
import os

import numpy as np

import wl_testing as T
import scenes as S
import generate_demo as G

simple = T.load_plugin()

DEMO = os.path.join(os.environ.get("WALLLOADS_SOURCE_DIR", os.path.join(os.path.dirname(__file__), "..", "..")),
                    "examples", "demo")
with open(os.path.join(DEMO, "analytic.json")) as fh:
    EXACT = json.load(fh)
PAR = EXACT["parameters"]
R, RHO, MU, P_INF = PAR["radius"], PAR["density"], PAR["dynamic_viscosity"], PAR["p_inf"]
U_Z = PAR["stream_velocity"][2]
OMEGA = np.array(PAR["angular_velocity"])
TOTAL = EXACT["regions"]["Total"]
FV_Z, F_Z, M_Z = TOTAL["viscous_force"][2], TOTAL["total_force"][2], TOTAL["total_moment"][2]
assert abs(FV_Z - 4 * math.pi * MU * R * U_Z) < 1e-12 * FV_Z
assert abs(M_Z + 8 * math.pi * MU * R**3 * OMEGA[2]) < 1e-12 * abs(M_Z)
assert (G.N_POLAR, G.N_AZIMUTH, G.VOLUME_N_RADIAL) == (36, 72, 18), "the file's level"

LEVELS = [12, 18, 24, 36]          # 36: the files
H = np.array([math.pi / n for n in LEVELS])
METHODS = ["Near-wall difference", "Wall fit", "Gradient tensor"]
# Nominal order and the band of observed orders over n = 12..36 (docstring).
ORDER = {"Near-wall difference": (1, (0.7, 1.3)), "Gradient tensor": (1, (0.7, 1.3)),
         "Wall fit": (2, (1.7, 3.5))}
QUANTITIES = {  # name: (exact, source)
    "friction drag": (FV_Z, "Stokes 1851; Batchelor 1967 §4.9: 4 pi mu R U"),
    "total drag": (F_Z, "Stokes 1851: 6 pi mu R U, plus buoyancy (analytic.json)"),
    "torque": (M_Z, "Landau & Lifshitz §20: -8 pi mu R^3 Omega"),
}


def wall_velocity_function():
    """Calculator expression for Omega x x (point coordinates)."""
    wx, wy, wz = ("%.17g" % v for v in OMEGA)
    return ("(%s*coordsZ-%s*coordsY)*iHat+(%s*coordsX-%s*coordsZ)*jHat+(%s*coordsY-%s*coordsX)*kHat"
            % (wy, wz, wz, wx, wx, wy))


def loads_pipeline(volume, walls, method):
    sp = simple.ShearProjection(Input=volume, Walls=walls)
    sp.Velocity = ["CELLS", "velocity"]
    sp.WallVelocity = ["POINTS", "wall_velocity"]
    sp.Method = method
    sp.Viscosity = MU
    sp.Density = RHO
    wt = simple.WallTraction(Input=sp)
    wt.Pressure = ["POINTS", "static_pressure"]
    wt.ReferencePressure = P_INF
    wt.ShearSource = "Wall shear stress array"
    wt.ShearStressArray = ["CELLS", "Wall Shear Stress"]
    wt.Orientation = "Use Wall Normal array"
    wt.LoadDirection = [0.0, 0.0, 1.0]
    wt.Density = RHO
    wt.ReferenceSpeed = U_Z
    li = simple.LoadIntegration(Input=wt)
    li.MomentCentre = [0.0, 0.0, 0.0]
    li.DragDirection = [0.0, 0.0, 1.0]
    li.LiftDirection = [1.0, 0.0, 0.0]
    li.ReferenceDensity = RHO
    li.ReferenceSpeed = U_Z
    li.ReferenceArea = math.pi * R * R
    li.ReferenceLength = 2 * R
    li.ReferenceSpan = 2 * R
    return sp, wt, li


def totals(li):
    out = T.output_of(li, 0)
    return {"friction drag": T.field(out, "Viscous Force")[2], "total drag": T.field(out, "Force")[2],
            "torque": T.field(out, "Moment")[2], "skipped": T.field(out, "Skipped Faces"),
            "rows": T.table_rows(T.output_of(li, 1))}


def wall_leaves(data):
    if data.IsA("vtkMultiBlockDataSet"):
        return [(data.GetMetaData(i).Get(data.NAME()), data.GetBlock(i)) for i in range(data.GetNumberOfBlocks())]
    return [("walls", data)]


results = {m: {q: [] for q in QUANTITIES} for m in METHODS}
file_rows, yplus = {}, {}

# --- coarse levels, in memory -------------------------------------------------------
for n in LEVELS[:-1]:
    vol = T.producer(G.build_volume(n, 2 * n, n // 2))
    P, F, _ = S.uv_sphere(R, n, 2 * n, center=G.CENTER, ordering=G.ORDERING)
    wl = T.producer(S.polydata(P, F, point_arrays={"static_pressure": G.static_pressure(P), "wall_velocity": np.cross(OMEGA, P)}))
    for m in METHODS:
        sp, wt, li = loads_pipeline(vol, wl, m)
        r = totals(li)
        assert r["skipped"] == 0, "n=%d %s: skipped faces" % (n, m)
        for q in QUANTITIES:
            results[m][q].append(r[q])
        for p in (li, wt, sp):
            simple.Delete(p)
    for p in (wl, vol):
        simple.Delete(p)

# --- the files ------------------------------------------------------------------------
vol = simple.XMLUnstructuredGridReader(FileName=[os.path.join(DEMO, "bead_volume.vtu")])
bead = simple.XMLMultiBlockDataReader(FileName=[os.path.join(DEMO, "bead.vtm")])
calc = simple.Calculator(Input=bead)
calc.AttributeType = "Point Data"
calc.ResultArrayName = "wall_velocity"
calc.Function = wall_velocity_function()
vtu = T.output_of(vol)
print("bead_volume.vtu: %d cells, %d points, %.2f MB" % (
    vtu.GetNumberOfCells(), vtu.GetNumberOfPoints(), os.path.getsize(os.path.join(DEMO, "bead_volume.vtu")) / 1e6))
# The file is the generator's default level (not stale): same cells exactly, and the
# same points and arrays to 1e-12 of their magnitude. Not bit for bit: numpy's
# trigonometry takes other vectorised paths on other CPUs (AVX-512), which changes
# the last bit of some coordinates.
from vtkmodules.util.numpy_support import vtk_to_numpy  # noqa: E402
ref = G.build_volume()
for what, a, b, exact in (("points", vtu.GetPoints().GetData(), ref.GetPoints().GetData(), False),
                          ("cell types", vtu.GetCellTypesArray(), ref.GetCellTypesArray(), True),
                          ("connectivity", vtu.GetCells().GetConnectivityArray(),
                           ref.GetCells().GetConnectivityArray(), True),
                          ("velocity", vtu.GetCellData().GetArray("velocity"),
                           ref.GetCellData().GetArray("velocity"), False),
                          ("static_pressure", vtu.GetCellData().GetArray("static_pressure"),
                           ref.GetCellData().GetArray("static_pressure"), False)):
    x, y = vtk_to_numpy(a), vtk_to_numpy(b)
    same = np.array_equal(x, y) if exact else (
        x.shape == y.shape and np.allclose(x, y, rtol=0.0, atol=1e-12 * np.abs(y).max()))
    assert same, "bead_volume.vtu differs from build_volume(): " + what
del ref
sp, wt, li = loads_pipeline(vol, calc, METHODS[0])
for m in METHODS:
    sp.Method = m
    r = totals(li)
    assert r["skipped"] == 0, "file %s: skipped faces" % m
    for q in QUANTITIES:
        results[m][q].append(r[q])
    file_rows[m] = r["rows"]
    out = T.output_of(sp)
    leaves = wall_leaves(out)
    assert [name for name, _ in leaves] == ["Upper Cap", "Equator Band", "Lower Cap"], "block names kept"
    yp = np.concatenate([T.cell_array(b, "y+") for _, b in leaves])
    regime = np.concatenate([T.cell_array(b, "Near-Wall Regime") for _, b in leaves])
    dist = np.concatenate([T.cell_array(b, "Wall Distance") for _, b in leaves])
    assert np.all(np.isfinite(yp)) and np.all(np.isfinite(dist)), "every bead face matched a cell"
    assert np.all(regime == 0), "creeping flow: viscous sublayer everywhere"
    yplus[m] = (yp.min(), yp.max(), dist.min(), dist.max())
builds = sp.GetClientSideObject().GetNumberOfAdjacencyBuilds()
T.check_close("adjacency built once for the three methods", builds, 1.0, source="vtkShearProjection.h: cache")

# The surface-only path: bead_loads.py's settings on bead.vtm.
wt_s = simple.WallTraction(Input=bead)
wt_s.Pressure = ["POINTS", "static_pressure"]
wt_s.ReferencePressure = P_INF
wt_s.ShearSource = "Wall shear stress array"
wt_s.ShearStressArray = ["CELLS", "wall_shear"]
wt_s.Orientation = "Stored normals point into the wall"
li_s = simple.LoadIntegration(Input=wt_s)
li_s.MomentCentre = [0.0, 0.0, 0.0]
li_s.DragDirection = [0.0, 0.0, 1.0]
li_s.LiftDirection = [1.0, 0.0, 0.0]
surface = totals(li_s)

# --- checks ---------------------------------------------------------------------------
defects = []
print("Errors relative to the exact loads (levels n = %s; n = 36 is the file):" % LEVELS)
bounds = {}
for m in METHODS:
    for q, (exact, source) in QUANTITIES.items():
        vals = np.array(results[m][q])
        err = np.abs(vals / exact - 1.0)
        p, (lo, hi) = ORDER[m]
        consts = err / H ** p
        order = T.observed_order(H, err)
        c_bound = 1.05 * (consts[-2] + max(0.0, consts[-2] - consts[-3]))
        bound = c_bound * H[-1] ** p
        bounds[(m, q)] = bound
        # Extrapolation of the ratio from n = 18 and 36 (h halves), at the nominal order.
        ratio = vals / exact
        limit = (2 ** p * ratio[-1] - ratio[1]) / (2 ** p - 1)
        print("  %-21s %-13s ratio %s  |err| %s  e/h^%d %s  order %.2f  extrapolated ratio %.4f" % (
            m, q, np.array2string(ratio, precision=4), np.array2string(err, precision=3), p,
            np.array2string(consts, precision=3), order, limit))
        ok = err[-1] <= bound and lo <= order <= hi
        line = "    file level |err| %.3e vs tolerance %.3e (1.05 x extrapolated C x h_36^%d) [%s]" % (
            err[-1], bound, p, source)
        print(line)
        if q == "torque" and m in ("Near-wall difference", "Wall fit") and not ok:
            defects.append(
                "%s on the spinning bead: torque ratio %s at n = %s (extrapolated %.3f); near 2/3 means "
                "the G^T n part of the wall shear stress of the moving wall (-mu Omega x n, from the "
                "point wall velocity) is missing." % (m, np.array2string(ratio, precision=3), LEVELS, limit))
            continue
        assert ok, "%s %s: file-level error %.3e (tolerance %.3e) or order %.2f out of range" % (
            m, q, err[-1], bound, order)

print("Surface-only path (bead_loads.py settings): friction %.6e, total %.6e N, torque %.6e N m" % (
    surface["friction drag"], surface["total drag"], surface["torque"]))
for q, (exact, source) in QUANTITIES.items():
    e_surf = abs(surface[q] / exact - 1.0)
    print("  surface %-13s |err| %.3e" % (q, e_surf))
    # Second-order faceting of the 36 x 72 sphere: relative area deficit
    # (5/24) h^2 = 0.16 % (test_stokes_sphere.py), the torque's shorter lever
    # arm about as much again; measured 0.15, 0.22 and 0.32 %.
    assert e_surf < 2 * 1.05 * (5.0 / 24.0) * H[-1] ** 2, "surface path: faceting error"
    for m in METHODS:
        got = results[m][q][-1]
        tol = (bounds[(m, q)] + e_surf) * abs(exact)
        print("  volume (%s) vs surface %-13s: %.6e vs %.6e, |diff| %.3e (tolerance %.3e)" % (
            m, q, got, surface[q], abs(got - surface[q]), tol))
        if abs(got - surface[q]) > tol:
            assert q == "torque" and m in ("Near-wall difference", "Wall fit"), \
                "%s %s: volume and surface paths disagree beyond their measured errors" % (m, q)

print("Per region at the file level (exact from analytic.json):")
for m in ("Near-wall difference", "Gradient tensor"):
    for name in ("Upper Cap", "Equator Band", "Lower Cap", "Total"):
        row, ex = file_rows[m][name], EXACT["regions"][name]
        print("  %-21s %-13s friction F_z %.5e (exact %.5e)  M_z %.5e (exact %.5e)" % (
            m, name, row["Viscous Force"][2], ex["viscous_force"][2], row["Moment"][2],
            ex["total_moment"][2]))
    parts = sum(file_rows[m][nm]["Force"] for nm in ("Upper Cap", "Equator Band", "Lower Cap"))
    T.check_close("(%s) regions sum to the Total row" % m, parts, file_rows[m]["Total"]["Force"],
                  atol=1e-14 * abs(F_Z), source="Load Integration")

for m, (ymin, ymax, dmin, dmax) in yplus.items():
    print("y+ on the bead (%s): %.3e .. %.3e  (wall distance %.3e .. %.3e m)" % (m, ymin, ymax, dmin, dmax))
# Creeping flow: u_tau = sqrt(tau/rho) ~ sqrt(3 mu U/(2 R rho) + 3 mu Omega/rho) and the
# first cell d ~ 1e-5 m give y+ ~ 1e-3; the viscous sublayer needs y+ < 5.
assert max(v[1] for v in yplus.values()) < 1e-2, "y+ must be tiny in creeping flow"

for p in (li_s, wt_s, li, wt, sp, calc, bead, vol):
    simple.Delete(p)

if defects:
    print("\nDEFECTS (documented behaviour not delivered):")
    for d in defects:
        print("  - " + d)
    raise AssertionError("%d documented property(ies) fail; see DEFECTS above" % len(defects))
T.done(__file__)
