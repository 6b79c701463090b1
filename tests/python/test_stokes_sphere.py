"""Stokes (creeping) flow past a fixed sphere: drag, its pressure/friction
split, zero side force and zero moment about the centre, with measured
convergence under mesh refinement.

Closed forms (Stokes 1851; Batchelor, An Introduction to Fluid Dynamics,
1967, §4.9 -- section number recalled from memory; the values below are
also re-derived by Gauss quadrature in scenes.selfcheck):

  p - p_inf = -(3/2) mu (U.n)/R,     wall shear stress = (3 mu/2R)(U - (U.n) n),
  traction  = (3 mu / 2R) U  (uniform over the sphere),
  pressure drag  F_p = 2 pi mu R U   (1/3 of the total),
  friction drag  F_v = 4 pi mu R U   (2/3 of the total),
  total          F   = 6 pi mu R U,   no force normal to U, no moment about
  the centre (the traction is uniform, and integral of n dA = 0).

Discretisation: a latitude/longitude sphere (scenes.uv_sphere)
with n_polar = 8, 16, 32, 64 and n_azimuth = 2 n_polar, so that the polar
and azimuthal angular steps are both h = pi / n_polar. Fields are evaluated
at the radial projection of each face centroid (cell data) or at the
vertices, which lie exactly on the sphere (point data, averaged over the
corners by the filter). The faces are flat, so every path is expected to be
second order in h. For the cell paths with a uniform exact traction the
leading error is the area deficit of the inscribed polyhedron. Per quad
(our own derivation) the flat/curved area ratio is
  [2 sin(dphi/2)/dphi] cos(dtheta/2) sqrt(cos^2(dphi/2) cos^2 theta + sin^2 theta)
  = 1 - dphi^2/24 - dtheta^2/8 - (dphi^2/8) cos^2 theta + O(h^4),
and the area-weighted mean of cos^2 theta over the sphere is 1/3, so the
relative area deficit is (1/24 + 1/8 + 1/24) h^2 = (5/24) h^2 = 0.2083 h^2:
the constant measured for the total force on paths (a) and (b).

Paths:
  (a) cell pressure + wall shear stress array;
  (b) cell pressure + cell velocity gradient, constant dynamic viscosity;
  (c) point pressure (vertices on the sphere) + cell velocity gradient;
  (d) point pressure + point velocity gradient (all point data).

Tolerances: every error is measured at the four levels; the observed order
(least-squares slope) must lie in a stated band, and the finest-level error
must be below 1.05 x (largest error constant e/h^2 of the three coarser
levels) x h_finest^2 -- for the second-order quantities the measured
constants drift by < 1 % between the two finest levels and by <= 4 %
between the two coarsest (path d), so 5 % covers the pre-asymptotic drift -- and below 1.05 x the constant recorded here when the
test was written (RECORDED_C). Quantities that vanish by the symmetry of the
mesh (moment about the centre) are checked against a round-off bound
instead, as stated beside them.
"""
import math

import numpy as np

import wl_testing as T
import scenes as S

simple = T.load_plugin()

R = 0.5
MU = 2.0e-3
U = np.array([0.3, -0.2, 0.25])      # arbitrary direction: not along a mesh axis
CENTRE = np.array([0.1, -0.2, 0.3])  # off the origin: moments about the sphere centre
LEVELS = [8, 16, 32, 64]
H = np.array([math.pi / n for n in LEVELS])
EPS = np.finfo(float).eps

F_EXACT = 6.0 * math.pi * MU * R * U          # Stokes 1851
FP_EXACT = 2.0 * math.pi * MU * R * U         # 1/3 (Batchelor 1967, §4.9)
FV_EXACT = 4.0 * math.pi * MU * R * U         # 2/3
E_U = U / np.linalg.norm(U)
SCALE = np.linalg.norm(F_EXACT)

# Error constants e/h^2 measured at n_polar = 64 when this test was written
# (errors relative to |6 pi mu R U|, h = pi/n_polar; 'split' is the absolute
# error of F_p.e_U / Drag). Used as a regression bound with a 5 % margin: the
# computation is deterministic up to round-off, so 5 % only absorbs platform
# differences in summation order, far below any real change of the method.
RECORDED_C = {
    ("a", "force"): 2.0833e-01, ("a", "pressure"): 6.9739e-02, ("a", "viscous"): 1.3925e-01,
    ("a", "side"): 1.2911e-06, ("a", "split"): 1.4458e-04,
    ("b", "force"): 2.0838e-01, ("b", "pressure"): 6.9739e-02, ("b", "viscous"): 1.3930e-01,
    ("b", "side"): 2.5140e-05, ("b", "split"): 1.5913e-04,
    ("c", "force"): 2.7960e-01, ("c", "pressure"): 1.4054e-01, ("c", "viscous"): 1.3930e-01,
    ("c", "side"): 2.7273e-02, ("c", "split"): 4.6467e-02,
    ("d", "force"): 6.9425e-01, ("d", "pressure"): 1.4054e-01, ("d", "viscous"): 5.5703e-01,
    ("d", "side"): 3.8968e-02, ("d", "split"): 9.2014e-02,
}


def scene(n, ordering="into_fluid"):
    P, F, _ = S.uv_sphere(R, n, 2 * n, center=CENTRE, ordering=ordering)
    C = S.face_centroids(P, F)
    cell = S.stokes_sphere(C, R, U, MU, center=CENTRE)    # at the radial projection of C
    point = S.stokes_sphere(P, R, U, MU, center=CENTRE)   # vertices are on the sphere
    return S.polydata(P, F,
                      cell_arrays={"p": cell["p"], "wss": cell["wss"], "grad": cell["grad"]},
                      point_arrays={"p": point["p"], "grad": point["grad"]})


def loads(pd, path, orientation="Stored normals point into the fluid"):
    src = T.producer(pd)
    wt = simple.WallTraction(Input=src)
    wt.Orientation = orientation
    if path == "a":
        wt.Pressure = ["CELLS", "p"]
        wt.ShearSource = "Wall shear stress array"
        wt.ShearStressArray = ["CELLS", "wss"]
    else:
        wt.Pressure = ["CELLS", "p"] if path == "b" else ["POINTS", "p"]
        wt.ShearSource = "Velocity gradient"
        wt.VelocityGradient = ["POINTS", "grad"] if path == "d" else ["CELLS", "grad"]
        wt.Viscosity = MU
        wt.ViscosityKind = "Dynamic"
    li = simple.LoadIntegration(Input=wt)
    li.MomentCentre = list(CENTRE)
    li.DragDirection = list(E_U)
    li.LiftDirection = [0.0, 0.0, 1.0]   # made orthogonal to the drag direction by the filter
    out = T.output_of(li, 0)
    res = {k: T.field(out, k) for k in
           ("Pressure Force", "Viscous Force", "Force", "Moment", "Drag", "Side Force", "Lift",
            "Area")}
    res["rows"] = T.table_rows(T.output_of(li, 1))
    for p in (li, wt, src):
        simple.Delete(p)
    return res


def check_convergence(path, name, errors, band, source):
    """Order in `band` (lo, hi or None) and finest error below the measured-constant bound."""
    errors = np.asarray(errors, dtype=float)
    order = T.observed_order(H, errors)
    consts = errors / H**2
    print("  %s %-9s errors %s  e/h^2 %s  order %.3f" % (
        path, name, np.array2string(errors, precision=3), np.array2string(consts, formatter={'float_kind': lambda v: '%.4e' % v}), order))
    lo, hi = band
    assert order >= lo and (hi is None or order <= hi), \
        "path %s %s: observed order %.3f outside [%s, %s]" % (path, name, order, lo, hi)
    bound = 1.05 * consts[:-1].max() * H[-1]**2
    assert errors[-1] <= bound, "path %s %s: finest error %.3e above %.3e (measured constant)" % (
        path, name, errors[-1], bound)
    rec = 1.05 * RECORDED_C[(path, name)] * H[-1]**2
    assert errors[-1] <= rec, "path %s %s: finest error %.3e above %.3e (recorded constant)" % (
        path, name, errors[-1], rec)
    print("    finest %.3e <= %.3e (1.05 x measured C) and <= %.3e (1.05 x recorded C)  [%s]" % (
        errors[-1], bound, rec, source))


print("Stokes sphere: R=%g mu=%g U=%s centre=%s; F_exact=%s" % (R, MU, U, CENTRE, F_EXACT))
for path in "abcd":
    e_force, e_p, e_v, e_side, e_split = [], [], [], [], []
    for n in LEVELS:
        r = loads(scene(n), path)
        F, Fp, Fv = r["Force"], r["Pressure Force"], r["Viscous Force"]
        e_force.append(np.linalg.norm(F - F_EXACT) / SCALE)
        e_p.append(np.linalg.norm(Fp - FP_EXACT) / SCALE)
        e_v.append(np.linalg.norm(Fv - FV_EXACT) / SCALE)
        # Side components: the part of F normal to U, i.e. Side Force and Lift
        # on the load axes whose drag axis is U.
        e_side.append(math.hypot(r["Side Force"], r["Lift"]) / SCALE)
        e_split.append(abs(Fp.dot(E_U) / r["Drag"] - 1.0 / 3.0))
        # Consistency of the reported axes components with the vectors (round-off).
        T.check_close("(%s n=%d) Drag = F.e_U" % (path, n), r["Drag"], F.dot(E_U),
                      atol=16 * EPS * SCALE)
        # Table Total row equals the field data (same numbers, two outputs).
        T.check_close("(%s n=%d) table Total Force" % (path, n), r["rows"]["Total"]["Force"], F,
                      atol=0.0)
        # Moment about the sphere centre: the uv_sphere with even n_azimuth is
        # centrally symmetric about CENTRE, and on each path the discrete
        # traction at the mirror face is the same vector while the lever arm
        # flips, so the discrete moment vanishes in exact arithmetic; what is
        # left is round-off of N ~ 10^4 terms of size |F| R / N.
        T.check_close("(%s n=%d) Moment about centre" % (path, n), r["Moment"], np.zeros(3),
                      atol=1e-12 * SCALE * R, source="symmetry; round-off bound")
        if n == LEVELS[-1]:
            # The vectors themselves at the finest level, within the
            # recorded-constant bound on |error| (see check_convergence).
            hf2 = H[-1]**2
            T.check_close("(%s n=%d) Force" % (path, n), F, F_EXACT,
                          atol=1.05 * RECORDED_C[(path, "force")] * hf2 * SCALE,
                          source="Stokes 1851: 6 pi mu R U")
            T.check_close("(%s n=%d) Pressure Force" % (path, n), Fp, FP_EXACT,
                          atol=1.05 * RECORDED_C[(path, "pressure")] * hf2 * SCALE,
                          source="Batchelor 1967 §4.9: 2 pi mu R U")
            T.check_close("(%s n=%d) Viscous Force" % (path, n), Fv, FV_EXACT,
                          atol=1.05 * RECORDED_C[(path, "viscous")] * hf2 * SCALE,
                          source="Batchelor 1967 §4.9: 4 pi mu R U")
    src = "Stokes 1851; Batchelor 1967 §4.9"
    check_convergence(path, "force", e_force, (1.8, 2.2), src + ": 6 pi mu R U")
    check_convergence(path, "pressure", e_p, (1.8, 2.2), src + ": 2 pi mu R U")
    check_convergence(path, "viscous", e_v, (1.8, 2.2), src + ": 4 pi mu R U")
    # The side error is superconvergent on paths (a) and (b) (measured orders
    # about 4.0 and 3.4: the x-y isotropy of the mesh is exact, only the
    # z-vs-xy anisotropy of sum n n^T A is left, at higher order), hence no
    # upper limit on its band; (c), (d) measure about 1.93-1.96.
    check_convergence(path, "side", e_side, (1.8, None), src + ": F parallel to U")
    # The 1/3 split: measured orders 2.02 (a), 2.6 (b, mixed h^2/h^3 terms), 1.99, 2.01.
    check_convergence(path, "split", e_split, (1.8, None), src + ": F_p/F = 1/3")

# Orientation: the same scene stored with reversed faces ('into_wall', the
# usual solver export) and the default Orientation (flip) gives the same loads.
n = 16
a = loads(scene(n), "a")
b = loads(scene(n, ordering="into_wall"), "a", orientation="Stored normals point into the wall")
for k in ("Pressure Force", "Viscous Force", "Force"):
    T.check_close("into_wall + default flip: %s (n=%d)" % (k, n), b[k], a[k],
                  atol=64 * EPS * SCALE, source="same faces, reversed order")

T.done(__file__)
