"""A synthetic transient run for the Load History tests, written as a .pvd
series of surfaces with uneven time steps.

The wall is a faceted sphere carrying a face pressure p = -g(t) x (x the face
centroid's coordinate, p in Pa). Wall Traction's pressure force is
-sum p n A, linear in g, so Load Integration's drag along +x is C g(t) with a
constant C fixed by the mesh alone (the tests measure C once, with g = 1, and
check the history against C g(t_i) to round-off). The signal is

    g(t) = MEAN + TRANSIENT exp(-t / TAU) + AMPLITUDE sin(2 pi FREQUENCY t + PHASE) + noise,

noise white, normal, sd NOISE, drawn from a fixed seed; the time steps are
uneven: dt uniform in [0.5, 1.5] DT. Every file is written inline binary (the
platform's expat reads appended files back empty)."""
import os

import numpy as np

import scenes as sc

MEAN, TRANSIENT, TAU = 2.0, 3.0, 0.5            # -, -, s
AMPLITUDE, FREQUENCY, PHASE = 0.5, 1.7, 0.4     # -, Hz, rad
NOISE, DT, DURATION = 0.02, 0.04, 20.0          # -, s, s
RADIUS = 0.3                                    # m


def times(seed=11):
    rng = np.random.default_rng(seed)
    steps = rng.uniform(0.5, 1.5, size=int(2 * DURATION / DT)) * DT
    t = np.concatenate([[0.0], np.cumsum(steps)])
    return t[t <= DURATION]


def signal(t, seed=12, transient=True, noise=True):
    rng = np.random.default_rng(seed)
    g = MEAN + AMPLITUDE * np.sin(2 * np.pi * FREQUENCY * t + PHASE)
    if transient:
        g = g + TRANSIENT * np.exp(-t / TAU)
    if noise:
        g = g + rng.normal(0.0, NOISE, size=t.shape)
    return g


def sphere():
    pts, faces, _ = sc.uv_sphere(RADIUS, 8, 16, ordering="into_wall")
    return pts, faces


def _write_polydata(data, path):
    from vtkmodules.vtkIOXML import vtkXMLPolyDataWriter
    w = vtkXMLPolyDataWriter()
    w.SetDataModeToBinary()  # inline: appended files read back empty on this platform
    w.SetFileName(path)
    w.SetInputData(data)
    assert w.Write() == 1, path


def write_series(folder, name, t, g, face_subset=None):
    """Write <folder>/<name>.pvd and one .vtp per step (p = -g x on the faces
    of `face_subset`, all faces by default); returns the .pvd path."""
    os.makedirs(folder, exist_ok=True)
    pts, faces = sphere()
    if face_subset is not None:
        faces = [faces[i] for i in face_subset]
    x = sc.face_centroids(pts, faces)[:, 0]
    entries = []
    for i, (ti, gi) in enumerate(zip(t, g)):
        fname = "%s_%04d.vtp" % (name, i)
        _write_polydata(sc.polydata(pts, faces, cell_arrays={"p": -gi * x}), os.path.join(folder, fname))
        entries.append('    <DataSet timestep="%.17g" part="0" file="%s"/>' % (ti, fname))
    path = os.path.join(folder, name + ".pvd")
    with open(path, "w") as f:
        f.write('<?xml version="1.0"?>\n<VTKFile type="Collection" version="0.1">\n  <Collection>\n')
        f.write("\n".join(entries))
        f.write("\n  </Collection>\n</VTKFile>\n")
    return path
