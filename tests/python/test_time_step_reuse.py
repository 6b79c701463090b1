"""A time-step loop through a reader: every step is a new file read into new
objects with the same mesh (issue 11). For an open surface Wall Traction must
recognise the mesh by its content and run the exact orientation check once;
a closed one it certifies again in the face loop without hashing. On every
step it must give exactly what a fresh filter gives (the reuse may change the
cost, never the result: that is the check, with the loads of each step
differing so that stale values would show).
"""
import os
import tempfile

import numpy as np

import wl_testing as T
import scenes as S

T.load_plugin()
from vtkmodules.vtkIOXML import vtkXMLPolyDataReader, vtkXMLPolyDataWriter  # noqa: E402
from wallloads.WallLoadsFilters import vtkLoadIntegration, vtkWallTraction  # noqa: E402


def pipeline(source_port=None, data=None):
    wt = vtkWallTraction()
    if source_port is not None:
        wt.SetInputConnection(source_port)
    else:
        wt.SetInputData(data)
    wt.SetInputArrayToProcess(0, 0, 0, 1, "p")
    wt.SetOrientation(vtkWallTraction.STORED_INTO_FLUID)
    li = vtkLoadIntegration()
    li.SetInputConnection(wt.GetOutputPort())
    li.SetMomentCentre(0.1, 0.2, -0.3)
    return wt, li


def totals(li):
    out = li.GetOutputDataObject(0)
    return np.array([T.field(out, name) for name in ("Force", "Moment")]).ravel()


points, faces, row = S.uv_sphere(1.0, 16, 24, ordering="into_fluid")
# Closed (certified in the face loop) and open (the southern polar cap
# removed: the exact check runs once and its result is found by content).
SURFACES = {
    "closed": faces,
    "open": [f for f, r in zip(faces, row) if r != 15],
}


def time_loop(label, faces):
    centroids = S.face_centroids(points, faces)
    with tempfile.TemporaryDirectory() as tmp:
        paths = []
        for step in range(3):
            # Hydrostatic pressure whose gravity turns with the step.
            g = np.array([np.cos(step), np.sin(step), 1.0])
            p = 1e5 - 998.0 * 9.81 * centroids @ g
            pd = S.polydata(points, faces, cell_arrays={"p": p})
            path = os.path.join(tmp, "step%d.vtp" % step)
            writer = vtkXMLPolyDataWriter()
            writer.SetInputData(pd)
            writer.SetFileName(path)
            writer.SetDataModeToBinary()  # inline binary (see PLATFORM notes on appended)
            writer.Write()
            paths.append(path)

        reader = vtkXMLPolyDataReader()
        wt, li = pipeline(source_port=reader.GetOutputPort())
        previous = None
        for step, path in enumerate(paths):
            reader.SetFileName(path)
            li.Update()
            got = totals(li)
            # The same step through a fresh pipeline (its own reader).
            fresh_reader = vtkXMLPolyDataReader()
            fresh_reader.SetFileName(path)
            fresh_reader.Update()
            fwt, fli = pipeline(data=fresh_reader.GetOutput())
            fli.Update()
            T.expect("%s step %d totals equal a fresh filter's" % (label, step),
                     np.array_equal(got, totals(fli)), "%s vs %s" % (got, totals(fli)))
            for name in ("Inconsistently Oriented Faces", "Open Boundary Edges"):
                T.expect("%s step %d %s equal a fresh filter's" % (label, step, name),
                         T.field(wt.GetOutputDataObject(0), name)
                         == T.field(fwt.GetOutputDataObject(0), name))
            if previous is not None:
                T.expect("%s step %d loads differ from the previous step" % (label, step),
                         not np.array_equal(got, previous))
            previous = got
        return wt


wt = time_loop("open", SURFACES["open"])
T.expect("open: 24 open edges", T.field(wt.GetOutputDataObject(0), "Open Boundary Edges") == 24)
T.expect("open: orientation check ran once", wt.GetMeshCacheBuilds() == 1,
         "builds %d" % wt.GetMeshCacheBuilds())
T.expect("open: later steps found by content", wt.GetMeshCacheContentHits() == 2,
         "content hits %d" % wt.GetMeshCacheContentHits())
T.expect("open: one hash per step", wt.GetMeshContentHashes() == 3,
         "hashes %d" % wt.GetMeshContentHashes())

# A closed surface is certified again on every step's new objects, in the
# face loop, and never hashed (the hash would cost more than it saves).
wt = time_loop("closed", SURFACES["closed"])
T.expect("closed: certified on every step", wt.GetMeshCacheBuilds() == 3,
         "builds %d" % wt.GetMeshCacheBuilds())
T.expect("closed: no hash taken", wt.GetMeshContentHashes() == 0,
         "hashes %d" % wt.GetMeshContentHashes())
T.expect("closed: no open edge", T.field(wt.GetOutputDataObject(0), "Open Boundary Edges") == 0)
T.expect("closed: no inconsistent face",
         T.field(wt.GetOutputDataObject(0), "Inconsistently Oriented Faces") == 0)

T.done("test_time_step_reuse")
