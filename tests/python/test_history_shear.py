"""Load History through Shear Projection: a 20-step series on an unchanged
mesh builds Shear Projection's adjacency once (its counter,
vtkShearProjection::GetNumberOfAdjacencyBuilds), and the history is linear in
the driving speed.

The series: a channel of hexahedra (the scenes library's hex_grid) with the
cell velocity u = U(t) y / H e_x, U(t) = 1 + 0.5 sin(2 pi 0.8 t) at 20
uneven times, written as a .pvd of .vtu files. A Programmable Filter hands
each step's velocity to Shear Projection on the same mesh objects (points and
cells), as a reader that keeps a static mesh between steps does; the
adjacency is keyed on those objects (filters/WallAdjacency.h, MeshKey).

The same series read as plain files (the reader makes new point and cell
arrays at every step with the same content) also builds it once: MeshKey falls
back to a content hash of the mesh arrays when the objects differ."""
import os
import tempfile

import numpy as np

import wl_testing as T
import scenes as S

simple = T.load_plugin()

out = os.path.join(os.environ.get("WALLLOADS_TEST_OUTPUT", tempfile.gettempdir()), "history_shear")
os.makedirs(out, exist_ok=True)
H_CH = 0.2
X, Y, Z = np.linspace(0, 1, 7), np.linspace(0, H_CH, 6), np.linspace(0, 0.3, 3)
P, hexes, _ = S.hex_grid(X, Y, Z)
C = P[hexes].mean(axis=1)
t = np.cumsum(np.r_[0, np.random.default_rng(1).uniform(0.5, 1.5, 19)]) * 0.1
U = 1 + 0.5 * np.sin(2 * np.pi * 0.8 * t)
entries = []
for i, (ti, ui) in enumerate(zip(t, U)):
    vol = S.mixed_unstructured_grid(P, [(S.VTK_HEXAHEDRON, hexes)],
                                    cell_arrays={"velocity": np.outer(ui * C[:, 1] / H_CH, [1.0, 0.0, 0.0])})
    S.write_vtu(vol, os.path.join(out, "channel_%02d.vtu" % i))
    entries.append('    <DataSet timestep="%.17g" file="channel_%02d.vtu"/>' % (ti, i))
pvd = os.path.join(out, "channel.pvd")
with open(pvd, "w") as f:
    f.write('<?xml version="1.0"?>\n<VTKFile type="Collection" version="0.1">\n  <Collection>\n%s\n'
            '  </Collection>\n</VTKFile>\n' % "\n".join(entries))

# The mesh once, kept by the Programmable Filter between steps.
mesh = S.mixed_unstructured_grid(P, [(S.VTK_HEXAHEDRON, hexes)])
import builtins  # noqa: E402
builtins.wallloads_history_mesh = mesh


def loads_chain(volume):
    sp = simple.ShearProjection(Input=volume, Velocity=["CELLS", "velocity"])
    wt = simple.WallTraction(Input=sp, PressureKind="None", ShearSource="Wall shear stress array",
                             ShearStressArray=["CELLS", "Wall Shear Stress"])
    li = simple.LoadIntegration(Input=wt)
    lh = simple.LoadHistory(Input=simple.OutputPort(li, 1))
    lh.UpdatePipeline()
    return sp.GetClientSideObject(), lh.GetClientSideObject().GetOutputDataObject(0)


reader = simple.PVDReader(FileName=pvd)
same_mesh = simple.ProgrammableFilter(Input=reader, OutputDataSetType="vtkUnstructuredGrid", Script=(
    "import builtins\n"
    "out = self.GetOutput()\n"
    "out.ShallowCopy(builtins.wallloads_history_mesh)\n"
    "out.GetCellData().AddArray(self.GetInput().GetCellData().GetArray('velocity'))\n"))
sp, history = loads_chain(same_mesh)
T.expect("20 steps in the history", history.GetNumberOfRows() == 20, str(history.GetNumberOfRows()))
T.expect("20 steps through Shear Projection build the adjacency once",
         sp.GetNumberOfAdjacencyBuilds() == 1, "%d builds" % sp.GetNumberOfAdjacencyBuilds())
# Every load is linear in U (u = U y/H, Shear Projection and the sums are
# linear in the velocity): the viscous drag over U is the same at every step.
from vtkmodules.util.numpy_support import vtk_to_numpy  # noqa: E402
drag = vtk_to_numpy(history.GetColumnByName("Total: Viscous Force X"))
ratio = drag / U
T.close_worst("Total: Viscous Force X / U(t) constant over the steps", ratio, ratio[0], rtol=1e-12,
              source="linearity in the velocity")
T.close_worst("Time column = the written times", vtk_to_numpy(history.GetColumnByName("Time")), t, atol=1e-15)

sp_files, history_files = loads_chain(reader)
T.expect("a file series (new arrays, same content, every step) builds the adjacency once",
         sp_files.GetNumberOfAdjacencyBuilds() == 1 and history_files.GetNumberOfRows() == 20,
         "%d builds over %d steps" % (sp_files.GetNumberOfAdjacencyBuilds(), history_files.GetNumberOfRows()))
T.close_worst("file series: the same history", vtk_to_numpy(history_files.GetColumnByName("Total: Viscous Force X")),
              drag, rtol=1e-12)
T.done("test_history_shear")
