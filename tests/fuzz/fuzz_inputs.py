"""Random inputs for the WallLoads fuzz driver: surfaces, volumes, composites,
arrays and filter settings, from well-formed to hostile.

Every generator takes a numpy Generator and returns VTK objects built in
memory. A case is "clean" when it is well formed (finite coordinates of
ordinary size, valid ids, planar-enough polygons, arrays of the right kind,
width and length): the driver then also checks the results against an
independent numpy computation (fuzz_oracle.py).
"""
import numpy as np
from vtkmodules.util.numpy_support import numpy_to_vtk, numpy_to_vtkIdTypeArray
from vtkmodules.vtkCommonCore import (vtkDoubleArray, vtkFloatArray, vtkIntArray, vtkLongLongArray,
                                      vtkPoints, vtkStringArray, vtkTypeInt32Array,
                                      vtkTypeInt64Array, vtkUnsignedCharArray)
from vtkmodules.vtkCommonDataModel import (vtkCellArray, vtkImageData, vtkMultiBlockDataSet,
                                           vtkPartitionedDataSet, vtkPartitionedDataSetCollection,
                                           vtkPolyData, vtkRectilinearGrid, vtkStructuredGrid,
                                           vtkUnstructuredGrid)
from vtkmodules.vtkCommonDataModel import vtkCompositeDataSet

# VTK cell type ids (vtkCellType.h)
VERTEX, POLY_VERTEX, LINE, POLY_LINE, TRIANGLE, TRIANGLE_STRIP, POLYGON, PIXEL, QUAD = 1, 2, 3, 4, 5, 6, 7, 8, 9
TETRA, VOXEL, HEXAHEDRON, WEDGE, PYRAMID = 10, 11, 12, 13, 14
QUADRATIC_TRIANGLE, QUADRATIC_QUAD, QUADRATIC_TETRA, QUADRATIC_HEXAHEDRON = 22, 23, 24, 25
BIQUADRATIC_QUAD, BIQUADRATIC_TRIANGLE = 28, 34

# corner counts of fixed-size cells
CORNERS = {VERTEX: 1, LINE: 2, TRIANGLE: 3, PIXEL: 4, QUAD: 4, TETRA: 4, VOXEL: 8, HEXAHEDRON: 8,
           WEDGE: 6, PYRAMID: 5, QUADRATIC_TRIANGLE: 6, QUADRATIC_QUAD: 8, QUADRATIC_TETRA: 10,
           QUADRATIC_HEXAHEDRON: 20, BIQUADRATIC_QUAD: 9, BIQUADRATIC_TRIANGLE: 7}
SURFACE_TYPES = [TRIANGLE, QUAD, POLYGON, PIXEL, QUADRATIC_TRIANGLE, QUADRATIC_QUAD, BIQUADRATIC_QUAD,
                 BIQUADRATIC_TRIANGLE]
OTHER_TYPES = [VERTEX, POLY_VERTEX, LINE, POLY_LINE, TRIANGLE_STRIP, TETRA, HEXAHEDRON, WEDGE]
VOLUME_TYPES = [TETRA, HEXAHEDRON, WEDGE, PYRAMID, VOXEL, QUADRATIC_TETRA, QUADRATIC_HEXAHEDRON]

# names that settings may select: some exist on a given input, some don't
ARRAY_NAMES = ["pressure", "wall_shear", "velocity_gradient", "density", "viscosity",
               "eddy_viscosity", "zone", "velocity", "wall_velocity", "missing"]
WIDTHS = {"pressure": 1, "wall_shear": 3, "velocity_gradient": 9, "density": 1, "viscosity": 1,
          "eddy_viscosity": 1, "zone": 1, "velocity": 3, "wall_velocity": 3}

SCALES = [1.0, 1.0, 1.0, 1e-3, 1e3, 1e-200, 1e77, 1e200, 1e-30]


def pick(rng, seq, p=None):
    return seq[int(rng.choice(len(seq), p=p))]


# --- values ------------------------------------------------------------------------
def hostile_values(rng, shape, integer=False):
    """Mostly ordinary values, sprinkled with NaN, Inf, huge, tiny and extremes."""
    v = rng.normal(size=shape) * pick(rng, [1.0, 1e5, 1e-5, 1e150])
    if integer:
        lim = pick(rng, [10, 2**31 - 1, 2**62])
        return rng.integers(-lim, lim, size=shape, endpoint=True)
    if rng.random() < 0.3:
        mask = rng.random(shape) < 0.1
        v[mask] = rng.choice([np.nan, np.inf, -np.inf, 1e308, -1e308, 5e-324], size=int(mask.sum()))
    return v


def numeric_array(name, values, kind):
    values = np.ascontiguousarray(values)
    if kind == "double":
        arr = numpy_to_vtk(values.astype(np.float64), deep=1, array_type=11)
    elif kind == "float":
        with np.errstate(over="ignore", invalid="ignore"):
            arr = numpy_to_vtk(values.astype(np.float32), deep=1, array_type=10)
    elif kind == "int32":
        arr = numpy_to_vtk(np.clip(np.nan_to_num(values), -2**31, 2**31 - 1).astype(np.int32), deep=1,
                           array_type=6)
    elif kind == "int64":
        arr = numpy_to_vtk(np.clip(np.nan_to_num(values), -2**63, 2**63 - 1024).astype(np.int64),
                           deep=1, array_type=16)
    else:  # uint8
        arr = numpy_to_vtk(np.clip(np.nan_to_num(values), 0, 255).astype(np.uint8), deep=1, array_type=3)
    arr.SetName(name)
    return arr


def add_array(rng, ds, name, n_cells, n_points, clean):
    """Add an array named `name` with a random association, kind, width, length."""
    width = WIDTHS.get(name, 1)
    on_points = rng.random() < 0.35
    n = n_points if on_points else n_cells
    if clean:
        kind = pick(rng, ["double", "double", "float"])
        comps, length = width, n
        vals = rng.normal(size=(length, comps)) * (1e5 if name == "pressure" else 1.0)
        if name == "zone":
            vals = rng.integers(0, 4, size=(length, 1)).astype(float)
            kind = "int32"
        if name in ("density", "viscosity", "eddy_viscosity"):
            vals = np.abs(vals) + 0.1
    else:
        if rng.random() < 0.02:  # a string array under a numeric array's name
            s = vtkStringArray()
            s.SetName(name)
            s.SetNumberOfValues(n)
            for i in range(n):
                s.SetValue(i, "x%d" % i)
            (ds.GetPointData() if on_points else ds.GetCellData()).AddArray(s)
            return
        kind = pick(rng, ["double", "double", "double", "float", "float", "int32", "int64", "uint8"])
        comps = width if rng.random() < 0.95 else int(rng.integers(1, 10))
        length = n if rng.random() < 0.95 else max(0, n + int(rng.integers(-3, 4)))
        if rng.random() < 0.02:
            length = 1
        vals = hostile_values(rng, (length, comps), integer=kind in ("int32", "int64"))
        if name == "zone" and rng.random() < 0.5:
            kind = pick(rng, ["int32", "int64"])
            lim = pick(rng, [3, 2**31 - 1, 2**62, 2**63 - 1025])
            vals = rng.integers(-lim, lim, size=(length, comps), endpoint=True)
    arr = numeric_array(name, vals.reshape(length, comps), kind)
    arr.SetNumberOfComponents(comps)
    (ds.GetPointData() if on_points else ds.GetCellData()).AddArray(arr)


def add_ghosts(rng, ds, clean):
    n = ds.GetNumberOfCells()
    if clean:
        g = rng.choice([0, 0, 0, 1, 32, 2, 8], size=n).astype(np.uint8)
        arr = numpy_to_vtk(g, deep=1, array_type=3)
    else:
        mode = pick(rng, ["ok", "short", "long", "int", "two"])
        length = {"short": max(0, n - 1 - int(rng.integers(0, 3))), "long": n + 2}.get(mode, n)
        g = rng.integers(0, 256, size=length)
        if mode == "int":
            arr = numpy_to_vtk(g.astype(np.int32), deep=1, array_type=6)
        elif mode == "two":
            arr = numpy_to_vtk(np.repeat(g, 2).astype(np.uint8).reshape(-1, 2), deep=1, array_type=3)
        else:
            arr = numpy_to_vtk(g.astype(np.uint8), deep=1, array_type=3)
    arr.SetName("vtkGhostType")
    ds.GetCellData().AddArray(arr)


# --- geometry ----------------------------------------------------------------------
def random_points(rng, n, clean):
    if clean:
        return rng.normal(size=(n, 3)) * pick(rng, [1.0, 1e-3, 10.0])
    pts = rng.normal(size=(n, 3)) * pick(rng, SCALES)
    if rng.random() < 0.2 and n:
        pts[rng.random(n) < 0.2] = pick(rng, [np.nan, np.inf, 1e300])
    if rng.random() < 0.1 and n > 3:  # collinear or coincident points
        pts[: n // 2] = pts[0] + np.outer(np.arange(n // 2), pts[1] - pts[0])
    return pts


def vtk_points(pts, rng):
    p = vtkPoints()
    if rng.random() < 0.3:
        p.SetDataTypeToFloat()
        with np.errstate(over="ignore", invalid="ignore"):
            p.SetData(numpy_to_vtk(pts.astype(np.float32), deep=1))
    else:
        p.SetData(numpy_to_vtk(pts.astype(np.float64), deep=1))
    return p


def cell_array_of(cells, wide):
    """vtkCellArray from a list of id lists, 32- or 64-bit storage."""
    offsets = np.zeros(len(cells) + 1, dtype=np.int64)
    offsets[1:] = np.cumsum([len(c) for c in cells]) if cells else []
    conn = np.concatenate([np.asarray(c, dtype=np.int64) for c in cells]) if cells else np.zeros(0, np.int64)
    return cell_array_from(offsets, conn, wide)


def cell_types_of(types):
    """vtkUnsignedCharArray of VTK cell type ids (a numpy array or a list)."""
    ct = vtkUnsignedCharArray()
    ct.DeepCopy(numpy_to_vtk(np.ascontiguousarray(types, dtype=np.uint8), deep=1, array_type=3))
    return ct


def cell_array_from(offsets, conn, wide):
    """vtkCellArray from int64 offsets and connectivity, 32- or 64-bit storage."""
    ca = vtkCellArray()
    if wide:
        o, c = vtkTypeInt64Array(), vtkTypeInt64Array()
        o.DeepCopy(numpy_to_vtk(offsets, deep=1, array_type=16))
        c.DeepCopy(numpy_to_vtk(conn, deep=1, array_type=16))
    else:
        o, c = vtkTypeInt32Array(), vtkTypeInt32Array()
        o.DeepCopy(numpy_to_vtk(offsets.astype(np.int32), deep=1, array_type=6))
        c.DeepCopy(numpy_to_vtk(conn.astype(np.int32), deep=1, array_type=6))
    ca.SetData(o, c)
    return ca


def random_cell(rng, ctype, npts, clean):
    if ctype in CORNERS:
        k = CORNERS[ctype]
    elif ctype == POLYGON:
        k = int(rng.integers(3, 9))
    else:
        k = int(rng.integers(1, 7))
    if clean:
        ids = list(rng.choice(npts, size=k, replace=False)) if npts >= k else []
    else:
        if rng.random() < 0.05:
            k = int(rng.integers(0, 3)) if ctype == POLYGON else k
        ids = list(rng.integers(0, max(npts, 1), size=k))
        if rng.random() < 0.04 and ids:  # an id past the last point, or negative
            ids[int(rng.integers(0, len(ids)))] = pick(rng, [npts, npts + 7, 2**31 - 1, -1])
    return [int(i) for i in ids]


def random_surface(rng, clean):
    """vtkPolyData or vtkUnstructuredGrid of mostly 2-D cells."""
    if clean:
        return planar_clean_surface(rng)
    n_points = int(rng.integers(0, 40))
    pts = random_points(rng, n_points, clean)
    n_cells = int(rng.integers(0, 30))
    wide = rng.random() < 0.4
    p_other = pick(rng, [0.0, 0.1, 0.5])
    types = [pick(rng, OTHER_TYPES) if rng.random() < p_other else pick(rng, SURFACE_TYPES)
             for _ in range(n_cells)]
    cells = [random_cell(rng, t, n_points, clean) for t in types]
    use_poly = rng.random() < 0.6
    if use_poly:
        pd = vtkPolyData()
        pd.SetPoints(vtk_points(pts, rng))
        groups = {"verts": [], "lines": [], "polys": [], "strips": []}
        kept = []
        for t, c in zip(types, cells):
            if t in (VERTEX, POLY_VERTEX):
                groups["verts"].append(c)
            elif t in (LINE, POLY_LINE):
                groups["lines"].append(c)
            elif t == TRIANGLE_STRIP:
                groups["strips"].append(c)
            elif t in (TRIANGLE, QUAD, POLYGON):
                groups["polys"].append(c)
            else:
                continue  # polydata holds no pixels or quadratic cells
            kept.append(t)
        pd.SetVerts(cell_array_of(groups["verts"], wide))
        pd.SetLines(cell_array_of(groups["lines"], wide))
        pd.SetPolys(cell_array_of(groups["polys"], wide))
        pd.SetStrips(cell_array_of(groups["strips"], wide))
        ds = pd
    else:
        ug = vtkUnstructuredGrid()
        ug.SetPoints(vtk_points(pts, rng))
        ct = cell_types_of(types)
        ug.SetCells(ct, cell_array_of(cells, wide))
        ds = ug
    if not clean and rng.random() < 0.03:
        ds.SetPoints(None)  # cells but no points
    decorate(rng, ds, clean)
    return ds


def decorate(rng, ds, clean):
    n_cells, n_points = ds.GetNumberOfCells(), ds.GetNumberOfPoints()
    for name in ARRAY_NAMES[:-1]:
        if rng.random() < (0.85 if clean else 0.6):
            add_array(rng, ds, name, n_cells, n_points, clean)
    if rng.random() < 0.25:
        add_ghosts(rng, ds, clean)


def planar_clean_surface(rng):
    """A clean, oracle-friendly surface: a perturbed closed or open polyhedral
    patch of triangles/quads/polygons with well-separated points."""
    nu, nv = int(rng.integers(2, 7)), int(rng.integers(2, 7))
    u = np.linspace(0, 1, nu + 1)
    v = np.linspace(0, 1, nv + 1)
    U, V = np.meshgrid(u, v, indexing="ij")
    pts = np.stack([U.ravel(), V.ravel(), 0.1 * np.sin(3 * U.ravel() + V.ravel())], axis=1)
    rot = np.linalg.qr(rng.normal(size=(3, 3)))[0]
    pts = pts @ rot.T * pick(rng, [1.0, 0.01, 100.0]) + rng.normal(size=3)
    pid = lambda i, j: i * (nv + 1) + j  # noqa: E731
    cells, types = [], []
    for i in range(nu):
        for j in range(nv):
            q = [pid(i, j), pid(i + 1, j), pid(i + 1, j + 1), pid(i, j + 1)]
            r = rng.random()
            if r < 0.4:
                cells += [[q[0], q[1], q[2]], [q[0], q[2], q[3]]]
                types += [TRIANGLE, TRIANGLE]
            elif r < 0.8:
                cells.append(q)
                types.append(QUAD)
            else:
                cells.append(q)
                types.append(POLYGON)
    wide = rng.random() < 0.4
    if rng.random() < 0.5:
        ds = vtkPolyData()
        ds.SetPoints(vtk_points(pts, rng))
        ds.SetPolys(cell_array_of(cells, wide))
    else:
        ds = vtkUnstructuredGrid()
        ds.SetPoints(vtk_points(pts, rng))
        ct = cell_types_of(types)
        ds.SetCells(ct, cell_array_of(cells, wide))
    decorate(rng, ds, clean=True)
    return ds


def random_volume(rng, clean):
    """A small volume: a hexahedral block split into random 3-D cell kinds,
    or a structured dataset; sometimes hostile."""
    kind = pick(rng, ["ugrid", "ugrid", "ugrid", "image", "rectilinear", "structured"])
    nx, ny, nz = (int(rng.integers(1, 4)) for _ in range(3))
    x = np.cumsum(np.r_[0, rng.uniform(0.2, 1.0, nx)])
    y = np.cumsum(np.r_[0, rng.uniform(0.2, 1.0, ny)])
    z = np.cumsum(np.r_[0, rng.uniform(0.2, 1.0, nz)])
    if kind == "image":
        ds = vtkImageData()
        ds.SetDimensions(nx + 1, ny + 1, nz + 1)
        ds.SetSpacing(*rng.uniform(0.1, 2.0, 3))
    elif kind == "rectilinear":
        ds = vtkRectilinearGrid()
        ds.SetDimensions(nx + 1, ny + 1, nz + 1)
        ds.SetXCoordinates(numpy_to_vtk(x, deep=1))
        ds.SetYCoordinates(numpy_to_vtk(y, deep=1))
        ds.SetZCoordinates(numpy_to_vtk(z, deep=1))
    else:
        X, Y, Z = np.meshgrid(x, y, z, indexing="ij")
        pts = np.stack([X.ravel(order="F"), Y.ravel(order="F"), Z.ravel(order="F")], axis=1)
        if kind == "structured":
            ds = vtkStructuredGrid()
            ds.SetDimensions(nx + 1, ny + 1, nz + 1)
            ds.SetPoints(vtk_points(pts, rng))
        else:
            ds = hex_block_ugrid(rng, pts, nx, ny, nz, clean)
    decorate(rng, ds, clean)
    return ds


def hex_block_ugrid(rng, pts, nx, ny, nz, clean):
    pid = lambda i, j, k: i + (nx + 1) * (j + (ny + 1) * k)  # noqa: E731
    cells, types = [], []
    for k in range(nz):
        for j in range(ny):
            for i in range(nx):
                h = [pid(i, j, k), pid(i + 1, j, k), pid(i + 1, j + 1, k), pid(i, j + 1, k),
                     pid(i, j, k + 1), pid(i + 1, j, k + 1), pid(i + 1, j + 1, k + 1), pid(i, j + 1, k + 1)]
                r = rng.random()
                if r < 0.5:
                    cells.append(h)
                    types.append(HEXAHEDRON)
                elif r < 0.75:  # two wedges
                    cells += [[h[0], h[1], h[3], h[4], h[5], h[7]], [h[1], h[2], h[3], h[5], h[6], h[7]]]
                    types += [WEDGE, WEDGE]
                else:  # five tetrahedra
                    for t in ([0, 1, 3, 4], [1, 2, 3, 6], [1, 4, 5, 6], [3, 4, 6, 7], [1, 3, 4, 6]):
                        cells.append([h[a] for a in t])
                        types.append(TETRA)
    if not clean and rng.random() < 0.2 and types[0] == HEXAHEDRON:
        # a quadratic hexahedron on the first hexahedron's corners, with its
        # twelve mid-edge nodes appended as new points
        n0 = len(pts)
        corners = cells[0]
        edges = [(0, 1), (1, 2), (2, 3), (3, 0), (4, 5), (5, 6), (6, 7), (7, 4),
                 (0, 4), (1, 5), (2, 6), (3, 7)]
        mids = np.array([0.5 * (pts[corners[a]] + pts[corners[b]]) for a, b in edges])
        pts = np.vstack([pts, mids])
        cells.append(list(corners) + list(range(n0, n0 + 12)))
        types.append(QUADRATIC_HEXAHEDRON)
    if not clean and rng.random() < 0.1 and cells:
        cells[-1] = random_cell(rng, types[-1], len(pts), clean=False)
    ug = vtkUnstructuredGrid()
    ug.SetPoints(vtk_points(pts, rng))
    ct = cell_types_of(types)
    ug.SetCells(ct, cell_array_of(cells, rng.random() < 0.4))
    return ug


# --- composites --------------------------------------------------------------------
def random_composite(rng, make_leaf, clean):
    """A multiblock (maybe nested, with empty and None leaves) or a partitioned
    dataset collection of leaves made by make_leaf."""
    if rng.random() < 0.3:
        pdc = vtkPartitionedDataSetCollection()
        for i in range(int(rng.integers(0 if not clean else 1, 4))):
            pds = vtkPartitionedDataSet()
            for j in range(int(rng.integers(0, 3))):
                pds.SetPartition(j, make_leaf())
            pdc.SetPartitionedDataSet(i, pds)
            pdc.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), pick(rng, ["wall", "body", "", "wall"]))
        return pdc
    mb = vtkMultiBlockDataSet()
    for i in range(int(rng.integers(0 if not clean else 1, 4))):
        r = rng.random()
        if r < 0.15 and not clean:
            mb.SetBlock(i, None)
        elif r < 0.3:
            inner = vtkMultiBlockDataSet()
            inner.SetBlock(0, make_leaf())
            if rng.random() < 0.5:
                inner.SetBlock(1, vtkPolyData())
            mb.SetBlock(i, inner)
        elif r < 0.35 and not clean:
            img = vtkImageData()
            img.SetDimensions(2, 2, 1)
            mb.SetBlock(i, img)
        else:
            mb.SetBlock(i, make_leaf())
        mb.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), pick(rng, ["Upper", "Lower", "", "Upper"]))
    return mb


# --- settings ----------------------------------------------------------------------
def hostile_number(rng, typical):
    return pick(rng, [typical, typical, typical, 0.0, -typical, np.nan, np.inf, 1e300, 1e-300])


def hostile_vector(rng, typical):
    r = rng.random()
    if r < 0.6:
        return list(typical)
    if r < 0.8:
        return list(rng.normal(size=3) * pick(rng, [1.0, 1e200, 1e-200]))
    return pick(rng, [[0.0, 0.0, 0.0], [np.nan, 0.0, 1.0], [1e200, 1e200, 0.0], [1e-200, 0.0, 0.0],
                      [np.inf, 0, 0]])


def selection(rng, name, clean):
    """(association, name) for SetInputArrayToProcess: 0 points, 1 cells."""
    if clean:
        return None
    if rng.random() < 0.05:
        name = pick(rng, ARRAY_NAMES)
    return (int(rng.random() < 0.35), name)


# --- large surfaces ------------------------------------------------------------------
# Wall Traction writes its per-face arrays with streaming stores when they
# take at least 32 MiB together (WallTractionTypes.h, StreamBytes): 174 763
# faces with all arrays (24 doubles a face), 599 187 with forces only (7).
STREAM_BYTES = 32 * 1024 * 1024
OUTPUT_DOUBLES = {"all arrays": 24, "forces only": 7}
STREAM_FACES = {k: -(-STREAM_BYTES // (8 * d)) for k, d in OUTPUT_DOUBLES.items()}


def large_surface(rng, clean):
    """A surface above the streaming threshold, and whether its case asks
    for forces only: a wavy grid of quads (some split into two triangles in
    place, so that runs of one corner count break at random faces), polydata
    or an unstructured grid, 32- or 64-bit ids, float or double points,
    double cell arrays (pressure, gradient, wall shear; sometimes density and
    viscosities). Hostile cases sprinkle degenerate faces (a repeated
    corner), NaN and Inf values and ghost flags at random faces. Built with
    numpy, in well under a second."""
    forces_only = rng.random() < 0.3
    target = int(STREAM_FACES["forces only" if forces_only else "all arrays"] * rng.uniform(1.01, 1.3))
    nv = int(rng.integers(200, 700))
    nu = target // nv + 1
    u, v = np.meshgrid(np.linspace(0, 1, nu + 1), np.linspace(0, 1, nv + 1), indexing="ij")
    pts = np.stack([u.ravel(), v.ravel(), 0.05 * np.sin(7 * u.ravel()) * np.cos(5 * v.ravel())], axis=1)
    pts = pts * pick(rng, [1.0, 0.01, 100.0]) + rng.normal(size=3)
    i, j = np.meshgrid(np.arange(nu), np.arange(nv), indexing="ij")
    q = (i * (nv + 1) + j).ravel()
    q = np.stack([q, q + nv + 1, q + nv + 2, q + 1], axis=1)
    split = rng.random(len(q)) < pick(rng, [0.0, 0.001, 0.02, 0.3])
    # Six id slots a quad: q0 q1 q2 q3 - - whole, q0 q1 q2 q0 q2 q3 split.
    slots = np.full((len(q), 6), -1, dtype=np.int64)
    slots[:, :4] = q
    slots[split] = q[split][:, [0, 1, 2, 0, 2, 3]]
    conn = slots[slots >= 0]
    sizes = np.where(split[:, None], [3, 3], [4, 0]).ravel()
    sizes = sizes[sizes > 0]
    offsets = np.r_[0, np.cumsum(sizes)].astype(np.int64)
    n_cells = len(sizes)
    if not clean:
        bad = np.flatnonzero(rng.random(n_cells) < pick(rng, [0.0, 1e-4, 1e-3]))
        conn[offsets[bad] + 1] = conn[offsets[bad]]  # a repeated corner: a degenerate face
    cells = cell_array_from(offsets, conn, rng.random() < 0.5)
    if rng.random() < 0.5:
        ds = vtkPolyData()
        ds.SetPoints(vtk_points(pts, rng))
        ds.SetPolys(cells)
    else:
        ds = vtkUnstructuredGrid()
        ds.SetPoints(vtk_points(pts, rng))
        ct = cell_types_of(np.where(sizes == 3, TRIANGLE, QUAD))
        ds.SetCells(ct, cells)
    widths = {"pressure": 1, "velocity_gradient": 9, "wall_shear": 3}
    for name in ("density", "viscosity", "eddy_viscosity"):
        if rng.random() < 0.3:
            widths[name] = 1
    for name, width in widths.items():
        vals = rng.normal(size=(n_cells, width)) * (1e5 if name == "pressure" else 1.0)
        if name in ("density", "viscosity", "eddy_viscosity"):
            vals = np.abs(vals) + 0.1
        if not clean and rng.random() < 0.5:
            hit = rng.random(n_cells) < pick(rng, [1e-4, 1e-3])
            vals[hit, int(rng.integers(0, width))] = pick(rng, [np.nan, np.inf, -np.inf])
        ds.GetCellData().AddArray(numeric_array(name, vals, "double"))
    if not clean and rng.random() < 0.3:
        g = np.where(rng.random(n_cells) < 0.01, pick(rng, [1, 32, 2, 8]), 0).astype(np.uint8)
        arr = numpy_to_vtk(g, deep=1, array_type=3)
        arr.SetName("vtkGhostType")
        ds.GetCellData().AddArray(arr)
    return ds, forces_only
