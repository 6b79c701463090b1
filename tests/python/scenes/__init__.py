"""Analytic test scenes for the WallLoads plugin.

This module builds small surface meshes (sphere, cylinder, box, tetrahedron)
with numpy, wraps them as vtkPolyData and provides closed-form wall fields
(pressure, wall shear stress, velocity gradient, traction) for flows whose
surface loads are known exactly.  It is meant for tests and demo data only.

Conventions (SI units throughout)
---------------------------------
* A wall face's unit normal ``n`` points OUT OF THE WALL INTO THE FLUID.  For
  a closed body immersed in fluid that is the outward normal of the body.
* ``ordering='into_fluid'`` builds faces whose right-hand-rule (Newell) normal
  is that ``n``; ``ordering='into_wall'`` reverses every face, which is how
  flow solvers usually store boundary faces.
* Velocity gradients are 9 components, row-major, ``G[i][j] = du_i/dx_j``
  (component order du/dx, du/dy, du/dz, dv/dx, ...).
* Wall shear stress = tangential traction the fluid exerts on the wall (Pa).
* Traction ``t = sigma . n`` with ``sigma = -(p - p_ref) I + mu (G + G^T)``
  is the force per unit area the fluid exerts on the wall.

Run ``pvpython wallloads_scenes.py`` to execute the self-check.
"""

import numpy as np

__all__ = [
    "uv_sphere", "cylinder_lateral", "box", "tetrahedron",
    "polydata", "face_centroids", "newell_normals",
    "enclosed_volume", "volume_centroid",
    "stokes_sphere", "stokes_sphere_velocity",
    "rotating_sphere", "rotating_sphere_velocity",
    "cylinder_with_circulation", "cylinder_region_forces", "CYLINDER_REGIONS",
    "write_vtm",
]

_ORDERINGS = ("into_fluid", "into_wall")


# ---------------------------------------------------------------------------
# Small helpers
# ---------------------------------------------------------------------------

def _check_ordering(ordering):
    if ordering not in _ORDERINGS:
        raise ValueError("ordering must be one of %r, got %r" % (_ORDERINGS, ordering))


def _apply_ordering(faces, ordering):
    """Return faces as tuples, reversed when ``ordering == 'into_wall'``."""
    _check_ordering(ordering)
    if ordering == "into_wall":
        return [tuple(int(i) for i in f[::-1]) for f in faces]
    return [tuple(int(i) for i in f) for f in faces]


def _group_faces(faces):
    """Group faces by vertex count for vectorised processing.

    Returns a list of ``(face_indices (k,), connectivity (k, m))`` pairs, one
    per distinct polygon size ``m``.
    """
    sizes = np.fromiter((len(f) for f in faces), dtype=np.int64, count=len(faces))
    if sizes.size and sizes.min() < 3:
        raise ValueError("every face needs at least 3 vertices")
    groups = []
    for m in np.unique(sizes):
        idx = np.flatnonzero(sizes == m)
        conn = np.array([faces[i] for i in idx], dtype=np.int64).reshape(len(idx), m)
        groups.append((idx, conn))
    return groups


def _as_points(x):
    x = np.asarray(x, dtype=np.float64)
    if x.ndim == 1:
        x = x[None, :]
    if x.ndim != 2 or x.shape[1] != 3:
        raise ValueError("points must have shape (M, 3)")
    return x


def _cross_matrix(w):
    """Cross-product matrix [w x] so that ``[w x] @ v == np.cross(w, v)``."""
    wx, wy, wz = np.asarray(w, dtype=np.float64)
    return np.array([[0.0, -wz, wy],
                     [wz, 0.0, -wx],
                     [-wy, wx, 0.0]])


def _project_to_sphere(x, radius, center):
    """Radial projection of points onto a sphere: (unit normals, surface points)."""
    x = _as_points(x)
    c = np.asarray(center, dtype=np.float64)
    d = x - c
    r = np.linalg.norm(d, axis=1)
    if np.any(r == 0.0):
        raise ValueError("cannot project the sphere centre onto the sphere")
    n = d / r[:, None]
    return n, c + radius * n


# ---------------------------------------------------------------------------
# Meshes
# ---------------------------------------------------------------------------

def uv_sphere(radius, n_polar, n_azimuth, center=(0.0, 0.0, 0.0), ordering="into_fluid"):
    """Latitude/longitude sphere mesh.

    The polar angle theta is measured from +z and the azimuth phi from +x
    toward +y.  Row ``i`` (0 <= i < n_polar) spans theta in
    [i*pi/n_polar, (i+1)*pi/n_polar]; rows 0 and n_polar-1 are triangle fans
    around a single pole point, the others are quads.  Points are shared (no
    duplicates) and lie exactly on the sphere.

    Point layout: id 0 is the north pole, then rings 1..n_polar-1 of
    ``n_azimuth`` points each (phi_j = 2 pi j / n_azimuth), last id is the
    south pole.

    Returns ``(points (N,3) float64, faces list of tuples, polar_row (F,) int)``.
    """
    _check_ordering(ordering)
    n_polar, n_azimuth = int(n_polar), int(n_azimuth)
    if n_polar < 2 or n_azimuth < 3:
        raise ValueError("need n_polar >= 2 and n_azimuth >= 3")
    c = np.asarray(center, dtype=np.float64)

    theta = np.pi * np.arange(1, n_polar) / n_polar
    phi = 2.0 * np.pi * np.arange(n_azimuth) / n_azimuth
    st, ct = np.sin(theta)[:, None], np.cos(theta)[:, None]
    ring = np.stack([st * np.cos(phi), st * np.sin(phi), ct * np.ones_like(phi)], axis=-1)
    points = np.vstack([[0.0, 0.0, 1.0], ring.reshape(-1, 3), [0.0, 0.0, -1.0]])
    points = c + radius * points

    north, south = 0, points.shape[0] - 1
    j = np.arange(n_azimuth)
    jn = (j + 1) % n_azimuth

    def ring_id(i, jj):  # ring i = 1..n_polar-1
        return 1 + (i - 1) * n_azimuth + jj

    faces, rows = [], []
    # Vertex order (theta increasing first, then phi increasing) gives
    # e_theta x e_phi = e_r, i.e. an outward (into-fluid) Newell normal.
    faces += [(north, int(a), int(b)) for a, b in zip(ring_id(1, j), ring_id(1, jn))]
    rows += [0] * n_azimuth
    for i in range(1, n_polar - 1):
        quads = np.stack([ring_id(i, j), ring_id(i + 1, j), ring_id(i + 1, jn), ring_id(i, jn)], axis=1)
        faces += [tuple(int(v) for v in q) for q in quads]
        rows += [i] * n_azimuth
    last = n_polar - 1
    faces += [(int(a), south, int(b)) for a, b in zip(ring_id(last, j), ring_id(last, jn))]
    rows += [n_polar - 1] * n_azimuth

    return points, _apply_ordering(faces, ordering), np.asarray(rows, dtype=np.int64)


def cylinder_lateral(radius, span, n_around, n_span=1, ordering="into_fluid"):
    """Open lateral surface of a circular cylinder, axis along z in [0, span].

    The angle theta is measured from +x toward +y; vertex ring ``j`` sits at
    theta_j = 2 pi j / n_around, starting at theta = 0, so with ``n_around``
    divisible by 4 the faces split exactly into upper/lower (y >< 0) and
    front/rear (x >< 0) halves.  Faces are quads ordered span row by span row.

    Returns ``(points (N,3), faces, theta_centre (F,))`` with theta_centre in
    [0, 2 pi) the angle of each face centre.  ``'into_fluid'`` normals point
    radially outward (fluid outside the cylinder).
    """
    _check_ordering(ordering)
    n_around, n_span = int(n_around), int(n_span)
    if n_around < 3 or n_span < 1:
        raise ValueError("need n_around >= 3 and n_span >= 1")
    theta = 2.0 * np.pi * np.arange(n_around) / n_around
    z = span * np.arange(n_span + 1) / n_span
    points = np.stack(np.broadcast_arrays(radius * np.cos(theta)[None, :],
                                          radius * np.sin(theta)[None, :],
                                          z[:, None]), axis=-1).reshape(-1, 3)
    k, j = np.meshgrid(np.arange(n_span), np.arange(n_around), indexing="ij")
    k, j = k.ravel(), j.ravel()
    jn = (j + 1) % n_around
    # theta increasing then z increasing: e_theta x e_z = e_r (outward).
    quads = np.stack([k * n_around + j, k * n_around + jn,
                      (k + 1) * n_around + jn, (k + 1) * n_around + j], axis=1)
    faces = [tuple(int(v) for v in q) for q in quads]
    theta_centre = 2.0 * np.pi * (j + 0.5) / n_around
    return points.astype(np.float64), _apply_ordering(faces, ordering), theta_centre


def box(lengths=(1.0, 1.0, 1.0), center=(0.0, 0.0, 0.0), rotation=None, ordering="into_fluid"):
    """Closed rectangular box of edge lengths (a, b, c): 8 points, 6 quads.

    ``rotation`` is an optional 3x3 matrix applied about ``center``.  Corner
    ``i`` has local offsets ((i&1), (i>>1)&1, (i>>2)&1) scaled to +-L/2.
    ``'into_fluid'`` normals point out of the box.
    """
    L = np.asarray(lengths, dtype=np.float64)
    if L.shape != (3,) or np.any(L <= 0):
        raise ValueError("lengths must be three positive numbers")
    bits = np.array([[(i >> 0) & 1, (i >> 1) & 1, (i >> 2) & 1] for i in range(8)], dtype=np.float64)
    local = (bits - 0.5) * L
    R = np.eye(3) if rotation is None else np.asarray(rotation, dtype=np.float64)
    if R.shape != (3, 3):
        raise ValueError("rotation must be a 3x3 matrix")
    points = np.asarray(center, dtype=np.float64) + local @ R.T
    faces = [(0, 4, 6, 2), (1, 3, 7, 5),   # -x, +x
             (0, 1, 5, 4), (2, 6, 7, 3),   # -y, +y
             (0, 2, 3, 1), (4, 5, 7, 6)]   # -z, +z
    if enclosed_volume(points, faces) < 0.0:  # an improper (reflecting) matrix
        faces = [f[::-1] for f in faces]
    return points, _apply_ordering(faces, ordering)


def tetrahedron(points4, ordering="into_fluid"):
    """Tetrahedron from 4 points with consistently oriented triangle faces.

    Each face is ordered so its Newell normal points away from the opposite
    vertex (out of the solid) for ``'into_fluid'``.
    """
    P = np.asarray(points4, dtype=np.float64)
    if P.shape != (4, 3):
        raise ValueError("points4 must have shape (4, 3)")
    signed6 = np.dot(np.cross(P[1] - P[0], P[2] - P[0]), P[3] - P[0])
    scale = max(np.ptp(P, axis=0).max(), np.finfo(float).tiny) ** 3
    if abs(signed6) <= 1e-12 * scale:
        raise ValueError("degenerate tetrahedron")
    faces = [(0, 2, 1), (0, 1, 3), (1, 2, 3), (0, 3, 2)]  # outward if signed6 > 0
    if signed6 < 0:
        faces = [f[::-1] for f in faces]
    return P.copy(), _apply_ordering(faces, ordering)


# ---------------------------------------------------------------------------
# VTK conversion
# ---------------------------------------------------------------------------

def _to_vtk_array(name, values, n_expected, what):
    from vtkmodules.util.numpy_support import numpy_to_vtk
    a = np.asarray(values)
    if a.ndim not in (1, 2) or a.shape[0] != n_expected:
        raise ValueError("%s array %r: expected shape (%d,) or (%d, k), got %r"
                         % (what, name, n_expected, n_expected, a.shape))
    a = np.ascontiguousarray(a if np.issubdtype(a.dtype, np.integer) else a.astype(np.float64))
    arr = numpy_to_vtk(a, deep=1)
    arr.SetName(name)
    return arr


def polydata(points, faces, cell_arrays=None, point_arrays=None):
    """Build a vtkPolyData with one polygon per face.

    ``cell_arrays`` / ``point_arrays`` map names to numpy arrays of shape
    (F,) / (N,) or (F, k) / (N, k).  Integer arrays keep their dtype, all
    others are converted to float64.  Arrays are deep-copied.
    """
    from vtkmodules.util.numpy_support import numpy_to_vtk
    from vtkmodules.util.vtkConstants import VTK_ID_TYPE
    from vtkmodules.vtkCommonCore import vtkPoints
    from vtkmodules.vtkCommonDataModel import vtkCellArray, vtkPolyData

    P = np.ascontiguousarray(np.asarray(points, dtype=np.float64).reshape(-1, 3))
    n_faces = len(faces)
    sizes = np.fromiter((len(f) for f in faces), dtype=np.int64, count=n_faces)
    offsets = np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64)
    conn = (np.fromiter((i for f in faces for i in f), dtype=np.int64, count=int(offsets[-1]))
            if n_faces else np.zeros(0, dtype=np.int64))
    if conn.size and (conn.min() < 0 or conn.max() >= P.shape[0]):
        raise ValueError("face refers to a point id out of range")

    vpts = vtkPoints()
    vpts.SetData(numpy_to_vtk(P, deep=1))
    cells = vtkCellArray()
    cells.SetData(numpy_to_vtk(offsets, deep=1, array_type=VTK_ID_TYPE),
                  numpy_to_vtk(conn, deep=1, array_type=VTK_ID_TYPE))
    pd = vtkPolyData()
    pd.SetPoints(vpts)
    pd.SetPolys(cells)
    for name, values in (cell_arrays or {}).items():
        pd.GetCellData().AddArray(_to_vtk_array(name, values, n_faces, "cell"))
    for name, values in (point_arrays or {}).items():
        pd.GetPointData().AddArray(_to_vtk_array(name, values, P.shape[0], "point"))
    return pd


# ---------------------------------------------------------------------------
# Geometry of polygon soups (independent numpy implementations)
# ---------------------------------------------------------------------------

def newell_normals(points, faces):
    """Unit normals and areas of polygons by Newell's method.

    N_x = sum_i (y_i - y_{i+1}) (z_i + z_{i+1}) and cyclic permutations;
    |N| is twice the (projected) polygon area.  Returns ``(normals (F,3),
    areas (F,))``; degenerate faces get a zero normal.
    """
    P = np.asarray(points, dtype=np.float64)
    N = np.zeros((len(faces), 3))
    for idx, conn in _group_faces(faces):
        v = P[conn]                     # (k, m, 3)
        w = np.roll(v, -1, axis=1)      # next vertex
        x, y, z = v[..., 0], v[..., 1], v[..., 2]
        xn, yn, zn = w[..., 0], w[..., 1], w[..., 2]
        N[idx, 0] = np.sum((y - yn) * (z + zn), axis=1)
        N[idx, 1] = np.sum((z - zn) * (x + xn), axis=1)
        N[idx, 2] = np.sum((x - xn) * (y + yn), axis=1)
    norm = np.linalg.norm(N, axis=1)
    unit = np.divide(N, norm[:, None], out=np.zeros_like(N), where=norm[:, None] > 0)
    return unit, 0.5 * norm


def face_centroids(points, faces):
    """Area centroid of each polygon, (F, 3).

    Triangle fan from the first vertex; each fan triangle is weighted by its
    area vector projected on the polygon's Newell normal (signed, so planar
    non-convex polygons are handled too).
    """
    P = np.asarray(points, dtype=np.float64)
    normals, _ = newell_normals(points, faces)
    C = np.zeros((len(faces), 3))
    for idx, conn in _group_faces(faces):
        v = P[conn]
        a, b, c = v[:, :1, :], v[:, 1:-1, :], v[:, 2:, :]
        w = 0.5 * np.einsum("kti,ki->kt", np.cross(b - a, c - a), normals[idx])
        tri_c = (a + b + c) / 3.0
        wsum = w.sum(axis=1)
        fallback = v.mean(axis=1)  # degenerate faces: vertex average
        ok = np.abs(wsum) > 0
        C[idx] = np.where(ok[:, None],
                          np.einsum("kt,kti->ki", w, tri_c) / np.where(ok, wsum, 1.0)[:, None],
                          fallback)
    return C


def _signed_tets(points, faces):
    """Signed volumes (fan tetrahedra from the origin) and their centroids."""
    P = np.asarray(points, dtype=np.float64)
    vols, cents = [], []
    for _, conn in _group_faces(faces):
        v = P[conn]
        a, b, c = v[:, :1, :], v[:, 1:-1, :], v[:, 2:, :]
        a = np.broadcast_to(a, b.shape)
        vols.append((np.einsum("kti,kti->kt", a, np.cross(b, c)) / 6.0).ravel())
        cents.append(((a + b + c) / 4.0).reshape(-1, 3))
    if not vols:
        return np.zeros(0), np.zeros((0, 3))
    return np.concatenate(vols), np.concatenate(cents)


def enclosed_volume(points, faces):
    """Volume enclosed by a closed surface (divergence theorem).

    Sum of signed tetrahedra (origin, v0, v_k, v_k+1) over the triangle fan
    of every face; positive when the faces are oriented with outward
    (``'into_fluid'`` for an immersed body) normals.
    """
    vols, _ = _signed_tets(points, faces)
    return float(vols.sum())


def volume_centroid(points, faces):
    """Centroid of the volume enclosed by a closed surface, (3,)."""
    vols, cents = _signed_tets(points, faces)
    V = vols.sum()
    if V == 0.0:
        raise ValueError("zero enclosed volume")
    return (vols[:, None] * cents).sum(axis=0) / V


# ---------------------------------------------------------------------------
# Analytic flows: sphere
# ---------------------------------------------------------------------------

def stokes_sphere_velocity(x, radius, U, center=(0.0, 0.0, 0.0)):
    """Creeping-flow velocity past a fixed sphere in a uniform stream U.

    u = U - (3R/4r)(U + (U.y)y/r^2) - (R^3/4r^3)(U - 3(U.y)y/r^2),
    y = x - c  (Stokes 1851; Batchelor, An Introduction to Fluid Dynamics,
    1967, §4.9).  Returns (M, 3).
    """
    x = _as_points(x)
    U = np.asarray(U, dtype=np.float64)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)[:, None]
    Uy = (y @ U)[:, None]
    R = float(radius)
    return (U - 0.75 * R / r * (U + Uy * y / r**2)
            - 0.25 * R**3 / r**3 * (U - 3.0 * Uy * y / r**2))


def stokes_sphere(x, radius, U, mu, center=(0.0, 0.0, 0.0)):
    """Wall fields of creeping flow past a fixed sphere in a uniform stream U.

    Evaluated on the sphere at the radial projection of ``x``, with
    n = (x - c)/|x - c| the unit normal into the fluid (Stokes 1851;
    Batchelor, An Introduction to Fluid Dynamics, 1967, §4.9):

    * ``p``        = p - p_inf = -(3/2) mu (U.n)/R
    * ``wss``      = (3 mu / 2R) (U - (U.n) n)            (tangential)
    * ``grad``     = (3 / 2R) (U - (U.n) n) n^T, row-major (M, 9)
    * ``traction`` = -(p - p_inf) n + wss = (3 mu / 2R) U  (uniform), so the
      force on the sphere is the Stokes drag 6 pi mu R U.

    Also returns ``normal`` (n) and ``x_wall`` (projected points).
    """
    R, mu = float(radius), float(mu)
    U = np.asarray(U, dtype=np.float64)
    n, xs = _project_to_sphere(x, R, center)
    Un = n @ U
    Ut = U - Un[:, None] * n
    wss = 1.5 * mu / R * Ut
    return {
        "p": -1.5 * mu * Un / R,
        "wss": wss,
        "grad": (1.5 / R * np.einsum("mi,mj->mij", Ut, n)).reshape(-1, 9),
        "traction": np.broadcast_to(1.5 * mu / R * U, n.shape).copy(),
        "normal": n,
        "x_wall": xs,
    }


def rotating_sphere_velocity(x, radius, Omega, center=(0.0, 0.0, 0.0)):
    """Creeping flow around a sphere rotating at Omega in fluid at rest.

    u = Omega x (x - c) R^3 / r^3 (Landau & Lifshitz, Fluid Mechanics, §20).
    Returns (M, 3).
    """
    x = _as_points(x)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)[:, None]
    return np.cross(np.asarray(Omega, dtype=np.float64), y) * (float(radius) / r) ** 3


def rotating_sphere(x, radius, Omega, mu, center=(0.0, 0.0, 0.0)):
    """Wall fields of a sphere rotating at angular velocity Omega in fluid at rest.

    With y = x - c, u_i = eps_ikl Omega_k y_l R^3 r^-3, differentiating,
      du_i/dy_j = R^3 [eps_ikj Omega_k r^-3 - 3 (Omega x y)_i y_j r^-5],
    so at r = R:  G = [Omega x] (I - 3 n n^T)  (row-major, (M, 9)).
    The pressure is uniform (p - p_inf = 0).  The deformation rate is
    G + G^T = -3 ((Omega x n) n^T + n (Omega x n)^T) ([Omega x] is
    antisymmetric), hence the traction
      t = mu (G + G^T) n = -3 mu Omega x n,
    which is tangential, so ``wss`` = ``traction``.  The torque about c is
    integral of R n x t dA = -8 pi mu R^3 Omega (Landau & Lifshitz, Fluid
    Mechanics, §20).  Note that for this moving wall mu (du/dn) = -2 mu
    Omega x n differs from the traction: the full deformation-rate tensor is
    needed.

    Returns dict with ``p``, ``wss``, ``grad``, ``traction``, ``u_wall``
    (= Omega x (x_s - c)), ``normal`` and ``x_wall``.
    """
    R, mu = float(radius), float(mu)
    Omega = np.asarray(Omega, dtype=np.float64)
    n, xs = _project_to_sphere(x, R, center)
    W = _cross_matrix(Omega)
    Oxn = np.cross(Omega, n)
    G = W[None, :, :] - 3.0 * np.einsum("mi,mj->mij", Oxn, n)
    t = -3.0 * mu * Oxn
    return {
        "p": np.zeros(n.shape[0]),
        "wss": t.copy(),
        "grad": G.reshape(-1, 9),
        "traction": t,
        "u_wall": R * Oxn,
        "normal": n,
        "x_wall": xs,
    }


# ---------------------------------------------------------------------------
# Analytic flows: circular cylinder with circulation (2-D potential flow)
# ---------------------------------------------------------------------------

#: Angular ranges (radians, theta from +x toward +y) of the cylinder regions.
CYLINDER_REGIONS = {
    "upper": (0.0, np.pi),
    "lower": (np.pi, 2.0 * np.pi),
    "front": (0.5 * np.pi, 1.5 * np.pi),   # x < 0, facing the oncoming stream
    "rear": (-0.5 * np.pi, 0.5 * np.pi),
    "all": (0.0, 2.0 * np.pi),
}


def cylinder_with_circulation(theta, U, Gamma, radius, rho):
    """Surface pressure p - p_inf of potential flow past a circular cylinder.

    Uniform stream U along +x plus a clockwise vortex of strength Gamma
    (Anderson, Fundamentals of Aerodynamics, §3.15).  Surface speed
    v_theta = -2 U sin(theta) - Gamma/(2 pi R); Bernoulli gives
    p - p_inf = 0.5 rho (U^2 - v_theta^2).  Lift per unit span rho U Gamma
    along +y (Kutta-Joukowski), drag zero (d'Alembert).
    """
    theta = np.asarray(theta, dtype=np.float64)
    v = -2.0 * U * np.sin(theta) - Gamma / (2.0 * np.pi * radius)
    return 0.5 * rho * (U**2 - v**2)


def cylinder_region_forces(U, Gamma, radius, rho, span):
    """Closed-form pressure force (p_ref = p_inf) on regions of the cylinder.

    Force from the fluid on the wall: F = -integral (p - p_inf) n dA with
    n = (cos t, sin t, 0) and dA = R span dt.  With q = 0.5 rho U^2 and
    a = Gamma/(2 pi R U):
      C_p = 1 - (2 sin t + a)^2 = (1 - a^2) - 4 a sin t - 4 sin^2 t,
      F_x = -q R span integral C_p cos t dt,  F_y = -q R span integral C_p sin t dt.
    Needed integrals (antiderivatives sin t, -cos t, sin^2/2, sin^3/3,
    t/2 - sin 2t/4, cos^3/3 - cos t):
      upper [0, pi]:      int sin = 2,  int sin^2 = pi/2, int sin^3 = 4/3,
                          int cos = int sin cos = int sin^2 cos = 0
        -> F = q R span (0, 10/3 + 2 a^2 + 2 pi a, 0)
      lower [pi, 2 pi]:   int sin = -2, int sin^2 = pi/2, int sin^3 = -4/3
        -> F = q R span (0, -(10/3 + 2 a^2 - 2 pi a), 0)
      front [pi/2, 3pi/2]: int cos = -2, int sin^2 cos = -2/3, int sin cos = 0,
                          int sin = int sin^3 = 0, int sin^2 = pi/2
        -> F = q R span (-(2/3 + 2 a^2), 2 pi a, 0)
      rear [-pi/2, pi/2]: int cos = 2, int sin^2 cos = 2/3, others as front
        -> F = q R span (2/3 + 2 a^2, 2 pi a, 0)
      all: F = q R span (0, 4 pi a, 0) = (0, rho U Gamma span, 0).
    Returns dict region name -> 3-vector (N).
    """
    U, Gamma, R, rho, span = map(float, (U, Gamma, radius, rho, span))
    qRs = 0.5 * rho * U**2 * R * span
    a = Gamma / (2.0 * np.pi * R * U)
    return {
        "upper": np.array([0.0, qRs * (10.0 / 3.0 + 2 * a**2 + 2 * np.pi * a), 0.0]),
        "lower": np.array([0.0, -qRs * (10.0 / 3.0 + 2 * a**2 - 2 * np.pi * a), 0.0]),
        "front": np.array([-qRs * (2.0 / 3.0 + 2 * a**2), qRs * 2 * np.pi * a, 0.0]),
        "rear": np.array([qRs * (2.0 / 3.0 + 2 * a**2), qRs * 2 * np.pi * a, 0.0]),
        "all": np.array([0.0, rho * U * Gamma * span, 0.0]),
    }


# ---------------------------------------------------------------------------
# Volume meshes (fluid volumes for Shear Projection)
# ---------------------------------------------------------------------------
#
# The generators below return numpy points and per-type connectivity in VTK's
# vertex order (vtkCellType.h ids), so that tests can evaluate fields at the
# same cell centres the filters use and build the VTK grid with
# mixed_unstructured_grid().  VTK orders a hexahedron with its first quad
# counter-clockwise seen from the second one (right-hand normal into the
# cell), but a wedge with its first triangle clockwise seen from the second
# (right-hand normal out of the cell); a tetrahedron (0, 1, 2, 3) has point 3
# on the side the right-hand normal of (0, 1, 2) points to.  These are the
# orders vtkCellValidator accepts as correctly oriented (checked by hand on
# unit cells) and give positive vtkCellSizeFilter volumes, which
# volume_mesh_check() verifies.

__all__ += [
    "VTK_TETRA", "VTK_HEXAHEDRON", "VTK_WEDGE",
    "mixed_unstructured_grid", "mixed_cell_vertex_means", "hex_grid", "grid_boundary_patch",
    "pipe_volume", "split_prisms_to_tets", "detached_faces", "volume_mesh_check",
]

#: VTK cell type ids (vtkCellType.h).
VTK_TETRA, VTK_HEXAHEDRON, VTK_WEDGE = 10, 12, 13


def mixed_unstructured_grid(points, cells, cell_arrays=None, point_arrays=None):
    """Build a vtkUnstructuredGrid from numpy.

    ``cells`` is a list of ``(vtk_cell_type, connectivity (k, m))`` pairs;
    cell ids follow the list order.  Arrays as in :func:`polydata` (cell
    arrays in the same concatenated cell order).
    """
    from vtkmodules.util.numpy_support import numpy_to_vtk
    from vtkmodules.util.vtkConstants import VTK_ID_TYPE, VTK_UNSIGNED_CHAR
    from vtkmodules.vtkCommonCore import vtkPoints
    from vtkmodules.vtkCommonDataModel import vtkCellArray, vtkUnstructuredGrid

    P = np.ascontiguousarray(np.asarray(points, dtype=np.float64).reshape(-1, 3))
    types, sizes, conns = [], [], []
    for ctype, conn in cells:
        conn = np.asarray(conn, dtype=np.int64)
        if conn.ndim != 2:
            raise ValueError("connectivity must be (k, m)")
        types.append(np.full(conn.shape[0], int(ctype), dtype=np.uint8))
        sizes.append(np.full(conn.shape[0], conn.shape[1], dtype=np.int64))
        conns.append(conn.ravel())
    types = np.concatenate(types) if types else np.zeros(0, np.uint8)
    sizes = np.concatenate(sizes) if sizes else np.zeros(0, np.int64)
    conn = np.concatenate(conns) if conns else np.zeros(0, np.int64)
    if conn.size and (conn.min() < 0 or conn.max() >= P.shape[0]):
        raise ValueError("cell refers to a point id out of range")
    offsets = np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64)
    vpts = vtkPoints()
    vpts.SetData(numpy_to_vtk(P, deep=1))
    ca = vtkCellArray()
    ca.SetData(numpy_to_vtk(offsets, deep=1, array_type=VTK_ID_TYPE),
               numpy_to_vtk(conn, deep=1, array_type=VTK_ID_TYPE))
    ug = vtkUnstructuredGrid()
    ug.SetPoints(vpts)
    ug.SetCells(numpy_to_vtk(types, deep=1, array_type=VTK_UNSIGNED_CHAR), ca)
    n_cells = int(types.size)
    for name, values in (cell_arrays or {}).items():
        ug.GetCellData().AddArray(_to_vtk_array(name, values, n_cells, "cell"))
    for name, values in (point_arrays or {}).items():
        ug.GetPointData().AddArray(_to_vtk_array(name, values, P.shape[0], "point"))
    return ug


def mixed_cell_vertex_means(points, cells):
    """Mean of each cell's vertices, (K, 3), cells in the order of ``cells``.

    This is the cell centre vtkShearProjection uses (its header: the cell
    value sits at the vertex mean); it differs from the volume centroid for
    cells that are not parallelepipeds.
    """
    P = np.asarray(points, dtype=np.float64)
    out = [P[np.asarray(conn, dtype=np.int64)].mean(axis=1) for _, conn in cells]
    return np.concatenate(out) if out else np.zeros((0, 3))


def hex_grid(x, y, z, rotation=None, origin=(0.0, 0.0, 0.0)):
    """Structured block of hexahedra on the tensor grid x (nx) * y (ny) * z (nz).

    Point (i, j, k) has id i + nx (j + ny k) and sits at
    origin + R (x_i, y_j, z_k) with R the optional 3x3 ``rotation``.  Cell
    (i, j, k) (id i + (nx-1)(j + (ny-1) k)) has its VTK corners
    (i,j,k) (i+1,j,k) (i+1,j+1,k) (i,j+1,k) and the same at k+1 (positive
    volume for a proper rotation).  Returns ``(points (N,3), hex (K,8),
    ijk (K,3))``.
    """
    x, y, z = (np.asarray(v, dtype=np.float64) for v in (x, y, z))
    nx, ny, nz = x.size, y.size, z.size
    if min(nx, ny, nz) < 2:
        raise ValueError("need at least two coordinates per direction")
    K, J, I = np.meshgrid(np.arange(nz), np.arange(ny), np.arange(nx), indexing="ij")
    local = np.stack([x[I.ravel()], y[J.ravel()], z[K.ravel()]], axis=1)
    R = np.eye(3) if rotation is None else np.asarray(rotation, dtype=np.float64)
    points = np.asarray(origin, dtype=np.float64) + local @ R.T

    def pid(i, j, k):
        return i + nx * (j + ny * k)

    K, J, I = np.meshgrid(np.arange(nz - 1), np.arange(ny - 1), np.arange(nx - 1), indexing="ij")
    i, j, k = I.ravel(), J.ravel(), K.ravel()
    hexes = np.stack([pid(i, j, k), pid(i + 1, j, k), pid(i + 1, j + 1, k), pid(i, j + 1, k),
                      pid(i, j, k + 1), pid(i + 1, j, k + 1), pid(i + 1, j + 1, k + 1),
                      pid(i, j + 1, k + 1)], axis=1)
    return points, hexes.astype(np.int64), np.stack([i, j, k], axis=1)


def grid_boundary_patch(x, y, z, axis, side, rotation=None, origin=(0.0, 0.0, 0.0),
                        ordering="into_wall"):
    """The boundary plane of :func:`hex_grid` normal to ``axis`` at its
    first (``side`` 0) or last (``side`` 1) coordinate, as quads with their
    OWN points (not the grid's ids).

    ``'into_wall'`` orders each quad so its right-hand normal points out of
    the grid (as flow solvers store boundary faces); ``'into_fluid'`` the
    reverse.  Returns ``(points (M,3), faces list of 4-tuples)``; faces run
    over the two in-plane axes (axis+1, axis+2) mod 3, the first fastest.
    """
    _check_ordering(ordering)
    coords = [np.asarray(v, dtype=np.float64) for v in (x, y, z)]
    a, b = (axis + 1) % 3, (axis + 2) % 3
    ca, cb = coords[a], coords[b]
    B, A = np.meshgrid(np.arange(cb.size), np.arange(ca.size), indexing="ij")
    local = np.zeros((A.size, 3))
    local[:, a] = ca[A.ravel()]
    local[:, b] = cb[B.ravel()]
    local[:, axis] = coords[axis][0 if side == 0 else -1]
    R = np.eye(3) if rotation is None else np.asarray(rotation, dtype=np.float64)
    points = np.asarray(origin, dtype=np.float64) + local @ R.T
    na = ca.size

    def pid(p, q):
        return p + na * q

    faces = []
    for q in range(cb.size - 1):
        for p in range(na - 1):
            # e_a x e_b = +e_axis: this order points along +axis.
            f = (pid(p, q), pid(p + 1, q), pid(p + 1, q + 1), pid(p, q + 1))
            outward_is_plus = side == 1
            if (ordering == "into_wall") != outward_is_plus:
                f = f[::-1]
            faces.append(tuple(int(v) for v in f))
    return points, faces


#: Prism symmetries that bring the vertex at position m (0..5) to position 0
#: while keeping the prism structure (triangles (0,1,2), (3,4,5); vertex i+3
#: above vertex i): rotations of the triangles, and for m >= 3 the exchange
#: of the two triangles.
_PRISM_PERMS = np.array([[0, 1, 2, 3, 4, 5], [1, 2, 0, 4, 5, 3], [2, 0, 1, 5, 3, 4],
                         [3, 4, 5, 0, 1, 2], [4, 5, 3, 1, 2, 0], [5, 3, 4, 2, 0, 1]])


def _orient_tets(points, tets):
    """Reorder tetrahedra to positive VTK orientation (swap points 1 and 2)."""
    P = np.asarray(points, dtype=np.float64)
    t = np.array(tets, dtype=np.int64)
    a, b, c, d = (P[t[:, k]] for k in range(4))
    neg = np.einsum("ij,ij->i", np.cross(b - a, c - a), d - a) < 0
    t[neg, 1], t[neg, 2] = t[neg, 2].copy(), t[neg, 1].copy()
    return t


def split_prisms_to_tets(points, prisms):
    """Split prisms into three tetrahedra each, conformingly.

    ``prisms`` (k, 6) lists triangle (0, 1, 2) and triangle (3, 4, 5) with
    vertex i+3 joined to vertex i (either winding).  Every quadrilateral face
    is cut along the diagonal through its vertex of smallest global id, so
    two prisms sharing a face cut it alike and the tetrahedral mesh is
    conforming (Dompierre, Labbe, Vallet & Camarero, "How to subdivide
    pyramids, prisms and hexahedra into tetrahedra", IMR 1999; rule recalled
    from memory, and checked here by the face count of volume_mesh_check).
    Returns (3k, 4) tetrahedra with positive VTK orientation.
    """
    W = np.asarray(prisms, dtype=np.int64)
    if W.size == 0:
        return np.zeros((0, 4), dtype=np.int64)
    m = np.argmin(W, axis=1)
    V = np.take_along_axis(W, _PRISM_PERMS[m], axis=1)   # V[:, 0] is the smallest id
    v0, v1, v2, v3, v4, v5 = (V[:, k] for k in range(6))
    # Face (v1, v2, v5, v4): diagonal v1-v5 when its smaller id is on it.
    diag15 = np.minimum(v1, v5) < np.minimum(v2, v4)
    t1 = np.where(diag15[:, None], np.stack([v0, v1, v2, v5], 1), np.stack([v0, v1, v2, v4], 1))
    t2 = np.where(diag15[:, None], np.stack([v0, v1, v5, v4], 1), np.stack([v0, v4, v2, v5], 1))
    t3 = np.stack([v0, v4, v5, v3], 1)
    tets = np.stack([t1, t2, t3], axis=1).reshape(-1, 4)
    return _orient_tets(points, tets)


def _split_quads_min_diagonal(quads):
    """Split quads (k, 4) into triangles along the diagonal through the
    smallest id (the rule of split_prisms_to_tets), keeping the winding."""
    Q = np.asarray(quads, dtype=np.int64)
    m = np.argmin(Q, axis=1)
    through02 = (m % 2) == 0
    a, b, c, d = (Q[:, k] for k in range(4))
    t1 = np.where(through02[:, None], np.stack([a, b, c], 1), np.stack([a, b, d], 1))
    t2 = np.where(through02[:, None], np.stack([a, c, d], 1), np.stack([b, c, d], 1))
    return np.stack([t1, t2], axis=1).reshape(-1, 3)


def pipe_volume(radius, length, n_radial, n_around, n_axial, kind="hex", ordering="into_wall"):
    """Fluid volume of a circular pipe r <= R, 0 <= z <= L (axis along z).

    A polar grid: at each of the n_axial+1 stations z_k = L k/n_axial there
    is one axis point and rings i = 1..n_radial of radius r_i = R i/n_radial
    with n_around points at theta_j = 2 pi j/n_around (all points on the
    wall ring lie exactly on the circle; the wall faces are flat, so the
    discrete wall is the inscribed polygonal prism).  Point ids: station k
    holds ids k Np .. (k+1) Np - 1, Np = 1 + n_radial n_around, the axis
    first, then ring i point j at 1 + (i-1) n_around + j.

    kind:
      'hex'   hexahedra between consecutive rings around a core of wedges
              (axis, ring 1): every wall cell is a hexahedron;
      'wedge' the disc triangulated (each polar quad cut along its
              (i, j)-(i+1, j+1) diagonal; the core fan) and extruded: wedges;
      'tet'   each wedge of 'wedge' split into three tetrahedra by
              split_prisms_to_tets (conforming); the wall faces are then
              triangles.

    Returns a dict: ``points`` (N,3); ``cells`` [(vtk type, conn)];
    ``wall`` (F, m) lateral wall faces in volume point ids (quads, or
    triangles for 'tet'), ``'into_wall'`` = right-hand normal radially
    outward; ``wall_theta`` (F,) the angle of each wall face's vertex mean;
    ``caps`` the number of end-cap faces expected on the boundary.
    """
    _check_ordering(ordering)
    if kind not in ("hex", "wedge", "tet"):
        raise ValueError("kind must be 'hex', 'wedge' or 'tet'")
    R, L = float(radius), float(length)
    nr, nt, nz = int(n_radial), int(n_around), int(n_axial)
    if nr < 1 or nt < 3 or nz < 1:
        raise ValueError("need n_radial >= 1, n_around >= 3, n_axial >= 1")
    Np = 1 + nr * nt
    theta = 2.0 * np.pi * np.arange(nt) / nt
    r = R * np.arange(1, nr + 1) / nr
    ring = np.stack([np.outer(r, np.cos(theta)).ravel(), np.outer(r, np.sin(theta)).ravel()], axis=1)
    layer = np.vstack([[0.0, 0.0], ring])
    z = L * np.arange(nz + 1) / nz
    points = np.hstack([np.tile(layer, (nz + 1, 1)), np.repeat(z, Np)[:, None]])

    def pid(i, j, k):          # ring i >= 1, any j (wrapped), station k
        return k * Np + 1 + (i - 1) * nt + (j % nt)

    def axis_id(k):
        return k * Np

    j = np.arange(nt)
    # 2D cells of one station (ids at station 0), counter-clockwise about +z.
    core = np.stack([np.zeros(nt, np.int64), pid(1, j, 0), pid(1, j + 1, 0)], axis=1)
    I, Jq = np.meshgrid(np.arange(1, nr), j, indexing="ij")
    I, Jq = I.ravel(), Jq.ravel()
    quads = np.stack([pid(I, Jq, 0), pid(I + 1, Jq, 0), pid(I + 1, Jq + 1, 0), pid(I, Jq + 1, 0)], axis=1)

    def extrude(faces2d):
        """(k, m) station-0 ids -> (nz k, 2m): bottom ids then top ids."""
        f = np.asarray(faces2d, dtype=np.int64)
        out = [np.hstack([f + k * Np, f + (k + 1) * Np]) for k in range(nz)]
        return np.vstack(out) if out else np.zeros((0, 2 * f.shape[1]), np.int64)

    def vtk_wedges(tris_ccw):
        w = extrude(tris_ccw)               # natural: (b0 b1 b2 t0 t1 t2), ccw
        return w[:, [0, 2, 1, 3, 5, 4]]     # VTK: first triangle clockwise from the second

    cells = []
    if kind == "hex":
        if quads.size:
            cells.append((VTK_HEXAHEDRON, extrude(quads)))
        cells.append((VTK_WEDGE, vtk_wedges(core)))
        # list the hexes first so cell ids of wall cells do not depend on the core
    else:
        tris = [core]
        if quads.size:
            tris.append(np.stack([quads[:, 0], quads[:, 1], quads[:, 2]], 1))
            tris.append(np.stack([quads[:, 0], quads[:, 2], quads[:, 3]], 1))
        tris = np.vstack(tris)
        if kind == "wedge":
            cells.append((VTK_WEDGE, vtk_wedges(tris)))
        else:
            cells.append((VTK_TETRA, split_prisms_to_tets(points, extrude(tris))))

    K, Jw = np.meshgrid(np.arange(nz), j, indexing="ij")
    K, Jw = K.ravel(), Jw.ravel()
    wall = np.stack([pid(nr, Jw, K), pid(nr, Jw + 1, K), pid(nr, Jw + 1, K + 1), pid(nr, Jw, K + 1)],
                    axis=1)                  # e_theta x e_z = e_r: radially outward
    n_cap_per_end = nt * (2 * nr - 1) if kind != "hex" else nt * nr
    if kind == "tet":
        wall = _split_quads_min_diagonal(wall)
    if ordering == "into_fluid":
        wall = wall[:, ::-1]
    wc = points[wall].mean(axis=1)
    return {
        "points": points,
        "cells": cells,
        "wall": wall,
        "wall_theta": np.mod(np.arctan2(wc[:, 1], wc[:, 0]), 2.0 * np.pi),
        "caps": 2 * n_cap_per_end,
    }


def detached_faces(points, faces, seed=None):
    """The same faces with their own, renumbered points (not the volume's ids).

    Only the points the faces use are kept; with ``seed`` they are also
    shuffled, so that no point id of the result matches the source.
    Returns ``(points (M,3), faces (F, m) int64)``.
    """
    P = np.asarray(points, dtype=np.float64)
    F = np.asarray(faces, dtype=np.int64)
    used, inverse = np.unique(F.ravel(), return_inverse=True)
    order = np.arange(used.size)
    if seed is not None:
        order = np.random.default_rng(seed).permutation(used.size)
    new_of_old = np.empty(used.size, dtype=np.int64)
    new_of_old[order] = np.arange(used.size)
    newP = np.empty((used.size, 3))
    newP[new_of_old] = P[used]
    return newP, new_of_old[inverse].reshape(F.shape)


def volume_mesh_check(ug, expected_volume=None, expected_boundary_faces=None, rtol=1e-12):
    """Validate a generated volume mesh with VTK's own tools.

    The cell volumes (vtkCellSizeFilter, signed: an inverted VTK vertex
    order gives a negative volume) must be positive and sum to
    ``expected_volume`` (if given), and the number of
    boundary faces (vtkDataSetSurfaceFilter) must equal
    ``expected_boundary_faces`` (if given): a non-conforming mesh shows extra
    internal faces there.  Returns ``(total volume, boundary face count)``.
    """
    from vtkmodules.util.numpy_support import vtk_to_numpy
    from vtkmodules.vtkFiltersGeometry import vtkDataSetSurfaceFilter
    from vtkmodules.vtkFiltersVerdict import vtkCellSizeFilter

    cs = vtkCellSizeFilter()
    cs.SetInputData(ug)
    cs.ComputeVertexCountOff()
    cs.ComputeLengthOff()
    cs.ComputeAreaOff()
    cs.Update()
    vol = vtk_to_numpy(cs.GetOutput().GetCellData().GetArray("Volume"))
    if np.any(vol <= 0):
        raise AssertionError("%d cells with volume <= 0" % np.count_nonzero(vol <= 0))
    total = float(vol.sum())
    if expected_volume is not None and abs(total - expected_volume) > rtol * abs(expected_volume):
        raise AssertionError("volume %.17g, expected %.17g" % (total, expected_volume))
    sf = vtkDataSetSurfaceFilter()
    sf.SetInputData(ug)
    sf.Update()
    nb = sf.GetOutput().GetNumberOfCells()
    if expected_boundary_faces is not None and nb != expected_boundary_faces:
        raise AssertionError("%d boundary faces, expected %d" % (nb, expected_boundary_faces))
    return total, nb


# ---------------------------------------------------------------------------
# Output
# ---------------------------------------------------------------------------

def write_vtm(blocks, path):
    """Write named vtkPolyData blocks as a vtkMultiBlockDataSet (.vtm).

    ``blocks`` is an ordered list of ``(name, vtkPolyData)``.  Files are
    written in inline binary mode (the .vtp pieces go in a folder named
    after ``path`` without its extension).  Returns the multiblock.
    """
    import os
    from vtkmodules.vtkCommonDataModel import vtkCompositeDataSet, vtkMultiBlockDataSet
    from vtkmodules.vtkIOXML import vtkXMLMultiBlockDataWriter

    mb = vtkMultiBlockDataSet()
    mb.SetNumberOfBlocks(len(blocks))
    for i, (name, pd) in enumerate(blocks):
        mb.SetBlock(i, pd)
        mb.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), str(name))
    d = os.path.dirname(os.path.abspath(path))
    os.makedirs(d, exist_ok=True)
    w = vtkXMLMultiBlockDataWriter()
    w.SetFileName(str(path))
    w.SetDataModeToBinary()      # inline binary; never appended
    w.SetInputData(mb)
    if w.Write() != 1:
        raise IOError("failed to write %s" % path)
    return mb


# ---------------------------------------------------------------------------
# Volume meshes and volume fields (for Shear Projection)
# ---------------------------------------------------------------------------

__all__ += [
    "stokes_sphere_pressure", "stokes_sphere_velocity_gradient",
    "rotating_sphere_velocity_gradient",
    "stretched_nodes", "spherical_shell", "hex_box", "cell_vertex_means",
    "unstructured_grid", "write_vtu",
]

#: VTK cell type ids used below (vtkCellType.h).
VTK_WEDGE_ID, VTK_HEXAHEDRON_ID = 13, 12


def stokes_sphere_pressure(x, radius, U, mu, center=(0.0, 0.0, 0.0)):
    """Creeping-flow pressure p - p_inf at points x off a fixed sphere.

    p - p_inf = -(3/2) mu R (U . y) / r^3, y = x - c (Stokes 1851; Batchelor,
    An Introduction to Fluid Dynamics, 1967, §4.9).  At r = R it equals the
    ``p`` of :func:`stokes_sphere`.  Returns (M,).
    """
    x = _as_points(x)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)
    return -1.5 * float(mu) * float(radius) * (y @ np.asarray(U, dtype=np.float64)) / r**3


def stokes_sphere_velocity_gradient(x, radius, U, center=(0.0, 0.0, 0.0)):
    """Gradient of :func:`stokes_sphere_velocity`, row-major G[i][j] = du_i/dx_j, (M, 9).

    Differentiating u = U - (3R/4)(U/r + (U.y) y/r^3) - (R^3/4)(U/r^3 - 3 (U.y) y/r^5)
    term by term (our own derivation, checked against central differences in
    the self-check):
      d(U_i/r)/dy_j            = -U_i y_j / r^3
      d((U.y) y_i/r^3)/dy_j    = (U_j y_i + (U.y) delta_ij)/r^3 - 3 (U.y) y_i y_j/r^5
      d(U_i/r^3)/dy_j          = -3 U_i y_j / r^5
      d((U.y) y_i/r^5)/dy_j    = (U_j y_i + (U.y) delta_ij)/r^5 - 5 (U.y) y_i y_j/r^7.
    """
    x = _as_points(x)
    U = np.asarray(U, dtype=np.float64)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)[:, None, None]
    Uy = (y @ U)[:, None, None]
    R = float(radius)
    I = np.eye(3)[None, :, :]
    Uiyj = np.einsum("i,mj->mij", U, y)
    yiUj = np.einsum("mi,j->mij", y, U)
    yy = np.einsum("mi,mj->mij", y, y)
    A = -Uiyj / r**3 + (yiUj + Uy * I) / r**3 - 3.0 * Uy * yy / r**5
    B = -3.0 * Uiyj / r**5 - 3.0 * ((yiUj + Uy * I) / r**5 - 5.0 * Uy * yy / r**7)
    return (-0.75 * R * A - 0.25 * R**3 * B).reshape(-1, 9)


def rotating_sphere_velocity_gradient(x, radius, Omega, center=(0.0, 0.0, 0.0)):
    """Gradient of :func:`rotating_sphere_velocity`, row-major (M, 9).

    du_i/dy_j = R^3 [eps_ikj Omega_k r^-3 - 3 (Omega x y)_i y_j r^-5]
    (as in :func:`rotating_sphere`, here off the wall).
    """
    x = _as_points(x)
    Om = np.asarray(Omega, dtype=np.float64)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)[:, None, None]
    W = _cross_matrix(Om)[None, :, :]
    Oxy = np.cross(Om, y)
    G = float(radius) ** 3 * (W / r**3 - 3.0 * np.einsum("mi,mj->mij", Oxy, y) / r**5)
    return G.reshape(-1, 9)


def stretched_nodes(a, b, n, stretch=0.0):
    """n + 1 nodes from a to b, finer near a: a + (b - a) g(k/n).

    g(s) = (exp(stretch s) - 1)/(exp(stretch) - 1) (uniform for stretch = 0).
    The mapping is fixed and smooth, so refining n refines every cell by the
    same factor (successive cells grow by exp(stretch/n) -> 1): the cell
    sizes scale like 1/n everywhere, as a convergence study needs.
    """
    s = np.arange(n + 1, dtype=np.float64) / n
    if stretch == 0.0:
        g = s
    else:
        g = np.expm1(stretch * s) / np.expm1(stretch)
    nodes = a + (b - a) * g
    nodes[0], nodes[-1] = a, b
    return nodes


def spherical_shell(r_inner, r_outer, n_polar, n_azimuth, n_radial, stretch=0.0,
                    center=(0.0, 0.0, 0.0)):
    """Volume mesh of the shell r_inner <= r <= r_outer, graded toward r_inner.

    Every radial layer is the :func:`uv_sphere` (n_polar, n_azimuth) lattice
    swept between two concentric spheres whose radii are
    ``stretched_nodes(r_inner, r_outer, n_radial, stretch)``; the quads of the
    lattice give hexahedra (VTK_HEXAHEDRON), the triangle fans at the poles
    wedges (VTK_WEDGE).  Shell k holds points [k Ns, (k+1) Ns) in the point
    layout of uv_sphere, Ns = 2 + (n_polar - 1) n_azimuth, so the inner wall
    is exactly ``uv_sphere(r_inner, n_polar, n_azimuth, center)`` (same
    coordinates, same face order, same point ids).

    Cells are ordered layer by layer (innermost first), within a layer in the
    face order of uv_sphere, with VTK's orientation conventions (positive
    volume): hexahedron base (0,1,2,3) facing the top (4..7), wedge base
    (0,1,2) facing away from the top (3,4,5).

    Returns dict: ``points`` (N, 3), ``cells`` (list of tuples), ``types``
    (C,) uint8, ``layer`` (C,) int, ``polar_row`` (C,) int, ``radii``
    (n_radial + 1,), ``inner_faces`` (uv_sphere faces, into_fluid order).
    """
    n_polar, n_azimuth, n_radial = int(n_polar), int(n_azimuth), int(n_radial)
    if not (0.0 < r_inner < r_outer):
        raise ValueError("need 0 < r_inner < r_outer")
    if n_radial < 1:
        raise ValueError("need n_radial >= 1")
    radii = stretched_nodes(float(r_inner), float(r_outer), n_radial, stretch)
    shells = []
    for r in radii:
        P, F, rows = uv_sphere(r, n_polar, n_azimuth, center=center, ordering="into_fluid")
        shells.append(P)
    Ns = shells[0].shape[0]
    points = np.vstack(shells)
    cells, types, layer, polar_row = [], [], [], []
    for k in range(n_radial):
        lo, hi = k * Ns, (k + 1) * Ns
        for f, row in zip(F, rows):
            if len(f) == 4:
                # into_fluid quad: Newell normal along +r, i.e. toward the top.
                cells.append(tuple(lo + v for v in f) + tuple(hi + v for v in f))
                types.append(VTK_HEXAHEDRON_ID)
            else:
                # the wedge base must face away from the top: reverse the triangle.
                a, b, c = f
                cells.append((lo + a, lo + c, lo + b, hi + a, hi + c, hi + b))
                types.append(VTK_WEDGE_ID)
            layer.append(k)
            polar_row.append(int(row))
    return {
        "points": points,
        "cells": cells,
        "types": np.asarray(types, dtype=np.uint8),
        "layer": np.asarray(layer, dtype=np.int64),
        "polar_row": np.asarray(polar_row, dtype=np.int64),
        "radii": radii,
        "inner_faces": F,
    }


def hex_box(x_nodes, y_nodes, z_nodes):
    """Structured block of hexahedra on the tensor grid of the given node lists.

    Point (i, j, k) has id i + nx (j + ny k) with nx, ny, nz the node counts.
    Cell (i, j, k) (cells counted likewise, i fastest) is a VTK_HEXAHEDRON
    with base z = z_k and top z = z_{k+1} (positive volume for increasing
    nodes).  Returns ``(points (N, 3), cells (C, 8) int64)``.
    """
    x = np.asarray(x_nodes, dtype=np.float64)
    y = np.asarray(y_nodes, dtype=np.float64)
    z = np.asarray(z_nodes, dtype=np.float64)
    nx, ny, nz = x.size, y.size, z.size
    Z, Y, X = np.meshgrid(z, y, x, indexing="ij")
    points = np.stack([X.ravel(), Y.ravel(), Z.ravel()], axis=1)
    k, j, i = np.meshgrid(np.arange(nz - 1), np.arange(ny - 1), np.arange(nx - 1), indexing="ij")
    i, j, k = i.ravel(), j.ravel(), k.ravel()
    pid = lambda a, b, c: a + nx * (b + ny * c)
    cells = np.stack([pid(i, j, k), pid(i + 1, j, k), pid(i + 1, j + 1, k), pid(i, j + 1, k),
                      pid(i, j, k + 1), pid(i + 1, j, k + 1), pid(i + 1, j + 1, k + 1),
                      pid(i, j + 1, k + 1)], axis=1).astype(np.int64)
    return points, cells


def cell_vertex_means(points, cells):
    """Mean of each cell's vertices, (C, 3): the cell centre Shear Projection uses."""
    P = np.asarray(points, dtype=np.float64)
    cells = [tuple(c) for c in cells] if isinstance(cells, np.ndarray) else cells
    C = np.zeros((len(cells), 3))
    for idx, conn in _group_faces(cells):
        C[idx] = P[conn].mean(axis=1)
    return C


def unstructured_grid(points, cells, cell_types, cell_arrays=None, point_arrays=None):
    """vtkUnstructuredGrid from points, cells (tuples or an (C, m) array) and VTK type ids.

    Arrays as in :func:`polydata` (deep copies; integer arrays keep their type).
    """
    from vtkmodules.util.numpy_support import numpy_to_vtk
    from vtkmodules.util.vtkConstants import VTK_ID_TYPE, VTK_UNSIGNED_CHAR
    from vtkmodules.vtkCommonCore import vtkPoints
    from vtkmodules.vtkCommonDataModel import vtkCellArray, vtkUnstructuredGrid

    P = np.ascontiguousarray(np.asarray(points, dtype=np.float64).reshape(-1, 3))
    if isinstance(cells, np.ndarray):
        sizes = np.full(cells.shape[0], cells.shape[1], dtype=np.int64)
        conn = np.ascontiguousarray(cells.reshape(-1), dtype=np.int64)
    else:
        sizes = np.fromiter((len(c) for c in cells), dtype=np.int64, count=len(cells))
        conn = np.fromiter((i for c in cells for i in c), dtype=np.int64, count=int(sizes.sum()))
    n_cells = sizes.size
    types = np.ascontiguousarray(np.broadcast_to(np.asarray(cell_types, dtype=np.uint8), (n_cells,)))
    offsets = np.concatenate([[0], np.cumsum(sizes)]).astype(np.int64)
    pts = vtkPoints()
    pts.SetDataTypeToDouble()
    pts.SetData(numpy_to_vtk(P, deep=1))
    ca = vtkCellArray()
    ca.SetData(numpy_to_vtk(offsets, deep=1, array_type=VTK_ID_TYPE),
               numpy_to_vtk(conn, deep=1, array_type=VTK_ID_TYPE))
    ug = vtkUnstructuredGrid()
    ug.SetPoints(pts)
    ug.SetCells(numpy_to_vtk(types, deep=1, array_type=VTK_UNSIGNED_CHAR), ca)
    for name, values in (cell_arrays or {}).items():
        ug.GetCellData().AddArray(_to_vtk_array(name, values, n_cells, "cell"))
    for name, values in (point_arrays or {}).items():
        ug.GetPointData().AddArray(_to_vtk_array(name, values, P.shape[0], "point"))
    return ug


def write_vtu(grid, path):
    """Write a vtkUnstructuredGrid as .vtu, inline binary (never appended)."""
    import os
    from vtkmodules.vtkIOXML import vtkXMLUnstructuredGridWriter

    d = os.path.dirname(os.path.abspath(path))
    os.makedirs(d, exist_ok=True)
    w = vtkXMLUnstructuredGridWriter()
    w.SetFileName(str(path))
    w.SetDataModeToBinary()      # inline binary; appended mode reads back empty here
    w.SetInputData(grid)
    if w.Write() != 1:
        raise IOError("failed to write %s" % path)
    return grid


# ---------------------------------------------------------------------------
# Self-check
# ---------------------------------------------------------------------------

def _sphere_gauss(radius, center, n_theta=24, n_phi=48):
    """Quadrature on the exact sphere: Gauss-Legendre in cos(theta), uniform in phi.

    Returns (points (M,3), weights (M,)); exact for low-order polynomial
    integrands in n.
    """
    mu_, w_ = np.polynomial.legendre.leggauss(n_theta)
    phi = 2.0 * np.pi * (np.arange(n_phi) + 0.5) / n_phi
    ct, ph = np.meshgrid(mu_, phi, indexing="ij")
    st = np.sqrt(1.0 - ct**2)
    n = np.stack([st * np.cos(ph), st * np.sin(ph), ct], axis=-1).reshape(-1, 3)
    w = (np.repeat(w_, n_phi) * (2.0 * np.pi / n_phi)) * radius**2
    return np.asarray(center, dtype=np.float64) + radius * n, w


def _fd_gradient(field, x, h):
    """Central-difference gradient of a vector field, row-major (M, 9)."""
    G = np.zeros((x.shape[0], 3, 3))
    for j in range(3):
        e = np.zeros(3)
        e[j] = h
        G[:, :, j] = (field(x + e) - field(x - e)) / (2.0 * h)
    return G.reshape(-1, 9)


def _traction_from(p, grad, n, mu):
    G = grad.reshape(-1, 3, 3)
    S = G + np.transpose(G, (0, 2, 1))
    return -p[:, None] * n + mu * np.einsum("mij,mj->mi", S, n)


def _self_check():
    rng = np.random.default_rng(12345)
    close = np.testing.assert_allclose

    # --- uv_sphere: topology, orientation, closure, volume -----------------
    R, c = 0.7, np.array([0.3, -0.2, 1.1])
    P, F, rows = uv_sphere(R, 18, 24, center=c)
    assert P.shape == (2 + 17 * 24, 3) and len(F) == 18 * 24 == rows.size
    assert len(np.unique(np.round(P, 12), axis=0)) == P.shape[0], "duplicate points"
    close(np.linalg.norm(P - c, axis=1), R, rtol=1e-15)
    assert sum(len(f) == 3 for f in F) == 2 * 24
    n, A = newell_normals(P, F)
    C = face_centroids(P, F)
    assert np.all(np.einsum("ij,ij->i", n, C - c) > 0), "normals must point into fluid"
    closure = np.abs((n * A[:, None]).sum(axis=0)).max() / A.sum()
    assert closure < 1e-14, closure
    V = enclosed_volume(P, F)
    assert 0.98 * 4 / 3 * np.pi * R**3 < V < 4 / 3 * np.pi * R**3
    close(volume_centroid(P, F), c, atol=1e-12)
    Pw, Fw, _ = uv_sphere(R, 18, 24, center=c, ordering="into_wall")
    close(enclosed_volume(Pw, Fw), -V, rtol=1e-13)
    close(newell_normals(Pw, Fw)[0], -n, atol=1e-14)
    theta_c = np.arccos(np.clip((C - c)[:, 2] / np.linalg.norm(C - c, axis=1), -1, 1))
    assert np.all(np.floor(theta_c / (np.pi / 18)).astype(int) == rows)

    # --- cylinder_lateral ----------------------------------------------------
    P, F, th = cylinder_lateral(0.5, 2.0, 16, n_span=3)
    n, A = newell_normals(P, F)
    C = face_centroids(P, F)
    close(np.mod(np.arctan2(C[:, 1], C[:, 0]), 2 * np.pi), th, atol=1e-12)
    close(n[:, :2], np.stack([np.cos(th), np.sin(th)], axis=1), atol=1e-12)
    close(n[:, 2], 0.0, atol=1e-14)
    assert np.sum(th < np.pi) == np.sum(th > np.pi) == len(F) // 2

    # --- box and tetrahedron ----------------------------------------------
    q, _ = np.linalg.qr(rng.normal(size=(3, 3)))
    for rot in (None, q, -q):
        P, F = box((1.0, 2.0, 3.0), center=(1.0, 2.0, 3.0), rotation=rot)
        close(enclosed_volume(P, F), 6.0, rtol=1e-13)
        close(volume_centroid(P, F), [1.0, 2.0, 3.0], atol=1e-13)
        n, A = newell_normals(P, F)
        close(np.sort(A), [2, 2, 3, 3, 6, 6], rtol=1e-13)
        close((n * A[:, None]).sum(axis=0), 0.0, atol=1e-13)
        close(face_centroids(P, F).mean(axis=0), [1.0, 2.0, 3.0], atol=1e-13)
    T = np.array([[0, 0, 0], [1, 0, 0], [0, 1, 0], [0, 0, 1]], dtype=float)
    for perm in ([0, 1, 2, 3], [1, 0, 2, 3]):
        P, F = tetrahedron(T[perm])
        close(enclosed_volume(P, F), 1.0 / 6.0, rtol=1e-14)
        close(volume_centroid(P, F), [0.25, 0.25, 0.25], atol=1e-15)
        P, F = tetrahedron(T[perm], ordering="into_wall")
        close(enclosed_volume(P, F), -1.0 / 6.0, rtol=1e-14)
    # non-convex planar polygon (an L shape): centroid known exactly
    L = np.array([[0, 0, 0], [2, 0, 0], [2, 1, 0], [1, 1, 0], [1, 2, 0], [0, 2, 0]], float)
    close(face_centroids(L, [tuple(range(6))])[0], [5.0 / 6.0, 5.0 / 6.0, 0.0], atol=1e-15)
    close(newell_normals(L, [tuple(range(6))])[1], [3.0])

    # --- Stokes sphere: fields vs finite differences, drag ------------------
    R, mu, U, c = 1.3, 0.8, np.array([0.4, -1.1, 0.7]), np.array([0.2, 0.1, -0.3])
    d = rng.normal(size=(50, 3))
    x = c + R * d / np.linalg.norm(d, axis=1)[:, None]
    s = stokes_sphere(2.0 * x - c, R, U, mu, center=c)   # tests radial projection
    close(s["x_wall"], x, atol=1e-14)
    close(stokes_sphere_velocity(x, R, U, c), 0.0, atol=1e-14)
    h = 1e-5 * R
    Gfd = _fd_gradient(lambda y: stokes_sphere_velocity(y, R, U, c), x, h)
    close(s["grad"], Gfd, atol=1e-8 * np.abs(U).max() / R)
    close(_traction_from(s["p"], s["grad"], s["normal"], mu), s["traction"], atol=1e-14)
    wn = np.einsum("ij,ij->i", s["wss"], s["normal"])
    close(wn, 0.0, atol=1e-14)
    xq, wq = _sphere_gauss(R, c)
    sq = stokes_sphere(xq, R, U, mu, center=c)
    close((wq[:, None] * sq["traction"]).sum(0), 6 * np.pi * mu * R * U, rtol=1e-12)
    Fp = -(wq * sq["p"])[:, None] * sq["normal"]
    close(Fp.sum(0), 2 * np.pi * mu * R * U, rtol=1e-12)        # pressure drag 1/3
    close((wq[:, None] * sq["wss"]).sum(0), 4 * np.pi * mu * R * U, rtol=1e-12)

    # --- Rotating sphere: gradient vs finite differences, torque -----------
    Om = np.array([0.3, -0.5, 1.7])
    r_ = rotating_sphere(x, R, Om, mu, center=c)
    close(rotating_sphere_velocity(x, R, Om, c), r_["u_wall"], atol=1e-14)
    close(r_["u_wall"], np.cross(Om, x - c), atol=1e-14)
    Gfd = _fd_gradient(lambda y: rotating_sphere_velocity(y, R, Om, c), x, h)
    close(r_["grad"], Gfd, atol=1e-8 * np.abs(Om).max())
    close(_traction_from(r_["p"], r_["grad"], r_["normal"], mu), r_["traction"], atol=1e-14)
    close(np.einsum("ij,ij->i", r_["wss"], r_["normal"]), 0.0, atol=1e-14)
    rq = rotating_sphere(xq, R, Om, mu, center=c)
    close((wq[:, None] * rq["traction"]).sum(0), 0.0, atol=1e-12)
    torque = (wq[:, None] * np.cross(xq - c, rq["traction"])).sum(0)
    close(torque, -8 * np.pi * mu * R**3 * Om, rtol=1e-12)

    # --- Cylinder with circulation: closed forms vs quadrature -------------
    gx, gw = np.polynomial.legendre.leggauss(200)
    for (U_, Gam, Rc, rho, span) in [(3.0, 0.0, 0.5, 1.2, 2.0), (3.0, 7.5, 0.5, 1.2, 2.0),
                                     (1.0, -4.0, 2.0, 1000.0, 0.3)]:
        ref = cylinder_region_forces(U_, Gam, Rc, rho, span)
        for name, (t1, t2) in CYLINDER_REGIONS.items():
            t = 0.5 * (t2 - t1) * gx + 0.5 * (t1 + t2)
            w = 0.5 * (t2 - t1) * gw * Rc * span
            dp = cylinder_with_circulation(t, U_, Gam, Rc, rho)
            nrm = np.stack([np.cos(t), np.sin(t), np.zeros_like(t)], axis=1)
            Fq = -(w * dp) @ nrm
            scale = 0.5 * rho * U_**2 * Rc * span * (1 + abs(Gam / (2 * np.pi * Rc * U_)))**2
            close(Fq, ref[name], atol=1e-12 * scale, err_msg=name)
        close(ref["all"], [0.0, rho * U_ * Gam * span, 0.0], atol=1e-12 * scale)
        close(ref["upper"] + ref["lower"], ref["all"], atol=1e-12 * scale)
        close(ref["front"] + ref["rear"], ref["all"], atol=1e-12 * scale)

    # --- polydata / write_vtm round trip ------------------------------------
    import os
    import tempfile
    from vtkmodules.vtkIOXML import vtkXMLMultiBlockDataReader
    from vtkmodules.util.numpy_support import vtk_to_numpy
    P, F, rows = uv_sphere(1.0, 6, 8)
    pd = polydata(P, F, cell_arrays={"row": rows.astype(np.int32), "v": np.ones((len(F), 3))},
                  point_arrays={"z": P[:, 2]})
    assert pd.GetNumberOfCells() == len(F) and pd.GetNumberOfPoints() == P.shape[0]
    assert pd.GetCellData().GetArray("row").GetDataTypeAsString() == "int"
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "t.vtm")
        write_vtm([("A", pd), ("B", pd)], path)
        rd = vtkXMLMultiBlockDataReader()
        rd.SetFileName(path)
        rd.Update()
        out = rd.GetOutput()
        assert out.GetNumberOfBlocks() == 2
        from vtkmodules.vtkCommonDataModel import vtkCompositeDataSet
        assert out.GetMetaData(1).Get(vtkCompositeDataSet.NAME()) == "B"
        b = out.GetBlock(0)
        assert b.GetNumberOfCells() == len(F)
        close(vtk_to_numpy(b.GetCellData().GetArray("row")), rows)
    print("wallloads_scenes self-check OK")


if __name__ == "__main__":
    _self_check()
