"""Shear Projection on the laminar flat-plate boundary layer (Blasius 1908):
skin friction from the cell-centred velocity of a hex volume over the plate,
with measured convergence under refinement in y and in x.

Blasius equation (Blasius 1908; Schlichting, Boundary-Layer Theory, ch. 7 --
chapter recalled from memory):  f''' + f f''/2 = 0,  f(0) = f'(0) = 0,
f'(inf) = 1, with eta = y sqrt(U/(nu x)),
  u = U f'(eta),   v = (1/2) sqrt(nu U/x) (eta f' - f),
  tau_w = mu U f''(0) sqrt(U/(nu x)),   c_f = 2 tau_w/(rho U^2) = 2 f''(0)/sqrt(Re_x).
f''(0) = 0.332057 (value recalled from memory), so c_f = 0.664/sqrt(Re_x).
We integrate the equation ourselves: classical RK4 for g''' = -g g''/2 with
g''(0) = 1, then f(eta) = c g(c eta) with c = g'(inf)^(-1/2) (the equation is
invariant under this scaling; f''(0) = c^3), so no shooting iteration is
needed. f and f' at any eta: one RK4 step from the nearest node.

Expected accuracy (our Taylor analysis of the Blasius equation at the wall:
f'''(0) = -f f''/2 = 0, f''''(0) = 0, f'''''(0) = -f''(0)^2/2):
  f'(eta) = a eta - a^2 eta^4/48 + O(eta^7),  a = f''(0),
so the near-wall difference mu u_P/d, with d the centre height of the wall
cell (eta_c = d sqrt(U/(nu x))), has the relative error exactly
  -a eta_c^3/48 (1 + O(eta_c^3)):
THIRD order in the wall-normal spacing, not first (u'' = u''' = 0 at the
wall of a zero-pressure-gradient layer), and independent of the x spacing
(the cell centre sits above the face centroid). The test checks the measured
errors against this formula face by face. The wall fit and the least-squares
gradient tensor are documented as second order in general; at zero pressure gradient their wall-normal
truncation is third order (vtkShearProjection.h, WallFit.h).

Mesh: x in [0.1, 0.5] m, y in [0, 0.01] m (2.3 boundary-layer thicknesses
5 sqrt(nu x/U) at the trailing edge), z in [0, 0.01] m with 2 cells (one
cell thick meshes are taken as 2-D cases, see test_shear_slabs.py); y nodes stretched_nodes(0, H, ny, 2) (the fixed
map refines every cell by the same factor). Walls: the plate faces y = 0 as
their own polydata (stored into the wall). Air-like: U = 10 m/s,
nu = 1.5e-5 m^2/s, rho = 1.2 kg/m^3: Re_x = 6.7e4 .. 3.3e5 (laminar).

Studies: y refinement ny = 12, 24, 48, 96 at nx = 16; x refinement
nx = 8, 16, 32, 64 at ny = 96. Tolerances: observed orders (least-squares
slope of the log of the max-over-faces relative error) in bands around the
measured values; finest errors below 1.05 x (the constant e/h^p of the
second finest level plus its last change: constants that still drift are
extrapolated, a drift that does not accelerate); the near-wall difference
matches the Taylor formula face by face within 1.05 x its next term (plus
8 ulps).

The wall fit (WallFit.h) is a quadratic in the three coordinates plus the
wall gradient's variation along the wall, over the wall cell, its
neighbours through faces and corners and the face's corners (no slip); the
wall-normal derivative comes from it, the along-wall part of the shear from
the wall velocity (zero here). It reproduces u = a(x) y to second order in
dx along the wall, and its wall-normal truncation is that of the profile
(u'' = u''' = 0 at the wall): third order in y, measured. Its dependence on
dx is weak (checked within 0.8-1.25 of its scaled value at nx = 16).

Measured when written: f''(0) = 0.3320573362 (RK4 order 4.00). Near-wall
difference: max relative error 2.9e-4, 3.1e-5, 3.7e-6, 4.5e-7 for ny = 12..96
(order 3.00; -a eta_c^3/48 reproduced face by face to its next term, at
every nx). Wall fit: 3.1e-3, 3.3e-4, 3.7e-5, 4.5e-6 (order 3.1);
3.7e-6 .. 5.7e-6 under x refinement. Least-squares gradient
tensor: 1.1e-2, 1.1e-3, 1.2e-4, 1.5e-5 (order 3.07), x-independent.
(An earlier wall fit took the wall cell's x-neighbours as samples of the
profile at their distance from this face: its error stalled at 4.7e-2 under
y refinement and followed dx; a quadratic fit without the along-wall terms
stalled at 7.9e-3 here.)
"""
import math

import numpy as np

import wl_testing as T
import scenes as S

simple = T.load_plugin()

U_INF, NU, RHO = 10.0, 1.5e-5, 1.2
MU = RHO * NU
X0, X1, HEIGHT, SPAN = 0.1, 0.5, 0.01, 0.01
STRETCH = 2.0
NZ = 2
EPS = np.finfo(float).eps


# ---------------------------------------------------------------------------
# Blasius solution, by our own RK4 integration
# ---------------------------------------------------------------------------

def _rhs(F):
    return np.array([F[1], F[2], -0.5 * F[0] * F[2]])


def _rk4_step(F, h):
    k1 = _rhs(F)
    k2 = _rhs(F + 0.5 * h * k1)
    k3 = _rhs(F + 0.5 * h * k2)
    k4 = _rhs(F + h * k3)
    return F + h / 6.0 * (k1 + 2 * k2 + 2 * k3 + k4)


class Blasius:
    """f, f' of the Blasius profile from RK4 nodes of g (g''(0) = 1), step `step` in g's variable."""

    XI_MAX = 12.0   # g'' is below 1e-16 there (checked)

    def __init__(self, step):
        n = int(round(self.XI_MAX / step))
        self.step = self.XI_MAX / n
        G = np.zeros((n + 1, 3))
        G[0] = [0.0, 0.0, 1.0]
        for k in range(n):
            G[k + 1] = _rk4_step(G[k], self.step)
        self.G = G
        self.c = G[-1, 1] ** -0.5        # f(eta) = c g(c eta) has f'(inf) = c^2 g'(inf) = 1
        self.fpp0 = self.c ** 3

    def __call__(self, eta):
        """(f, f') at eta (array), one vectorised RK4 step from the node below."""
        xi = self.c * np.asarray(eta, dtype=np.float64)
        inside = np.minimum(xi, self.XI_MAX)
        k = np.minimum((inside / self.step).astype(np.int64), self.G.shape[0] - 1)
        F = self.G[k].T.copy()
        F = _rk4_step(F, inside - k * self.step)
        beyond = xi - inside                      # f' = 1, f'' = 0 beyond XI_MAX
        g, gp = F[0] + beyond * F[1], F[1]
        return self.c * g, self.c**2 * gp


blasius = Blasius(0.0025)
half = Blasius(0.005)
quarter = Blasius(0.01)
print("Blasius f''(0): h=0.01 %.13f, h=0.005 %.13f, h=0.0025 %.13f" % (quarter.fpp0, half.fpp0, blasius.fpp0))
rk_order = math.log2(abs(quarter.fpp0 - half.fpp0) / abs(half.fpp0 - blasius.fpp0))
print("RK4 observed order in f''(0): %.2f" % rk_order)
assert 3.5 < rk_order < 4.5, "RK4 should converge at fourth order"
# Richardson: the error of the finest is |half - finest| / (2^4 - 1).
rk_err = abs(half.fpp0 - blasius.fpp0) / 15.0
assert rk_err < 1e-12, rk_err
T.check_close("f''(0) from our integration", blasius.fpp0, 0.332057, atol=1e-5,
              source="Blasius 1908 (0.332057, recalled from memory)")
_, fp_far = blasius(np.array([15.0, 20.0, 60.0]))
T.check_close("f'(eta) -> 1 outside the layer", fp_far, np.ones(3), atol=1e-12,
              source="boundary condition f'(inf) = 1")
# Near the wall f' follows its Taylor series a eta - a^2 eta^4/48 (to O(eta^7)).
eta_s = np.array([0.05, 0.1, 0.2])
_, fp_s = blasius(eta_s)
a = blasius.fpp0
# The next term, 11 a^3 eta^7/20160 (our expansion), is 2.6e-10 at eta = 0.2.
T.check_close("f'(eta) Taylor series at the wall", fp_s, a * eta_s - a**2 * eta_s**4 / 48,
              atol=1e-9, source="our series: f''''(0) = 0, f'''''(0) = -a^2/2")
T.check_close("f'(eta) series with the eta^7 term", fp_s,
              a * eta_s - a**2 * eta_s**4 / 48 + 11 * a**3 * eta_s**7 / 20160, atol=1e-12)
print("0.664/sqrt(Re_x) vs 2 f''(0) = %.7f: the textbook constant is its 3-digit rounding" % (2 * a))
assert abs(2 * a - 0.664) < 5e-4


# ---------------------------------------------------------------------------
# The plate volume and the filter
# ---------------------------------------------------------------------------

def plate_scene(nx, ny):
    xn = np.linspace(X0, X1, nx + 1)
    yn = S.stretched_nodes(0.0, HEIGHT, ny, STRETCH)
    zn = np.linspace(0.0, SPAN, NZ + 1)
    P, cells = S.hex_box(xn, yn, zn)
    xc = S.cell_vertex_means(P, cells)
    eta = xc[:, 1] * np.sqrt(U_INF / (NU * xc[:, 0]))
    f, fp = blasius(eta)
    u = np.stack([U_INF * fp, 0.5 * np.sqrt(NU * U_INF / xc[:, 0]) * (eta * fp - f),
                  np.zeros_like(eta)], axis=1)
    vol = S.unstructured_grid(P, cells, S.VTK_HEXAHEDRON_ID, cell_arrays={"velocity": u})
    X, Z = np.meshgrid(xn, zn, indexing="ij")
    wp = np.stack([X.ravel(), np.zeros(X.size), Z.ravel()], axis=1)
    m = NZ + 1
    # (x, z) order gives the Newell normal -y: stored into the wall.
    faces = [(i * m + k, (i + 1) * m + k, (i + 1) * m + k + 1, i * m + k + 1)
             for i in range(nx) for k in range(NZ)]
    xf = S.face_centroids(wp, faces)[:, 0]
    return {"vol": vol, "walls": S.polydata(wp, faces), "xf": xf,
            "d_first": 0.5 * yn[1], "nx": nx, "ny": ny}


def shear(sc, method, walls=True):
    vol = T.producer(sc["vol"])
    made = [vol]
    if walls:
        wl = T.producer(sc["walls"])
        sp = simple.ShearProjection(Input=vol, Walls=wl)
        made.append(wl)
    else:
        sp = simple.ShearProjection(Input=vol)
    sp.Velocity = ["CELLS", "velocity"]
    sp.Method = method
    sp.Viscosity = MU
    sp.Density = RHO
    out = T.output_of(sp)
    res = {"out": out}
    if walls:
        res.update({k: T.cell_array(out, k).copy() for k in
                    ("Wall Shear Stress", "Wall Normal", "Wall Distance", "Friction Velocity", "y+",
                     "Near-Wall Regime")})
    res["proxies"] = [sp] + made
    return res


def release(res):
    for p in res["proxies"]:
        simple.Delete(p)


def check_max(label, got, expected, rtol=0.0, atol=0.0, source=""):
    """Like T.check_close for long arrays: prints only the largest error."""
    got, expected = np.asarray(got, dtype=float), np.asarray(expected, dtype=float)
    err = np.abs(got - expected)
    tol = atol + rtol * np.abs(expected)
    worst = float(np.max(err - tol))
    print("%-60s max|err| %.3e over %d values (tol up to %.1e) %s" % (
        label, err.max(), err.size, np.max(tol), ("[" + source + "]") if source else ""))
    assert worst <= 0.0, "%s: error %.3e exceeds tolerance" % (label, err.max())


def tau_exact(xf):
    return MU * U_INF * blasius.fpp0 * np.sqrt(U_INF / (NU * xf))


def face_errors(sc, res):
    tau = res["Wall Shear Stress"]
    assert np.all(np.isfinite(tau)), "NaN wall shear stress"
    ex = tau_exact(sc["xf"])
    # v is normal to the plate and w = 0: the tangential split leaves tau_x only.
    assert np.abs(tau[:, 1:]).max() <= 1e-13 * np.abs(ex).max(), "tau has y or z components"
    return tau[:, 0] / ex - 1.0


def taylor_error(sc, res):
    """Leading relative error -a eta_c^3/48 of mu u_P/d, and eta_c."""
    eta_c = res["Wall Distance"] * np.sqrt(U_INF / (NU * sc["xf"]))
    return -blasius.fpp0 * eta_c**3 / 48.0, eta_c


def taylor_next(eta_c):
    """Relative size of the next term: f'/(a eta) - 1 = -a eta^3/48 + 11 a^2 eta^6/20160,
    so error/(-a eta^3/48) - 1 = -(11 * 48/20160) a eta^3 (our expansion, checked above)."""
    return 11.0 * 48.0 / 20160.0 * blasius.fpp0 * eta_c**3


def taylor_tolerance(eta_c, model):
    """1.05 x the next term, plus 8 ulps of tau/tau_exact divided by the
    leading term (the ratio of two numbers near 1e-7 carries their round-off)."""
    return 1.05 * taylor_next(eta_c) + 8 * EPS / np.abs(model)


def orders_and_bounds(label, h, errs, band, p, source):
    errs = np.asarray(errs, dtype=float)
    order = T.observed_order(h, errs)
    consts = errs / np.asarray(h) ** p
    print("  %-40s errors %s  e/h^%g %s  order %.3f" % (
        label, np.array2string(errs, precision=3), p,
        np.array2string(consts, formatter={"float_kind": lambda v: "%.3e" % v}), order))
    lo, hi = band
    assert lo <= order <= hi, "%s: observed order %.3f outside [%g, %g]" % (label, order, lo, hi)
    # Constants that still drift (pre-asymptotic) are extrapolated by their
    # last change, a drift that does not accelerate; then 5 %.
    c_bound = 1.05 * (consts[-2] + max(0.0, consts[-2] - consts[-3]))
    bound = c_bound * h[-1] ** p
    assert errs[-1] <= bound, "%s: finest error %.3e above %.3e" % (label, errs[-1], bound)
    print("    finest %.3e <= %.3e (1.05 x extrapolated constant)  [%s]" % (errs[-1], bound, source))
    return order


defects = []   # documented behaviour the filter does not deliver (reported, then failed)

NX_Y, NY_LEVELS = 16, [12, 24, 48, 96]
NY_X, NX_LEVELS = 96, [8, 16, 32, 64]
SRC = "Blasius 1908; Schlichting ch. 7: c_f = 2 f''(0)/sqrt(Re_x)"

# --- near-wall difference -------------------------------------------------------
print("Near-wall difference, y refinement (nx = %d):" % NX_Y)
hy, e_y, dev = [], [], []
for ny in NY_LEVELS:
    sc = plate_scene(NX_Y, ny)
    res = shear(sc, "Near-wall difference")
    e = face_errors(sc, res)
    model, eta_c = taylor_error(sc, res)
    hy.append(sc["d_first"])
    e_y.append(np.abs(e).max())
    dev.append(np.abs(e / model - 1.0).max())
    check_max("(ny=%d) error / (-a eta_c^3/48) on every face" % ny, e / model, np.ones(e.size),
              atol=taylor_tolerance(eta_c, model), source="our Taylor analysis of the Blasius equation")
    print("  ny=%3d d=%.3e eta_c %.3f..%.3f  max|rel err| %.3e  err/(-a eta_c^3/48) - 1 in [%.4f, %.4f]" % (
        ny, sc["d_first"], eta_c.min(), eta_c.max(), e_y[-1], (e / model - 1).min(), (e / model - 1).max()))
    if ny == NY_LEVELS[-1]:
        # Skin friction coefficient against the textbook formula.
        Re_x = U_INF * sc["xf"] / NU
        cf = 2.0 * res["Wall Shear Stress"][:, 0] / (RHO * U_INF**2)
        check_max("c_f sqrt(Re_x) on all plate faces (ny=%d)" % ny, cf * np.sqrt(Re_x),
                      np.full(Re_x.size, 2 * blasius.fpp0), rtol=1.05 * e_y[-1], source=SRC)
        check_max("c_f sqrt(Re_x) vs the rounded 0.664", cf * np.sqrt(Re_x), np.full(Re_x.size, 0.664),
                      rtol=abs(2 * blasius.fpp0 / 0.664 - 1) + 1.05 * e_y[-1],
                      source="0.664/sqrt(Re_x) (Blasius 1908)")
        # Wall quantities: the normal +y into the fluid, d the centre height, y+.
        check_max("Wall Normal (plate faces stored into the wall)", res["Wall Normal"],
                      np.tile([0.0, 1.0, 0.0], (Re_x.size, 1)), atol=4 * EPS)
        check_max("Wall Distance = first cell centre height", res["Wall Distance"],
                      np.full(Re_x.size, sc["d_first"]), atol=4 * EPS * HEIGHT)
        utau = np.sqrt(res["Wall Shear Stress"][:, 0] / RHO)
        check_max("y+ = d u_tau / nu", res["y+"], sc["d_first"] * utau / NU, rtol=1e-13)
        print("  y+ of the first cells: %.3f .. %.3f (ny=%d)" % (res["y+"].min(), res["y+"].max(), ny))
        assert np.all(res["Near-Wall Regime"] == 0), "y+ < 5: viscous sublayer"
        # Without Walls: the plate faces among all boundary faces carry the same values.
        nw = shear(sc, "Near-wall difference", walls=False)
        out = nw["out"]
        from vtkmodules.util.numpy_support import vtk_to_numpy
        pts = vtk_to_numpy(out.GetPoints().GetData())
        cen = np.array([pts[[out.GetCell(i).GetPointId(k) for k in range(4)]].mean(0)
                        for i in range(out.GetNumberOfCells())])
        plate = np.abs(cen[:, 1]) < 1e-12
        idx = np.lexsort((cen[plate, 2], cen[plate, 0]))
        check_max("no Walls: plate faces = Walls path", T.cell_array(out, "Wall Shear Stress")[plate][idx],
                      res["Wall Shear Stress"], atol=4 * EPS * np.abs(res["Wall Shear Stress"]).max())
        release(nw)
    release(res)
hy = np.array(hy)
orders_and_bounds("near-wall difference, y", hy, e_y, (2.8, 3.4), 3.0, SRC)
# The deviation from the leading Taylor term is its next term, O(eta_c^3).
print("  max deviation from -a eta_c^3/48: %s (order %.2f)" % (
    np.array2string(np.array(dev), precision=3), T.observed_order(hy, dev)))

print("Near-wall difference, x refinement (ny = %d):" % NY_X)
for nx in NX_LEVELS:
    sc = plate_scene(nx, NY_X)
    res = shear(sc, "Near-wall difference")
    e = face_errors(sc, res)
    model, eta_c = taylor_error(sc, res)
    # x-independent: every face, at every nx, has the Taylor error of its own x.
    check_max("(nx=%d) error / (-a eta_c^3/48) on every face" % nx, e / model, np.ones(e.size),
              atol=taylor_tolerance(eta_c, model), source="our Taylor analysis; x spacing does not enter")
    release(res)

# --- wall fit and gradient tensor ---------------------------------------------------

for method, label in (("Wall fit", "wall fit"), ("Gradient tensor", "gradient tensor (least squares)")):
    print("%s, y refinement (nx = %d):" % (label, NX_Y))
    e_y = []
    for ny in NY_LEVELS:
        sc = plate_scene(NX_Y, ny)
        res = shear(sc, method)
        e = face_errors(sc, res)
        e_y.append(np.abs(e).max())
        print("  ny=%3d max|rel err| %.3e  (interior faces %.3e, first %.3e, last %.3e)" % (
            ny, e_y[-1], np.abs(e[NZ:-NZ]).max(), e[0], e[-1]))
        release(res)
    orders_and_bounds("%s, y" % label, hy, e_y, (2.8, 3.4), 3.0, SRC)
    print("%s, x refinement (ny = %d):" % (label, NY_X))
    e_x = []
    for nx in NX_LEVELS:
        sc = plate_scene(nx, NY_X)
        res = shear(sc, method)
        e = face_errors(sc, res)
        e_x.append(np.abs(e).max())
        release(res)
    print("  max|rel err| at nx = %s: %s" % (NX_LEVELS, np.array2string(np.array(e_x), precision=3)))
    first_x = [X0 + 0.5 * (X1 - X0) / nx for nx in NX_LEVELS]
    growth = (first_x[1] / np.array(first_x)) ** 1.5           # eta_c^3 ~ x^(-3/2)
    if method == "Gradient tensor":
        # The wall cell's x-neighbours lie beside it at the same height: they do
        # not change the wall-normal column of the gradient, so the error is
        # that of each face's own x (it grows slightly with nx only because the
        # first face centroid moves toward the leading edge, where eta_c is
        # larger).
        T.check_close("%s: error x x_first^1.5 independent of nx" % label, np.array(e_x) / growth,
                      np.full(len(NX_LEVELS), e_x[1]), rtol=1e-3,
                      source="eta_c^3 ~ x^-3/2; the next term is below 1e-4 of it at eta_c < 0.05")
    else:
        # The wall fit takes its neighbours beside the cell (WallFit.h), with the
        # wall gradient's variation along the wall in its basis: the x spacing
        # enters only weakly. Measured ratios to the nx = 16 value, scaled by the
        # first face's eta_c^3: 0.96, 1, 1.07, 1.12 (asserted within [0.8, 1.25]).
        ratios = np.array(e_x) / growth / e_x[1]
        T.expect("%s: error x x_first^1.5 within 0.8-1.25 of nx = 16's" % label,
                 bool(np.all((ratios >= 0.8) & (ratios <= 1.25))), np.array2string(ratios, precision=3))

if defects:
    print("\nDEFECTS (documented behaviour not delivered):")
    for d in defects:
        print("  - " + d)
    raise AssertionError("%d documented property(ies) fail; see DEFECTS above" % len(defects))
T.done(__file__)
