"""Reading appended-mode VTK XML files (the default of ParaView's writers).

Debian 12's patched expat makes VTK 9.2's reader return zero cells for
appended files of more than a few KB. This test writes such a file and reads
it back in child processes without and with the project's preload library
(plugin/expat): with it, every cell must come back. Without it the result is
printed (it depends on the expat version installed) but not asserted."""
import os
import shutil
import subprocess
import tempfile

import wl_testing as T
import scenes as sc
from vtkmodules.vtkIOXML import vtkXMLPolyDataWriter

pts, faces, _ = sc.uv_sphere(1.0, 64, 128)
pd = sc.polydata(pts, faces, cell_arrays={"p": sc.face_centroids(pts, faces)[:, 2]})
out_dir = os.environ.get("WALLLOADS_TEST_OUTPUT", tempfile.gettempdir())
os.makedirs(out_dir, exist_ok=True)
path = os.path.join(out_dir, "appended_sphere.vtp")
w = vtkXMLPolyDataWriter()
w.SetFileName(path)
w.SetDataModeToAppended()
w.SetInputData(pd)
assert w.Write() == 1

reader_script = (
    "from vtkmodules.vtkIOXML import vtkXMLPolyDataReader\n"
    "r = vtkXMLPolyDataReader(); r.SetFileName(%r); r.Update()\n"
    "print('CELLS', r.GetOutput().GetNumberOfCells())\n" % path)


def cells_read(preload):
    env = dict(os.environ)
    env.pop("LD_PRELOAD", None)
    if preload:
        env["LD_PRELOAD"] = preload
    run = subprocess.run([shutil.which("pvpython") or "pvpython", "-c", reader_script], env=env, capture_output=True, text=True)
    for line in run.stdout.splitlines():
        if line.startswith("CELLS"):
            return int(line.split()[1])
    raise AssertionError("reader child failed: %s %s" % (run.stdout, run.stderr))


fix = os.environ["WALLLOADS_EXPAT_FIX"]
assert os.path.exists(fix), fix
without = cells_read(None)
with_fix = cells_read(fix)
print("appended file of %d cells: %d read back without the preload library, %d with it"
      % (pd.GetNumberOfCells(), without, with_fix))
T.check_close("cells read with the preload library", with_fix, pd.GetNumberOfCells())
T.done(__file__)
