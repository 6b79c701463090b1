"""Shear Projection on Stokes flow past a fixed sphere: the friction drag
4 pi mu R U from the velocity of a fluid volume, with measured convergence.

Flow (Stokes 1851; Batchelor, An Introduction to Fluid Dynamics, 1967, §4.9
-- section number recalled from memory; the fields are re-derived and
checked against finite differences in scenes.selfcheck):
  u = U - (3R/4r)(U + (U.y)y/r^2) - (R^3/4r^3)(U - 3(U.y)y/r^2),
  p - p_inf = -(3/2) mu R (U.y)/r^3,   y = x - c,
  wall shear stress (3 mu/2R)(U - (U.n)n), friction drag 4 pi mu R U (2/3 of
  the total 6 pi mu R U), pressure drag 2 pi mu R U.

Mesh (scenes.spherical_shell): the uv_sphere lattice n_polar x
2 n_polar swept over n_radial = n_polar/2 layers between R and 3R, graded
toward the wall by the fixed map stretched_nodes(stretch = 2), so every cell
size scales like h = pi/n_polar (first-layer centre d = 0.65 R/n_polar).
Hexahedra, wedges in the two polar rows. U (and the exact velocity gradient,
for one path) are evaluated at the cell centroids (vertex means, the centre
the filter uses). Walls: the inner uv_sphere as its own polydata (faces
stored into the wall, as solvers export them; no shared point ids), with the
exact cell pressure at the radial projection of each face centroid.
Pipeline: Shear Projection -> Wall Traction (ShearSource 'Wall shear stress
array', ShearStressArray 'Wall Shear Stress', Orientation 'Use Wall Normal
array', Pressure the wall's cell 'p') -> Load Integration over the inner wall.

Levels n_polar = 8, 16, 32, 64. Expected orders (our analysis):
* every path is FIRST order here. Near-wall difference: mu t(u_P)/d has the
  profile error (d/2) u_t''/u_t' = -(3/2) d/R for this flow (u_t is
  proportional to 1 - 3R/4r - R^3/4r^3 = (3/2)xi - (9/4)xi^2 + ..., xi =
  (r-R)/R), and the mesh adds a second first-order term: the analytic field
  vanishes on the true sphere, but d is measured from the flat face, whose
  centroid lies a sagitta delta ~ R h^2/16 (1 + sin^2 theta) inside it, so
  u_P corresponds to a wall distance d - delta: a relative error -delta/d ~
  h (d ~ h). The test prints both parts at the finest level.
* Wall fit (WallFit.h): a quadratic fit over the wall cell, its neighbours
  and the face's corners with no slip. The corners lie on the sphere, so
  the sagitta does not enter: second order, and the friction drag converges
  faster still (face errors of both signs partly cancel in the sum; measured
  order 3.9 over n = 16..64, asserted >= 1.8). The largest face errors sit
  in the rows next to the poles, where the cells' aspect ratio grows like n:
  printed, not asserted (the order per face is asserted on the cylinder of
  test_shear_slabs.py and in the kernel tests).
* Gradient tensor: the gradient at the cell centre, not at the wall: first
  order (documented), with the array and with the least-squares gradient.
* Point velocity (vertex data averaged over the cell): first order.
Pressure force: the wall pressure is given exactly; its error is the
faceting of the surface, second order, as in test_stokes_sphere.py.

Tolerances: the observed order (least-squares slope of log error over
n = 16, 32, 64) must lie in a band around the measured value; the finest
error must be below 1.05 x C x h_finest^p with p the nominal order and C the
constant e/h^p of n = 32 plus its change from n = 16 (the constants still
drift upward by 4-13 % per level, a drift that shrinks), and below 1.05 x
the constant
recorded when the test was written (RECORDED_C; deterministic computation,
5 % absorbs platform summation-order differences only). Identities that
hold exactly (the near-wall formula, the wall distance, y+, the moment
about the centre by central symmetry, the pressure pass-through) are
checked to round-off.

Measured when written (friction drag error at n = 8/16/32/64, order over
16..64): near-wall difference 40/23/12/6.4 %, 0.93 (of which, at n = 64,
1.4 % is the profile term, model 1.5 d/R = 1.5 %, and 5 % the sagitta);
wall fit 12/1.7/0.18/0.0075 %, 3.9 (an earlier fit on the two cells stacked
off the wall gave 40/23/13/6.6 %, order 0.91, and one that also fitted the
tangential neighbours 1.4/13/8.6/4.9 %, order 0.70); least-squares gradient
56/32/16/7.6 %, 1.04; gradient array at the cell centre 25/14/7.4/3.8 %,
0.94; near-wall difference with point velocity 26/13/6.1/3.0 %, 1.03.
Pressure force 6.97e-2 h^2, order 2.00, identical to the surface-only path.
"""
import math

import numpy as np

import wl_testing as T
import scenes as S

simple = T.load_plugin()

R = 0.5
MU = 2.0e-3
RHO = 1.0
U = np.array([0.3, -0.2, 0.25])      # arbitrary direction, not along a mesh axis
CENTRE = np.array([0.1, -0.2, 0.3])  # off the origin
OUTER = 3.0 * R
STRETCH = 2.0
LEVELS = [8, 16, 32, 64]
FIT = slice(1, None)                 # levels used for the orders: 16, 32, 64
H = np.array([math.pi / n for n in LEVELS])
EPS = np.finfo(float).eps

FV_EXACT = 4.0 * math.pi * MU * R * U     # friction drag (Stokes 1851; Batchelor 1967 §4.9)
FP_EXACT = 2.0 * math.pi * MU * R * U     # pressure drag
F_EXACT = FV_EXACT + FP_EXACT             # 6 pi mu R U
E_U = U / np.linalg.norm(U)

PATHS = {  # name: (Method, velocity association, velocity-gradient array)
    "near-wall difference": ("Near-wall difference", "CELLS", None),
    "wall fit": ("Wall fit", "CELLS", None),
    "gradient, least squares": ("Gradient tensor", "CELLS", None),
    "gradient, array": ("Gradient tensor", "CELLS", "G"),
    "near-wall diff., point U": ("Near-wall difference", "POINTS", None),
}
# (observed-order band over n = 16..64, nominal order p of the bound)
BANDS = {"viscous": ((0.8, 1.3), 1.0), "force": ((0.8, 1.3), 1.0), "pressure": ((1.8, 2.2), 2.0)}
# The wall fit puts no slip at the faces' corners, which lie on the sphere:
# second order (module docstring).
PATH_BANDS = {"wall fit": {"viscous": ((1.8, 4.5), 2.0), "force": ((1.8, 4.5), 2.0)}}

# Error constants e/h^p at n = 64 when this test was written (relative to
# |4 pi mu R U| for 'viscous', |6 pi mu R U| for 'force' and 'pressure';
# p = 2 for the wall fit and the pressure, 1 otherwise).
RECORDED_C = {
    "near-wall difference viscous": 1.2977, "near-wall difference force": 0.86854,
    "wall fit viscous": 0.031178, "wall fit force": 0.085069,
    "gradient, least squares viscous": 1.5471, "gradient, least squares force": 1.0348,
    "gradient, array viscous": 0.77277, "gradient, array force": 0.51858,
    "near-wall diff., point U viscous": 0.60913, "near-wall diff., point U force": 0.40949,
}
for _path in PATHS:   # the surface faceting alone: test_stokes_sphere.py's path (a) constant
    RECORDED_C[_path + " pressure"] = 6.9739e-02


def check_max(label, got, expected, rtol=0.0, atol=0.0, source=""):
    """Like T.check_close for long arrays: prints only the largest error."""
    got, expected = np.asarray(got, dtype=float), np.asarray(expected, dtype=float)
    err = np.abs(got - expected)
    tol = atol + rtol * np.abs(expected)
    worst = float(np.max(err - tol))
    print("%-60s max|err| %.3e over %d values (tol %.1e rel, %.1e abs) %s" % (
        label, err.max(), err.size, rtol, atol, ("[" + source + "]") if source else ""))
    assert worst <= 0.0, "%s: error %.3e exceeds tolerance" % (label, err.max())


def scene(n):
    sh = S.spherical_shell(R, OUTER, n, 2 * n, n // 2, stretch=STRETCH, center=CENTRE)
    xc = S.cell_vertex_means(sh["points"], sh["cells"])
    vol = S.unstructured_grid(
        sh["points"], sh["cells"], sh["types"],
        cell_arrays={"velocity": S.stokes_sphere_velocity(xc, R, U, CENTRE),
                     "G": S.stokes_sphere_velocity_gradient(xc, R, U, CENTRE)},
        point_arrays={"velocity": S.stokes_sphere_velocity(sh["points"], R, U, CENTRE)})
    P, F, _ = S.uv_sphere(R, n, 2 * n, center=CENTRE, ordering="into_wall")
    C = S.face_centroids(P, F)
    walls = S.polydata(P, F, cell_arrays={"p": S.stokes_sphere(C, R, U, MU, CENTRE)["p"]})
    return {"vol": vol, "walls": walls, "xc": xc, "sh": sh, "P": P, "F": F, "C": C}


def run(sc, path, with_loads=True):
    method, assoc, grad = PATHS[path]
    vol, wl = T.producer(sc["vol"]), T.producer(sc["walls"])
    sp = simple.ShearProjection(Input=vol, Walls=wl)
    sp.Velocity = [assoc, "velocity"]
    sp.Method = method
    sp.Viscosity = MU
    sp.Density = RHO
    if grad:
        sp.VelocityGradient = ["CELLS", grad]
    out = T.output_of(sp)
    res = {k: T.cell_array(out, k).copy() for k in
           ("Wall Shear Stress", "Wall Normal", "Wall Distance", "Friction Velocity", "y+",
            "Near-Wall Regime")}
    made = [sp, wl, vol]
    if with_loads:
        wt = simple.WallTraction(Input=sp)
        wt.Pressure = ["CELLS", "p"]
        wt.ShearSource = "Wall shear stress array"
        wt.ShearStressArray = ["CELLS", "Wall Shear Stress"]
        wt.Orientation = "Use Wall Normal array"
        li = simple.LoadIntegration(Input=wt)
        li.MomentCentre = list(CENTRE)
        li.DragDirection = list(E_U)
        li.LiftDirection = [0.0, 0.0, 1.0]
        lo = T.output_of(li, 0)
        for k in ("Pressure Force", "Viscous Force", "Force", "Moment", "Skipped Faces"):
            res[k] = T.field(lo, k)
        made = [li, wt] + made
    for p in made:
        simple.Delete(p)
    return res


def surface_pressure_force(sc):
    """The same walls through Wall Traction alone (pressure only)."""
    wl = T.producer(sc["walls"])
    wt = simple.WallTraction(Input=wl)
    wt.Pressure = ["CELLS", "p"]
    wt.Orientation = "Stored normals point into the wall"
    li = simple.LoadIntegration(Input=wt)
    Fp = T.field(T.output_of(li, 0), "Pressure Force")
    for p in (li, wt, wl):
        simple.Delete(p)
    return Fp


def check_convergence(label, errors, band, p, source):
    errors = np.asarray(errors, dtype=float)
    order = T.observed_order(H[FIT], errors[FIT])
    consts = errors / H**p
    print("  %-26s errors %s  e/h^%g %s  order(16..64) %.3f" % (
        label, np.array2string(errors, precision=3), p,
        np.array2string(consts, formatter={"float_kind": lambda v: "%.4e" % v}), order))
    lo, hi = band
    assert lo <= order <= hi, "%s: observed order %.3f outside [%g, %g]" % (label, order, lo, hi)
    # The constants still drift upward (pre-asymptotic): bound the finest one
    # by the last coarser constant plus its last change (a drift that does not
    # accelerate), with 5 %.
    c_prev, c_last = consts[-3], consts[-2]
    c_bound = 1.05 * (c_last + max(0.0, c_last - c_prev))
    bound = c_bound * H[-1]**p
    assert errors[-1] <= bound, "%s: finest error %.3e above %.3e (measured constant)" % (
        label, errors[-1], bound)
    line = "    finest %.3e <= %.3e (1.05 x extrapolated C)" % (errors[-1], bound)
    if label in RECORDED_C:
        rec = 1.05 * RECORDED_C[label] * H[-1]**p
        assert errors[-1] <= rec, "%s: finest error %.3e above %.3e (recorded constant)" % (
            label, errors[-1], rec)
        line += " and <= %.3e (1.05 x recorded C)" % rec
    print(line + "  [%s]" % source)
    return order


print("Stokes sphere volume: R=%g mu=%g U=%s centre=%s, shell to %g R, stretch %g" % (
    R, MU, U, CENTRE, OUTER / R, STRETCH))
errors = {path: {"viscous": [], "force": [], "pressure": []} for path in PATHS}
face_errors = []   # wall fit: max over the faces of |tau - tau_exact| / max |tau_exact|
for n in LEVELS:
    sc = scene(n)
    n_faces = len(sc["F"])
    nw, area = S.newell_normals(sc["P"], sc["F"])
    nw = -nw                                    # stored into the wall -> into the fluid
    Fp_surface = surface_pressure_force(sc)
    for path in PATHS:
        r = run(sc, path)
        tau, nrm, d = r["Wall Shear Stress"], r["Wall Normal"], r["Wall Distance"]
        assert np.all(np.isfinite(tau)) and r["Skipped Faces"] == 0, "%s n=%d: NaN faces" % (path, n)
        errors[path]["viscous"].append(np.linalg.norm(r["Viscous Force"] - FV_EXACT) / np.linalg.norm(FV_EXACT))
        errors[path]["force"].append(np.linalg.norm(r["Force"] - F_EXACT) / np.linalg.norm(F_EXACT))
        errors[path]["pressure"].append(np.linalg.norm(r["Pressure Force"] - FP_EXACT) / np.linalg.norm(F_EXACT))
        # Wall Normal: the Newell normal of the face, into the fluid (geometry).
        check_max("(%s n=%d) Wall Normal = Newell normal into fluid" % (path, n), nrm, nw,
                  atol=1e-12, source="face geometry")
        assert np.all(np.einsum("ij,ij->i", nrm, sc["C"] - CENTRE) > 0), "normal not into the fluid"
        # The pressure passes through untouched: Wall Traction on the output
        # gives the surface-only pressure force (same faces, same normals).
        T.check_close("(%s n=%d) pressure force = surface-only path" % (path, n),
                      r["Pressure Force"], Fp_surface, atol=1e3 * EPS * np.linalg.norm(FP_EXACT),
                      source="pass-through of the wall arrays")
        # Moment about the centre: mesh and flow are centrally symmetric about
        # CENTRE (u(c - y) = u(c + y)), so mirror faces carry the same shear
        # and opposite lever arms; round-off of ~n^2 terms of size |F| R / n^2.
        T.check_close("(%s n=%d) moment about centre" % (path, n), r["Moment"], np.zeros(3),
                      atol=1e-12 * np.linalg.norm(F_EXACT) * R, source="central symmetry")
        # y+ = d u_tau / nu with u_tau = sqrt(|tau|/rho) (the filter's definition).
        utau = np.sqrt(np.linalg.norm(tau, axis=1) / RHO)
        check_max("(%s n=%d) Friction Velocity, y+" % (path, n),
                      np.concatenate([r["Friction Velocity"], r["y+"]]),
                  np.concatenate([utau, d * utau / (MU / RHO)]), rtol=1e-13)
        assert np.all(r["Near-Wall Regime"] == 0), "creeping flow: y+ < 5 everywhere"
        if path == "wall fit":
            # Face by face against the exact wall shear stress at the face's
            # radial projection on the sphere (the faces' corners are on it).
            wss = S.stokes_sphere(sc["C"], R, U, MU, CENTRE)["wss"]
            face_errors.append(float(np.max(np.linalg.norm(tau - wss, axis=1)) /
                                     np.max(np.linalg.norm(wss, axis=1))))
        if path in ("near-wall difference", "near-wall diff., point U"):
            # The documented formula, face by face, recomputed with numpy: the
            # wall faces are the inner faces of the first layer (same order).
            if path == "near-wall difference":
                uP = S.stokes_sphere_velocity(sc["xc"][:n_faces], R, U, CENTRE)
            else:
                # the mean of the vertex values over the cell's points
                uP = S.cell_vertex_means(S.stokes_sphere_velocity(sc["sh"]["points"], R, U, CENTRE),
                                         sc["sh"]["cells"][:n_faces])
            dP = np.einsum("ij,ij->i", sc["xc"][:n_faces] - sc["C"], nw)
            ut = uP - np.einsum("ij,ij->i", uP, nw)[:, None] * nw
            check_max("(%s n=%d) Wall Distance = (x_P - x_f).n" % (path, n), d, dP,
                      atol=1e-12 * R)
            check_max("(%s n=%d) tau = mu t(u_P)/d per face" % (path, n), tau,
                      MU * ut / dP[:, None], atol=1e-10 * np.abs(tau).max(),
                      source="vtkShearProjection.h, near-wall difference")
            if path == "near-wall difference" and n == LEVELS[-1]:
                # Split of the error: profile (true wall distance) vs sagitta.
                s_true = np.linalg.norm(sc["xc"][:n_faces] - CENTRE, axis=1) - R
                wss = S.stokes_sphere(sc["C"], R, U, MU, CENTRE)["wss"]
                Fv = lambda t: (t * area[:, None]).sum(0)
                e_prof = np.linalg.norm(Fv(MU * ut / s_true[:, None]) - Fv(wss)) / np.linalg.norm(FV_EXACT)
                print("  n=%d near-wall difference: d/R = %.4f, profile error alone %.4f "
                      "(model 1.5 d/R = %.4f), total %.4f (the rest: sagitta)" % (
                          n, np.median(dP) / R, e_prof, 1.5 * np.median(dP) / R,
                          errors[path]["viscous"][-1]))
    print("n=%d: %d wall faces, %d cells" % (n, n_faces, sc["vol"].GetNumberOfCells()))

src = "Stokes 1851; Batchelor 1967 §4.9"
orders = {}
for path in PATHS:
    print(path + ":")
    for q, label in (("viscous", "4 pi mu R U"), ("force", "6 pi mu R U"), ("pressure", "2 pi mu R U")):
        band, p = PATH_BANDS.get(path, {}).get(q, BANDS[q])
        orders[(path, q)] = check_convergence("%s %s" % (path, q), errors[path][q], band, p,
                                              src + ": " + label)

# Printed, not asserted: the largest face errors sit in the rows next to the
# poles, whose cells' aspect ratio grows like n (width R sin(theta) dphi), so
# the second-order constant grows there; the friction drag, asserted above,
# and the cylinder of test_shear_slabs.py measure the order.
print("wall fit, face by face: max |tau - tau_exact|/max|tau_exact| %s (n = %s)" % (
    " ".join("%.3e" % e for e in face_errors), LEVELS))
print("Observed orders of the friction drag (n = 16..64): " + ", ".join(
    "%s %.2f" % (path, orders[(path, "viscous")]) for path in PATHS))
print("Finest friction-drag errors (n = 64): " + ", ".join(
    "%s %.2f %%" % (path, 100 * errors[path]["viscous"][-1]) for path in PATHS))

# Without Walls every boundary face is a wall face: the inner ones carry the
# same values as with the inner sphere given as Walls (matched by centroid).
sc = scene(16)
with_walls = run(sc, "near-wall difference", with_loads=False)
vol = T.producer(sc["vol"])
sp = simple.ShearProjection(Input=vol)
sp.Velocity = ["CELLS", "velocity"]
sp.Viscosity = MU
out = T.output_of(sp)
assert out.IsA("vtkPolyData"), "plain volume without Walls gives a polydata"
from vtkmodules.util.numpy_support import vtk_to_numpy  # noqa: E402
pts = vtk_to_numpy(out.GetPoints().GetData())
faces = [tuple(out.GetCell(i).GetPointId(k) for k in range(out.GetCell(i).GetNumberOfPoints()))
         for i in range(out.GetNumberOfCells())]
cen = S.face_centroids(pts, faces)
inner = np.linalg.norm(cen - CENTRE, axis=1) < 2.0 * R
assert inner.sum() == len(sc["F"]) and (~inner).sum() == len(sc["F"]), "inner + outer boundary"
order_ = [int(np.argmin(np.linalg.norm(cen - c, axis=1) + 1e9 * ~inner)) for c in sc["C"]]
check_max("no Walls: inner faces = Walls path (n=16)", T.cell_array(out, "Wall Shear Stress")[order_],
          with_walls["Wall Shear Stress"], atol=64 * EPS * np.abs(with_walls["Wall Shear Stress"]).max())
T.check_close("no Walls: outer faces' normal points inward (into the fluid)",
              float(np.all(np.einsum("ij,ij->i", T.cell_array(out, "Wall Normal")[~inner],
                                     cen[~inner] - CENTRE) < 0)), 1.0)
for p in (sp, vol):
    simple.Delete(p)

T.done(__file__)
