"""Wall Traction and Load Integration against an independent numpy
re-implementation, on a randomly perturbed (non-planar quads) uv sphere
with random fields.

Reference formulas (all from the filter documentation, implemented here
from scratch with numpy and math.fsum):

* Newell area vector a = 1/2 sum_i x_i x x_{i+1} (Sutherland, Sproull &
  Schumacker 1974; Tampieri, Graphics Gems III, 1992); area |a|, normal
  a/|a|, negated for faces stored into the wall.  For a warped face the area
  centroid is that of the fan from the first vertex, each fan triangle
  weighted by its area vector projected on the unit Newell normal.
* Newtonian stress with Stokes' hypothesis (Batchelor, An Introduction to
  Fluid Dynamics, 1967, §3.3):
  tau = mu_eff (G + G^T) - (2/3) mu_eff tr(G) I, mu_eff = mu + mu_t,
  t = -(p - p_ref) n + tau n; the tangential part of tau n is the wall
  shear stress, its normal part (tau n).n is kept only on request.
* C_p = (p - p_ref)/q, C_f = |tau_w|/q, q = 1/2 rho U^2.
* Totals F = sum f, M = sum (c - r0) x f; load axes by Gram-Schmidt;
  central axis of the force system: the point r0 + F x M/|F|^2 and the
  couple (F.M)/|F| along F (the reduction of a force system to a wrench,
  e.g. Goldstein, Classical Mechanics, or any statics text).

Agreement: 1e-12 relative (with an absolute floor of 1e-13 of the vector a
component was projected from, for components that may nearly cancel).
"""
import math

import numpy as np

import wl_testing as T
import scenes as S
from wallloads import batch

simple = T.load_plugin()

RNG = np.random.default_rng(987654321)
RTOL = 1e-12


def close(label, got, expected, rtol=RTOL, atol=0.0, source=""):
    T.close_arrays(label, got, expected, rtol=rtol, atol=atol, source=source)


# ---------------------------------------------------------------------------
# the mesh: uv sphere, stored into the wall, every point jittered radially
# ---------------------------------------------------------------------------
R, CENTRE = 1.3, np.array([0.4, -0.3, 0.8])
P0, FACES, _ = S.uv_sphere(R, 14, 20, center=CENTRE, ordering="into_wall")
P = CENTRE + (P0 - CENTRE) * (1.0 + 0.08 * (RNG.random(len(P0)) - 0.5))[:, None]
NF, NP = len(FACES), len(P)


def geometry(points, faces, stored_into_wall=True):
    """Independent Newell normals (into the fluid), areas and fan centroids."""
    n = np.zeros((len(faces), 3))
    A = np.zeros(len(faces))
    C = np.zeros((len(faces), 3))
    for k, f in enumerate(faces):
        v = points[list(f)]
        # Newell's sum is translation invariant; relative to the first vertex
        # it keeps its digits for small faces far from the origin
        d = v - v[0]
        a = 0.5 * np.cross(d, np.roll(d, -1, axis=0)).sum(axis=0)
        A[k] = np.linalg.norm(a)
        nhat = a / A[k]
        w, cw = 0.0, np.zeros(3)
        for j in range(1, len(f) - 1):
            wt = np.dot(np.cross(v[j] - v[0], v[j + 1] - v[0]), nhat)
            w += wt
            cw += wt * (v[0] + v[j] + v[j + 1]) / 3.0
        C[k] = cw / w
        n[k] = -nhat if stored_into_wall else nhat
    return n, A, C


N_REF, A_REF, C_REF = geometry(P, FACES)
warp = max(abs(np.dot(np.cross(P[f[1]] - P[f[0]], P[f[2]] - P[f[0]]), P[f[3]] - P[f[0]]))
           for f in FACES if len(f) == 4)
print("perturbed sphere: %d faces, %d points, largest quad warp (triple product) %.3e m^3" % (NF, NP, warp))
assert warp > 1e-4, "the jitter should make the quads non-planar"


def reference_faces(p_gauge, G, mu_eff, include_normal, load_dir, q, shear_vector=None):
    """Every per-face array, by the formulas of the module docstring."""
    n, A = N_REF, A_REF
    tp = -p_gauge[:, None] * n
    if shear_vector is None:
        Gm = G.reshape(-1, 3, 3)
        tr = np.trace(Gm, axis1=1, axis2=2)
        tau = mu_eff[:, None, None] * (Gm + np.transpose(Gm, (0, 2, 1))
                                       - (2.0 / 3.0) * tr[:, None, None] * np.eye(3))
        v = np.einsum("kij,kj->ki", tau, n)
    else:
        v = shear_vector
    nvs = np.einsum("ki,ki->k", v, n)
    shear = v - nvs[:, None] * n
    tv = shear + (nvs[:, None] * n if include_normal else 0.0)
    t = tp + tv
    e = np.asarray(load_dir, float) / np.linalg.norm(load_dir)
    out = {
        "Wall Normal": n, "Face Area": A,
        "Pressure Traction": tp, "Viscous Traction": tv, "Traction": t,
        "Pressure Force": tp * A[:, None], "Viscous Force": tv * A[:, None], "Force": t * A[:, None],
        "Normal Viscous Stress": nvs, "Directional Traction": t @ e,
    }
    if q > 0:
        out["Pressure Coefficient"] = p_gauge / q
        out["Skin Friction Coefficient"] = np.linalg.norm(shear, axis=1) / q
    return out


def fsum3(x):
    return np.array([math.fsum(x[:, i]) for i in range(x.shape[1])])


def reference_totals(faces, r0, drag, lift, ref):
    fp, fv, A = faces["Pressure Force"], faces["Viscous Force"], faces["Face Area"]
    arm = C_REF - np.asarray(r0, float)
    out = {"Faces": float(NF), "Skipped Faces": 0.0, "Area": math.fsum(A),
           "Pressure Force": fsum3(fp), "Viscous Force": fsum3(fv),
           "Pressure Moment": fsum3(np.cross(arm, fp)), "Viscous Moment": fsum3(np.cross(arm, fv))}
    out["Force"] = out["Pressure Force"] + out["Viscous Force"]
    out["Moment"] = out["Pressure Moment"] + out["Viscous Moment"]
    eD = np.asarray(drag, float) / np.linalg.norm(drag)
    l = np.asarray(lift, float) - np.dot(lift, eD) * eD
    eL = l / np.linalg.norm(l)
    eS = np.cross(eL, eD)
    F, M = out["Force"], out["Moment"]
    out.update({"Drag": F @ eD, "Side Force": F @ eS, "Lift": F @ eL,
                "Rolling Moment": M @ eD, "Pitching Moment": M @ eS, "Yawing Moment": M @ eL})
    qA = 0.5 * ref["ReferenceDensity"] * ref["ReferenceSpeed"] ** 2 * ref["ReferenceArea"]
    out.update({"Drag Coefficient": out["Drag"] / qA, "Side Force Coefficient": out["Side Force"] / qA,
                "Lift Coefficient": out["Lift"] / qA,
                "Rolling Moment Coefficient": out["Rolling Moment"] / (qA * ref["ReferenceSpan"]),
                "Pitching Moment Coefficient": out["Pitching Moment"] / (qA * ref["ReferenceLength"]),
                "Yawing Moment Coefficient": out["Yawing Moment"] / (qA * ref["ReferenceSpan"])})
    out["Line Of Action Point"] = np.asarray(r0, float) + np.cross(F, M) / np.dot(F, F)
    out["Residual Couple"] = np.dot(F, M) / np.linalg.norm(F)
    axes = {"Drag Direction": eD, "Side Direction": eS, "Lift Direction": eL}
    return out, axes


def floor_of(name, ref, li):
    """Absolute floor for quantities that are projections of a vector (they
    may nearly cancel): 1e-13 of that vector's length, in the same units."""
    F, M = np.linalg.norm(ref["Force"]), np.linalg.norm(ref["Moment"])
    qA = 0.5 * li["ReferenceDensity"] * li["ReferenceSpeed"] ** 2 * li["ReferenceArea"]
    if name in ("Drag", "Side Force", "Lift"):
        return 1e-13 * F
    if name in ("Rolling Moment", "Pitching Moment", "Yawing Moment", "Residual Couple"):
        return 1e-13 * M
    if name in ("Drag Coefficient", "Side Force Coefficient", "Lift Coefficient"):
        return 1e-13 * F / qA
    if name.endswith("Moment Coefficient"):
        return 1e-13 * M / (qA * min(li["ReferenceLength"], li["ReferenceSpan"]))
    return 0.0


def run_case(label, point_arrays, cell_arrays, wt_props, li_props, expected_faces):
    pd = S.polydata(P, FACES, cell_arrays=cell_arrays, point_arrays=point_arrays)
    src = T.producer(pd)
    wt = simple.WallTraction(Input=src)
    for k, v in wt_props.items():
        setattr(wt, k, v)
    li = simple.LoadIntegration(Input=wt)
    for k, v in li_props.items():
        setattr(li, k, v)
    tot = T.output_of(li, 0)
    rows = T.table_rows(T.output_of(li, 1))
    out = T.output_of(wt, 0)
    print("\n== %s ==" % label)
    for name, exp in expected_faces.items():
        close("%s: %s" % (label, name), T.cell_array(out, name), exp, source="numpy reference")
    names = [out.GetCellData().GetArrayName(i) for i in range(out.GetCellData().GetNumberOfArrays())]
    made = set(names) - set(cell_arrays)
    assert made == set(expected_faces), "unexpected per-face arrays: %s" % sorted(made ^ set(expected_faces))
    close("%s: Wetted Area" % label, T.field(out, "Wetted Area"), math.fsum(A_REF))

    ref, axes = reference_totals(expected_faces, li_props["MomentCentre"], li_props["DragDirection"],
                                 li_props["LiftDirection"], li_props)
    for name, exp in ref.items():
        atol = floor_of(name, ref, li_props)
        close("%s: field %s" % (label, name), T.field(tot, name), exp, atol=atol)
        for region in ("Surface", "Total"):
            close("%s: table[%s] %s" % (label, region, name), rows[region][name], exp, atol=atol)
    for name, exp in axes.items():
        close("%s: field %s" % (label, name), T.field(tot, name), exp, atol=1e-15)
    close("%s: field Moment Centre" % label, T.field(tot, "Moment Centre"), li_props["MomentCentre"])
    # property of the central axis: about the line-of-action point the
    # moment is parallel to F
    F, M = T.field(tot, "Force"), T.field(tot, "Moment")
    r = T.field(tot, "Line Of Action Point") - np.asarray(li_props["MomentCentre"])
    M_axis = M - np.cross(r, F)
    close("%s: M(line of action) x F" % label, np.cross(M_axis, F) / np.dot(F, F), np.zeros(3),
          atol=1e-13 * np.linalg.norm(M) / np.linalg.norm(F), source="central axis: M parallel to F")
    for p in (li, wt, src):
        simple.Delete(p)
    return ref


LI = dict(MomentCentre=[0.25, -1.1, 0.6], DragDirection=[2.0, 0.5, 0.3], LiftDirection=[0.4, 0.2, 1.0],
          ReferenceDensity=1.3, ReferenceSpeed=12.0, ReferenceArea=0.7, ReferenceLength=0.4, ReferenceSpan=2.5)
assert abs(np.dot(LI["DragDirection"], LI["LiftDirection"])) > 0.5, "lift input must not be orthogonal"

# --- case A: static pressure, dynamic viscosity arrays -------------------
G = RNG.normal(0.0, 30.0, (NF, 9))
p = RNG.normal(200.0, 80.0, NF)
mu = 1.8e-5 * (1.0 + RNG.random(NF))
mut = 1.0e-3 * RNG.random(NF)
pref, rho0, U = 150.0, 1.18, 25.0
ld = [0.3, -1.2, 0.7]
exp_a = reference_faces(p - pref, G, mu + mut, False, ld, 0.5 * rho0 * U**2)
ref_a = run_case(
    "A: static p, gradient, mu + mu_t arrays",
    None, {"p": p, "G": G, "mu": mu, "eddy_dynamic_viscosity": mut},
    dict(Pressure=["CELLS", "p"], ReferencePressure=pref, Density=rho0,
         ShearSource="Velocity gradient", VelocityGradient=["CELLS", "G"], ViscosityKind="Dynamic",
         ViscosityArray=["CELLS", "mu"], TurbulentViscosityArray=["CELLS", "eddy_dynamic_viscosity"],
         LoadDirection=ld, ReferenceSpeed=U),
    LI, exp_a)

# --- case B: per-unit-density pressure with a density array, kinematic ----
pk = RNG.normal(50.0, 30.0, NF)
rho = 1.1 + 0.2 * RNG.random(NF)
nu = 1.5e-5 * (1.0 + RNG.random(NF))
nut = 8.0e-4 * RNG.random(NF)
pref, rho0, U = 20.0, 1.25, 30.0
ld = [-0.5, 0.25, 2.0]
exp_b = reference_faces(rho * pk - pref, G, rho * (nu + nut), True, ld, 0.5 * rho0 * U**2)
run_case(
    "B: p/rho x density array, kinematic arrays, include normal",
    None, {"pk": pk, "G": G, "rho": rho, "nu": nu, "eddy_viscosity": nut},
    dict(Pressure=["CELLS", "pk"], PressureKind="Per unit density", DensityArray=["CELLS", "rho"],
         ReferencePressure=pref, Density=rho0,
         ShearSource="Velocity gradient", VelocityGradient=["CELLS", "G"], ViscosityKind="Kinematic",
         ViscosityArray=["CELLS", "nu"], TurbulentViscosityArray=["CELLS", "eddy_viscosity"],
         IncludeNormalViscousStress=1, LoadDirection=ld, ReferenceSpeed=U),
    LI, exp_b)

# --- case C: point pressure (face value = corner average), shear-stress array
pp = RNG.normal(-40.0, 25.0, NP)
wss = RNG.normal(0.0, 0.3, (NF, 3))           # per unit density, with a normal part
rho0, U = 1.21, 18.0
ld = [0.0, 0.0, 1.0]
p_face = np.array([pp[list(f)].mean() for f in FACES])
exp_c = reference_faces(p_face, None, None, False, ld, 0.5 * rho0 * U**2, shear_vector=rho0 * wss)
run_case(
    "C: point p, per-unit-density wall shear stress",
    {"pp": pp}, {"wss": wss},
    dict(Pressure=["POINTS", "pp"], Density=rho0, ShearSource="Wall shear stress array",
         ShearStressArray=["CELLS", "wss"], ShearStressKind="Per unit density",
         LoadDirection=ld, ReferenceSpeed=U),
    LI, exp_c)

# --- flow angles ------------------------------------------------------------
# batch.flow_axes(alpha, beta): e_D = cos b (cos a, 0, sin a) + sin b e_y (the
# stream turned by alpha from x toward z, then by beta toward +y) and
# e_L = (-sin a, 0, cos a), the lift axis at incidence (wind axes, e.g.
# Etkin, Dynamics of Atmospheric Flight, 1972).  Drag, side force and lift are
# the projections of F on e_D, e_L x e_D, e_L.
print("\n== flow angles ==")
pd = S.polydata(P, FACES, cell_arrays={"p": p, "G": G, "mu": mu, "eddy_dynamic_viscosity": mut})
src = T.producer(pd)
wt = simple.WallTraction(Input=src, Pressure=["CELLS", "p"], ReferencePressure=150.0,
                         ShearSource="Velocity gradient", VelocityGradient=["CELLS", "G"],
                         ViscosityArray=["CELLS", "mu"], TurbulentViscosityArray=["CELLS", "eddy_dynamic_viscosity"])
li = simple.LoadIntegration(Input=wt, MomentCentre=LI["MomentCentre"])
F = ref_a["Force"]
from wallloads.WallLoadsFilters import vtkLoadIntegration  # noqa: E402
for alpha, beta in [(0.0, 0.0), (4.0, 0.0), (-7.5, 3.0), (12.0, -5.0), (90.0, 0.0), (30.0, 60.0)]:
    drag, lift = batch.flow_axes(alpha, beta)
    a, b = math.radians(alpha), math.radians(beta)
    eD = math.cos(b) * np.array([math.cos(a), 0.0, math.sin(a)]) + math.sin(b) * np.array([0.0, 1.0, 0.0])
    eL = np.array([-math.sin(a), 0.0, math.cos(a)])
    close("flow_axes(%g, %g): drag direction" % (alpha, beta), drag, eD, atol=1e-15)
    close("flow_axes(%g, %g): lift direction" % (alpha, beta), lift, eL, atol=1e-15)
    # the C++ SetFlowAngles gives the same directions
    direct = vtkLoadIntegration()
    direct.SetFlowAngles(alpha, beta)
    close("SetFlowAngles(%g, %g) drag direction" % (alpha, beta), direct.GetDragDirection(), eD, atol=1e-15)
    close("SetFlowAngles(%g, %g) lift direction" % (alpha, beta), direct.GetLiftDirection(), eL, atol=1e-15)
    li.DragDirection = drag
    li.LiftDirection = lift
    tot = T.output_of(li, 0)
    eS = np.cross(eL, eD)
    floor = 1e-13 * np.linalg.norm(F)
    close("alpha %g beta %g: Drag" % (alpha, beta), T.field(tot, "Drag"), F @ eD, atol=floor)
    close("alpha %g beta %g: Side Force" % (alpha, beta), T.field(tot, "Side Force"), F @ eS, atol=floor)
    close("alpha %g beta %g: Lift" % (alpha, beta), T.field(tot, "Lift"), F @ eL, atol=floor)
    close("alpha %g beta %g: Drag^2+Side^2+Lift^2" % (alpha, beta),
          T.field(tot, "Drag") ** 2 + T.field(tot, "Side Force") ** 2 + T.field(tot, "Lift") ** 2,
          F @ F, source="orthonormal axes")
for prx in (li, wt, src):
    simple.Delete(prx)

T.done(__file__)
