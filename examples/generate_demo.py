"""Generate the WallLoads demo data set: a spinning glass bead settling in oil.

Scenario
--------
A glass bead of radius R = 1 mm settles slowly through a viscous oil while
spinning about the vertical axis.  In the bead's frame the oil streams past
at U = 2 mm/s along +z (the bead settles along -z), the bead spins at
Omega = 5 rad/s about +z and gravity acts along -z.  The Reynolds number
rho U 2R / mu is about 0.004, so the creeping-flow (Stokes) equations apply
and, being linear, the translation and rotation solutions superpose exactly
(Batchelor, An Introduction to Fluid Dynamics, 1967, §4.9; Landau & Lifshitz,
Fluid Mechanics, §20).  The hydrostatic part -rho g z is added to the
dynamic pressure (it is balanced by the body force and does not disturb the
velocity field).

Output (default folder examples/demo, or the first command-line argument)
-------------------------------------------------------------------------
* ``bead.vtm`` + ``bead/*.vtp`` (inline binary): the sphere surface, with
  faces ordered as a solver would export them (right-hand normal into the
  wall), split into three blocks by polar angle:
  "Upper Cap" (theta < 60 deg), "Equator Band" (60..120 deg) and
  "Lower Cap" (theta > 120 deg).  Arrays: point ``static_pressure`` (Pa),
  cell ``wall_shear`` (Pa, 3, the wall shear stress), cell
  ``velocity_gradient`` (1/s, 9, row-major du_i/dx_j), cell ``zone_id``
  (int32: 0, 1, 2).
* ``analytic.json``: scenario parameters and the exact loads on each
  spherical zone and on the whole bead.
* ``bead_volume.vtu`` (inline binary): the oil around the bead, a
  spherical shell R <= r <= 3R of hexahedra (wedges in the two polar rows)
  on the same 36 x 72 latitude/longitude lattice as the surface, 18 radial
  layers graded toward the bead (``scenes.spherical_shell``,
  stretch 2: first layer 0.037 R, last 0.24 R).  Its inner boundary is the
  bead surface face for face (same coordinates, same face order).  Cell
  arrays, evaluated at the cell centroids (vertex means): ``velocity``
  (m/s, 3), the velocity in the bead frame -- Stokes flow past the
  translating sphere plus the flow of the rotating sphere, so it equals
  Omega x x on the bead -- and ``static_pressure`` (Pa), p_inf + Stokes
  pressure - rho g z, equal to the surface ``static_pressure`` on the bead.
  It feeds Shear Projection (the volume path of bead_loads.py and
  tests/python/test_shear_demo_volume.py).

* ``series/bead_series.pvd`` + ``series/bead_series_*.vtp`` (inline
  binary): a short time series of our own for Load History, 40 uneven steps
  over 2 s on a coarser 12 x 24 bead (one block, the same arrays as the
  bead's but the velocity gradient): the oil stream starts up,
  U(t) = U (1 - 0.5 exp(-t / 0.15 s)), and the spin oscillates,
  Omega(t) = Omega (1 + 0.3 sin(2 pi 2 Hz t)). Each step is the exact Stokes
  field of that instant (quasi-steady: the viscous time rho R^2 / mu =
  1.05 ms is far below 0.15 s and 0.5 s; the unsteady Basset and added-mass
  forces are left out). ``analytic.json`` ("series") holds the signals.

Usage: ``pvpython examples/generate_demo.py [outdir]``

The meshes, the analytic Stokes fields and the VTK writers come from the
scene library the tests use, ``tests/python/scenes`` (found relative to this
file, so the generator runs from any directory), so the demo and the tests
share one implementation.
"""

import glob
import json
import os
import sys

import numpy as np

# The scene library lives with the tests: <repository>/tests/python/scenes.
sys.path.insert(0, os.path.normpath(os.path.join(os.path.dirname(os.path.abspath(__file__)),
                                                 "..", "tests", "python")))
import scenes as ws  # noqa: E402

# --- Scenario parameters (SI) ------------------------------------------------
RADIUS = 1.0e-3                      # m
CENTER = np.zeros(3)                 # m
RHO = 1260.0                         # kg/m^3, oil density
MU = 1.2                             # Pa s, oil dynamic viscosity
U_SPEED = 2.0e-3                     # m/s, oil speed past the bead (bead frame)
U_VEC = np.array([0.0, 0.0, U_SPEED])
OMEGA_RATE = 5.0                     # rad/s, spin about +z
OMEGA_VEC = np.array([0.0, 0.0, OMEGA_RATE])
G_ACC = 9.81                         # m/s^2
G_VEC = np.array([0.0, 0.0, -G_ACC])
P_INF = 1.0e5                        # Pa, far-field pressure at z = 0

N_POLAR, N_AZIMUTH = 36, 72
VOLUME_OUTER_RADIUS = 3.0 * RADIUS   # m, outer boundary of the fluid volume
VOLUME_N_RADIAL = 18                 # radial layers (n_polar / 2)
VOLUME_STRETCH = 2.0                 # scenes.stretched_nodes grading
ORDERING = "into_wall"
REGIONS = [  # (block name, zone_id, theta range in degrees)
    ("Upper Cap", 0, (0.0, 60.0)),
    ("Equator Band", 1, (60.0, 120.0)),
    ("Lower Cap", 2, (120.0, 180.0)),
]


def reynolds_number():
    """Re = rho U d / mu with the bead diameter d = 2R."""
    return RHO * U_SPEED * 2.0 * RADIUS / MU


# --- Wall fields ---------------------------------------------------------------

def static_pressure(x):
    """p = p_inf - (3/2) mu U cos(theta)/R - rho g z on the bead surface.

    Stokes dynamic pressure (evaluated at the radial projection of x) plus the
    hydrostatic part rho (g . x).
    """
    x = np.asarray(x, dtype=np.float64)
    dyn = ws.stokes_sphere(x, RADIUS, U_VEC, MU, CENTER)["p"]
    return P_INF + dyn + RHO * (x @ G_VEC)


def wall_fields(x):
    """Superposed translation + rotation wall fields at the projection of x."""
    s = ws.stokes_sphere(x, RADIUS, U_VEC, MU, CENTER)
    r = ws.rotating_sphere(x, RADIUS, OMEGA_VEC, MU, CENTER)
    return {"wss": s["wss"] + r["wss"], "grad": s["grad"] + r["grad"],
            "normal": s["normal"], "x_wall": s["x_wall"],
            "traction_viscous": s["wss"] + r["traction"]}


# --- Closed-form zone loads --------------------------------------------------------
#
# On the sphere n = (sin t cos f, sin t sin f, cos t), z = R cos t and
# dA = R^2 sin t dt df.  Forces are those the oil exerts on the bead, with
# p_ref = p_inf; moments are about the origin (the bead centre).
#
# Pressure.  p - p_inf = -K cos t with K = 3 mu U/(2R) + rho g R, so
#   F = -int (p - p_inf) n dA = K int cos t n dA.
# The f-integral kills the x, y components; for z
#   F_z = 2 pi R^2 K int_t1^t2 cos^2 t sin t dt = 2 pi R^2 K (cos^3 t1 - cos^3 t2)/3.
# Its moment is zero since R n x n = 0.
#
# Viscous, translation.  wss = (3 mu/(2R)) (U - (U.n) n) with U = U e_z, so
#   wss_z = (3 mu U/(2R)) sin^2 t  and  F_z = (3 mu U/(2R)) 2 pi R^2 S3,
#   S3 = int_t1^t2 sin^3 t dt = [cos^3 t/3 - cos t]_t1^t2.
# Its moment R n x wss = (3 mu U/2) n x e_z has only x, y parts, which
# integrate to zero over f.
#
# Viscous, rotation.  t = -3 mu Omega x n (tangential, azimuthal) integrates
# to zero force over f.  Moment R n x t = -3 mu R (Omega - (Omega.n) n), whose
# z part is -3 mu R Omega sin^2 t, so
#   M_z = -3 mu R Omega 2 pi R^2 S3,
# and the x, y parts vanish over f.
#
# Whole sphere (t1 = 0, t2 = pi, S3 = 4/3): F_z = 2 pi mu R U + rho g (4/3) pi
# R^3 (pressure) + 4 pi mu R U (viscous) = 6 pi mu R U + buoyancy, and
# M_z = -8 pi mu R^3 Omega.
#
# With p_ref = 0 the pressure force gains -p_inf int n dA, whose z part is
# -p_inf 2 pi R^2 int cos t sin t dt = -p_inf pi R^2 (sin^2 t2 - sin^2 t1).

def _sin3_integral(t1, t2):
    F = lambda t: np.cos(t) ** 3 / 3.0 - np.cos(t)
    return F(t2) - F(t1)


def zone_loads(t1, t2):
    """Exact loads on the spherical zone t1 <= theta <= t2 (radians)."""
    R = RADIUS
    K = 1.5 * MU * U_SPEED / R + RHO * G_ACC * R
    S3 = _sin3_integral(t1, t2)
    ez = np.array([0.0, 0.0, 1.0])
    fp = 2.0 * np.pi * R**2 * K * (np.cos(t1) ** 3 - np.cos(t2) ** 3) / 3.0 * ez
    fv = 1.5 * MU * U_SPEED / R * 2.0 * np.pi * R**2 * S3 * ez
    mv = -3.0 * MU * R * OMEGA_RATE * 2.0 * np.pi * R**2 * S3 * ez
    mp = np.zeros(3)
    n_int_z = np.pi * R**2 * (np.sin(t2) ** 2 - np.sin(t1) ** 2)
    return {
        "area": 2.0 * np.pi * R**2 * (np.cos(t1) - np.cos(t2)),
        "pressure_force": fp,
        "viscous_force": fv,
        "total_force": fp + fv,
        "pressure_moment": mp,
        "viscous_moment": mv,
        "total_moment": mp + mv,
        "pressure_force_absolute": fp - P_INF * n_int_z * ez,
    }


def _zone_quadrature(t1, t2, n_t=48, n_f=64):
    """Points, unit normals and weights of a Gauss rule on the exact zone."""
    g, w = np.polynomial.legendre.leggauss(n_t)
    t = 0.5 * (t2 - t1) * g + 0.5 * (t1 + t2)
    wt = 0.5 * (t2 - t1) * w * np.sin(t) * RADIUS**2
    f = 2.0 * np.pi * (np.arange(n_f) + 0.5) / n_f
    T, Fi = np.meshgrid(t, f, indexing="ij")
    n = np.stack([np.sin(T) * np.cos(Fi), np.sin(T) * np.sin(Fi), np.cos(T)], -1).reshape(-1, 3)
    W = np.repeat(wt, n_f) * (2.0 * np.pi / n_f)
    return CENTER + RADIUS * n, n, W


def check_closed_forms():
    """Closed-form zone loads vs quadrature of the wall fields on the exact sphere."""
    for _, _, (d1, d2) in REGIONS + [("Total", -1, (0.0, 180.0))]:
        t1, t2 = np.radians(d1), np.radians(d2)
        ref = zone_loads(t1, t2)
        x, n, W = _zone_quadrature(t1, t2)
        dp = static_pressure(x) - P_INF
        tv = wall_fields(x)["traction_viscous"]
        fp = -(W * dp) @ n
        fv = W @ tv
        mp = W @ np.cross(x, -dp[:, None] * n)
        mv = W @ np.cross(x, tv)
        fscale = 6 * np.pi * MU * RADIUS * U_SPEED
        mscale = 8 * np.pi * MU * RADIUS**3 * OMEGA_RATE
        np.testing.assert_allclose(W.sum(), ref["area"], rtol=1e-12)
        np.testing.assert_allclose(fp, ref["pressure_force"], atol=1e-11 * fscale)
        np.testing.assert_allclose(fv, ref["viscous_force"], atol=1e-11 * fscale)
        np.testing.assert_allclose(mp, ref["pressure_moment"], atol=1e-11 * mscale)
        np.testing.assert_allclose(mv, ref["viscous_moment"], atol=1e-11 * mscale)
        fabs = -(W * static_pressure(x)) @ n
        np.testing.assert_allclose(fabs, ref["pressure_force_absolute"], atol=1e-9 * P_INF * RADIUS**2)
    tot = zone_loads(0.0, np.pi)
    buoy = RHO * G_ACC * 4.0 / 3.0 * np.pi * RADIUS**3
    drag = 6 * np.pi * MU * RADIUS * U_SPEED
    np.testing.assert_allclose(tot["total_force"][2], drag + buoy, rtol=1e-13)
    np.testing.assert_allclose(tot["total_moment"][2], -8 * np.pi * MU * RADIUS**3 * OMEGA_RATE, rtol=1e-13)
    parts = [zone_loads(np.radians(a), np.radians(b)) for _, _, (a, b) in REGIONS]
    for key in ("area", "total_force", "total_moment", "pressure_force_absolute"):
        np.testing.assert_allclose(sum(p[key] for p in parts), tot[key], atol=1e-12 * np.max(np.abs(tot[key])) + 1e-30)


# --- Mesh and blocks -----------------------------------------------------------------

def build_blocks():
    """Return [(name, vtkPolyData)] and per-region mesh statistics."""
    P, F, rows = ws.uv_sphere(RADIUS, N_POLAR, N_AZIMUTH, center=CENTER, ordering=ORDERING)
    row_deg = 180.0 / N_POLAR
    centroids = ws.face_centroids(P, F)
    normals, areas = ws.newell_normals(P, F)
    sign = -1.0 if ORDERING == "into_wall" else 1.0      # -> normal into the fluid
    fields = wall_fields(centroids)
    p_points = static_pressure(P)

    blocks, stats = [], {}
    for name, rid, (d1, d2) in REGIONS:
        r1, r2 = d1 / row_deg, d2 / row_deg
        assert r1.is_integer() and r2.is_integer(), "rows must align with region limits"
        sel = np.flatnonzero((rows >= int(r1)) & (rows < int(r2)))
        used = np.unique(np.concatenate([np.asarray(F[i]) for i in sel]))
        local = np.full(P.shape[0], -1, dtype=np.int64)
        local[used] = np.arange(used.size)
        faces = [tuple(int(v) for v in local[np.asarray(F[i])]) for i in sel]
        pd = ws.polydata(
            P[used], faces,
            cell_arrays={
                "wall_shear": fields["wss"][sel],
                "velocity_gradient": fields["grad"][sel],
                "zone_id": np.full(sel.size, rid, dtype=np.int32),
            },
            point_arrays={"static_pressure": p_points[used]},
        )
        blocks.append((name, pd))
        stats[name] = {
            "n_cells": int(sel.size),
            "n_points": int(used.size),
            "area": float(areas[sel].sum()),
            "area_vector_into_fluid": (sign * (normals[sel] * areas[sel, None]).sum(0)).tolist(),
        }
    return blocks, stats


def verify(path, blocks):
    """Read the .vtm back and check every block, its cells and its arrays."""
    from vtkmodules.util.numpy_support import vtk_to_numpy
    from vtkmodules.vtkCommonDataModel import vtkCompositeDataSet
    from vtkmodules.vtkIOXML import vtkXMLMultiBlockDataReader

    rd = vtkXMLMultiBlockDataReader()
    rd.SetFileName(path)
    rd.Update()
    out = rd.GetOutput()
    assert out.GetNumberOfBlocks() == len(blocks), "wrong number of blocks"
    for i, (name, pd) in enumerate(blocks):
        got = out.GetBlock(i)
        assert out.GetMetaData(i).Get(vtkCompositeDataSet.NAME()) == name, name
        assert got is not None and got.GetNumberOfCells() == pd.GetNumberOfCells() > 0, name
        assert got.GetNumberOfPoints() == pd.GetNumberOfPoints(), name
        for data_got, data_ref, names in ((got.GetCellData(), pd.GetCellData(),
                                           ("wall_shear", "velocity_gradient", "zone_id")),
                                          (got.GetPointData(), pd.GetPointData(), ("static_pressure",))):
            for a in names:
                arr = data_got.GetArray(a)
                assert arr is not None, (name, a)
                np.testing.assert_array_equal(vtk_to_numpy(arr), vtk_to_numpy(data_ref.GetArray(a)))
        np.testing.assert_array_equal(vtk_to_numpy(got.GetPoints().GetData()),
                                      vtk_to_numpy(pd.GetPoints().GetData()))
    return out


# --- Fluid volume --------------------------------------------------------------------

def volume_velocity(x):
    """Velocity in the bead frame at points x off the bead (m/s, (M, 3)).

    Stokes flow past a fixed sphere in the stream U (Stokes 1851; Batchelor
    1967, §4.9) plus the flow of a sphere rotating at Omega in fluid at rest
    (Landau & Lifshitz, Fluid Mechanics, §20); linear, so they superpose.
    On the bead, U = Omega x x (the spinning wall).
    """
    return (ws.stokes_sphere_velocity(x, RADIUS, U_VEC, CENTER)
            + ws.rotating_sphere_velocity(x, RADIUS, OMEGA_VEC, CENTER))


def volume_pressure(x):
    """Static pressure at points x off the bead: p_inf + Stokes pressure - rho g z (Pa).

    The rotation adds no pressure in creeping flow; at r = R this equals
    static_pressure(x).
    """
    x = np.asarray(x, dtype=np.float64)
    return P_INF + ws.stokes_sphere_pressure(x, RADIUS, U_VEC, MU, CENTER) + RHO * (x @ G_VEC)


def build_volume(n_polar=N_POLAR, n_azimuth=N_AZIMUTH, n_radial=VOLUME_N_RADIAL,
                 stretch=VOLUME_STRETCH, outer_radius=VOLUME_OUTER_RADIUS):
    """The fluid shell around the bead as a vtkUnstructuredGrid with cell
    ``velocity`` and ``static_pressure``.

    The defaults make examples/demo/bead_volume.vtu; other sizes give the
    refinement family of the convergence tests (n_radial = n_polar / 2 keeps
    the cell shapes).
    """
    sh = ws.spherical_shell(RADIUS, outer_radius, n_polar, n_azimuth, n_radial,
                            stretch=stretch, center=CENTER)
    xc = ws.cell_vertex_means(sh["points"], sh["cells"])
    return ws.unstructured_grid(sh["points"], sh["cells"], sh["types"],
                                cell_arrays={"velocity": volume_velocity(xc),
                                             "static_pressure": volume_pressure(xc)})


def verify_volume(path, grid):
    """Read the .vtu back and check its cells, points and arrays, and that the
    inner boundary is the bead surface (the first layer's inner faces)."""
    from vtkmodules.util.numpy_support import vtk_to_numpy
    from vtkmodules.vtkIOXML import vtkXMLUnstructuredGridReader

    rd = vtkXMLUnstructuredGridReader()
    rd.SetFileName(path)
    rd.Update()
    got = rd.GetOutput()
    assert got.GetNumberOfCells() == grid.GetNumberOfCells() > 0, "volume cells"
    assert got.GetNumberOfPoints() == grid.GetNumberOfPoints(), "volume points"
    np.testing.assert_array_equal(vtk_to_numpy(got.GetPoints().GetData()),
                                  vtk_to_numpy(grid.GetPoints().GetData()))
    np.testing.assert_array_equal(vtk_to_numpy(got.GetCellTypesArray()),
                                  vtk_to_numpy(grid.GetCellTypesArray()))
    for a in ("velocity", "static_pressure"):
        np.testing.assert_array_equal(vtk_to_numpy(got.GetCellData().GetArray(a)),
                                      vtk_to_numpy(grid.GetCellData().GetArray(a)))
    P, F, _ = ws.uv_sphere(RADIUS, N_POLAR, N_AZIMUTH, center=CENTER)
    np.testing.assert_array_equal(vtk_to_numpy(got.GetPoints().GetData())[:P.shape[0]], P)
    return got


def _vec(a):
    return [float(v) for v in np.asarray(a, dtype=np.float64)]


def main(outdir):
    check_closed_forms()
    os.makedirs(outdir, exist_ok=True)
    blocks, stats = build_blocks()

    vtm = os.path.join(outdir, "bead.vtm")
    for stale in glob.glob(os.path.join(outdir, "bead", "bead_*.vtp")):
        os.remove(stale)
    ws.write_vtm(blocks, vtm)
    verify(vtm, blocks)

    regions = {}
    for name, rid, (d1, d2) in REGIONS + [("Total", None, (0.0, 180.0))]:
        loads = zone_loads(np.radians(d1), np.radians(d2))
        entry = {"theta_range_deg": [d1, d2]}
        if rid is not None:
            entry["zone_id"] = rid
        entry["area"] = float(loads["area"])
        for key in ("pressure_force", "viscous_force", "total_force",
                    "pressure_moment", "viscous_moment", "total_moment",
                    "pressure_force_absolute"):
            entry[key] = _vec(loads[key])
        if rid is not None:
            entry["mesh"] = stats[name]
        else:
            entry["mesh"] = {
                "n_cells": sum(s["n_cells"] for s in stats.values()),
                "area": float(sum(s["area"] for s in stats.values())),
                "area_vector_into_fluid": _vec(sum(np.asarray(s["area_vector_into_fluid"])
                                                   for s in stats.values())),
            }
        regions[name] = entry

    buoyancy = RHO * G_ACC * 4.0 / 3.0 * np.pi * RADIUS**3
    doc = {
        "description": "Glass bead settling slowly through a viscous oil while spinning "
                       "(Stokes regime, exact superposition of translation and rotation).",
        "conventions": {
            "units": "SI",
            "force": "exerted by the fluid on the wall, N",
            "moment": "about the origin (bead centre), N m",
            "normal": "unit normal out of the wall into the fluid",
            "reference_pressure": "p_ref = p_inf for all loads except pressure_force_absolute (p_ref = 0)",
            "face_ordering": "faces stored with right-hand-rule normal into the wall",
            "area": "exact spherical zone 2 pi R^2 (cos t1 - cos t2); 'mesh' holds the "
                    "polygonal mesh's own area and area vector",
        },
        "parameters": {
            "radius": RADIUS,
            "center": _vec(CENTER),
            "density": RHO,
            "dynamic_viscosity": MU,
            "stream_velocity": _vec(U_VEC),
            "angular_velocity": _vec(OMEGA_VEC),
            "gravity": _vec(G_VEC),
            "p_inf": P_INF,
            "p_inf_height_z": 0.0,
            "reynolds_number": reynolds_number(),
            "mesh": {"generator": "uv_sphere", "n_polar": N_POLAR, "n_azimuth": N_AZIMUTH,
                     "ordering": ORDERING},
            "arrays": {"point": {"static_pressure": "Pa"},
                       "cell": {"wall_shear": "Pa, wall shear stress",
                                "velocity_gradient": "1/s, row-major du_i/dx_j",
                                "zone_id": "int32, the block's zone"},
                       "volume_cell": {"velocity": "m/s, bead frame", "static_pressure": "Pa"}},
        },
        "reference_totals": {
            "stokes_drag_z": 6.0 * np.pi * MU * RADIUS * U_SPEED,
            "buoyancy_z": buoyancy,
            "torque_z": -8.0 * np.pi * MU * RADIUS**3 * OMEGA_RATE,
        },
        "regions": regions,
        "series": write_series(outdir),
    }
    with open(os.path.join(outdir, "analytic.json"), "w") as fh:
        json.dump(doc, fh, indent=2)
        fh.write("\n")

    print("Reynolds number rho U 2R / mu = %.4g" % reynolds_number())
    for name, e in regions.items():
        print("%-13s cells %4d  F_z = %.6e N (p %.6e, visc %.6e)  M_z = %.6e N m"
              % (name, e["mesh"]["n_cells"], e["total_force"][2], e["pressure_force"][2],
                 e["viscous_force"][2], e["total_moment"][2]))
    print("wrote %s and %s" % (vtm, os.path.join(outdir, "analytic.json")))

    vtu = os.path.join(outdir, "bead_volume.vtu")
    grid = build_volume()
    ws.write_vtu(grid, vtu)
    verify_volume(vtu, grid)
    print("wrote %s: %d cells, %d radial layers between r = %g and %g m, %.2f MB"
          % (vtu, grid.GetNumberOfCells(), VOLUME_N_RADIAL, RADIUS, VOLUME_OUTER_RADIUS,
             os.path.getsize(vtu) / 1e6))


# --- Time series (Load History) ------------------------------------------------

SERIES_STEPS = 40
SERIES_DURATION = 2.0                # s
SERIES_N_POLAR, SERIES_N_AZIMUTH = 12, 24
SERIES_STARTUP = (0.5, 0.15)         # U(t) = U (1 - a exp(-t / tau)): a, tau in s
SERIES_SPIN = (0.3, 2.0)             # Omega(t) = Omega (1 + b sin(2 pi f t)): b, f in Hz


def series_times():
    """SERIES_STEPS uneven times from 0 to SERIES_DURATION (steps uniform in [0.5, 1.5] dt)."""
    steps = np.random.default_rng(2026).uniform(0.5, 1.5, SERIES_STEPS - 1)
    return np.concatenate([[0.0], np.cumsum(steps) * SERIES_DURATION / steps.sum()])


def series_state(t):
    """Stream speed (m/s) and spin rate (rad/s) at time t."""
    a, tau = SERIES_STARTUP
    b, f = SERIES_SPIN
    return U_SPEED * (1 - a * np.exp(-t / tau)), OMEGA_RATE * (1 + b * np.sin(2 * np.pi * f * t))


def write_series(outdir):
    """The time series files; returns the "series" entry of analytic.json."""
    folder = os.path.join(outdir, "series")
    os.makedirs(folder, exist_ok=True)
    for stale in glob.glob(os.path.join(folder, "bead_series_*.vtp")):
        os.remove(stale)
    P, F, _ = ws.uv_sphere(RADIUS, SERIES_N_POLAR, SERIES_N_AZIMUTH, center=CENTER, ordering=ORDERING)
    centroids = ws.face_centroids(P, F)
    entries = []
    from vtkmodules.vtkIOXML import vtkXMLPolyDataWriter
    for i, t in enumerate(series_times()):
        speed, spin = series_state(t)
        u_vec, omega_vec = np.array([0.0, 0.0, speed]), np.array([0.0, 0.0, spin])
        wss = (ws.stokes_sphere(centroids, RADIUS, u_vec, MU, CENTER)["wss"]
               + ws.rotating_sphere(centroids, RADIUS, omega_vec, MU, CENTER)["wss"])
        p = P_INF + ws.stokes_sphere(P, RADIUS, u_vec, MU, CENTER)["p"] + RHO * (P @ G_VEC)
        pd = ws.polydata(P, F, cell_arrays={"wall_shear": wss}, point_arrays={"static_pressure": p})
        name = "bead_series_%02d.vtp" % i
        writer = vtkXMLPolyDataWriter()
        writer.SetDataModeToBinary()  # inline: appended files read back empty on this platform
        writer.SetFileName(os.path.join(folder, name))
        writer.SetInputData(pd)
        assert writer.Write() == 1
        entries.append('    <DataSet timestep="%.17g" part="0" file="%s"/>' % (t, name))
    with open(os.path.join(folder, "bead_series.pvd"), "w") as fh:
        fh.write('<?xml version="1.0"?>\n<VTKFile type="Collection" version="0.1">\n  <Collection>\n')
        fh.write("\n".join(entries) + "\n  </Collection>\n</VTKFile>\n")
    a, tau = SERIES_STARTUP
    b, f = SERIES_SPIN
    return {
        "description": "quasi-steady Stokes series: U(t) = U (1 - a exp(-t/tau)), "
                       "Omega(t) = Omega (1 + b sin(2 pi f t)); exact values for the whole sphere",
        "steps": SERIES_STEPS, "duration": SERIES_DURATION,
        "mesh": {"n_polar": SERIES_N_POLAR, "n_azimuth": SERIES_N_AZIMUTH},
        "startup_fraction": a, "startup_time": tau, "spin_modulation": b, "spin_frequency": f,
        "drag_steady": 6.0 * np.pi * MU * RADIUS * U_SPEED + RHO * G_ACC * 4.0 / 3.0 * np.pi * RADIUS**3,
        "rolling_moment_mean": -8.0 * np.pi * MU * RADIUS**3 * OMEGA_RATE,
        "rolling_moment_amplitude": 8.0 * np.pi * MU * RADIUS**3 * OMEGA_RATE * b,
    }


if __name__ == "__main__":
    here = os.path.dirname(os.path.abspath(__file__))
    main(sys.argv[1] if len(sys.argv) > 1 else os.path.join(here, "demo"))
