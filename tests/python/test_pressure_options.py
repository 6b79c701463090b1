"""Pressure, orientation and viscosity options of Wall Traction, and
Archimedes' principle through the whole Wall Traction -> Load Integration
pipeline.

Conventions (see tests/python/scenes): n is the unit normal out of the
wall into the fluid; the traction the fluid exerts on the wall is
t = -(p - p_ref) n + tau n, tau = mu_eff (G + G^T) - (2/3) mu_eff tr(G) I
(Newtonian fluid with Stokes' hypothesis, e.g. Batchelor, An Introduction to
Fluid Dynamics, 1967, §3.3; White, Fluid Mechanics, §4.3).

Every check prints the measured value, the expected value and the tolerance.
"""
import numpy as np

import wl_testing as T
import scenes as S

simple = T.load_plugin()

INTO_FLUID = "Stored normals point into the fluid"
INTO_WALL = "Stored normals point into the wall"

VEC_ARRAYS = ["Wall Normal", "Pressure Traction", "Viscous Traction", "Traction",
              "Pressure Force", "Viscous Force", "Force"]
SCALAR_ARRAYS = ["Face Area", "Normal Viscous Stress", "Directional Traction"]
COEFF_ARRAYS = ["Pressure Coefficient", "Skin Friction Coefficient"]
SIGNED_ARRAYS = VEC_ARRAYS + ["Directional Traction"]   # change sign with n
TOTAL_NAMES = ["Area", "Pressure Force", "Viscous Force", "Force",
               "Pressure Moment", "Viscous Moment", "Moment"]

RNG = np.random.default_rng(20240611)


# ---------------------------------------------------------------------------
# helpers
# ---------------------------------------------------------------------------

def run(pd, integration=None, **props):
    """Wall Traction (with `props`) -> Load Integration on `pd`.

    Returns (faces, totals, wt_fielddata): numpy copies of every per-face
    array, of the Load Integration field-data totals and of Wall Traction's
    field data.  The proxies are deleted afterwards."""
    src = T.producer(pd)
    wt = simple.WallTraction(Input=src)
    for k, v in props.items():
        setattr(wt, k, v)
    li = simple.LoadIntegration(Input=wt)
    for k, v in (integration or {}).items():
        setattr(li, k, v)
    tot_obj = T.output_of(li, 0)
    out = T.output_of(wt, 0)
    assert out.GetNumberOfCells() == pd.GetNumberOfCells(), "Wall Traction produced no output"
    faces = {}
    cd = out.GetCellData()
    for i in range(cd.GetNumberOfArrays()):
        name = cd.GetArrayName(i)
        faces[name] = np.array(T.cell_array(out, name), dtype=float)
    totals = {}
    fd = tot_obj.GetFieldData()
    for i in range(fd.GetNumberOfArrays()):
        totals[fd.GetArrayName(i)] = np.array(T.field(tot_obj, fd.GetArrayName(i)), dtype=float)
    wfd = {}
    fd = out.GetFieldData()
    for i in range(fd.GetNumberOfArrays()):
        wfd[fd.GetArrayName(i)] = np.array(T.field(out, fd.GetArrayName(i)), dtype=float)
    for p in (li, wt, src):
        simple.Delete(p)
    return faces, totals, wfd


close = T.close_arrays


def compare_faces(label, got, expected, names, rtol, source=""):
    for name in names:
        close("%s: %s" % (label, name), got[name], expected[name], rtol=rtol, source=source)


def compare_totals(label, got, expected, names, rtol, source=""):
    for name in names:
        close("%s: total %s" % (label, name), got[name], expected[name], rtol=rtol,
              source=source)


def rowwise_close(label, got, expected, rtol, source=""):
    """|got_f - expected_f| <= rtol |expected_f| for every face f (vector rows)."""
    got = np.atleast_2d(np.asarray(got, float).T).T
    expected = np.atleast_2d(np.asarray(expected, float).T).T
    err = np.linalg.norm(got - expected, axis=1)
    scale = np.linalg.norm(expected, axis=1)
    worst = np.max(err / np.where(scale > 0, scale, 1.0))
    print("%-55s worst per-face relative error %.3e (tol %.1e rel per face) %s" % (
        label, worst, rtol, ("[" + source + "]") if source else ""))
    assert np.all(err <= rtol * scale), "%s: per-face relative error %g exceeds %g" % (label, worst, rtol)


def exactly(label, got, expected, source=""):
    """Bitwise equality (NaN-free arrays)."""
    got = np.asarray(got, float)
    expected = np.asarray(expected, float)
    err = np.max(np.abs(got - expected)) if got.size else 0.0
    print("%-55s max |difference| %.3e (tol 0, exact) %s" % (label, err, ("[" + source + "]") if source else ""))
    assert np.array_equal(got, expected), "%s: not exactly equal (max diff %g)" % (label, err)


def rotation(seed):
    q, r = np.linalg.qr(np.random.default_rng(seed).normal(size=(3, 3)))
    q = q @ np.diag(np.sign(np.diag(r)))
    if np.linalg.det(q) < 0:
        q[:, 0] = -q[:, 0]
    return q


# Shared meshes ------------------------------------------------------------
SPH_C = np.array([0.2, -0.1, 0.3])
SPH_P, SPH_F, SPH_ROWS = S.uv_sphere(0.8, 10, 16, center=SPH_C)
NF = len(SPH_F)


# ---------------------------------------------------------------------------
# 1. Per-unit-density pressure
# ---------------------------------------------------------------------------

def check_per_unit_density():
    print("\n== per-unit-density pressure ==")
    pk = RNG.normal(0.0, 40.0, NF)             # m^2/s^2
    rho0 = 1.225
    common = dict(Orientation=INTO_FLUID)
    # constant Density
    pd = S.polydata(SPH_P, SPH_F, cell_arrays={"pk": pk, "ps": rho0 * pk})
    a, ta, _ = run(pd, Pressure=["CELLS", "pk"], PressureKind="Per unit density", Density=rho0, **common)
    b, tb, _ = run(pd, Pressure=["CELLS", "ps"], PressureKind="Static", Density=rho0, **common)
    compare_faces("p/rho * Density vs static", a, b, VEC_ARRAYS + SCALAR_ARRAYS, 1e-14,
                  "definition: p = rho (p/rho)")
    compare_totals("p/rho * Density vs static", ta, tb, TOTAL_NAMES, 1e-14)

    # reference pressure is subtracted after the density product
    pref = 17.5
    a, ta, _ = run(pd, Pressure=["CELLS", "pk"], PressureKind="Per unit density", Density=rho0,
                   ReferencePressure=pref, **common)
    pd2 = S.polydata(SPH_P, SPH_F, cell_arrays={"pg": rho0 * pk - pref})
    b, tb, _ = run(pd2, Pressure=["CELLS", "pg"], **common)
    compare_faces("rho p_k - p_ref vs static gauge", a, b, ["Pressure Traction", "Pressure Force"], 1e-14,
                  "XML: p_ref subtracted after the density product")

    # variable density from a DensityArray (Density must then be ignored)
    rho = 1.0 + 0.3 * RNG.random(NF)
    pd = S.polydata(SPH_P, SPH_F, cell_arrays={"pk": pk, "rho": rho, "ps": rho * pk})
    a, ta, _ = run(pd, Pressure=["CELLS", "pk"], PressureKind="Per unit density",
                   DensityArray=["CELLS", "rho"], Density=123.0, **common)
    b, tb, _ = run(pd, Pressure=["CELLS", "ps"], PressureKind="Static", **common)
    compare_faces("p/rho * DensityArray vs static rho_i p_i", a, b, VEC_ARRAYS + SCALAR_ARRAYS, 1e-14,
                  "definition: p_i = rho_i (p/rho)_i")
    compare_totals("p/rho * DensityArray vs static rho_i p_i", ta, tb, TOTAL_NAMES, 1e-14)


# ---------------------------------------------------------------------------
# 2. Reference pressure: closed vs open surfaces
# ---------------------------------------------------------------------------

def check_reference_pressure():
    print("\n== reference pressure ==")
    # Why it cancels: the Newell area vector of a face is (1/2) sum_i x_i x x_{i+1}
    # over its edges; on a closed polyhedron every edge is traversed once in
    # each direction by its two faces, so the area vectors sum to zero exactly
    # (discrete form of  closed-integral n dA = 0, Gauss' divergence theorem;
    # Tampieri, "Newell's method...", Graphics Gems III, 1992).  With planar
    # faces also sum_f c_f x A_f n_f = closed-integral x x n dA = 0, so the moment
    # of a uniform pressure vanishes too.
    pref = 1.0e5
    Q = rotation(7)
    closed = {
        "uv_sphere": S.uv_sphere(0.8, 10, 16, center=SPH_C)[:2],
        "rotated box": S.box((1.0, 2.0, 3.0), center=(1.0, 2.0, 3.0), rotation=Q),
    }
    for name, (P, F) in closed.items():
        p = RNG.normal(0.0, 50.0, len(F))
        pd = S.polydata(P, F, cell_arrays={"p": p})
        li = dict(MomentCentre=[0.4, -0.3, 0.2])
        a, ta, wa = run(pd, li, Pressure=["CELLS", "p"], Orientation=INTO_FLUID)
        b, tb, _ = run(pd, li, Pressure=["CELLS", "p"], Orientation=INTO_FLUID, ReferencePressure=pref)
        area = float(wa["Wetted Area"])
        L = np.max(np.linalg.norm(S.face_centroids(P, F) - li["MomentCentre"], axis=1))
        src = "closed polyhedron: sum of Newell area vectors = 0"
        close("%s: F(p_ref) - F(0)" % name, tb["Force"] - ta["Force"], np.zeros(3),
              atol=1e-15 * pref * area, source=src)
        close("%s: M(p_ref) - M(0)" % name, tb["Moment"] - ta["Moment"], np.zeros(3),
              atol=1e-15 * pref * area * L, source="closed polyhedron, planar faces")
        # p_ref alone on a closed body: no force at all
        pd0 = S.polydata(P, F, cell_arrays={"p": np.zeros(len(F))})
        c, tc, _ = run(pd0, li, Pressure=["CELLS", "p"], Orientation=INTO_FLUID, ReferencePressure=pref)
        close("%s: force of p_ref alone" % name, tc["Force"], np.zeros(3),
              atol=1e-15 * pref * area, source=src)
        # but the per-face traction does see p_ref: +p_ref n on every face
        close("%s: per-face traction change" % name, b["Pressure Traction"] - a["Pressure Traction"],
              pref * a["Wall Normal"], rtol=1e-14, atol=0.0, source="t = -(p - p_ref) n")

    # Open hemisphere (northern half, stored into the wall, default orientation)
    R, npol, naz = 0.7, 12, 16
    P, F, rows = S.uv_sphere(R, npol, naz, ordering="into_wall")
    F = [f for f, r in zip(F, rows) if r < npol // 2]
    p = RNG.normal(0.0, 50.0, len(F))
    pd = S.polydata(P, F, cell_arrays={"p": p})
    r0 = np.array([0.1, 0.2, -0.3])
    li = dict(MomentCentre=list(r0))
    a, ta, _ = run(pd, li, Pressure=["CELLS", "p"])
    b, tb, _ = run(pd, li, Pressure=["CELLS", "p"], ReferencePressure=pref)
    nst, Ast = S.newell_normals(P, F)
    stored = (nst * Ast[:, None]).sum(axis=0)          # sum of stored area vectors
    # The area vectors of an open polyhedral surface sum to the area vector of
    # its boundary loop: here the regular naz-gon of the equator, of area
    # (naz/2) R^2 sin(2 pi/naz) -> pi R^2 (the exact hemisphere's projected disc).
    rim = 0.5 * naz * R**2 * np.sin(2 * np.pi / naz)
    close("hemisphere: sum of stored area vectors", stored, [0.0, 0.0, -rim], rtol=1e-12,
          source="Stokes: sum of area vectors = rim polygon area vector")
    print("    (rim polygon area %.12f vs pi R^2 = %.12f for the exact hemisphere)" % (rim, np.pi * R**2))
    close("hemisphere: F(p_ref) - F(0)", tb["Force"] - ta["Force"], -pref * stored, rtol=1e-12,
          source="t = -(p - p_ref) n: dF = -p_ref * sum(stored area vectors)")
    C = S.face_centroids(P, F)
    dM = np.cross(C - r0, -pref * nst * Ast[:, None]).sum(axis=0)
    close("hemisphere: M(p_ref) - M(0)", tb["Moment"] - ta["Moment"], dM, rtol=1e-12,
          source="sum (c - r0) x dF_f")


# ---------------------------------------------------------------------------
# 3. Orientation
# ---------------------------------------------------------------------------

def check_orientation():
    print("\n== orientation ==")
    p = RNG.normal(0.0, 30.0, NF)
    G = RNG.normal(0.0, 20.0, (NF, 9))
    arrays = {"p": p, "G": G}
    pd = S.polydata(SPH_P, SPH_F, cell_arrays=arrays)
    base = dict(Pressure=["CELLS", "p"], ShearSource="Velocity gradient", VelocityGradient=["CELLS", "G"],
                Viscosity=0.01, ReferenceSpeed=10.0, LoadDirection=[0.3, -1.0, 0.5])
    for include in (0, 1):
        a, ta, _ = run(pd, Orientation=INTO_FLUID, IncludeNormalViscousStress=include, **base)
        b, tb, _ = run(pd, Orientation=INTO_WALL, IncludeNormalViscousStress=include, **base)
        tag = "flip (IncludeNormalViscousStress=%d)" % include
        for name in SIGNED_ARRAYS:
            exactly("%s: %s negated" % (tag, name), b[name], -a[name], "n -> -n: t(-n) = -t(n)")
        for name in ["Face Area", "Normal Viscous Stress"] + COEFF_ARRAYS:
            exactly("%s: %s unchanged" % (tag, name), b[name], a[name], "even in n")
        for name in ["Pressure Force", "Viscous Force", "Force", "Moment"]:
            close("%s: total %s negated" % (tag, name), tb[name], -ta[name], rtol=1e-14)

    # A mesh stored into the wall with the default orientation is the same as
    # the mesh stored into the fluid with "into the fluid".
    Pw, Fw, _ = S.uv_sphere(0.8, 10, 16, center=SPH_C, ordering="into_wall")
    pdw = S.polydata(Pw, Fw, cell_arrays=arrays)
    a, ta, _ = run(pd, Orientation=INTO_FLUID, **base)
    b, tb, _ = run(pdw, **base)                  # default orientation
    compare_faces("into_wall+default vs into_fluid+into fluid", b, a,
                  VEC_ARRAYS + SCALAR_ARRAYS + COEFF_ARRAYS, 1e-13,
                  "same geometry, reversed vertex order")
    compare_totals("into_wall+default vs into_fluid+into fluid", tb, ta, TOTAL_NAMES, 1e-13)


# ---------------------------------------------------------------------------
# 4. Viscosity
# ---------------------------------------------------------------------------

def check_viscosity():
    print("\n== viscosity ==")
    G = RNG.normal(0.0, 20.0, (NF, 9))
    nu = 1.5e-5 * (1.0 + RNG.random(NF))
    nut = 4.0e-4 * RNG.random(NF)
    rho = 1.0 + 0.3 * RNG.random(NF)
    pd = S.polydata(SPH_P, SPH_F, cell_arrays={
        "G": G, "nu": nu, "eddy_viscosity": nut, "rho": rho, "mu": rho * nu, "eddy_dynamic_viscosity": rho * nut,
        "uniform_eddy_dynamic_viscosity": np.full(NF, 2.5e-4), "mu_const": np.full(NF, 1.8e-5)})
    base = dict(Orientation=INTO_FLUID, ShearSource="Velocity gradient", VelocityGradient=["CELLS", "G"])
    visc = ["Viscous Traction", "Viscous Force", "Normal Viscous Stress"]

    # kinematic times Density = dynamic
    a, ta, _ = run(pd, ViscosityKind="Kinematic", Viscosity=1.5e-5, Density=1.2, **base)
    b, tb, _ = run(pd, ViscosityKind="Dynamic", Viscosity=1.2 * 1.5e-5, Density=1.2, **base)
    compare_faces("nu * Density vs mu", a, b, visc, 1e-14, "mu = rho nu")
    compare_totals("nu * Density vs mu", ta, tb, ["Viscous Force", "Viscous Moment"], 1e-14)
    # kinematic arrays times a DensityArray = dynamic arrays rho_i nu_i, rho_i nu_t,i
    a, ta, _ = run(pd, ViscosityKind="Kinematic", ViscosityArray=["CELLS", "nu"],
                   TurbulentViscosityArray=["CELLS", "eddy_viscosity"], DensityArray=["CELLS", "rho"], **base)
    b, tb, _ = run(pd, ViscosityKind="Dynamic", ViscosityArray=["CELLS", "mu"],
                   TurbulentViscosityArray=["CELLS", "eddy_dynamic_viscosity"], **base)
    compare_faces("rho_i (nu_i + nu_t,i) vs mu_i + mu_t,i", a, b, visc, 1e-14, "mu = rho nu")

    # a ViscosityArray replaces the constant
    a, _, _ = run(pd, Viscosity=99.0, ViscosityArray=["CELLS", "mu_const"], **base)
    b, _, _ = run(pd, Viscosity=1.8e-5, **base)
    compare_faces("uniform ViscosityArray vs constant", a, b, visc, 1e-15)

    # turbulent viscosity adds: mu_eff = mu + mu_t
    a, _, _ = run(pd, Viscosity=1.8e-5, TurbulentViscosityArray=["CELLS", "uniform_eddy_dynamic_viscosity"], **base)
    b, _, _ = run(pd, Viscosity=1.8e-5 + 2.5e-4, **base)
    compare_faces("uniform mu_t array vs constant mu + mu_t", a, b, visc, 1e-15, "mu_eff = mu + mu_t")
    lam, tlam, _ = run(pd, Viscosity=1.8e-5, **base)
    tur, ttur, _ = run(pd, Viscosity=1.8e-5, TurbulentViscosityArray=["CELLS", "eddy_dynamic_viscosity"], **base)
    scale = (1.8e-5 + rho * nut) / 1.8e-5
    rowwise_close("viscous force scales by (mu + mu_t)/mu", tur["Viscous Force"],
                  scale[:, None] * lam["Viscous Force"], 1e-13, "tau linear in mu_eff")
    rowwise_close("normal viscous stress scales by (mu + mu_t)/mu", tur["Normal Viscous Stress"],
                  scale * lam["Normal Viscous Stress"], 1e-13, "tau linear in mu_eff")
    exactly("pressure force unaffected by mu_t", tur["Pressure Force"], lam["Pressure Force"])

    # Newton's law of viscosity on an axis-aligned box: G = gamma e_x e_z^T
    # (u = gamma z e_x) gives tau_xz = mu gamma (White, Fluid Mechanics, §1.7):
    # traction +-mu gamma e_x on the faces z = +-c/2, +-mu gamma e_z on x = +-a/2,
    # zero on y = +-b/2, all tangential.
    P, F = S.box((1.0, 2.0, 3.0), center=(0.5, 0.0, -1.0))
    gamma, mu = 3.0, 0.02
    Gs = np.zeros((len(F), 9))
    Gs[:, 2] = gamma
    nb, Ab = S.newell_normals(P, F)
    expected = mu * gamma * (np.outer(nb[:, 2], [1, 0, 0]) + np.outer(nb[:, 0], [0, 0, 1]))
    a, _, _ = run(S.polydata(P, F, cell_arrays={"G": Gs}), Orientation=INTO_FLUID,
                  ShearSource="Velocity gradient", VelocityGradient=["CELLS", "G"], Viscosity=mu)
    close("simple shear: viscous traction per face", a["Viscous Traction"], expected,
          rtol=1e-14, atol=0.0, source="White §1.7, tau = mu du/dy")
    close("simple shear: normal viscous stress", a["Normal Viscous Stress"], np.zeros(len(F)),
          atol=1e-15 * mu * gamma)

    # The bulk term: a pure dilatation G = c I (plus a rigid rotation W,
    # antisymmetric) has tau = 2 mu c I - (2/3) mu (3c) I = 0 (Stokes'
    # hypothesis; Batchelor §3.3): no viscous traction at all, even the normal
    # part.  Without the bulk term it would be 2 mu c n.
    c = 3.7
    W = RNG.normal(0.0, 5.0, (NF, 3))
    Gd = np.zeros((NF, 3, 3))
    Gd[:, 0, 0] = Gd[:, 1, 1] = Gd[:, 2, 2] = c
    Gd[:, 0, 1], Gd[:, 1, 0] = -W[:, 2], W[:, 2]
    Gd[:, 0, 2], Gd[:, 2, 0] = W[:, 1], -W[:, 1]
    Gd[:, 1, 2], Gd[:, 2, 1] = -W[:, 0], W[:, 0]
    mu = 0.02
    pdd = S.polydata(SPH_P, SPH_F, cell_arrays={"Gi": np.tile(c * np.eye(3).ravel(), (NF, 1)),
                                                "Gw": Gd.reshape(NF, 9)})
    for arr in ("Gi", "Gw"):
        for include in (0, 1):
            a, ta, _ = run(pdd, Orientation=INTO_FLUID, ShearSource="Velocity gradient",
                           VelocityGradient=["CELLS", arr], Viscosity=mu,
                           IncludeNormalViscousStress=include)
            tag = "G = cI%s (include=%d)" % (" + W" if arr == "Gw" else "", include)
            close(tag + ": viscous traction", a["Viscous Traction"], np.zeros((NF, 3)),
                  atol=1e-14 * mu * c, source="Stokes hypothesis, bulk term -(2/3) mu tr(G) I")
            close(tag + ": normal viscous stress", a["Normal Viscous Stress"], np.zeros(NF),
                  atol=1e-14 * mu * c, source="(would be 2 mu c = %.3f without the bulk term)" % (2 * mu * c))

    # IncludeNormalViscousStress moves (tau n).n n into the viscous traction
    off, toff, _ = run(pd, Viscosity=0.02, IncludeNormalViscousStress=0, **base)
    on, ton, _ = run(pd, Viscosity=0.02, IncludeNormalViscousStress=1, **base)
    n = off["Wall Normal"]
    vscale = np.max(np.abs(off["Viscous Traction"]))
    close("include off: viscous traction . n", np.einsum("ij,ij->i", off["Viscous Traction"], n),
          np.zeros(NF), atol=1e-14 * vscale, source="off: tangential part only")
    exactly("include on/off: same Normal Viscous Stress", on["Normal Viscous Stress"], off["Normal Viscous Stress"])
    nvs = off["Normal Viscous Stress"]
    close("include on: viscous traction = off + nvs n", on["Viscous Traction"],
          off["Viscous Traction"] + nvs[:, None] * n, rtol=1e-14, atol=1e-15 * vscale)
    close("include on: viscous force = off + nvs n A", on["Viscous Force"],
          off["Viscous Force"] + (nvs * off["Face Area"])[:, None] * n, rtol=1e-13)
    close("include on: total viscous force difference", ton["Viscous Force"] - toff["Viscous Force"],
          ((nvs * off["Face Area"])[:, None] * n).sum(axis=0), rtol=1e-12)
    close("include on: traction = pressure + viscous", on["Traction"],
          on["Pressure Traction"] + on["Viscous Traction"], rtol=1e-15)


# ---------------------------------------------------------------------------
# 5. Archimedes
# ---------------------------------------------------------------------------

def check_archimedes():
    # Hydrostatic p = p0 - rho g z.  For a closed body, F = -closed-int p n dA
    # = -int grad p dV = rho g V e_z (Archimedes via the divergence theorem;
    # White, Fluid Mechanics, §2.8).  The filter uses one value of p per face;
    # for linear p on a planar face, int_f p dA = p(c_f) A_f exactly, so the
    # discrete force is exact when the face value is p at the area centroid:
    # point data averaged over the corners gives that for triangles and
    # parallelograms (vertex average = centroid); for the trapezoids of a
    # uv_sphere we give p(c_f) as cell data.  V is the polyhedron's own volume.
    print("\n== Archimedes ==")
    rho, g, p0 = 998.2, 9.80665, 101325.0
    Q = rotation(11)
    ez = np.array([0.0, 0.0, 1.0])

    cases = []
    P, F = S.box((0.6, 1.1, 0.9), center=(0.4, -0.8, -2.0), rotation=Q, ordering="into_wall")
    cases.append(("rotated box (point p)", P, F, "point", True))
    P, F, _ = S.uv_sphere(0.5, 12, 16, center=(0.3, -0.2, -1.1), ordering="into_wall")  # n_azimuth even
    cases.append(("uv_sphere (cell p at centroids)", P, F, "cell", True))
    P, F = S.tetrahedron([[0.1, 0.0, -1.0], [1.3, 0.2, -0.9], [0.4, 1.1, -1.2], [0.5, 0.3, 0.2]],
                         ordering="into_wall")
    cases.append(("tetrahedron (point p)", P, F, "point", False))

    for name, P, F, assoc, symmetric in cases:
        V = -S.enclosed_volume(P, F)       # stored into the wall: negative volume
        xc = S.volume_centroid(P, F)
        if assoc == "point":
            pd = S.polydata(P, F, point_arrays={"p": p0 - rho * g * P[:, 2]})
            sel = ["POINTS", "p"]
        else:
            C = S.face_centroids(P, F)
            pd = S.polydata(P, F, cell_arrays={"p": p0 - rho * g * C[:, 2]})
            sel = ["CELLS", "p"]
        faces, tot, wfd = run(pd, dict(MomentCentre=list(xc)), Pressure=sel)   # default orientation
        Fb = rho * g * V * ez
        close("%s: buoyancy force" % name, tot["Force"], Fb, rtol=1e-12,
              source="Archimedes, White §2.8; V = %.12f" % V)
        L = np.max(np.linalg.norm(P - xc, axis=1))
        area = float(wfd["Wetted Area"])
        # round-off of the moment scales with the absolute pressure level
        # (a few ulps of p0 A L; the gauge part alone is far smaller)
        atol = 1e-15 * (p0 + rho * g * L) * area * L
        if symmetric:
            # Exact moment about the centre of buoyancy is zero
            # (M = -int (x - x_c) x grad p dV = rho g (int (x - x_c) dV) x e_z = 0).
            # The face-centroid rule drops, per face, (J_f grad p) x n_f with
            # J_f the face's second moment of area about its centroid; a
            # centrally symmetric body pairs every face with an opposite face
            # of equal J and opposite n, so those terms cancel and the
            # discrete moment is zero to round-off.
            close("%s: moment about volume centroid" % name, tot["Moment"], np.zeros(3),
                  atol=atol, source="centrally symmetric: zero to round-off")
        else:
            # A tetrahedron is not centrally symmetric: the discrete moment is
            # nonzero (it is a quadrature residue, O(rho g A h^2) per face, small
            # only relative to rho g A L^2 as faces are refined), and it is
            # exactly the dropped second-moment terms, sum_f (J_f grad p) x n_f
            # (grad p = -rho g e_z).  J_f from the edge-midpoint rule, which is
            # exact for quadratics on a triangle (any finite element text, e.g.
            # Zienkiewicz & Taylor, The Finite Element Method, Vol. 1,
            # numerical integration on triangles).
            nrm, A = S.newell_normals(P, F)
            nrm = -nrm                                   # into the fluid
            Cf = S.face_centroids(P, F)
            gradp = -rho * g * ez
            pred = np.zeros(3)
            for k, f in enumerate(F):
                v = P[list(f)]
                mids = 0.5 * (v + np.roll(v, -1, axis=0)) - Cf[k]
                J = A[k] / 3.0 * mids.T @ mids
                pred += np.cross(J @ gradp, nrm[k])
            Mmag = np.linalg.norm(tot["Moment"])
            print("    tetrahedron moment about the volume centroid |M| = %.6e N m, |F| L = %.6e N m, "
                  "rho g A L^2 = %.6e N m" % (Mmag, np.linalg.norm(Fb) * L, rho * g * area * L**2))
            assert Mmag > 1e-6 * np.linalg.norm(Fb) * L, "expected a nonzero moment"
            assert Mmag < rho * g * area * L**2, "moment larger than any quadrature residue"
            close("%s: moment = dropped face second moments" % name, tot["Moment"], pred,
                  rtol=1e-12, atol=atol,
                  source="sum_f (J_f grad p) x n_f; nonzero")


check_per_unit_density()
check_reference_pressure()
check_orientation()
check_viscosity()
check_archimedes()
T.done(__file__)
