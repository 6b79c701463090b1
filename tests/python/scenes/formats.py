"""Case files in the formats solvers write, made by our own code: a channel
with a volume and named boundary patches in CGNS and Exodus II, composite VTK
XML files in appended mode (the default of ParaView's writers, which Debian
12's patched expat truncates on reading without the fix), and a .pvd time
series.

CGNS and Exodus II files are written through the mid-level C APIs of the
libraries that ship with ParaView (libvtkcgns, libvtkexodusII, called with
ctypes), so the files carry what the readers look for: CGNS boundary
conditions with families (CGNSSeriesReader loads them as patches), Exodus
side sets with names and element variables.

The channel: hexahedra on [0, Lx] x [0, Ly] x [0, H], plane Couette flow
u = U(t) z / H e_x (cell-centred velocity; a point field `wall_velocity` of
the same profile gives the moving lid's velocity on the walls) and
hydrostatic pressure p = p0 - rho g z at the points.  Exact loads per wall
(`channel_exact`): the floor (z = 0) carries mu U / H Lx Ly along +x and
-(p0 - p_ref) Lx Ly along z; the lid (z = H) the opposite shear and
+(p0 - rho g H - p_ref) Lx Ly along z (White, Viscous Fluid Flow, 3rd ed.,
sec. 3-2.1 for the Couette profile).
"""
import ctypes
import os

import numpy as np

from .meshes import hex_grid

__all__ = ["channel", "channel_exact", "write_cgns", "write_exodus", "write_vtm_appended",
           "write_vtp_appended", "write_pvd", "write_vtpc_appended", "channel_blocks"]

_LIB = "/usr/lib/x86_64-linux-gnu"


def channel(nx=6, ny=4, nz=5, Lx=2.0, Ly=1.0, H=0.5, mu=1.5e-3, rho=998.0, g=9.81, p0=1.0e5, U=0.3):
    """The channel case as numpy arrays: points, hexahedra, fields and patches.

    Patches map a name to (quads as point ids ordered out of the fluid, the
    adjacent hexahedron of each quad, its Exodus side number)."""
    x, y, z = np.linspace(0, Lx, nx + 1), np.linspace(0, Ly, ny + 1), np.linspace(0, H, nz + 1)
    points, hexes, ijk = hex_grid(x, y, z)
    centres = points[hexes].mean(axis=1)
    patches = {}
    # Exodus HEX8 sides (1-based nodes): 1: 1 2 6 5 (y min), 2: 2 3 7 6 (x max),
    # 3: 3 4 8 7 (y max), 4: 1 5 8 4 (x min), 5: 1 4 3 2 (z min), 6: 5 6 7 8 (z max);
    # each ordered with its right-hand normal out of the element.
    sides = {1: (0, 1, 5, 4), 2: (1, 2, 6, 5), 3: (2, 3, 7, 6), 4: (0, 4, 7, 3), 5: (0, 3, 2, 1),
             6: (4, 5, 6, 7)}
    for name, mask, side in (("floor", ijk[:, 2] == 0, 5), ("lid", ijk[:, 2] == nz - 1, 6),
                             ("inlet", ijk[:, 0] == 0, 4), ("outlet", ijk[:, 0] == nx - 1, 2),
                             ("side_a", ijk[:, 1] == 0, 1), ("side_b", ijk[:, 1] == ny - 1, 3)):
        cells = np.nonzero(mask)[0]
        quads = hexes[cells][:, list(sides[side])]
        patches[name] = (quads, cells, side)
    return {"points": points, "hexes": hexes, "centres": centres, "patches": patches,
            "params": dict(nx=nx, ny=ny, nz=nz, Lx=Lx, Ly=Ly, H=H, mu=mu, rho=rho, g=g, p0=p0, U=U)}


def channel_fields(case, U=None):
    """Cell velocity, point pressure and point wall velocity at speed U."""
    par = case["params"]
    U = par["U"] if U is None else U
    vel = np.zeros((len(case["hexes"]), 3))
    vel[:, 0] = U * case["centres"][:, 2] / par["H"]
    wall_vel = np.zeros((len(case["points"]), 3))
    wall_vel[:, 0] = U * case["points"][:, 2] / par["H"]
    pressure = par["p0"] - par["rho"] * par["g"] * case["points"][:, 2]
    return vel, pressure, wall_vel


def channel_exact(case, p_ref=0.0, U=None):
    """Exact force on the floor and the lid: {name: (pressure force, viscous force)} (N)."""
    par = case["params"]
    U = par["U"] if U is None else U
    A = par["Lx"] * par["Ly"]
    tau = par["mu"] * U / par["H"]
    return {"floor": (np.array([0, 0, -(par["p0"] - p_ref) * A]), np.array([tau * A, 0, 0])),
            "lid": (np.array([0, 0, (par["p0"] - par["rho"] * par["g"] * par["H"] - p_ref) * A]),
                    np.array([-tau * A, 0, 0]))}


# ---------------------------------------------------------------------------
# CGNS (mid-level library through ctypes)
# ---------------------------------------------------------------------------

class _Cgns:
    Unstructured, RealDouble, HEXA_8, QUAD_4 = 3, 4, 17, 7
    Vertex, CellCenter, FaceCenter, PointRange = 2, 3, 4, 4
    BCWall = 20   # ParaView 5.11's reader loads wall-type BCs as patches (it skips inflow, outflow, ...)

    def __init__(self):
        self.lib = ctypes.CDLL(os.path.join(_LIB, "libvtkcgns-pv5.11.so.1"))

    def __call__(self, name, *args):
        fn = getattr(self.lib, "vtkcgns_" + name)
        status = fn(*args)
        if status != 0:
            err = self.lib.vtkcgns_cg_get_error
            err.restype = ctypes.c_char_p
            raise IOError("CGNS %s failed: %s" % (name, err().decode()))


def _size(values):
    a = np.ascontiguousarray(values, dtype=np.int64)      # cgsize_t is 64-bit in this build
    return a, a.ctypes.data_as(ctypes.POINTER(ctypes.c_int64))


def write_cgns(path, case, U=None):
    """One base, one unstructured zone: the hexahedra, a boundary section of
    quads, one BC per patch (with a family of the same name, which the reader
    needs to load a patch), vertex pressure and wall velocity, cell velocity."""
    cg = _Cgns()
    I = ctypes.c_int
    pts, hexes = case["points"], case["hexes"]
    vel, pressure, wall_vel = channel_fields(case, U)
    fn, B, Z, idx = I(), I(), I(), I()
    if os.path.exists(path):
        os.unlink(path)
    cg("cg_open", str(path).encode(), 1, ctypes.byref(fn))
    try:
        cg("cg_base_write", fn, b"channel", 3, 3, ctypes.byref(B))
        n_quads = sum(len(q) for q, _, _ in case["patches"].values())
        size, psize = _size([len(pts), len(hexes), 0])
        cg("cg_zone_write", fn, B, b"fluid", psize, _Cgns.Unstructured, ctypes.byref(Z))
        for k, name in enumerate((b"CoordinateX", b"CoordinateY", b"CoordinateZ")):
            c = np.ascontiguousarray(pts[:, k], dtype=np.float64)
            cg("cg_coord_write", fn, B, Z, _Cgns.RealDouble, name, c.ctypes.data_as(ctypes.c_void_p),
               ctypes.byref(idx))
        conn, pconn = _size(hexes.ravel() + 1)
        cg("cg_section_write", fn, B, Z, b"hexahedra", _Cgns.HEXA_8, ctypes.c_int64(1), ctypes.c_int64(len(hexes)),
           0, pconn, ctypes.byref(idx))
        start = len(hexes) + 1
        ranges = {}
        for name, (quads, cells, side) in case["patches"].items():
            qc, pqc = _size(quads.ravel() + 1)
            end = start + len(quads) - 1
            cg("cg_section_write", fn, B, Z, (name + "_faces").encode(), _Cgns.QUAD_4, ctypes.c_int64(start),
               ctypes.c_int64(end), 0, pqc, ctypes.byref(idx))
            ranges[name] = (start, end)
            start = end + 1
        assert start - 1 == len(hexes) + n_quads
        for name, (first, last) in ranges.items():
            fam = I()
            cg("cg_family_write", fn, B, name.encode(), ctypes.byref(fam))
            fbc = I()
            cg("cg_fambc_write", fn, B, fam, b"FamBC", _Cgns.BCWall, ctypes.byref(fbc))
            rng, prng = _size([first, last])
            bc = I()
            cg("cg_boco_write", fn, B, Z, name.encode(), _Cgns.BCWall, _Cgns.PointRange, ctypes.c_int64(2),
               prng, ctypes.byref(bc))
            cg("cg_boco_gridlocation_write", fn, B, Z, bc, _Cgns.FaceCenter)
            cg("cg_goto", fn, B, b"Zone_t", Z, b"ZoneBC_t", I(1), b"BC_t", bc, b"end")
            cg("cg_famname_write", name.encode())
        for solname, loc, fields in ((b"vertex_solution", _Cgns.Vertex, {"static_pressure": pressure,
                                                                  "wall_velocityX": wall_vel[:, 0],
                                                                  "wall_velocityY": wall_vel[:, 1],
                                                                  "wall_velocityZ": wall_vel[:, 2]}),
                                     (b"cell_solution", _Cgns.CellCenter, {"velocityX": vel[:, 0],
                                                                   "velocityY": vel[:, 1],
                                                                   "velocityZ": vel[:, 2]})):
            S = I()
            cg("cg_sol_write", fn, B, Z, solname, loc, ctypes.byref(S))
            for fname, values in fields.items():
                v = np.ascontiguousarray(values, dtype=np.float64)
                cg("cg_field_write", fn, B, Z, S, _Cgns.RealDouble, fname.encode(),
                   v.ctypes.data_as(ctypes.c_void_p), ctypes.byref(idx))
    finally:
        cg("cg_close", fn)
    return path


# ---------------------------------------------------------------------------
# Exodus II (through ctypes)
# ---------------------------------------------------------------------------

def write_exodus(path, case, times=(0.0,), speeds=None):
    """One element block of HEX8, one named side set per patch, nodal
    static_pressure and wall_velocityX/Y/Z, element velocityX/Y/Z (read as vectors), at each
    time (speeds: the Couette speed at each time; default the case's U)."""
    lib = ctypes.CDLL(os.path.join(_LIB, "libvtkexodusII-pv5.11.so.1"))

    def ex(name, *args):
        status = getattr(lib, "vtkexodusII_" + name)(*args)
        if status < 0:
            raise IOError("Exodus %s failed (%d)" % (name, status))
        return status

    EX_ELEM_BLOCK, EX_SIDE_SET, EX_NODAL, EX_CLOBBER = 1, 3, 14, 0x0008
    I64 = ctypes.c_int64
    pts, hexes = case["points"], case["hexes"]
    speeds = [case["params"]["U"]] * len(times) if speeds is None else list(speeds)
    cws, iows = ctypes.c_int(8), ctypes.c_int(8)
    lib.vtkexodusII_ex_create_int.restype = ctypes.c_int
    exoid = lib.vtkexodusII_ex_create_int(str(path).encode(), EX_CLOBBER, ctypes.byref(cws),
                                          ctypes.byref(iows), 811)
    if exoid < 0:
        raise IOError("cannot create %s" % path)
    try:
        patches = case["patches"]
        ex("ex_put_init", exoid, b"channel", I64(3), I64(len(pts)), I64(len(hexes)), I64(1), I64(0),
           I64(len(patches)))
        xyz = [np.ascontiguousarray(pts[:, k], dtype=np.float64) for k in range(3)]
        ex("ex_put_coord", exoid, *[a.ctypes.data_as(ctypes.c_void_p) for a in xyz])
        ex("ex_put_block", exoid, EX_ELEM_BLOCK, I64(1), b"HEX8", I64(len(hexes)), I64(8), I64(0), I64(0), I64(0))
        conn = np.ascontiguousarray(hexes.ravel() + 1, dtype=np.int32)
        ex("ex_put_conn", exoid, EX_ELEM_BLOCK, I64(1), conn.ctypes.data_as(ctypes.c_void_p), None, None)
        names = (ctypes.c_char_p * 1)(b"fluid")
        ex("ex_put_names", exoid, EX_ELEM_BLOCK, names)
        for k, (name, (quads, cells, side)) in enumerate(patches.items(), 1):
            ex("ex_put_set_param", exoid, EX_SIDE_SET, I64(k), I64(len(cells)), I64(0))
            elems = np.ascontiguousarray(cells + 1, dtype=np.int32)
            side_ids = np.full(len(cells), side, dtype=np.int32)
            ex("ex_put_set", exoid, EX_SIDE_SET, I64(k), elems.ctypes.data_as(ctypes.c_void_p),
               side_ids.ctypes.data_as(ctypes.c_void_p))
        set_names = (ctypes.c_char_p * len(patches))(*[n.encode() for n in patches])
        ex("ex_put_names", exoid, EX_SIDE_SET, set_names)
        nodal = [b"static_pressure", b"wall_velocityX", b"wall_velocityY", b"wall_velocityZ"]
        elem = [b"velocityX", b"velocityY", b"velocityZ"]
        ex("ex_put_variable_param", exoid, EX_NODAL, len(nodal))
        ex("ex_put_variable_names", exoid, EX_NODAL, len(nodal), (ctypes.c_char_p * len(nodal))(*nodal))
        ex("ex_put_variable_param", exoid, EX_ELEM_BLOCK, len(elem))
        ex("ex_put_variable_names", exoid, EX_ELEM_BLOCK, len(elem), (ctypes.c_char_p * len(elem))(*elem))
        for step, (t, U) in enumerate(zip(times, speeds), 1):
            tv = ctypes.c_double(t)
            ex("ex_put_time", exoid, step, ctypes.byref(tv))
            vel, pressure, wall_vel = channel_fields(case, U)
            for k, values in enumerate([pressure, wall_vel[:, 0], wall_vel[:, 1], wall_vel[:, 2]], 1):
                v = np.ascontiguousarray(values, dtype=np.float64)
                ex("ex_put_var", exoid, step, EX_NODAL, k, I64(1), I64(len(v)), v.ctypes.data_as(ctypes.c_void_p))
            for k in range(3):
                v = np.ascontiguousarray(vel[:, k], dtype=np.float64)
                ex("ex_put_var", exoid, step, EX_ELEM_BLOCK, k + 1, I64(1), I64(len(v)),
                   v.ctypes.data_as(ctypes.c_void_p))
    finally:
        lib.vtkexodusII_ex_close(exoid)
    return path


# ---------------------------------------------------------------------------
# VTK XML in appended mode (what ParaView's writers produce by default)
# ---------------------------------------------------------------------------

def channel_blocks(case, U=None, walls=("floor", "lid")):
    """The channel's walls as named vtkPolyData blocks with their own points,
    carrying point static_pressure and cell wall_shear (the exact Couette
    traction, Pa), ordered into the wall."""
    from .files import polydata
    par = case["params"]
    U = par["U"] if U is None else U
    vel, pressure, _ = channel_fields(case, U)
    blocks = []
    for name in walls:
        quads = case["patches"][name][0]
        ids, inverse = np.unique(quads.ravel(), return_inverse=True)
        faces = inverse.reshape(quads.shape)
        shear = np.zeros((len(quads), 3))
        shear[:, 0] = (1.0 if name == "floor" else -1.0) * par["mu"] * U / par["H"]
        blocks.append((name, polydata(case["points"][ids], [tuple(f) for f in faces],
                                      cell_arrays={"wall_shear": shear},
                                      point_arrays={"static_pressure": pressure[ids]})))
    return blocks


def _appended(writer, compress=False):
    """Appended raw data, as ParaView's writers do by default.  Uncompressed
    unless asked: the expat defect shows on files past a few kilobytes of
    XML-parsed input, which compressed test files stay under."""
    writer.SetDataModeToAppended()
    writer.SetEncodeAppendedData(0)
    if not compress:
        writer.SetCompressorTypeToNone()


def write_vtp_appended(pd, path):
    from vtkmodules.vtkIOXML import vtkXMLPolyDataWriter
    os.makedirs(os.path.dirname(os.path.abspath(path)), exist_ok=True)
    w = vtkXMLPolyDataWriter()
    w.SetFileName(str(path))
    _appended(w)
    w.SetInputData(pd)
    if w.Write() != 1:
        raise IOError("failed to write %s" % path)
    return path


def write_vtm_appended(blocks, path):
    """Named polydata blocks as .vtm with appended-mode .vtp pieces."""
    from vtkmodules.vtkCommonDataModel import vtkCompositeDataSet, vtkMultiBlockDataSet
    from vtkmodules.vtkIOXML import vtkXMLMultiBlockDataWriter
    mb = vtkMultiBlockDataSet()
    mb.SetNumberOfBlocks(len(blocks))
    for i, (name, pd) in enumerate(blocks):
        mb.SetBlock(i, pd)
        mb.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), str(name))
    os.makedirs(os.path.dirname(os.path.abspath(path)), exist_ok=True)
    w = vtkXMLMultiBlockDataWriter()
    w.SetFileName(str(path))
    _appended(w)
    w.SetInputData(mb)
    if w.Write() != 1:
        raise IOError("failed to write %s" % path)
    return path


def write_vtpc_appended(blocks, path):
    """Named polydata blocks as a partitioned dataset collection (.vtpc), appended mode."""
    from vtkmodules.vtkCommonDataModel import (vtkCompositeDataSet, vtkPartitionedDataSet,
                                               vtkPartitionedDataSetCollection)
    from vtkmodules.vtkIOParallelXML import vtkXMLPartitionedDataSetCollectionWriter
    pdc = vtkPartitionedDataSetCollection()
    for i, (name, pd) in enumerate(blocks):
        part = vtkPartitionedDataSet()
        part.SetPartition(0, pd)
        pdc.SetPartitionedDataSet(i, part)
        pdc.GetMetaData(i).Set(vtkCompositeDataSet.NAME(), str(name))
    os.makedirs(os.path.dirname(os.path.abspath(path)), exist_ok=True)
    w = vtkXMLPartitionedDataSetCollectionWriter()
    w.SetFileName(str(path))
    _appended(w)
    w.SetInputData(pdc)
    if w.Write() != 1:
        raise IOError("failed to write %s" % path)
    return path


def write_pvd(steps, path):
    """A time series: steps is [(time, [(name, vtkPolyData), ...])]; each step a
    .vtm with appended pieces, listed in a .pvd."""
    folder = os.path.splitext(os.path.abspath(path))[0]
    entries = []
    for k, (t, blocks) in enumerate(steps):
        name = "step_%03d.vtm" % k
        write_vtm_appended(blocks, os.path.join(folder, name))
        entries.append('    <DataSet timestep="%r" part="0" file="%s/%s"/>'
                       % (float(t), os.path.basename(folder), name))
    with open(path, "w") as handle:
        handle.write('<?xml version="1.0"?>\n<VTKFile type="Collection" version="0.1">\n  <Collection>\n'
                     + "\n".join(entries) + "\n  </Collection>\n</VTKFile>\n")
    return path
