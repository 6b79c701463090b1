"""Meshes and flows of our own for the Shear Projection tests of 2-D cases
and unstructured near-wall meshes: one-cell-thick slabs of hexahedra or
wedges (a channel, an O-grid around a cylinder), a pipe of prism layers
around a tetrahedral core, and the Stokes-type flow near a cylinder.

Pure numpy geometry; the VTK objects come from ``scenes`` (``import scenes as
S``). Conventions as in ``scenes``: wall faces are returned ordered into the
wall (right-hand normal out of the fluid), as solvers store them.
"""
import math

import numpy as np

import scenes as S

VTK_TETRA, VTK_HEXAHEDRON, VTK_WEDGE = 10, 12, 13


# ---------------------------------------------------------------------------
# 2-D meshes and their extrusion into one-cell-thick slabs
# ---------------------------------------------------------------------------

def channel_2d(length, height, nx, ny, jitter=0.0, seed=0):
    """Nodes (N, 2) and quads (Q, 4, counter-clockwise) of [0, L] x [0, H];
    interior nodes moved at random by up to `jitter` of the local spacing
    (the walls y = 0, H stay straight). Returns (nodes, quads, wall_edges)
    with wall_edges a dict {'bottom': (E, 2), 'top': (E, 2)} of node pairs,
    each edge with the fluid on its left."""
    x = np.linspace(0.0, length, nx + 1)
    y = np.linspace(0.0, height, ny + 1)
    X, Y = np.meshgrid(x, y, indexing="ij")
    nodes = np.stack([X.ravel(), Y.ravel()], axis=1)
    rng = np.random.default_rng(seed)
    inner = np.ones((nx + 1, ny + 1), bool)
    inner[0, :] = inner[-1, :] = inner[:, 0] = inner[:, -1] = False
    inner = inner.ravel()
    nodes[inner] += jitter * rng.uniform(-1, 1, (inner.sum(), 2)) * [length / nx, height / ny]
    nid = lambda i, j: i * (ny + 1) + j
    quads = np.array([(nid(i, j), nid(i + 1, j), nid(i + 1, j + 1), nid(i, j + 1))
                      for i in range(nx) for j in range(ny)])
    bottom = np.array([(nid(i, 0), nid(i + 1, 0)) for i in range(nx)])
    top = np.array([(nid(i + 1, ny), nid(i, ny)) for i in range(nx)])
    return nodes, quads, {"bottom": bottom, "top": top}


def annulus_2d(r_inner, r_outer, n_around, n_radial, stretch=1.0, jitter=0.0, seed=0, warp=0.0):
    """O-grid between two circles: node (i, j) at radius r_i (r_0 = r_inner,
    geometric ratio `stretch`) and angle 2 pi j / n_around (the inner nodes
    on the circle exactly). Interior nodes jittered at random as in
    channel_2d, and/or moved by a smooth distortion: angle and radius
    shifted by `warp` times half the local spacing times sin(3 theta +
    4 pi s) and cos(2 theta - 3 pi s) (s the node's radial fraction), a
    distortion that keeps its shape under refinement (the cells stay
    skewed, but vary smoothly, so that convergence orders are measurable).
    Returns (nodes, quads counter-clockwise, {'cylinder': edges}) with the
    cylinder's edges running clockwise, the fluid on their left."""
    w = stretch ** np.arange(n_radial)
    r = r_inner + (r_outer - r_inner) * np.concatenate([[0.0], np.cumsum(w)]) / w.sum()
    th = 2.0 * np.pi * np.arange(n_around) / n_around
    nodes = np.array([(ri * math.cos(t), ri * math.sin(t)) for ri in r for t in th])
    rng = np.random.default_rng(seed)
    for i in range(1, n_radial):
        for j in range(n_around):
            k = i * n_around + j
            dr = min(r[i] - r[i - 1], r[i + 1] - r[i])
            dth = 2 * np.pi / n_around
            s_ = (r[i] - r_inner) / (r_outer - r_inner)
            a = th[j] + 0.5 * dth * (jitter * rng.uniform(-1, 1) + warp * math.sin(3 * th[j] + 4 * math.pi * s_))
            rr = r[i] + 0.5 * dr * (jitter * rng.uniform(-1, 1) + warp * math.cos(2 * th[j] - 3 * math.pi * s_))
            nodes[k] = (rr * math.cos(a), rr * math.sin(a))
    nid = lambda i, j: i * n_around + (j % n_around)
    quads = np.array([(nid(i, j), nid(i + 1, j), nid(i + 1, j + 1), nid(i, j + 1))
                      for i in range(n_radial) for j in range(n_around)])
    # counter-clockwise: (r_i, th_j) -> (r_i+1, th_j) -> (r_i+1, th_j+1) is ccw about +z
    cyl = np.array([(nid(0, j + 1), nid(0, j)) for j in range(n_around)])
    return nodes, quads, {"cylinder": cyl}


def split_quads(quads, alternate=True):
    """Triangles (counter-clockwise) from quads: diagonal 0-2, or alternately
    0-2 and 1-3 (an unstructured-looking mesh of the same nodes)."""
    tris = []
    for k, (a, b, c, d) in enumerate(quads):
        if alternate and k % 2:
            tris += [(a, b, d), (b, c, d)]
        else:
            tris += [(a, b, c), (a, c, d)]
    return np.array(tris)


def extrude_slab(nodes, cells2d, wall_edges, thickness, rotation=None, origin=(0.0, 0.0, 0.0)):
    """A one-cell-thick slab: the 2-D mesh at z = 0 and z = thickness, each
    cell extruded (quads to hexahedra, triangles to wedges), optionally
    rotated (3x3) and moved. Returns a dict: points (2N, 3), cells [(vtk
    type, conn)], walls {name: quads (E, 4) in the slab's point ids, ordered
    into the wall}, and the 2-D data (nodes, cells2d)."""
    n = nodes.shape[0]
    P = np.vstack([np.hstack([nodes, np.zeros((n, 1))]), np.hstack([nodes, np.full((n, 1), thickness)])])
    R = np.eye(3) if rotation is None else np.asarray(rotation, float)
    P = np.asarray(origin, float) + P @ R.T
    c = np.asarray(cells2d)
    if c.shape[1] == 4:
        cells = [(VTK_HEXAHEDRON, np.hstack([c, c + n]))]
    else:
        # VTK wedge: first triangle clockwise seen from the second.
        cells = [(VTK_WEDGE, np.hstack([c[:, [0, 2, 1]], c[:, [0, 2, 1]] + n]))]
    walls = {}
    for name, e in wall_edges.items():
        e = np.asarray(e)
        # Edge (a, b) with the fluid on its left: the quad (a, b, b', a')
        # has its right-hand normal (b - a) x z on the right, in the wall.
        walls[name] = np.stack([e[:, 0], e[:, 1], e[:, 1] + n, e[:, 0] + n], axis=1)
    return {"points": P, "cells": cells, "walls": walls, "nodes": nodes, "cells2d": c,
            "thickness": thickness}


# ---------------------------------------------------------------------------
# A pipe of prism layers around a tetrahedral core
# ---------------------------------------------------------------------------

def prism_tet_pipe(radius, length, n_around, n_core, n_layers, layer_height, n_axial, growth=1.3):
    """Fluid volume of a pipe r <= R along z: `n_layers` layers of prisms
    (wedges) on the wall, extruded radially from the wall's triangles
    (heights layer_height, growing by `growth`), around a core of
    tetrahedra (`n_core` rings, split from axial prisms conformingly, as in
    scenes.split_prisms_to_tets). The prisms' inner triangles are the core's
    boundary triangles (conforming). The wall points lie on the circle r = R.
    Returns a dict: points, cells [(type, conn)], wall (F, 3) triangles
    ordered into the wall, and the ring radii."""
    R, L, nt, nz = float(radius), float(length), int(n_around), int(n_axial)
    heights = layer_height * growth ** np.arange(n_layers)
    r_core = R - heights.sum()
    assert r_core > 0, "layers thicker than the pipe"
    r_rings = np.concatenate([r_core * np.arange(1, n_core + 1) / n_core,
                              r_core + np.cumsum(heights)])
    nr = r_rings.size
    Np = 1 + nr * nt
    theta = 2.0 * np.pi * np.arange(nt) / nt
    ring = np.stack([np.outer(r_rings, np.cos(theta)).ravel(), np.outer(r_rings, np.sin(theta)).ravel()], 1)
    ring[-nt:] *= R / np.hypot(ring[-nt:, 0], ring[-nt:, 1])[:, None]   # exactly on the wall
    layer = np.vstack([[0.0, 0.0], ring])
    z = L * np.arange(nz + 1) / nz
    points = np.hstack([np.tile(layer, (nz + 1, 1)), np.repeat(z, Np)[:, None]])

    def pid(i, j, k):          # ring i >= 1, angle j (wrapped), station k
        return k * Np + 1 + (i - 1) * nt + (j % nt)

    j = np.arange(nt)
    # Core: the disc of rings 1..n_core triangulated, extruded axially, split into tets.
    tris = [np.stack([np.zeros(nt, np.int64), pid(1, j, 0), pid(1, j + 1, 0)], 1)]
    for i in range(1, n_core):
        q = np.stack([pid(i, j, 0), pid(i + 1, j, 0), pid(i + 1, j + 1, 0), pid(i, j + 1, 0)], 1)
        tris += [q[:, [0, 1, 2]], q[:, [0, 2, 3]]]
    tris = np.vstack(tris)
    prisms = np.vstack([np.hstack([tris + k * Np, tris + (k + 1) * Np]) for k in range(nz)])
    tets = S.split_prisms_to_tets(points, prisms)
    # The core's lateral boundary (ring n_core) is cut along the diagonal of
    # each quad through its smallest id (split_prisms_to_tets' rule); the
    # prism layers take the same cut on every ring, so they conform.
    wedges, wall = [], []
    for k in range(nz):
        for jj in range(nt):
            def quad(i):
                return np.array([pid(i, jj, k), pid(i, jj + 1, k), pid(i, jj + 1, k + 1), pid(i, jj, k + 1)])
            q0 = quad(n_core)
            m = int(np.argmin(q0))
            pattern = ([0, 1, 2], [0, 2, 3]) if m % 2 == 0 else ([0, 1, 3], [1, 2, 3])
            for i in range(n_core, nr):
                qi, qo = quad(i), quad(i + 1)
                for t in pattern:
                    wedges.append(np.concatenate([qi[t], qo[t]]))
            qw = quad(nr)
            for t in pattern:
                wall.append(qw[t])
    wedges = np.array(wedges, dtype=np.int64)
    # VTK wedge orientation: first triangle clockwise seen from the second.
    a, b, c, d = (points[wedges[:, k]] for k in (0, 1, 2, 3))
    flip = np.einsum("ij,ij->i", np.cross(b - a, c - a), d - a) > 0
    wedges[flip] = wedges[flip][:, [0, 2, 1, 3, 5, 4]]
    wall = np.array(wall, dtype=np.int64)
    # Into the wall: right-hand normal radially outward.
    wc = points[wall].mean(axis=1)
    nrm = np.cross(points[wall[:, 1]] - points[wall[:, 0]], points[wall[:, 2]] - points[wall[:, 0]])
    out = np.einsum("ij,ij->i", nrm[:, :2], wc[:, :2]) > 0
    wall[~out] = wall[~out][:, ::-1]
    caps = 2 * (tris.shape[0] + nt * n_layers)   # each end: core triangles, one quad per layer and angle
    return {"points": points, "cells": [(VTK_TETRA, tets), (VTK_WEDGE, wedges)], "wall": wall,
            "rings": r_rings, "caps": caps}


# ---------------------------------------------------------------------------
# Flows
# ---------------------------------------------------------------------------

def stokes_cylinder(x, radius, U):
    """Creeping flow near a circular cylinder (axis z, radius R) in a stream
    along x, from the stream function
        psi = U sin(theta) g(r),  g(r) = r ln(r/R) - r/2 + R^2/(2 r),
    which is biharmonic (a Stokes flow) with psi = dpsi/dr = 0 on r = R: no
    slip (the inner solution of Oseen flow past a cylinder; Lamb,
    Hydrodynamics, 6th ed., §343 -- section recalled from memory; the
    velocities and the wall shear below are our own differentiation):
        u_r = U cos(theta) g(r)/r,   u_theta = -U sin(theta) g'(r),
        g'(r) = ln(r/R) + 1/2 - R^2/(2 r^2),   g''(R) = 2/R.
    Returns the velocity (M, 3) at the points x (z ignored)."""
    x = np.asarray(x, float)
    r = np.hypot(x[:, 0], x[:, 1])
    th = np.arctan2(x[:, 1], x[:, 0])
    R = float(radius)
    g = r * np.log(r / R) - 0.5 * r + R * R / (2 * r)
    gp = np.log(r / R) + 0.5 - R * R / (2 * r * r)
    ur = U * np.cos(th) * g / r
    ut = -U * np.sin(th) * gp
    return np.stack([ur * np.cos(th) - ut * np.sin(th), ur * np.sin(th) + ut * np.cos(th), 0 * r], 1)


def stokes_cylinder_wall_shear(x, radius, U, mu):
    """Wall shear stress of stokes_cylinder at the wall point in the radial
    direction of x: tau = mu du_theta/dr e_theta = -(2 mu U/R) sin(theta)
    e_theta (u = 0 along the wall, so the G^T n part vanishes). Its
    integral over the wall is the friction force 2 pi mu U per unit length
    along x (our own integration of sin^2)."""
    x = np.asarray(x, float)
    th = np.arctan2(x[:, 1], x[:, 0])
    t = -2.0 * mu * U / radius * np.sin(th)
    return np.stack([-t * np.sin(th), t * np.cos(th), 0 * th], 1)


def stokes_cylinder_gradient(x, radius, U, h=1e-6):
    """Velocity gradient (M, 9) of stokes_cylinder by central differences of
    step h R (error ~ h^2, below 1e-10 relative here)."""
    x = np.asarray(x, float)
    G = np.zeros((x.shape[0], 9))
    for j in range(2):
        e = np.zeros(3)
        e[j] = h * radius
        du = (stokes_cylinder(x + e, radius, U) - stokes_cylinder(x - e, radius, U)) / (2 * h * radius)
        for i in range(3):
            G[:, 3 * i + j] = du[:, i]
    return G
