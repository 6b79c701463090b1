"""Shear Projection on Hagen-Poiseuille flow in a circular pipe meshed with
hexahedra, prisms (wedges) and tetrahedra: wall shear stress, the axial
force balance through the whole chain Shear Projection -> Wall Traction ->
Load Integration, and measured convergence orders of every method on every
mesh kind, with the reason for each order.

Flow (White, Fluid Mechanics, §6.4, Hagen-Poiseuille flow; section recalled
from memory): fully developed laminar flow in a pipe of radius R, mean speed
U_m, u_z = 2 U_m (1 - r^2/R^2), so
    tau_w = mu |du/dr|_R = 4 mu U_m / R   (along +z: the fluid drags the wall),
    dp/dz = -8 mu U_m / R^2,
and the axial force balance on the fluid in a length L: the pressure force
dP pi R^2 = 8 pi mu U_m L equals the wall friction tau_w 2 pi R L.

Meshes (scenes.pipe_volume): a polar grid with n_radial rings,
n_around = 4 n_radial points per ring and 3 axial layers, L = 6 R:
'hex' (hexahedra around a wedge core), 'wedge' (the triangulated disc
extruded) and 'tet' (every wedge cut into three tetrahedra, conformingly).
The wall is the inscribed polygonal prism; the lateral wall faces are passed
as a separate polydata with their own, shuffled points.  Each cell carries
u_z = 2 U_m (1 - r_P^2/R^2) at its vertex mean x_P, which is the cell centre
the filter uses (its header: the cell value at the mean of the cell's
points), and the exact gradient du_z/dx_j = -4 U_m x_P,j / R^2 at the same
point (array 'G').  h = 1/n_radial (= Delta r / R); levels n_radial = 4 .. 64.

What is expected, and why (our own derivations):
* Near-wall difference mu u_P / d is first order: for the hex wall cell,
  r_P = (R - Dr/2) cos(Dth/2), the face lies at R cos(Dth/2) and d = (Dr/2)
  cos(Dth/2), so tau/tau_w = (1 - (1 - e/2)^2 c^2)/(e c) with e = Dr/R,
  c = cos(Dth/2) EXACTLY (checked to round-off), = 1 - e/4 + s^2/e + ...
  (s = sin(Dth/2)): -e/4 is the profile curvature (mu (d/2) u'', the
  header's leading error), s^2/e the facet: the flat face sits R(1 - c)
  inside the circle, where the exact velocity is not zero.  With
  Dth = 2 pi/(4 n_radial) = (pi/2) e the error constant is
  -1/4 + pi^2/16 = 0.36685, which the Richardson extrapolation of the
  measured constants reproduces.  Every kind: the filter's value equals
  mu u_P/d with d = (x_P - x_f).n from our own geometry, to round-off.
* Gradient tensor from the exact gradient array at x_P: tau_z = 4 mu U_m
  (x_P . e_f)/R^2 (e_f the outward face normal), to round-off; first order,
  because the gradient is taken at the cell centre, not at the wall
  (constant 1/2 for the hex cells: (1 - e/2) c).
* Gradient tensor, least squares (no array): first order.  The wall cell's
  stencil (its face neighbours plus the wall row) is one-sided in the wall
  normal direction, so the quadratic part of the profile does not cancel
  (the header says as much: first order at the wall).  The flat-wall control
  below shows the constant exactly: 17/5 times the near-wall difference's.
* Wall fit: exact at every face, whatever the cell shapes (hexahedra,
  wedges, tetrahedra): the field is a quadratic polynomial in x, y that
  vanishes on r = R, where the facets' corners lie, and the fit (WallFit.h)
  reproduces any quadratic with no slip at the corners. So tau_z is the
  field's own 4 mu U_m (x_f.e_f)/R^2 at the face centroid, to round-off
  (checked face by face), and its error against the smooth pipe's tau_w is
  the facet's sagitta, 1 - cos(pi/n_th) = pi^2/(32 n_r^2) + ...: second
  order, the same on every mesh kind, and vanishing as the facets shrink
  at fixed radial spacing (check_azimuthal_refinement). An earlier wall fit,
  which imposed no slip at the face centroid and used only cells stacked off
  the wall, was first order here and fell back to the near-wall difference
  on the tetrahedra.

Tolerances: exact identities to round-off bounds stated beside them; for
the convergence studies the local order between the two finest levels must
lie within 0.1 of the asymptotic order derived above (1, and 2 for the
wall fit; measured 0.95 to 1.07, and 2.000), the local orders must approach
it (the finest pair no farther than the previous pair, up to 0.02: the
measured sequences drift monotonically towards 1 by 0.03-0.1 per halving),
and the finest-level error constant e/h^p must be below 1.05 x the constant
recorded when the test was written (RECORDED_C:
the computation is deterministic, so 5 % is only a regression margin).
"""
import math
import time

import numpy as np


import wl_testing as T
import scenes as S

simple = T.load_plugin()

EPS = np.finfo(float).eps
R = 0.05            # m
L = 6 * R           # m
MU = 1.0e-3         # Pa s
RHO = 1000.0        # kg/m^3
UM = 0.02           # mean speed, m/s
N_AXIAL = 3
TAU_W = 4.0 * MU * UM / R                         # White FM §6.4
F_BALANCE = (8.0 * MU * UM * L / R**2) * math.pi * R**2   # dP pi R^2 = 8 pi mu U_m L
LEVELS = [4, 8, 16, 32, 64]
H = np.array([1.0 / n for n in LEVELS])
KINDS = ["hex", "wedge", "tet"]
METHODS = [("NWD", "Near-wall difference", None), ("LSQ", "Gradient tensor", "None"),
           ("GRAD", "Gradient tensor", "G"), ("FIT", "Wall fit", None)]
# Asymptotic order of each method here (module docstring).
ORDER = {"NWD": 1, "LSQ": 1, "GRAD": 1, "FIT": 2}
# Relative round-off bound for the exact identities. Measured <= 6e-14: the wall distance is a
# difference of coordinates of size R while d ~ R/(2 n_r), so it carries ~ eps 2 n_r relative
# error (n_r = 64: 3e-14), and tau = mu u_P/d inherits it.
ROUND = 1e-12
# The wall fit's exactness is a least-squares solve over up to 40 cells: its
# normal equations keep pivots above 1e-6 of the unit-diagonal matrix
# (WallFit.h), so round-off is amplified by at most ~1e6 in principle;
# measured <= 5.3e-11 relative here.
FIT_ROUND = 1e-9

# Error constants e/h^p (p = ORDER) at n_radial = 64 when this test was
# written: 'tau' the maximum over the wall faces of |tau_z - tau_w|/tau_w,
# 'force' the relative error of the total viscous force from Load
# Integration. The wall fit's 'tau' constant is pi^2/32 = 0.30843, the facet
# sagitta 1 - cos(pi/(4 n_r)) (checked face by face in run_level).
RECORDED_C = {
    ("hex", "NWD", "tau"): 0.3621, ("hex", "NWD", "force"): 0.3605,
    ("hex", "LSQ", "tau"): 0.7684, ("hex", "LSQ", "force"): 0.7700,
    ("hex", "GRAD", "tau"): 0.5048, ("hex", "GRAD", "force"): 0.5064,
    ("hex", "FIT", "tau"): 0.3084, ("hex", "FIT", "force"): 0.4112,
    ("wedge", "NWD", "tau"): 0.6542, ("wedge", "NWD", "force"): 0.6526,
    ("wedge", "LSQ", "tau"): 0.5357, ("wedge", "LSQ", "force"): 0.5373,
    ("wedge", "GRAD", "tau"): 0.3381, ("wedge", "GRAD", "force"): 0.3397,
    ("wedge", "FIT", "tau"): 0.3084, ("wedge", "FIT", "force"): 0.4112,
    ("tet", "NWD", "tau"): 1.1039, ("tet", "NWD", "force"): 0.9505,
    ("tet", "LSQ", "tau"): 0.8867, ("tet", "LSQ", "force"): 0.0715,
    ("tet", "GRAD", "tau"): 0.2548, ("tet", "GRAD", "force"): 0.2564,
    ("tet", "FIT", "tau"): 0.3084, ("tet", "FIT", "force"): 0.4112,
}


Capture = T.Capture


close = T.close_worst


expect = T.expect


# ---------------------------------------------------------------------------
# Scene
# ---------------------------------------------------------------------------

def pipe_scene(kind, n_radial, n_around=None, seed=None):
    n_around = 4 * n_radial if n_around is None else n_around
    m = S.pipe_volume(R, L, n_radial, n_around, N_AXIAL, kind)
    C = S.mixed_cell_vertex_means(m["points"], m["cells"])   # the filter's cell centre
    r2 = C[:, 0] ** 2 + C[:, 1] ** 2
    U = np.zeros_like(C)
    U[:, 2] = 2.0 * UM * (1.0 - r2 / R**2)
    G = np.zeros((C.shape[0], 9))
    G[:, 6] = -4.0 * UM * C[:, 0] / R**2       # du_z/dx
    G[:, 7] = -4.0 * UM * C[:, 1] / R**2       # du_z/dy
    vol = S.mixed_unstructured_grid(m["points"], m["cells"], cell_arrays={"velocity": U, "G": G})
    wp, wf = S.detached_faces(m["points"], m["wall"], seed=n_radial + n_around if seed is None else seed)
    wall = S.polydata(wp, [tuple(f) for f in wf])
    # our own geometry of the wall faces (face order is kept by detached_faces)
    n_out, area = S.newell_normals(m["points"], [tuple(f) for f in m["wall"]])
    xf = S.face_centroids(m["points"], [tuple(f) for f in m["wall"]])
    cell = adjacent_cells(m)
    return {"m": m, "vol": vol, "wall": wall, "C": C, "velocity": U, "G": G, "n_in": -n_out, "area": area,
            "xf": xf, "cell": cell, "n_around": n_around}


def adjacent_cells(m):
    """For each wall face (volume ids) the cell that has all its points: our
    own matching by ids, independent of the filter's geometric matching."""
    P = m["points"]
    on_wall = np.abs(np.hypot(P[:, 0], P[:, 1]) - R) < 1e-12 * R
    key_to_cell = {}
    offset = 0
    for _, conn in m["cells"]:
        w = on_wall[conn]
        for c in np.flatnonzero(w.sum(axis=1) >= 3):
            key_to_cell[tuple(sorted(conn[c][w[c]]))] = offset + c
        offset += conn.shape[0]
    return np.array([key_to_cell[tuple(sorted(f))] for f in m["wall"]])


# ---------------------------------------------------------------------------
# One level: every method, per-face identities, and the chain's force
# ---------------------------------------------------------------------------

def res_fit_error(tau):
    """Largest relative error of the axial wall shear against tau_w."""
    return float(np.max(np.abs(tau[:, 2] - TAU_W)) / TAU_W)


def run_level(kind, n_radial, n_around=None, chain=True, identities=True):
    sc = pipe_scene(kind, n_radial, n_around)
    vsrc, wsrc = T.producer(sc["vol"]), T.producer(sc["wall"])
    sp = simple.ShearProjection(Input=vsrc, Walls=wsrc, Velocity=["CELLS", "velocity"], Viscosity=MU, Density=RHO)
    cap = Capture(sp)
    wt = li = None
    if chain:
        wt = simple.WallTraction(Input=sp, Pressure=["CELLS", "None"], ShearSource="Wall shear stress array",
                                 ShearStressArray=["CELLS", "Wall Shear Stress"], Orientation="Use Wall Normal array")
        li = simple.LoadIntegration(Input=wt)
    tag = "%s n_r=%d n_th=%d" % (kind, n_radial, sc["n_around"])
    xP = sc["C"][sc["cell"]]
    uP = sc["velocity"][sc["cell"], 2]
    d = np.einsum("ij,ij->i", xP - sc["xf"], sc["n_in"])
    res = {}
    for key, method, grad in METHODS:
        sp.Method = method
        if grad is not None:
            sp.VelocityGradient = ["CELLS", grad]
        out = T.output_of(sp)
        tau = T.cell_array(out, "Wall Shear Stress")
        if identities:
            close("%s %s: tangential tau has no x, y part" % (tag, key), tau[:, :2], 0.0, atol=ROUND * TAU_W)
        if identities and key == "NWD":
            n = T.cell_array(out, "Wall Normal")
            # Newell normals from coordinates of size R over edges of size 2 pi R/n_th: round-off
            # ~ eps R/edge per vertex difference; 16 of them bound the differences of start vertex.
            close(tag + ": Wall Normal = inward face normal (into the fluid)", n, sc["n_in"],
                  atol=16 * EPS * sc["n_around"] / (2 * math.pi))
            inward = -np.stack([np.cos(sc["m"]["wall_theta"]), np.sin(sc["m"]["wall_theta"])], axis=1)
            expect(tag + ": Wall Normal points to the axis", np.all(np.einsum("ij,ij->i", n[:, :2], inward) > 0.99))
            close(tag + ": Wall Distance = (x_P - x_f).n", T.cell_array(out, "Wall Distance"), d, rtol=ROUND)
            close(tag + " NWD: tau_z = mu u_P / d (documented formula, own geometry)", tau[:, 2], MU * uP / d,
                  rtol=ROUND, source="filter header (a)")
            if kind == "hex":
                e, c = 1.0 / n_radial, math.cos(math.pi / sc["n_around"])
                close(tag + " NWD: closed form (1-(1-e/2)^2 c^2)/(e c) tau_w", tau[:, 2],
                      TAU_W * (1 - (1 - e / 2) ** 2 * c * c) / (e * c), rtol=ROUND, source="own derivation")
            ut = T.cell_array(out, "Friction Velocity")
            close(tag + ": u_tau = sqrt(|tau|/rho), y+ = d u_tau/nu", T.cell_array(out, "y+"),
                  d * ut / (MU / RHO), rtol=ROUND)
        if identities and key == "GRAD":
            close(tag + " GRAD: tau_z = 4 mu U_m (x_P.e_f)/R^2", tau[:, 2],
                  -4.0 * MU * UM * np.einsum("ij,ij->i", xP, sc["n_in"]) / R**2, rtol=ROUND,
                  source="exact gradient at x_P")
        if key == "FIT":
            close(tag + " FIT: max error = the facet sagitta 1 - cos(pi/n_th)", res_fit_error(tau),
                  1 - math.cos(math.pi / sc["n_around"]), atol=FIT_ROUND,
                  source="own derivation: x_f.e_f = R cos(pi/n_th)")
        if identities and key == "FIT":
            # The field is a quadratic polynomial and vanishes at the facets' corners (on
            # r = R): the wall fit reproduces it whatever the cell shapes (WallFit.h), so
            # its shear is the field's own at the face centroid, with the face normal.
            close(tag + " FIT: tau_z = 4 mu U_m (x_f.e_f)/R^2 (exact for quadratics)", tau[:, 2],
                  -4.0 * MU * UM * np.einsum("ij,ij->i", sc["xf"], sc["n_in"]) / R**2, rtol=FIT_ROUND,
                  source="exact gradient at x_f")
        res[key, "tau"] = float(np.max(np.abs(tau[:, 2] - TAU_W)) / TAU_W)
        if chain:
            tot = T.output_of(li, 0)
            Fv = T.field(tot, "Viscous Force")
            if identities:
                close("%s %s: chain viscous force = sum tau A (own sum)" % (tag, key), Fv,
                      [0.0, 0.0, float(np.sum(tau[:, 2] * sc["area"]))], rtol=ROUND)
                close("%s %s: chain pressure force = 0 (no pressure)" % (tag, key),
                      T.field(tot, "Pressure Force"), 0.0, atol=0.0)
            res[key, "force"] = float(abs(Fv[2] - F_BALANCE) / F_BALANCE)
            res[key, "signed force"] = float((Fv[2] - F_BALANCE) / F_BALANCE)
    if chain and identities:
        n_t = sc["n_around"]
        close(tag + ": wetted area = polygon prism 2 n R sin(pi/n) L", T.field(T.output_of(li, 0), "Area"),
              2 * n_t * R * math.sin(math.pi / n_t) * L, rtol=ROUND)
    quiet = cap.unexpected(T.NOTE_GRADIENT_ARRAY)
    expect(tag + ": no errors or unexpected warnings", not cap.errors and not quiet, str(cap.errors + quiet))
    builds = sp.GetClientSideObject().GetNumberOfAdjacencyBuilds()
    expect(tag + ": adjacency built once for the four methods", builds == 1, "%d" % builds)
    for p in (li, wt, sp, wsrc, vsrc):
        if p is not None:
            simple.Delete(p)
    return res


def check_convergence():
    print("\n== refinement in r and theta together: errors against tau_w = 4 mu U_m / R ==")
    close("force balance of the exact solution: dP pi R^2 = tau_w 2 pi R L", F_BALANCE,
          TAU_W * 2 * math.pi * R * L, rtol=4 * EPS, source="White FM §6.4")
    table = {}
    for kind in KINDS:
        results = []
        for n in LEVELS:
            t0 = time.time()
            results.append(run_level(kind, n))
            print("   (%s n_r=%d done in %.2f s)" % (kind, n, time.time() - t0))
        for key, _, _ in METHODS:
            for q in ("tau", "force"):
                table[kind, key, q] = np.array([r[key, q] for r in results])
            table[kind, key, "signed force"] = np.array([r[key, "signed force"] for r in results])
    print("\n   kind   method  quantity  errors (n_r = %s)                         pair orders            C = e/h at finest"
          % LEVELS)
    for kind in KINDS:
        for key, _, _ in METHODS:
            for q in ("tau", "force"):
                e = table[kind, key, q]
                pairs = np.log2(e[:-1] / e[1:])
                print("   %-6s %-6s  %-8s  %s  %s  %.4f" % (kind, key, q, np.array2string(e, precision=4),
                                                       np.array2string(pairs, precision=2),
                                                       e[-1] / H[-1] ** ORDER[key]))
    for kind in KINDS:
        for key, _, _ in METHODS:
            for q in ("tau", "force"):
                e = table[kind, key, q]
                label = "%s %s %s" % (kind, key, q)
                if (kind, key, q) == ("tet", "LSQ", "force"):
                    # On tetrahedra the least-squares per-face errors are small on most faces
                    # (measured at n_r = 32: +0.04 %, +0.19 %, +0.48 % for the three split patterns
                    # the smallest-id rule produces) but larger and of either sign on the few
                    # faces at theta = 0, where the point ids wrap around and the pattern changes
                    # (-0.5 % .. +2.7 %: these set the maximum, which is first order). The area
                    # sum mixes these contributions, falls to 0.1-0.3 % and changes sign between
                    # n_r = 4 and 16 (signed errors printed): no order can be measured from it,
                    # so only the recorded bound is checked.
                    print("   %s: signed %s (cancellation, no order asserted)"
                          % (label, np.array2string(table[kind, key, "signed force"], precision=4)))
                else:
                    p = ORDER[key]
                    p_pair = math.log2(e[-2] / e[-1])
                    p_prev = math.log2(e[-3] / e[-2])
                    p_fit = T.observed_order(H[-3:], e[-3:])
                    expect(label + ": local order of the finest pair in [%.1f, %.1f]" % (p - 0.1, p + 0.1),
                           p - 0.1 <= p_pair <= p + 0.1,
                           "%.3f (least squares over the 3 finest %.3f)" % (p_pair, p_fit))
                    expect(label + ": local orders approach %d (|p_fine - %d| <= |p_prev - %d| + 0.02)" % (p, p, p),
                           abs(p_pair - p) <= abs(p_prev - p) + 0.02, "%.3f then %.3f" % (p_prev, p_pair))
                p = ORDER[key]
                C = RECORDED_C[kind, key, q]
                expect(label + ": finest error <= 1.05 x recorded C h^%d" % p, e[-1] <= 1.05 * C * H[-1] ** p,
                       "%.4e vs %.4e" % (e[-1], 1.05 * C * H[-1] ** p))
    # The hex near-wall difference: constant -1/4 + pi^2/16 (module docstring), by Richardson
    # extrapolation of e/h (C(h) = C0 + C1 h + ..., so 2 C(h/2) - C(h) = C0 + O(h^2)).
    Cn = table["hex", "NWD", "tau"] / H
    C0 = 2 * Cn[-1] - Cn[-2]
    close("hex NWD: Richardson constant 2C(h/2)-C(h) = -1/4 + pi^2/16", C0, -0.25 + math.pi**2 / 16,
          rtol=2e-3, source="own derivation; O(h^2) remainder ~ |C''| h^2, 2e-3 measured bound")
    Cg = table["hex", "GRAD", "tau"] / H
    close("hex GRAD: Richardson constant = 1/2 (gradient taken at the cell centre)", 2 * Cg[-1] - Cg[-2], 0.5,
          rtol=2e-3, source="own derivation: (1 - e/2) cos(dth/2)")


def check_azimuthal_refinement():
    """Fixed n_radial = 8, n_around = 32 .. 512: the facets shrink, the radial spacing does not."""
    print("\n== refinement around the pipe only (n_r = 8): the wall fit error is a facet effect ==")
    n_ar = [32, 64, 128, 256, 512]
    dth = np.array([2 * math.pi / n for n in n_ar])
    for kind in KINDS:
        rows = [run_level(kind, 8, n, chain=False, identities=False) for n in n_ar]
        fit = np.array([r["FIT", "tau"] for r in rows])
        nwd = np.array([r["NWD", "tau"] for r in rows])
        lsq = np.array([r["LSQ", "tau"] for r in rows])
        print("   %-5s FIT %s  NWD %s  LSQ %s" % (kind, np.array2string(fit, precision=4),
                                                 np.array2string(nwd, precision=4), np.array2string(lsq, precision=4)))
        # The wall fit is exact at the face (the field is quadratic): its error is
        # the facet's sagitta, 1 - cos(pi/n_th), on every mesh kind (tetrahedra too).
        close(kind + ": wall fit error = 1 - cos(pi/n_th) (the facet)", fit,
              1 - np.cos(np.pi / np.array(n_ar)), atol=FIT_ROUND,
              source="own derivation: x_f.e_f = R cos(pi/n_th) on every face")
        p = T.observed_order(dth[-3:], fit[-3:])
        expect(kind + ": wall fit error ~ dth^2 at fixed dr (order in [1.9, 2.1])", 1.9 <= p <= 2.1, "%.3f" % p)
        expect(kind + ": wall fit error at n_th=512 below 2e-3 (-> 0 with the facets)", fit[-1] < 2e-3,
               "%.2e" % fit[-1])
        # The others tend to a nonzero error set by dr; the facet part of it decays like dth^2,
        # so successive changes shrink by ~4 (bound 0.35 for the next term), and the limit is
        # not small (the hex near-wall difference tends to e/4 = 0.031, see below).
        for name, e in (("NWD", nwd), ("LSQ", lsq)):
            ratio = abs(e[-1] - e[-2]) / abs(e[-2] - e[-3])
            expect(kind + ": %s approaches a dr-limited error at 2nd order in dth (ratio <= 0.35)" % name,
                   ratio <= 0.35, "change ratio %.3f" % ratio)
            expect(kind + ": %s error at fixed dr stays > 1e-2 (does not vanish)" % name, e[-1] > 1e-2,
                   "%.3e" % e[-1])
        if kind == "hex":
            # limit of the closed form as dth -> 0: 1 - e/4 exactly, e = 1/8
            e = 1.0 / 8
            c = np.cos(np.pi / np.array(n_ar))
            close("hex NWD at fixed dr: closed form |(1-(1-e/2)^2 c^2)/(e c) - 1|", nwd,
                  np.abs((1 - (1 - e / 2) ** 2 * c * c) / (e * c) - 1), rtol=1e-10,
                  source="own derivation; -> e/4 = %.5f as dth -> 0" % (e / 4))


def check_no_walls_mode():
    """Without Walls, every boundary face is a wall face; the lateral ones (selected
    by the Wall Normal, |n_z| < 0.5) must carry the same values as with explicit walls."""
    print("\n== no Walls input: lateral faces selected by their normal ==")
    for kind in KINDS:
        sc = pipe_scene(kind, 8)
        vsrc, wsrc = T.producer(sc["vol"]), T.producer(sc["wall"])
        a = simple.ShearProjection(Input=vsrc, Walls=wsrc, Velocity=["CELLS", "velocity"], Viscosity=MU,
                                   Method="Wall fit")
        b = simple.ShearProjection(Input=vsrc, Velocity=["CELLS", "velocity"], Viscosity=MU, Method="Wall fit")
        oa, ob = T.output_of(a), T.output_of(b)
        expect(kind + ": boundary = lateral faces + caps", ob.GetNumberOfCells() ==
               len(sc["m"]["wall"]) + sc["m"]["caps"], "%d" % ob.GetNumberOfCells())
        nb = T.cell_array(ob, "Wall Normal")
        lateral = np.abs(nb[:, 2]) < 0.5
        expect(kind + ": as many lateral faces as wall faces", np.count_nonzero(lateral) == len(sc["m"]["wall"]))
        from vtkmodules.vtkFiltersCore import vtkCellCenters
        centres = []
        for o in (oa, ob):
            cc = vtkCellCenters()
            cc.SetInputData(o)
            cc.Update()
            centres.append(np.array([cc.GetOutput().GetPoint(i) for i in range(o.GetNumberOfCells())]))
        ka = np.lexsort(np.round(centres[0] / R, 9).T)
        sel = np.flatnonzero(lateral)
        kb = sel[np.lexsort(np.round(centres[1][sel] / R, 9).T)]
        close(kind + ": same faces", centres[1][kb], centres[0][ka], atol=1e-12 * R)
        # The two modes number the faces' corners differently, so the fit sums its samples in
        # another order: equal to the fit's round-off (FIT_ROUND).
        close(kind + ": same wall shear stress", T.cell_array(ob, "Wall Shear Stress")[kb],
              T.cell_array(oa, "Wall Shear Stress")[ka], rtol=FIT_ROUND)
        for p in (a, b, wsrc, vsrc):
            simple.Delete(p)


def check_flat_wall_control():
    """Plane Poiseuille flow u = 6 U_m (y/h)(1 - y/h) = a y + b y^2 between plates
    y = 0 and y = h (White, Viscous Fluid Flow, §3-3, plane Poiseuille flow; section
    recalled from memory; tau_w = 6 mu U_m/h, a = 6 U_m/h, b = -6 U_m/h^2 by our own
    differentiation), uniform cells dy, d = dy/2:
      wall fit: exact (the profile is a d + b d^2, the fit's model);
      near-wall difference: mu (a d + b d^2)/d = mu (a + b d): error mu b d exactly;
      least squares: the y-column of the gradient sees only the wall row (dy = -d,
        du = -u_P) and the cell above (dy = 2d, du = u(3d) - u(d)), the lateral and
        axial neighbours having du = 0 and dy = 0, so g = (2 u(3d) - u(d))/(5 d)
        = a + (17/5) b d: error (17/5) mu b d exactly."""
    print("\n== flat-wall control: plane Poiseuille in a block of hexahedra ==")
    h = 2 * R
    for ny in (4, 8, 16):
        x = np.linspace(0.0, 3 * h, 7)
        y = np.linspace(0.0, h, ny + 1)
        z = np.linspace(0.0, h, 4)
        P, hexes, _ = S.hex_grid(x, y, z)
        C = P[hexes].mean(axis=1)
        U = np.zeros_like(C)
        U[:, 0] = 6 * UM * (C[:, 1] / h) * (1 - C[:, 1] / h)
        vol = S.mixed_unstructured_grid(P, [(S.VTK_HEXAHEDRON, hexes)], cell_arrays={"velocity": U})
        walls = []
        for side in (0, 1):
            wp, wf = S.grid_boundary_patch(x, y, z, 1, side)
            walls.append(S.polydata(*S.detached_faces(wp, wf, seed=side)))
        from vtkmodules.vtkFiltersCore import vtkAppendPolyData
        app = vtkAppendPolyData()
        for w in walls:
            app.AddInputData(w)
        app.Update()
        vsrc, wsrc = T.producer(vol), T.producer(app.GetOutput())
        sp = simple.ShearProjection(Input=vsrc, Walls=wsrc, Velocity=["CELLS", "velocity"], Viscosity=MU)
        cap = Capture(sp)
        a, b, d = 6 * UM / h, -6 * UM / h**2, 0.5 * h / ny
        for method, grad, expected in (("Wall fit", None, MU * a), ("Near-wall difference", None, MU * (a + b * d)),
                                       ("Gradient tensor", "None", MU * (a + 3.4 * b * d))):
            sp.Method = method
            if grad is not None:
                sp.VelocityGradient = ["CELLS", grad]
            tau = T.cell_array(T.output_of(sp), "Wall Shear Stress")
            close("plane Poiseuille ny=%d %s: tau_x (both walls)" % (ny, method), tau[:, 0], expected,
                  rtol=ROUND, source="White VFF §3-3; own error derivation")
            close("plane Poiseuille ny=%d %s: no y, z part" % (ny, method), tau[:, 1:], 0.0, atol=ROUND * MU * a)
        expect("plane Poiseuille ny=%d: no errors or warnings" % ny, not cap.errors and not cap.warnings,
               str(cap.errors + cap.warnings))
        for p in (sp, wsrc, vsrc):
            simple.Delete(p)


def check_meshes():
    print("\n== the generated meshes: positive volumes, inscribed-polygon volume, conforming ==")
    for kind in KINDS:
        for n in (4, 16):
            m = S.pipe_volume(R, L, n, 4 * n, N_AXIAL, kind)
            ug = S.mixed_unstructured_grid(m["points"], m["cells"])
            V = 0.5 * 4 * n * R**2 * math.sin(2 * math.pi / (4 * n)) * L
            vol, nb = S.volume_mesh_check(ug, V, len(m["wall"]) + m["caps"])
            print("   %-5s n_r=%-3d cells %6d volume %.15g (polygon prism %.15g) boundary faces %d"
                  % (kind, n, ug.GetNumberOfCells(), vol, V, nb))


def main():
    t0 = time.time()
    check_meshes()
    check_flat_wall_control()
    check_convergence()
    check_azimuthal_refinement()
    check_no_walls_mode()
    print("total %.1f s" % (time.time() - t0))
    T.done(__file__)


if __name__ == "__main__":
    main()
