"""Meshes of the analytic scenes: pure numpy geometry, no VTK.

Surface meshes (sphere, cylinder, box, tetrahedron) as ``(points, faces)``
with faces as tuples of point ids; volume meshes (hexahedral grids, pipes,
spherical shells) as points and VTK-ordered connectivity; and independent
numpy geometry of polygon soups (Newell normals and areas, area centroids,
enclosed volume and its centroid).  :mod:`scenes.files` turns them into VTK
objects and files.

Conventions: a wall face's unit normal ``n`` points OUT OF THE WALL INTO THE
FLUID.  ``ordering='into_fluid'`` builds faces whose right-hand-rule (Newell)
normal is that ``n``; ``ordering='into_wall'`` reverses every face, which is
how flow solvers usually store boundary faces.
"""

import numpy as np

__all__ = [
    "uv_sphere", "cylinder_lateral", "box", "tetrahedron",
    "face_centroids", "newell_normals", "enclosed_volume", "volume_centroid",
    "VTK_TETRA", "VTK_HEXAHEDRON", "VTK_WEDGE", "VTK_WEDGE_ID", "VTK_HEXAHEDRON_ID",
    "mixed_cell_vertex_means", "hex_grid", "grid_boundary_patch",
    "pipe_volume", "split_prisms_to_tets", "detached_faces",
    "stretched_nodes", "spherical_shell", "hex_box", "cell_vertex_means",
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


# ---------------------------------------------------------------------------
# Surface meshes
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
# Volume meshes (fluid volumes for Shear Projection)
# ---------------------------------------------------------------------------
#
# The generators below return numpy points and per-type connectivity in VTK's
# vertex order (vtkCellType.h ids), so that tests can evaluate fields at the
# same cell centres the filters use and build the VTK grid with
# scenes.files.mixed_unstructured_grid().  VTK orders a hexahedron with its first quad
# counter-clockwise seen from the second one (right-hand normal into the
# cell), but a wedge with its first triangle clockwise seen from the second
# (right-hand normal out of the cell); a tetrahedron (0, 1, 2, 3) has point 3
# on the side the right-hand normal of (0, 1, 2) points to.  These are the
# orders vtkCellValidator accepts as correctly oriented (checked by hand on
# unit cells) and give positive vtkCellSizeFilter volumes, which
# scenes.files.volume_mesh_check() verifies.

#: VTK cell type ids (vtkCellType.h).
VTK_TETRA, VTK_HEXAHEDRON, VTK_WEDGE = 10, 12, 13
#: The same ids under the names some tests use.
VTK_WEDGE_ID, VTK_HEXAHEDRON_ID = VTK_WEDGE, VTK_HEXAHEDRON


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
