"""Sphere rotating in fluid at rest (creeping flow), alone and superposed on
a Stokes translation: torque, force, moment transfer, line of action and
residual couple, with measured convergence under mesh refinement.

Closed forms
  Rotation (Landau & Lifshitz, Fluid Mechanics, §20 -- section and result
  recalled from memory; re-derived by quadrature in
  scenes.selfcheck): u = Omega x y R^3/r^3, uniform pressure,
  G = [Omega x](I - 3 n n^T) at r = R, traction t = mu (G + G^T) n
  = -3 mu Omega x n (tangential), torque about the centre
  M = integral R n x t dA = -8 pi mu R^3 Omega, force 0.
  The wall moves (u = Omega x y), so mu du/dn = -2 mu Omega x n is NOT the
  traction: the filter must use the full mu (G + G^T) n, or the torque on
  the gradient path would come out 2/3 of the right value.
  Translation (Stokes 1851; Batchelor, An Introduction to Fluid Dynamics,
  1967, §4.9 -- recalled from memory): force 6 pi mu R U, no moment about
  the centre.
  Creeping flow is linear, so the superposed fields are the sums and the
  loads add: F = 6 pi mu R U, M(c) = -8 pi mu R^3 Omega.
  Moment transfer to another centre r0 (statics of rigid bodies):
    M(r0) = M(c) + (c - r0) x F.
  Central axis of the force system (reduction to a wrench; e.g. Goldstein,
  Classical Mechanics, the reduction of a force system -- cited from memory):
  the point of the axis nearest r0 is r0 + F x M(r0)/|F|^2, and the couple
  left along F is (F . M)/|F|.
  For U = U e_x, Omega = Omega e_y: F x M(c)/|F|^2 = (M/F) e_z with
  M/F = -(4/3) R^2 Omega / U, so the axis is the line through
  c + (M/F) e_z parallel to e_x, its point nearest r0 is
  (r0_x, c_y, c_z + M/F), and the residual couple is 0. An oblique Omega
  (with an x component) gives the residual couple -8 pi mu R^3 Omega_x
  (U > 0), which is checked too.

Discretisation: uv_sphere with n_polar = 8, 16, 32, 64, n_azimuth = 2 n_polar,
h = pi/n_polar; fields at the radial projection of each face centroid (cell
data). Paths: wall shear stress array, and velocity gradient with constant
dynamic viscosity. Tolerances as in test_stokes_sphere: observed order in a
stated band; finest error below 1.05 x the largest coarser-level constant
e/h^2 times h^2 (measured drift of e/h^2 between the two finest levels
< 0.5 %), and below 1.05 x the constant recorded when the test was written.
Identities that are exact in exact arithmetic (moment transfer, the line of
action formula applied to the reported F and M, forces that vanish by the
central symmetry of the mesh) are checked against round-off bounds.
"""
import math

import numpy as np

import wl_testing as T
import scenes as S

simple = T.load_plugin()

R = 0.5
MU = 2.0e-3
CENTRE = np.array([0.2, -0.1, 0.3])
R0 = np.array([-0.4, 0.5, 0.1])          # moment centre off the sphere centre
LEVELS = [8, 16, 32, 64]
H = np.array([math.pi / n for n in LEVELS])
EPS = np.finfo(float).eps
PATHS = ("wss", "grad")


def scene(n, U, Omega):
    P, F, _ = S.uv_sphere(R, n, 2 * n, center=CENTRE)
    C = S.face_centroids(P, F)
    tr = S.stokes_sphere(C, R, U, MU, center=CENTRE)
    ro = S.rotating_sphere(C, R, Omega, MU, center=CENTRE)
    return S.polydata(P, F, cell_arrays={
        "p": tr["p"] + ro["p"], "wss": tr["wss"] + ro["wss"], "grad": tr["grad"] + ro["grad"]})


def loads(pd, path, centres):
    """Totals for each moment centre in `centres` (same Wall Traction)."""
    src = T.producer(pd)
    wt = simple.WallTraction(Input=src)
    wt.Orientation = "Stored normals point into the fluid"
    wt.Pressure = ["CELLS", "p"]
    if path == "wss":
        wt.ShearSource = "Wall shear stress array"
        wt.ShearStressArray = ["CELLS", "wss"]
    else:
        wt.ShearSource = "Velocity gradient"
        wt.VelocityGradient = ["CELLS", "grad"]
        wt.Viscosity = MU
        wt.ViscosityKind = "Dynamic"
    out = []
    for c in centres:
        li = simple.LoadIntegration(Input=wt)
        li.MomentCentre = list(c)
        o = T.output_of(li, 0)
        out.append({k: T.field(o, k) for k in
                    ("Force", "Moment", "Line Of Action Point", "Residual Couple")})
        out[-1]["Total row"] = T.table_rows(T.output_of(li, 1))["Total"]
        simple.Delete(li)
    simple.Delete(wt)
    simple.Delete(src)
    return out


def convergence(label, errors, band, recorded, source, drift=1.05):
    errors = np.asarray(errors, dtype=float)
    order = T.observed_order(H, errors)
    consts = errors / H**2
    print("  %-34s errors %s e/h^2 %s order %.3f" % (
        label, np.array2string(errors, formatter={"float_kind": lambda v: "%.3e" % v}),
        np.array2string(consts, formatter={"float_kind": lambda v: "%.4e" % v}), order))
    lo, hi = band
    assert lo <= order and (hi is None or order <= hi), "%s: order %.3f outside [%s, %s]" % (
        label, order, lo, hi)
    bound = drift * consts[:-1].max() * H[-1]**2
    rec = 1.05 * recorded * H[-1]**2
    print("    finest %.4e <= %.4e (%.2f x measured C) and <= %.4e (1.05 x recorded C %.4e) [%s]" % (
        errors[-1], bound, drift, rec, recorded, source))
    assert errors[-1] <= bound, "%s: finest error above the measured-constant bound" % label
    assert errors[-1] <= rec, "%s: finest error above the recorded-constant bound" % label


# ---------------------------------------------------------------------------
# 1. Pure rotation, Omega in an arbitrary direction: torque -8 pi mu R^3 Omega
# ---------------------------------------------------------------------------
OMEGA = np.array([0.4, -0.7, 1.1])
M_ROT = -8.0 * math.pi * MU * R**3 * OMEGA          # Landau & Lifshitz §20
SCALE_M = np.linalg.norm(M_ROT)
print("Rotating sphere: R=%g mu=%g Omega=%s: M_exact=%s" % (R, MU, OMEGA, M_ROT))
# e/h^2 (|M - M_exact|/|M_exact|) at n_polar = 64 when the test was written.
REC_ROT = {"wss": 4.2044e-01, "grad": 4.2048e-01}
for path in PATHS:
    err = []
    for n in LEVELS:
        (r,) = loads(scene(n, np.zeros(3), OMEGA), path, [CENTRE])
        err.append(np.linalg.norm(r["Moment"] - M_ROT) / SCALE_M)
        # Force: the traction -3 mu Omega x n is odd under the central
        # symmetry of the mesh, so the discrete force vanishes in exact
        # arithmetic; round-off bound for ~10^4 terms.
        T.check_close("rotation (%s n=%d) Force" % (path, n), r["Force"], np.zeros(3),
                      atol=1e-12 * SCALE_M / R, source="symmetry; round-off bound")
        # A pure couple has no line of action: the resultant is round-off of
        # the face forces (below 1e-12 of their summed magnitudes), so the
        # filter reports NaN rather than a point 1e16 m away.
        assert np.all(np.isnan(r["Line Of Action Point"])), r["Line Of Action Point"]
        assert np.isnan(r["Residual Couple"]), r["Residual Couple"]
        print("    (pure couple: Line Of Action Point %s, Residual Couple %s: NaN as expected)" % (
            r["Line Of Action Point"], r["Residual Couple"]))
        if n == LEVELS[-1]:
            T.check_close("rotation (%s n=%d) Moment" % (path, n), r["Moment"], M_ROT,
                          atol=1.05 * REC_ROT[path] * H[-1]**2 * SCALE_M,
                          source="Landau & Lifshitz §20: -8 pi mu R^3 Omega")
    convergence("rotation %s torque" % path, err, (1.8, 2.2), REC_ROT[path],
                "Landau & Lifshitz §20")
    # The mu du/dn shortcut would give 2/3 of the torque: the measured error
    # at the coarsest level (6.3 %) already excludes a 33 % deficit.
    assert err[0] < 0.1, "torque far from -8 pi mu R^3 Omega: full (G+G^T) n not used?"

# ---------------------------------------------------------------------------
# 2. Translation along x plus rotation along y; moment centre off the centre
# ---------------------------------------------------------------------------
def superposed(U, Omega, label, rec):
    F_ex = 6.0 * math.pi * MU * R * U                   # Stokes 1851
    Mc_ex = -8.0 * math.pi * MU * R**3 * Omega          # Landau & Lifshitz §20
    Mr0_ex = Mc_ex + np.cross(CENTRE - R0, F_ex)        # moment transfer
    f2 = F_ex.dot(F_ex)
    P_ex = R0 + np.cross(F_ex, Mr0_ex) / f2             # Goldstein: wrench axis
    C_ex = F_ex.dot(Mr0_ex) / math.sqrt(f2)             # residual couple
    sF, sM = np.linalg.norm(F_ex), np.linalg.norm(Mr0_ex)
    print("%s: U=%s Omega=%s centre=%s r0=%s" % (label, U, Omega, CENTRE, R0))
    print("  exact F=%s M(c)=%s M(r0)=%s line-of-action point=%s residual couple=%.6e" % (
        F_ex, Mc_ex, Mr0_ex, P_ex, C_ex))
    for path in PATHS:
        eF, eM, eP, eC = [], [], [], []
        for n in LEVELS:
            rc, rr = loads(scene(n, U, Omega), path, [CENTRE, R0])
            F, Mc, Mr = rc["Force"], rc["Moment"], rr["Moment"]
            tag = "%s (%s n=%d)" % (label, path, n)
            # Same Wall Traction output for both centres: the force is identical.
            T.check_close(tag + " Force independent of centre", rr["Force"], F, atol=0.0)
            # Moment transfer: an identity of the discrete sums,
            # sum (x_i - r0) x f_i = sum (x_i - c) x f_i + (c - r0) x sum f_i,
            # so round-off only (terms of size |F| |c - r0|).
            T.check_close(tag + " M(r0) = M(c) + (c - r0) x F", Mr, Mc + np.cross(CENTRE - R0, F),
                          atol=1e-12 * (sM + sF * np.linalg.norm(CENTRE - R0)),
                          source="statics: moment transfer")
            # Line of action and couple against the formula applied to the
            # reported F and M(r0) (round-off), and independent of the centre
            # up to a shift along F: P(r0) - P(c) = ((r0 - c).e) e.
            f2h = F.dot(F)
            T.check_close(tag + " Line Of Action Point = r0 + F x M/|F|^2",
                          rr["Line Of Action Point"], R0 + np.cross(F, Mr) / f2h,
                          atol=1e-12 * R, source="Goldstein: wrench reduction")
            T.check_close(tag + " Residual Couple = F.M/|F|", rr["Residual Couple"],
                          F.dot(Mr) / math.sqrt(f2h), atol=1e-12 * sM,
                          source="Goldstein: wrench reduction")
            e = F / math.sqrt(f2h)
            T.check_close(tag + " axis point moves along F with the centre",
                          rr["Line Of Action Point"] - rc["Line Of Action Point"],
                          (R0 - CENTRE).dot(e) * e, atol=1e-12 * R)
            T.check_close(tag + " residual couple independent of centre", rr["Residual Couple"],
                          rc["Residual Couple"], atol=1e-12 * sM)
            T.check_close(tag + " table Total row = field data",
                          np.concatenate([rr["Total row"]["Line Of Action Point"],
                                          [rr["Total row"]["Residual Couple"]]]),
                          np.concatenate([rr["Line Of Action Point"], [rr["Residual Couple"]]]),
                          atol=0.0)
            eF.append(np.linalg.norm(F - F_ex) / sF)
            eM.append(np.linalg.norm(Mr - Mr0_ex) / sM)
            eP.append(np.linalg.norm(rr["Line Of Action Point"] - P_ex) / R)
            eC.append(abs(rr["Residual Couple"] - C_ex) / np.linalg.norm(Mc_ex))
            if n == LEVELS[-1]:
                hf2 = H[-1]**2
                T.check_close(tag + " Force", F, F_ex,
                              atol=1.05 * rec[path, "force"] * hf2 * sF, source="Stokes 1851")
                T.check_close(tag + " Moment about r0", Mr, Mr0_ex,
                              atol=1.05 * rec[path, "moment"] * hf2 * sM,
                              source="L&L §20 + moment transfer")
                T.check_close(tag + " Line Of Action Point", rr["Line Of Action Point"], P_ex,
                              atol=1.05 * rec[path, "point"] * hf2 * R,
                              source="Goldstein: r0 + F x M/|F|^2")
                T.check_close(tag + " Residual Couple", rr["Residual Couple"], C_ex,
                              atol=max(1.05 * rec[path, "couple"] * hf2, 1e-12)
                              * np.linalg.norm(Mc_ex),
                              source="Goldstein: (F.M)/|F|")
        convergence("%s %s force" % (label, path), eF, (1.8, 2.2), rec[path, "force"],
                    "Stokes 1851")
        convergence("%s %s moment about r0" % (label, path), eM, (1.8, 2.2), rec[path, "moment"],
                    "L&L §20 + transfer")
        convergence("%s %s line of action point" % (label, path), eP, (1.8, 2.2),
                    rec[path, "point"], "Goldstein")
        if C_ex != 0.0:
            convergence("%s %s residual couple" % (label, path), eC, (1.8, 2.2),
                        rec[path, "couple"], "Goldstein")
        else:
            # F is along x and M(c) along y exactly by the mirror symmetries of
            # the mesh (y -> -y and z -> -z), so F.M(r0) = F.M(c) = 0 in exact
            # arithmetic: round-off bound.
            assert max(eC) <= 1e-12, "residual couple should vanish: %s" % eC
            print("  %s %s residual couple errors %s (exactly 0 by symmetry; round-off)" % (
                label, path, np.array2string(np.array(eC), precision=2)))


# e/h^2 at n_polar = 64 when the test was written; errors relative to |F|,
# |M(r0)|, R and |M(c)| respectively.
REC_Y = {("wss", "force"): 2.0833e-01, ("wss", "moment"): 3.8106e-01,
         ("wss", "point"): 3.6296e-01, ("wss", "couple"): 0.0,
         ("grad", "force"): 2.0839e-01, ("grad", "moment"): 3.8115e-01,
         ("grad", "point"): 3.6302e-01, ("grad", "couple"): 0.0}
superposed(np.array([0.3, 0.0, 0.0]), np.array([0.0, 0.8, 0.0]), "U e_x + Omega e_y", REC_Y)
REC_OBL = {("wss", "force"): 2.0833e-01, ("wss", "moment"): 3.7215e-01,
           ("wss", "point"): 3.9060e-01, ("wss", "couple"): 2.0829e-01,
           ("grad", "force"): 2.0839e-01, ("grad", "moment"): 3.7222e-01,
           ("grad", "point"): 3.9064e-01, ("grad", "couple"): 2.0834e-01}
superposed(np.array([0.3, 0.0, 0.0]), np.array([0.5, 0.8, -0.3]), "U e_x + oblique Omega", REC_OBL)

T.done(__file__)
