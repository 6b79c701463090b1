"""VTK objects and files of the scenes.

Builds vtkPolyData and vtkUnstructuredGrid from the numpy meshes of
:mod:`scenes.meshes` (arrays deep-copied; integer arrays keep their type,
others become float64), writes them as VTK XML in inline binary mode (never
appended: Debian 12's patched expat truncates appended data on reading), and
checks generated volume meshes with VTK's own tools.  VTK is imported inside
the functions, so the geometry can be used without it.
"""

import numpy as np

__all__ = [
    "polydata", "mixed_unstructured_grid", "unstructured_grid",
    "write_vtm", "write_vtu", "volume_mesh_check",
]



# ---------------------------------------------------------------------------
# VTK objects
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


# ---------------------------------------------------------------------------
# Files
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
# Checks
# ---------------------------------------------------------------------------

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
