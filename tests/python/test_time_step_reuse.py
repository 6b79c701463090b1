"""A time-step loop through a reader: every step is a new file read into new
objects with the same mesh (issue 11). Wall Traction must recognise the mesh
by its content, run the orientation check once, and give on every step
exactly what a fresh filter gives (the reuse may change the cost, never the
result: that is the check, with the loads of each step differing so that
stale values would show).
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


points, faces, _ = S.uv_sphere(1.0, 16, 24, ordering="into_fluid")
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
        T.expect("step %d totals equal a fresh filter's" % step, np.array_equal(got, totals(fli)),
                 "%s vs %s" % (got, totals(fli)))
        T.expect("step %d orientation counts equal" % step,
                 T.field(wt.GetOutputDataObject(0), "Inconsistently Oriented Faces")
                 == T.field(fwt.GetOutputDataObject(0), "Inconsistently Oriented Faces") == 0)
        if previous is not None:
            T.expect("step %d loads differ from the previous step" % step,
                     not np.array_equal(got, previous))
        previous = got
    T.expect("orientation check ran once", wt.GetMeshCacheBuilds() == 1,
             "builds %d" % wt.GetMeshCacheBuilds())
    T.expect("later steps found by content", wt.GetMeshCacheContentHits() == 2,
             "content hits %d" % wt.GetMeshCacheContentHits())

T.done("test_time_step_reuse")
