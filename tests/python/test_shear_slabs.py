"""Shear Projection on the meshes 2-D cases and unstructured near-wall
regions are stored in: one-cell-thick slabs of hexahedra and of wedges (a
triangulated 2-D mesh extruded by one cell), and a pipe of prism layers on a
tetrahedral core. Meshes and flows of our own (shear_scenes.py).

1. Channel slabs, interior nodes jittered, the slab turned to an oblique
   plane and moved off the origin (so that its thickness direction is not
   an axis and the cell centres' offsets across it are round-off):
   - plane Couette flow u = U y/H e_x (White, Viscous Fluid Flow, §3-2;
     section recalled from memory): the near-wall difference, the
     least-squares gradient and the wall fit are exact (round-off);
   - plane Poiseuille flow u = A y (H - y) e_x (White, §3-3): the wall fit
     is exact, mu A H; the near-wall difference is exactly mu A (H - d);
   - the slab is detected: one warning gives the number of faces whose
     neighbours span only a plane, and no face falls back or is NaN.
2. A cylinder in a slab (O-grid, hexahedra and wedges, skewed by a smooth
   distortion that keeps its shape under refinement): the
   Stokes-type flow of shear_scenes.stokes_cylinder (no slip on r = R, where
   the wall faces' corners lie), wall shear -(2 mu U/R) sin(theta) e_theta
   (our own differentiation). Face by face against it, refining around and
   across together: the wall fit is second order (measured errors fall by
   about 4 per halving), the near-wall difference and the least-squares
   gradient first order. The friction force through Wall Traction and Load
   Integration against 2 pi mu U t (our own integration). A gradient taken
   at the cell centres (the exact one, and VTK's own gradient of the cell
   velocities on the volume, as ParaView's Gradient filter gives) used as
   Velocity Gradient: its friction force falls short, the warning is given.
3. A pipe of three prism layers on a tetrahedral core, Hagen-Poiseuille
   flow u_z = 2 U_m (1 - r^2/R^2) (White, Fluid Mechanics, §6.4; recalled
   from memory), tau_w = 4 mu U_m/R: the wall fit reproduces the quadratic
   field at every wall triangle (tau_z = 4 mu U_m (x_f.e_f)/R^2, to
   round-off) and its error against tau_w is the facet's sagitta, second
   order, measured; the near-wall difference and the least-squares gradient
   are first order, measured.
4. Every method on every mesh kind (hexahedral and wedge slabs, the
   prism-tetrahedral pipe, an all-tetrahedral pipe) returns finite values
   on every wall face.

Tolerances: round-off bounds for the exact cases (stated beside them); for
the orders, the observed order of the two finest levels within a band
around the asymptotic one, and the pair orders approaching it.

Measured when written (max face error / max |tau|, n = 16 .. 256 around the
cylinder; pair orders): hexahedral slab wall fit 1.2e-1 .. 5.1e-4 (1.64,
2.00, 2.09, 2.09), near-wall difference 2.6e-1 .. 1.8e-2 (0.93 .. 0.98),
least-squares gradient 6.0e-1 .. 5.8e-2 (0.60 .. 0.96); wedge slab wall fit
1.2e-1 .. 9.7e-4 (1.55, 1.70, 1.77, 1.91), near-wall difference 2.3e-1 ..
1.7e-2 (0.91 .. 0.98), least-squares gradient 4.0e-1 .. 2.9e-2 (0.91 ..
0.98). Friction force at n = 64 / exact: wall fit 0.993 (wedges), 0.990
(hexahedra); near-wall difference 0.937, 0.927; least-squares 0.889, 0.779;
the exact gradient at the cell centres 0.896, 0.849; VTK's gradient of the
volume 0.358, 0.365. Prism-tetrahedral pipe, n = 12, 24, 48 around: wall
fit 3.4e-2, 8.6e-3, 2.1e-3 (1.99, 2.00, = the sagitta), near-wall
difference 0.68, 0.34, 0.17 (0.99, 0.99), least-squares gradient 0.21,
0.044, 0.025 (2.23, 0.85: the core's tetrahedra change the stencils between
levels).
"""
import math

import numpy as np

import wl_testing as T
import scenes as S
import shear_scenes as SS
from vtkmodules.vtkCommonDataModel import vtkCompositeDataSet, vtkMultiBlockDataSet

simple = T.load_plugin()

MU, RHO = 1.3e-3, 1000.0
EXACT_RTOL = 1e-10   # the wall fit's normal equations amplify round-off ~1e6 (WallFit.h); measured <= 2e-12
METHODS = ("Near-wall difference", "Gradient tensor", "Wall fit", "Wall law")

# An oblique frame for the slabs (Rodrigues rotation by 0.7 rad about (1, -2, 2)/3).
_A = np.array([1.0, -2.0, 2.0]) / 3.0
_K = np.array([[0, -_A[2], _A[1]], [_A[2], 0, -_A[0]], [-_A[1], _A[0], 0]])
Q = np.eye(3) + math.sin(0.7) * _K + (1 - math.cos(0.7)) * _K @ _K
ORIGIN = np.array([3.1, -1.7, 0.4])


def producer(mesh, cell_arrays=None):
    return T.producer(S.mixed_unstructured_grid(mesh["points"], mesh["cells"], cell_arrays=cell_arrays))


def walls_of(points, quads_by_name, cell_arrays=None):
    """The wall quads as their own polydata blocks (own points), one per name."""
    mb = vtkMultiBlockDataSet()
    for i, (name, faces) in enumerate(quads_by_name.items()):
        wp, wf = S.detached_faces(points, faces, seed=i)
        arrays = None if cell_arrays is None else cell_arrays.get(name)
        mb.SetBlock(i, S.polydata(wp, [tuple(f) for f in wf], cell_arrays=arrays))
        mb.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), name)
    return T.producer(mb)


def blocks(out):
    return {out.GetMetaData(i).Get(vtkCompositeDataSet.NAME()): out.GetBlock(i)
            for i in range(out.GetNumberOfBlocks())}


def run(vsrc, wsrc, method, **props):
    sp = simple.ShearProjection(Input=vsrc, Walls=wsrc, Velocity=["CELLS", "velocity"], Viscosity=MU,
                                Density=RHO, Method=method)
    for k, v in props.items():
        setattr(sp, k, v)
    cap = T.Capture(sp)
    out = T.output_of(sp)
    res = {name: {k: T.cell_array(b, k).copy() for k in ("Wall Shear Stress", "Wall Normal", "Wall Distance")}
           for name, b in blocks(out).items()}
    simple.Delete(sp)
    return res, cap


# ---------------------------------------------------------------------------
# 1. channel slabs
# ---------------------------------------------------------------------------

def check_channel_slabs():
    print("\n== 1. one-cell-thick channel slabs (oblique, jittered): Couette and Poiseuille ==")
    L, H, t = 1.0, 0.2, 0.05
    nodes, quads, edges = SS.channel_2d(L, H, 12, 6, jitter=0.25, seed=3)
    ex, ey = Q[:, 0], Q[:, 1]
    for kind, cells2d in (("hexahedra", quads), ("wedges", SS.split_quads(quads))):
        sl = SS.extrude_slab(nodes, cells2d, {"bottom": edges["bottom"]}, t, rotation=Q, origin=ORIGIN)
        C = S.mixed_cell_vertex_means(sl["points"], sl["cells"])
        y = (C - ORIGIN) @ ey
        n_faces = len(sl["walls"]["bottom"])
        # Couette
        U = 0.7
        vsrc = producer(sl, {"velocity": np.outer(U * y / H, ex)})
        wsrc = walls_of(sl["points"], sl["walls"])
        for method in METHODS[:3]:
            res, cap = run(vsrc, wsrc, method)
            tau = res["bottom"]["Wall Shear Stress"]
            T.close_worst("%s slab, Couette: %s exact" % (kind, method), tau, MU * U / H * ex,
                          rtol=EXACT_RTOL, source="White VFF §3-2; exact for linear profiles")
            T.close_worst("%s slab: Wall Normal = e_y (into the fluid)" % kind, res["bottom"]["Wall Normal"], ey,
                          atol=1e-13)
            if method != "Near-wall difference":
                # The slab is found and said once, with its face count; nothing falls back.
                planar = [w for w in cap.warnings if "span only a plane" in w]
                T.expect("%s slab, %s: one slab note, counting every face" % (kind, method),
                         len(planar) == 1 and ("%d of %d wall faces" % (n_faces, n_faces)) in planar[0],
                         str(cap.warnings))
                T.expect("%s slab, %s: no fallback, no NaN" % (kind, method),
                         not cap.errors and not cap.unexpected("span only a plane"), str(cap.errors + cap.warnings))
        simple.Delete(vsrc)
        # Poiseuille
        A = 3.0
        vsrc = producer(sl, {"velocity": np.outer(A * y * (H - y), ex)})
        res, cap = run(vsrc, wsrc, "Wall fit")
        T.close_worst("%s slab, Poiseuille: wall fit exact, mu A H" % kind, res["bottom"]["Wall Shear Stress"],
                      MU * A * H * ex, rtol=EXACT_RTOL, source="White VFF §3-3; WallFit.h: exact for quadratics")
        res, cap = run(vsrc, wsrc, "Near-wall difference")
        d = res["bottom"]["Wall Distance"]
        T.close_worst("%s slab, Poiseuille: near-wall difference = mu A (H - d)" % kind,
                      res["bottom"]["Wall Shear Stress"], MU * A * (H - d)[:, None] * ex, rtol=1e-12,
                      source="White VFF §3-3; mu u_P/d exactly")
        res, cap = run(vsrc, wsrc, "Gradient tensor")
        e = np.abs(res["bottom"]["Wall Shear Stress"] @ ex - MU * A * H).max() / (MU * A * H)
        T.expect("%s slab, Poiseuille: least-squares gradient finite (first order at the wall; error %.2e)"
                 % (kind, e), np.all(np.isfinite(res["bottom"]["Wall Shear Stress"])) and e < 0.5)
        for p in (vsrc, wsrc):
            simple.Delete(p)


# ---------------------------------------------------------------------------
# 2. a cylinder in a slab
# ---------------------------------------------------------------------------

R_CYL, U_CYL, T_CYL = 1.0, 0.4, 0.1
LEVELS = [16, 32, 64, 128, 256]


def cylinder_slab(n, kind):
    nodes, quads, edges = SS.annulus_2d(R_CYL, 3.0 * R_CYL, n, n // 4, warp=0.4)
    cells2d = quads if kind == "hexahedra" else SS.split_quads(quads)
    return SS.extrude_slab(nodes, cells2d, edges, T_CYL)


def check_cylinder():
    print("\n== 2. a cylinder in a slab: Stokes-type flow, orders face by face ==")
    band = {"Wall fit": (1.8, 2.3), "Near-wall difference": (0.8, 1.2), "Gradient tensor": (0.8, 1.3)}
    measured = {}
    for kind in ("hexahedra", "wedges"):
        errs = {m: [] for m in band}
        for n in LEVELS:
            sl = cylinder_slab(n, kind)
            C = S.mixed_cell_vertex_means(sl["points"], sl["cells"])
            vsrc = producer(sl, {"velocity": SS.stokes_cylinder(C, R_CYL, U_CYL)})
            wsrc = walls_of(sl["points"], sl["walls"])
            xf = S.face_centroids(sl["points"], [tuple(f) for f in sl["walls"]["cylinder"]])
            exact = SS.stokes_cylinder_wall_shear(xf, R_CYL, U_CYL, MU)
            scale = np.abs(exact).max()
            for m in band:
                res, cap = run(vsrc, wsrc, m)
                tau = res["cylinder"]["Wall Shear Stress"]
                T.expect("%s n=%d %s: finite on every face, no fallback" % (kind, n, m),
                         bool(np.all(np.isfinite(tau))) and not cap.errors
                         and not cap.unexpected("span only a plane"), str(cap.errors + cap.warnings))
                errs[m].append(float(np.abs(tau - exact).max() / scale))
            for p in (vsrc, wsrc):
                simple.Delete(p)
        for m, (lo, hi) in band.items():
            e = np.array(errs[m])
            pairs = np.log2(e[:-1] / e[1:])
            measured[kind, m] = (e, pairs)
            print("  %-9s %-21s max face error / max|tau| %s  pair orders %s" % (
                kind, m, " ".join("%.3e" % v for v in e), np.array2string(pairs, precision=2)))
            T.expect("%s %s: order of the finest pair in [%.1f, %.1f]" % (kind, m, lo, hi), lo <= pairs[-1] <= hi,
                     "%.3f" % pairs[-1])
            p = 2.0 if m == "Wall fit" else 1.0
            T.expect("%s %s: pair orders approach %d (|p_fine - %d| <= |p_prev - %d| + 0.02)" % (kind, m, p, p, p),
                     abs(pairs[-1] - p) <= abs(pairs[-2] - p) + 0.02, np.array2string(pairs, precision=3))
    return measured


def check_cylinder_chain_and_gradients(measured):
    print("\n== 2b. friction force through the chain; gradients at the cell centres ==")
    n = 64
    for kind in ("wedges", "hexahedra"):
        sl = cylinder_slab(n, kind)
        C = S.mixed_cell_vertex_means(sl["points"], sl["cells"])
        vol = S.mixed_unstructured_grid(sl["points"], sl["cells"], cell_arrays={
            "velocity": SS.stokes_cylinder(C, R_CYL, U_CYL),
            "exact_gradient": SS.stokes_cylinder_gradient(C, R_CYL, U_CYL)})
        # The gradient a user gets from VTK's own gradient filter on the volume (cell data).
        from vtkmodules.vtkFiltersGeneral import vtkGradientFilter
        gf = vtkGradientFilter()
        gf.SetInputData(vol)
        gf.SetInputArrayToProcess(0, 0, 0, 1, "velocity")
        gf.SetResultArrayName("volume_gradient")
        gf.Update()
        vol.GetCellData().AddArray(gf.GetOutput().GetCellData().GetArray("volume_gradient"))
        vsrc = T.producer(vol)
        wsrc = walls_of(sl["points"], sl["walls"])
        F_exact = 2 * math.pi * MU * U_CYL * T_CYL
        ratios = {}
        for label, method, grad in (("wall fit", "Wall fit", None),
                                    ("near-wall difference", "Near-wall difference", None),
                                    ("least-squares gradient", "Gradient tensor", None),
                                    ("exact gradient at the cell centre", "Gradient tensor", "exact_gradient"),
                                    ("VTK gradient of the volume", "Gradient tensor", "volume_gradient")):
            sp = simple.ShearProjection(Input=vsrc, Walls=wsrc, Velocity=["CELLS", "velocity"], Viscosity=MU,
                                        Method=method)
            if grad:
                sp.VelocityGradient = ["CELLS", grad]
            cap = T.Capture(sp)
            wt = simple.WallTraction(Input=sp, Pressure=["CELLS", "None"], ShearSource="Wall shear stress array",
                                     ShearStressArray=["CELLS", "Wall Shear Stress"], Orientation="Use Wall Normal array")
            li = simple.LoadIntegration(Input=wt)
            tot = T.output_of(li, 0)
            F = T.field(tot, "Viscous Force")
            ratios[label] = F[0] / F_exact
            print("  %-9s %-34s friction force %.6e N (exact 2 pi mu U t = %.6e): ratio %.4f, skipped %d" % (
                kind, label, F[0], F_exact, ratios[label], T.field(tot, "Skipped Faces")))
            T.expect("%s %s: no face skipped" % (kind, label), T.field(tot, "Skipped Faces") == 0)
            if grad:
                notes = [w for w in cap.warnings if T.NOTE_GRADIENT_ARRAY in w]
                T.expect("%s %s: the volume-gradient note is given once" % (kind, label), len(notes) == 1,
                         str(cap.warnings))
            for p in (li, wt, sp):
                simple.Delete(p)
        # Bounded by the largest face error at this level (section 2; each face's
        # shear is within it of the exact, relative to max |tau|, and the mean of
        # |tau| over the wall is 2/pi of its max) plus the faceting: the chord
        # polygon's perimeter falls short of the circle's by (pi/n)^2/6.
        face_error = measured[kind, "Wall fit"][0][LEVELS.index(n)]
        T.check_close("%s: wall fit friction force" % kind, ratios["wall fit"], 1.0,
                      rtol=face_error * math.pi / 2 + (math.pi / n) ** 2 / 6,
                      source="2 pi mu U t, our integration of stokes_cylinder")
        T.expect("%s: a gradient without the wall falls short (%.3f, %.3f of the exact force)" % (
            kind, ratios["exact gradient at the cell centre"], ratios["VTK gradient of the volume"]),
            ratios["VTK gradient of the volume"] < 0.99 and ratios["exact gradient at the cell centre"] < 0.99)
        for p in (vsrc, wsrc):
            simple.Delete(p)


# ---------------------------------------------------------------------------
# 3. prism layers on a tetrahedral core: Hagen-Poiseuille
# ---------------------------------------------------------------------------

def check_prism_tet_pipe():
    print("\n== 3. pipe of prism layers on a tetrahedral core: Hagen-Poiseuille ==")
    R, L, Um = 0.05, 0.1, 0.02
    tau_w = 4 * MU * Um / R
    levels = [12, 24, 48]
    errs = {m: [] for m in ("Wall fit", "Near-wall difference", "Gradient tensor")}
    for n in levels:
        m = SS.prism_tet_pipe(R, L, n, max(2, n // 8), 3, 0.6 * R / n, 3)
        C = S.mixed_cell_vertex_means(m["points"], m["cells"])
        u = np.zeros_like(C)
        u[:, 2] = 2 * Um * (1 - (C[:, 0] ** 2 + C[:, 1] ** 2) / R ** 2)
        vsrc = producer(m, {"velocity": u})
        wsrc = walls_of(m["points"], {"wall": m["wall"]})
        xf = S.face_centroids(m["points"], [tuple(f) for f in m["wall"]])
        n_out, _ = S.newell_normals(m["points"], [tuple(f) for f in m["wall"]])
        for method in errs:
            res, cap = run(vsrc, wsrc, method)
            tau = res["wall"]["Wall Shear Stress"]
            T.expect("pipe n=%d %s: finite, no error or fallback" % (n, method),
                     bool(np.all(np.isfinite(tau))) and not cap.errors and not cap.warnings,
                     str(cap.errors + cap.warnings))
            if method == "Wall fit":
                # Exact for the quadratic field, at each wall triangle's centroid with its normal.
                T.close_worst("pipe n=%d wall fit: tau_z = 4 mu U_m (x_f.e_f)/R^2" % n, tau[:, 2],
                              4 * MU * Um * np.einsum("ij,ij->i", xf, n_out) / R ** 2, rtol=EXACT_RTOL,
                              source="WallFit.h: exact for quadratics, any cell shapes")
            errs[method].append(float(np.abs(tau[:, 2] - tau_w).max() / tau_w))
        for p in (vsrc, wsrc):
            simple.Delete(p)
    for method, (p, lo, hi) in {"Wall fit": (2, 1.9, 2.1), "Near-wall difference": (1, 0.8, 1.2),
                                "Gradient tensor": (1, 0.8, 1.3)}.items():
        e = np.array(errs[method])
        pairs = np.log2(e[:-1] / e[1:])
        print("  %-21s max |tau_z - tau_w|/tau_w %s  pair orders %s" % (
            method, " ".join("%.3e" % v for v in e), np.array2string(pairs, precision=2)))
        T.expect("pipe %s: order of the finest pair in [%.1f, %.1f] (White FM §6.4)" % (method, lo, hi),
                 lo <= pairs[-1] <= hi, "%.3f" % pairs[-1])
    # The wall fit's error is the facet sagitta 1 - cos(pi/n) exactly (x_f.e_f = R cos(pi/n)).
    T.close_worst("pipe wall fit error = 1 - cos(pi/n)", errs["Wall fit"],
                  1 - np.cos(np.pi / np.array(levels)), atol=EXACT_RTOL, source="own derivation")


# ---------------------------------------------------------------------------
# 4. every method on every mesh kind
# ---------------------------------------------------------------------------

def check_every_method_finite():
    print("\n== 4. every method on every mesh kind: finite on every face ==")
    scenes_ = []
    nodes, quads, edges = SS.channel_2d(1.0, 0.2, 8, 4, jitter=0.2, seed=9)
    for kind, cells2d in (("hexahedral slab", quads), ("wedge slab", SS.split_quads(quads))):
        sl = SS.extrude_slab(nodes, cells2d, edges, 0.05, rotation=Q, origin=ORIGIN)
        C = S.mixed_cell_vertex_means(sl["points"], sl["cells"])
        y = (C - ORIGIN) @ Q[:, 1]
        scenes_.append((kind, sl["points"], sl["cells"], sl["walls"], np.outer(y * (0.2 - y), Q[:, 0])))
    m = SS.prism_tet_pipe(0.05, 0.1, 16, 2, 3, 0.002, 3)
    C = S.mixed_cell_vertex_means(m["points"], m["cells"])
    u = np.zeros_like(C)
    u[:, 2] = 1 - (C[:, 0] ** 2 + C[:, 1] ** 2) / 0.05 ** 2
    scenes_.append(("prism-tetrahedral pipe", m["points"], m["cells"], {"wall": m["wall"]}, u))
    t = S.pipe_volume(0.05, 0.1, 4, 16, 3, kind="tet")
    C = S.mixed_cell_vertex_means(t["points"], t["cells"])
    u = np.zeros_like(C)
    u[:, 2] = 1 - (C[:, 0] ** 2 + C[:, 1] ** 2) / 0.05 ** 2
    scenes_.append(("tetrahedral pipe", t["points"], t["cells"], {"wall": t["wall"]}, u))
    for kind, P, cells, walls, u in scenes_:
        vsrc = T.producer(S.mixed_unstructured_grid(P, cells, cell_arrays={"velocity": u}))
        wsrc = walls_of(P, walls)
        for method in METHODS:
            res, cap = run(vsrc, wsrc, method)
            tau = np.vstack([r["Wall Shear Stress"] for r in res.values()])
            T.expect("%s, %s: %d faces, all finite, no error" % (kind, method, tau.shape[0]),
                     tau.shape[0] > 0 and bool(np.all(np.isfinite(tau))) and not cap.errors,
                     str(cap.errors + cap.warnings))
        for p in (vsrc, wsrc):
            simple.Delete(p)


def main():
    check_channel_slabs()
    measured = check_cylinder()
    check_cylinder_chain_and_gradients(measured)
    check_prism_tet_pipe()
    check_every_method_finite()
    T.done(__file__)


if __name__ == "__main__":
    main()
