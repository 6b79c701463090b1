"""Independent numpy computation of Wall Traction's per-face forces and Load
Integration's totals, for the fuzz driver's clean cases.

Written from the conventions in README.md (not from the C++): Newell area
vector a = 1/2 sum x_i x x_{i+1} (Sutherland, Sproull & Schumacker 1974),
area centroid of the fan from the first corner weighted by the fan triangles'
areas projected on the unit normal, t = -(p - p_ref) n + tau n with
tau = mu_eff (G + G^T) - 2/3 mu_eff tr(G) I (Batchelor 1967, §3.3), the wall
shear stress the tangential part of tau n, f = t A, F = sum f,
M = sum (c - r0) x f. Sums with math.fsum (exactly rounded).
"""
import math

import numpy as np
from vtkmodules.util.numpy_support import vtk_to_numpy

DUPLICATE, HIDDEN = 1, 32


def faces_of(ds):
    """Corner id lists of the 2-D cells (clean cases hold triangles, quads, polygons)."""
    out = []
    for c in range(ds.GetNumberOfCells()):
        ids = ds.GetCell(c).GetPointIds()
        out.append([ids.GetId(k) for k in range(ids.GetNumberOfIds())])
    return out


def geometry(points, face):
    v = points[face]
    d = v - v[0]
    a = 0.5 * np.cross(d, np.roll(d, -1, axis=0)).sum(axis=0)
    area = np.linalg.norm(a)
    nhat = a / area
    w, cw = 0.0, np.zeros(3)
    for j in range(1, len(face) - 1):
        wt = np.dot(np.cross(v[j] - v[0], v[j + 1] - v[0]), nhat)
        w += wt
        cw += wt * (v[0] + v[j] + v[j + 1]) / 3.0
    return area, nhat, cw / w


def face_value(ds, selection, face, cell, comps):
    """The value of a face from a selection (association, name) as the
    filters take it: 0 points (the mean over its corners), 1 cells."""
    association, name = selection
    on_points = association == 0
    attrs = ds.GetPointData() if on_points else ds.GetCellData()
    arr = vtk_to_numpy(attrs.GetArray(name)).astype(np.float64).reshape(-1, comps)
    return arr[face].mean(axis=0) if on_points else arr[cell]


def wall_traction(ds, s):
    """Per-face (area, pressure force, viscous force, centroid, counted) under settings s."""
    points = vtk_to_numpy(ds.GetPoints().GetData()).astype(np.float64)
    ghosts = ds.GetCellData().GetArray("vtkGhostType")
    ghosts = vtk_to_numpy(ghosts) if ghosts is not None else np.zeros(ds.GetNumberOfCells(), np.uint8)
    rows = []
    for c, face in enumerate(faces_of(ds)):
        area, nhat, centroid = geometry(points, face)
        n = nhat if s["Orientation"] == 1 else -nhat
        rho = s["Density"]
        if s.get("DensityArray"):
            rho = face_value(ds, s["DensityArray"], face, c, 1)[0]
        p = 0.0
        if s.get("Pressure"):
            p = face_value(ds, s["Pressure"], face, c, 1)[0]
            p = (rho * p if s["PressureKind"] == 1 else p) - s["ReferencePressure"]
        visc = np.zeros(3)
        if s["ShearSource"] == 1:
            visc = face_value(ds, s["ShearStressArray"], face, c, 3)
            visc = visc * (rho if s["ShearStressKind"] == 1 else 1.0)
        elif s["ShearSource"] == 2:
            G = face_value(ds, s["VelocityGradient"], face, c, 9).reshape(3, 3)
            mu = s["Viscosity"]
            if s.get("ViscosityArray"):
                mu = face_value(ds, s["ViscosityArray"], face, c, 1)[0]
            if s.get("TurbulentViscosityArray"):
                mu = mu + face_value(ds, s["TurbulentViscosityArray"],
                                     face, c, 1)[0]
            mu_eff = rho * mu if s["ViscosityKind"] == 1 else mu
            tau = mu_eff * (G + G.T) - 2.0 / 3.0 * mu_eff * np.trace(G) * np.eye(3)
            visc = tau @ n
        vn = np.dot(visc, n)
        shear = visc - vn * n
        viscous = shear + (vn * n if s["IncludeNormalViscousStress"] else 0.0)
        counted = (int(ghosts[c]) & (DUPLICATE | HIDDEN)) == 0
        rows.append((area, -p * n * area, viscous * area, centroid, counted))
    return rows


def totals(rows, r0):
    """Area, force and moment over the counted faces, exactly rounded sums."""
    fsum = lambda xs: math.fsum(xs)  # noqa: E731
    counted = [r for r in rows if r[4]]
    area = fsum(r[0] for r in counted)
    force = np.array([fsum(r[1][k] + r[2][k] for r in counted) for k in range(3)])
    moments = [np.cross(r[3] - r0, r[1]) + np.cross(r[3] - r0, r[2]) for r in counted]
    moment = np.array([fsum(m[k] for m in moments) for k in range(3)])
    scale = fsum(np.linalg.norm(r[1] + r[2]) for r in counted)
    mscale = fsum(np.linalg.norm(r[3] - r0) * np.linalg.norm(r[1] + r[2]) for r in counted)
    return area, force, moment, scale, mscale
