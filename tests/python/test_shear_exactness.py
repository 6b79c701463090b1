"""Shear Projection's documented exactness properties, one small mesh each.
Cases 3-6 are the minimal reproductions of defects found with
test_shear_blasius.py and test_shear_demo_volume.py in an earlier build
(wall fit mixing in tangential neighbours, least-squares gradient on a mesh
one cell thick, moving curved walls); they now pass and guard against
regressions. A check that fails is listed under DEFECTS and fails the test.

Documented (vtkShearProjection.h, NearWallShear.h, LeastSquaresGradient.h,
WallFit.h):
  near-wall difference exact for linear profiles (Couette flow);
  wall fit exact for quadratic fields (plane Poiseuille flow), second order
  otherwise;
  least-squares gradient exact for linear fields, taken in the plane the
  neighbours span when they span fewer than three directions;
  Wall Shear Stress is what Wall Traction takes as the viscous traction.

Checks (exact answers by construction, tolerances round-off; or measured
orders):
 1. Couette flow over a sliding wall, on a box rotated to an arbitrary
    orientation: u = U_w + y' (g1 e_x' + g2 e_z'), tau_w = mu (g1 e_x' + g2 e_z')
    (Couette flow: White, Viscous Fluid Flow, ch. 3 -- recalled from
    memory). All methods, with the wall velocity as a cell array.
 2. Plane Poiseuille flow u = A y (h - y) e_x (White, ch. 3): wall fit exact,
    near-wall difference exactly mu A (h - d).
 3. A developing profile, quadratic in the wall distance at every x:
    u = (a(x) y + b(x) y^2) e_x on a flat wall: the wall fit (a quadratic in
    all three coordinates over the cell, its neighbours and the wall's
    corners, WallFit.h) is second order, measured under refinement.
 4. A faceted curved wall (a 24-sided prism, the walls of a polygonal
    annulus), axial flow linear in the distance to each facet:
    u_z = g dist(x, own facet plane): near-wall difference exact. Wall fit
    on u_z = g (r - R_v) (zero on the circle through the facets' corners):
    second order, measured refining sectors and layers together.
 5. A mesh one cell thick (a common quasi-2D set-up), least-squares
    gradient on a quadratic field: every face finite with tau_z = 0 (the
    gradient is taken in the slab plane), or NaN, never a value set by
    round-off.
 6. A spinning cylinder (moving curved wall), u_theta = Omega R^2/r (an exact
    Navier-Stokes solution, the outer cylinder of Couette flow between
    rotating cylinders moved to infinity; Landau & Lifshitz, Fluid
    Mechanics, §18 -- section recalled from memory):
    tau_w = -2 mu Omega on the wall (tau_r_theta = mu r d(u_theta/r)/dr),
    torque -4 pi mu Omega R^2 per unit length. One fine mesh: 1024 facets,
    first cell centre 1e-3 R (the faceting and profile errors are below
    1 %); the torque from Shear Projection -> Wall Traction -> Load
    Integration must be within 3 % of the exact one, with the wall velocity
    as point data (vtkShearProjection.h adds the wall-velocity part of tau n
    from it), and for the wall fit also as cell data (its neighbours beside
    the cell carry the rotation); with cell data the near-wall difference
    gives half the shear, as its header documents: checked.

Measured when written: 1, 2 and 4 (near-wall difference) exact to 2e-12 or
below; 3: wall fit errors 6.2e-5, 6.6e-6, 7.7e-7 (orders 3.2, 3.1); 4:
wall fit errors 3.9e-3, 5.4e-4, 7.2e-5 (orders 2.9, 2.9); 5: finite on
every face, |tau_z| 7e-21 Pa; 6: torque ratios 0.995 (near-wall
difference), 1.000 (wall fit), 0.996 (least squares), 0.998 (array) with the
point wall velocity; with the cell one 0.9995 (wall fit) and 0.495
(near-wall difference, documented). An earlier build failed 5 (NaN on 1 face
of 10, |tau_z| = 2e10 Pa on the others) and 6 (0.495 for every wall
velocity); an earlier wall fit, which used only the cells stacked straight
off the wall, was exact on 3 and on the kinked field of 4 but fell back to
first order on every mesh without stacked cells.
"""
import math

import numpy as np

import wl_testing as T
import scenes as S

simple = T.load_plugin()

MU = 1.3e-3
EPS = np.finfo(float).eps
METHODS = ("Near-wall difference", "Wall fit", "Gradient tensor")
defects = []


def shear(vol, walls, method, wall_velocity=None, gradient=None, wall_velocity_on_points=False):
    """Run Shear Projection (and Wall Traction + Load Integration); return arrays and Moment."""
    v, w = T.producer(vol), T.producer(walls)
    sp = simple.ShearProjection(Input=v, Walls=w)
    sp.Velocity = ["CELLS", "velocity"]
    sp.Viscosity = MU
    sp.Method = method
    if wall_velocity:
        sp.WallVelocity = ["POINTS" if wall_velocity_on_points else "CELLS", wall_velocity]
    if gradient:
        sp.VelocityGradient = ["CELLS", gradient]
    out = T.output_of(sp)
    res = {k: T.cell_array(out, k).copy() for k in ("Wall Shear Stress", "Wall Normal", "Wall Distance")}
    wt = simple.WallTraction(Input=sp)
    wt.ShearSource = "Wall shear stress array"
    wt.ShearStressArray = ["CELLS", "Wall Shear Stress"]
    wt.Orientation = "Use Wall Normal array"
    li = simple.LoadIntegration(Input=wt)
    lo = T.output_of(li, 0)
    res["Moment"] = T.field(lo, "Moment")
    res["Skipped Faces"] = T.field(lo, "Skipped Faces")
    for p in (li, wt, sp, w, v):
        simple.Delete(p)
    return res


def max_rel(got, expected):
    scale = np.abs(expected).max()
    return float(np.nanmax(np.abs(got - expected)) / scale) if np.all(np.isfinite(got)) else float("inf")


def expect_exact(label, got, expected, defect_text=None, rtol=1e-11):
    err = max_rel(got, expected)
    ok = err <= rtol
    print("%-62s max rel err %.3e (tol %.0e) %s" % (label, err, rtol, "" if ok else "FAIL"))
    if not ok:
        if defect_text is None:
            raise AssertionError("%s: relative error %.3e" % (label, err))
        defects.append("%s: relative error %.3e. %s" % (label, err, defect_text))


def box_walls(xn, zn, y0=0.0):
    """Quads of the plane y = y0 on the (x, z) nodes, stored into the wall (-y)."""
    X, Z = np.meshgrid(xn, zn, indexing="ij")
    pts = np.stack([X.ravel(), np.full(X.size, y0), Z.ravel()], axis=1)
    m = zn.size
    faces = [(i * m + k, (i + 1) * m + k, (i + 1) * m + k + 1, i * m + k + 1)
             for i in range(xn.size - 1) for k in range(zn.size - 1)]
    return pts, faces


# --- 1. sliding Couette flow, rotated box ------------------------------------------
rng = np.random.default_rng(7)
Q, _ = np.linalg.qr(rng.normal(size=(3, 3)))
xn, yn, zn = np.linspace(0, 1, 6), S.stretched_nodes(0, 0.2, 5, 1.5), np.linspace(0, 0.5, 4)
P, C = S.hex_box(xn, yn, zn)
origin = np.array([0.3, -0.7, 1.1])
Pr = origin + P @ Q.T
xc = S.cell_vertex_means(Pr, C)
yloc = (xc - origin) @ Q[:, 1]
Uw = 0.3 * Q[:, 0] - 0.2 * Q[:, 2]
gam = 2.0 * Q[:, 0] + 0.7 * Q[:, 2]
vol = S.unstructured_grid(Pr, C, S.VTK_HEXAHEDRON_ID,
                          cell_arrays={"velocity": Uw + yloc[:, None] * gam,
                                       "G": np.tile(np.outer(gam, Q[:, 1]).ravel(), (C.shape[0], 1))})
wp, wf = box_walls(xn, zn)
walls = S.polydata(origin + wp @ Q.T, wf, cell_arrays={"Uw": np.tile(Uw, (len(wf), 1))})
exact = np.tile(MU * gam, (len(wf), 1))
for m in METHODS:
    r = shear(vol, walls, m, wall_velocity="Uw")
    expect_exact("1. Couette, rotated box, sliding wall: %s" % m, r["Wall Shear Stress"], exact)
r = shear(vol, walls, "Gradient tensor", wall_velocity="Uw", gradient="G")
expect_exact("1. Couette, rotated box: gradient tensor from the array", r["Wall Shear Stress"], exact)
nerr = np.abs(r["Wall Normal"] - Q[:, 1]).max()
print("%-62s max err %.3e (tol 1e-14)" % ("1. Wall Normal = e_y' (into the fluid)", nerr))
assert nerr <= 1e-14, nerr

# --- 2. plane Poiseuille flow ------------------------------------------------------------
h, A = 0.2, 3.0
xn, yn, zn = np.linspace(0, 1, 6), S.stretched_nodes(0, h, 8, 1.0), np.linspace(0, 0.5, 3)
P, C = S.hex_box(xn, yn, zn)
xc = S.cell_vertex_means(P, C)
vol = S.unstructured_grid(P, C, S.VTK_HEXAHEDRON_ID,
                          cell_arrays={"velocity": np.stack([A * xc[:, 1] * (h - xc[:, 1]), 0 * xc[:, 0], 0 * xc[:, 0]], 1)})
wp, wf = box_walls(xn, zn)
walls = S.polydata(wp, wf)
r = shear(vol, walls, "Wall fit")
expect_exact("2. plane Poiseuille: wall fit = mu A h", r["Wall Shear Stress"],
             np.tile([MU * A * h, 0, 0], (len(wf), 1)))
r = shear(vol, walls, "Near-wall difference")
d = r["Wall Distance"]
expect_exact("2. plane Poiseuille: near-wall difference = mu A (h - d)", r["Wall Shear Stress"],
             np.stack([MU * A * (h - d), 0 * d, 0 * d], 1))

# --- 3. developing quadratic profile on a flat wall ------------------------------------------
# u = (a(x) y + b(x) y^2) e_x: quadratic in the wall distance at every x, but
# a(x), b(x) are not polynomials. The wall fit takes neighbours beside the
# cell too (WallFit.h: a quadratic in all three coordinates, plus the wall
# gradient varying quadratically along the wall), so it is not exact here:
# the error in mu a(x_f) is measured under refinement of x and y together.
# Documented: at least second order (asserted >= 1.8); measured 3.4 and 3.1
# (the along-wall terms of the basis take a(x) to second order, leaving
# cubic terms), finest error 7.69e-7 (asserted <= 1.05 x that: the
# computation is deterministic). (An earlier fit used only the cells stacked
# straight off the wall and was exact here, but fell back to first order on
# every mesh without stacked cells.)
a_of = lambda x: 2.0 * np.exp(1.5 * x)
b_of = lambda x: -4.0 * np.cos(2.0 * x)
errs3, hs3 = [], []
for level in range(3):
    nx, ny = 10 * 2 ** level, 5 * 2 ** level
    xn, yn, zn = np.linspace(0, 1, nx + 1), S.stretched_nodes(0, 0.1, ny, 1.5), np.linspace(0, 0.2, 3)
    P, C = S.hex_box(xn, yn, zn)
    xc = S.cell_vertex_means(P, C)
    ux = a_of(xc[:, 0]) * xc[:, 1] + b_of(xc[:, 0]) * xc[:, 1] ** 2
    vol = S.unstructured_grid(P, C, S.VTK_HEXAHEDRON_ID,
                              cell_arrays={"velocity": np.stack([ux, 0 * ux, 0 * ux], 1)})
    wp, wf = box_walls(xn, zn)
    xf = S.face_centroids(wp, wf)[:, 0]
    r = shear(vol, S.polydata(wp, wf), "Wall fit")
    interior = (xf > 0.15) & (xf < 0.85)        # away from the box's ends (one-sided stencils)
    errs3.append(max_rel(r["Wall Shear Stress"][interior], np.stack([MU * a_of(xf), 0 * xf, 0 * xf], 1)[interior]))
    hs3.append(1.0 / nx)
order3 = np.log2(errs3[-2] / errs3[-1])
print("3. u = a(x) y + b(x) y^2, wall fit: max rel errors %s, order %.2f (expected 2)" % (
    " ".join("%.3e" % e for e in errs3), order3))
assert order3 >= 1.8, "3. wall fit order %.2f below second order" % order3
assert errs3[-1] <= 1.05 * 7.69e-7, "3. wall fit finest error %.3e above 1.05 x the recorded 7.69e-7" % errs3[-1]

# --- 4. faceted curved wall: polygonal annulus, axial flow ------------------------------------

def polygon_annulus(n_sides, apothems, z_nodes):
    """Hexahedra between similar regular polygons (vertex radius apothem/cos(pi/n)).
    Returns points, cells (C, 8), the inner wall faces and the sector of each cell."""
    th = 2 * np.pi * np.arange(n_sides) / n_sides
    rv = np.asarray(apothems) / math.cos(math.pi / n_sides)
    nr, nzn = rv.size, z_nodes.size
    pts = np.array([[r * math.cos(t), r * math.sin(t), z] for z in z_nodes for r in rv for t in th])
    pid = lambda k, j, l: (l * nr + k) * n_sides + j % n_sides
    cells, sector = [], []
    for l in range(nzn - 1):
        for k in range(nr - 1):
            for j in range(n_sides):
                cells.append((pid(k, j, l), pid(k + 1, j, l), pid(k + 1, j + 1, l), pid(k, j + 1, l),
                              pid(k, j, l + 1), pid(k + 1, j, l + 1), pid(k + 1, j + 1, l + 1), pid(k, j + 1, l + 1)))
                sector.append(j)
    walls = [(pid(0, j, l), pid(0, j + 1, l), pid(0, j + 1, l + 1), pid(0, j, l + 1))
             for l in range(nzn - 1) for j in range(n_sides)]
    return pts, np.array(cells), walls, np.array(sector)


N, a0, d1 = 24, 1.0, 0.05           # first cell centre 0.05 from the wall
P, C, wf, sector = polygon_annulus(N, a0 + np.array([0, 2 * d1, 6 * d1, 14 * d1]), np.array([0.0, 0.1, 0.2]))
xc = S.cell_vertex_means(P, C)
phi_k = (sector + 0.5) * 2 * np.pi / N        # the outward normal of the facet below each cell
dist = xc[:, 0] * np.cos(phi_k) + xc[:, 1] * np.sin(phi_k) - a0
g = 3.0
vol = S.unstructured_grid(P, C, S.VTK_HEXAHEDRON_ID,
                          cell_arrays={"velocity": np.stack([0 * dist, 0 * dist, g * dist], 1)})
walls = S.polydata(P, wf)
exact = np.tile([0.0, 0.0, MU * g], (len(wf), 1))
r = shear(vol, walls, "Near-wall difference")
expect_exact("4. polygonal annulus, u_z = g dist: near-wall difference", r["Wall Shear Stress"], exact)
# The wall fit on a curved wall: u_z = g (r - R_v), zero on the circle
# through the facets' corners (where the fit puts no slip) and linear in r,
# so not a polynomial in x, y. The exact wall shear at every facet centroid,
# with the facet normal, is mu g. Sectors, layers and the first cell refined
# together: at least second order (WallFit.h; asserted >= 1.8; measured 2.9
# and 2.9, finest error 7.17e-5, asserted <= 1.05 x that).
# (The field above, linear in each sector with kinks between sectors, is not
# smooth, and the wall fit is not exact on it.)
errs4 = []
for level in range(3):
    Nl = 24 * 2 ** level
    d1l = d1 / 2 ** level
    Pl, Cl, wfl, _ = polygon_annulus(Nl, a0 + np.array([0, 2 * d1l, 6 * d1l, 14 * d1l]), np.array([0.0, 0.1, 0.2]))
    Rv = a0 / math.cos(math.pi / Nl)
    xcl = S.cell_vertex_means(Pl, Cl)
    rl = np.hypot(xcl[:, 0], xcl[:, 1])
    voll = S.unstructured_grid(Pl, Cl, S.VTK_HEXAHEDRON_ID,
                               cell_arrays={"velocity": np.stack([0 * rl, 0 * rl, g * (rl - Rv)], 1)})
    rr = shear(voll, S.polydata(Pl, wfl), "Wall fit")
    errs4.append(max_rel(rr["Wall Shear Stress"], np.tile([0.0, 0.0, MU * g], (len(wfl), 1))))
order4 = np.log2(errs4[-2] / errs4[-1])
print("4. polygonal annulus, u_z = g (r - R_v), wall fit: max rel errors %s, order %.2f (expected 2)" % (
    " ".join("%.3e" % e for e in errs4), order4))
assert order4 >= 1.8, "4. wall fit order %.2f below second order" % order4
assert errs4[-1] <= 1.05 * 7.17e-5, "4. wall fit finest error %.3e above 1.05 x the recorded 7.17e-5" % errs4[-1]

# --- 5. one cell thick, least-squares gradient ----------------------------------------------------
xn, yn, zn = np.linspace(0, 1, 11), np.linspace(0, 0.1, 6), np.array([0.0, 0.1])
P, C = S.hex_box(xn, yn, zn)
xc = S.cell_vertex_means(P, C)
u = np.stack([2.0 * xc[:, 1] + 5 * xc[:, 1] ** 2, 0.3 * xc[:, 1] ** 2 * (1 + xc[:, 0]), 0 * xc[:, 0]], 1)
vol = S.unstructured_grid(P, C, S.VTK_HEXAHEDRON_ID, cell_arrays={"velocity": u})
wp, wf = box_walls(xn, zn)
walls = S.polydata(wp, wf)
r = shear(vol, walls, "Gradient tensor")
tau = r["Wall Shear Stress"]
finite = np.all(np.isfinite(tau), axis=1)
tz = np.abs(tau[finite, 2]).max() if finite.any() else 0.0
print("5. one cell thick, least squares: %d of %d faces NaN, max |tau_z| on the others %.3e Pa "
      "(|tau_x| ~ %.1e Pa)" % ((~finite).sum(), finite.size, tz, MU * 2.0))
if not (finite.all() or (~finite).all()) or tz > 1e-9 * MU * 2.0:
    defects.append(
        "5. least-squares gradient on a mesh one cell thick: %d of %d faces NaN and |tau_z| up to %.2e Pa "
        "on the others (tau_x = %.1e Pa). All neighbours and the cell lie in one z plane; only the wall "
        "row's face centroid differs in z, by round-off (~1e-17), and the Jacobi scaling of the normal "
        "matrix turns that into a unit diagonal, so the determinant test passes and du/dz = residual/1e-17. "
        "Faces whose centroid z is exact come out Degenerate." % ((~finite).sum(), finite.size, tz, MU * 2.0))

# --- 6. spinning cylinder (moving curved wall) ------------------------------------------------------
Rc, Om, nf = 1.0, 2.0, 1024
first = 2.0e-3 * Rc                  # first layer; its centre is 1e-3 R from the wall
P, C, wf, sector = polygon_annulus(nf, Rc * math.cos(math.pi / nf) + np.array([0.0, first, 3 * first]),
                                   np.array([0.0, 0.5, 1.0]))
xc = S.cell_vertex_means(P, C)
r2 = xc[:, 0] ** 2 + xc[:, 1] ** 2
u = np.stack([-xc[:, 1], xc[:, 0], 0 * r2], 1) * (Om * Rc**2 / r2)[:, None]
# Exact gradient of u = Om R^2 (-y, x, 0)/r^2 at the cell centres.
x_, y_ = xc[:, 0], xc[:, 1]
k = Om * Rc**2 / r2**2
Gc = np.zeros((xc.shape[0], 9))
Gc[:, 0], Gc[:, 1] = 2 * x_ * y_ * k, (y_**2 - x_**2) * k
Gc[:, 3], Gc[:, 4] = (y_**2 - x_**2) * k, -2 * x_ * y_ * k
vol = S.unstructured_grid(P, C, S.VTK_HEXAHEDRON_ID, cell_arrays={"velocity": u, "G": Gc})
cw = S.face_centroids(P, wf)
walls = S.polydata(P, wf, cell_arrays={"Uw": np.cross([0.0, 0.0, Om], cw)},
                   point_arrays={"Uwp": np.cross([0.0, 0.0, Om], P)})
m_exact = -4 * math.pi * MU * Om * Rc**2 * 1.0          # span 1
for m, grad, wv in (("Near-wall difference", None, "Uwp"), ("Wall fit", None, "Uwp"),
                    ("Gradient tensor", None, "Uwp"), ("Gradient tensor", "G", "Uwp"),
                    ("Near-wall difference", None, "Uw"), ("Wall fit", None, "Uw")):
    r = shear(vol, walls, m, wall_velocity=wv, gradient=grad, wall_velocity_on_points=(wv == "Uwp"))
    ratio = r["Moment"][2] / m_exact
    label = "6. spinning cylinder torque ratio: %s%s, %s wall velocity" % (
        m, " (array)" if grad else "", "point" if wv == "Uwp" else "cell")
    ok = abs(ratio - 1.0) < 0.03 and r["Skipped Faces"] == 0
    if wv == "Uw" and m == "Near-wall difference":
        # Documented (vtkShearProjection.h): the near-wall difference adds the
        # wall-velocity part of tau n only for a point-data wall velocity.
        print("%-72s %.4f (documented limitation: half the shear)" % (label, ratio))
        continue
    print("%-72s %.4f %s" % (label, ratio, "" if ok else "FAIL"))
    if not ok:
        if m in ("Near-wall difference", "Wall fit"):
            defects.append(
                "%s: torque ratio %.4f (exact 1; faceting and profile errors < 1 %%). The tangential part "
                "of mu G n is mu du_theta/dr = -mu Omega at the wall; the wall shear stress is the "
                "tangential part of mu (G + G^T) n = mu (du_theta/dr - u_theta/r) = -2 mu Omega. The "
                "missing t(mu G^T n) is mu times the gradient along the wall of u.n (n fixed), zero on a "
                "stationary wall but not on a moving curved one (-mu Omega x n for a rigid rotation)."
                % (label, ratio))
        else:
            raise AssertionError("%s: ratio %.4f" % (label, ratio))

# Documented limitation: with a cell-data wall velocity the along-wall part is
# not known to the near-wall difference, which gives the wall-normal part
# only: on a spinning cylinder exactly half (mu du_theta/dr = -mu Omega of
# -2 mu Omega). The wall fit takes the along-wall part from its neighbours
# beside the cell, whose velocities carry the rotation: the whole torque
# with either wall velocity (checked in the loop above; measured 0.998).
for m in ("Near-wall difference",):
    r = shear(vol, walls, m, wall_velocity="Uw")
    ratio = r["Moment"][2] / m_exact
    print("6. cell-data wall velocity, %s: torque ratio %.4f (documented: 1/2)" % (m, ratio))
    T.check_close("6. cell-data wall velocity, %s: half the torque" % m, ratio, 0.5, rtol=0.03,
                  source="documented limitation; faceting and profile errors < 1 %")

if defects:
    print("\nDEFECTS (documented behaviour not delivered):")
    for dft in defects:
        print("  - " + dft)
    raise AssertionError("%d documented property(ies) fail; see DEFECTS above" % len(defects))
T.done(__file__)
