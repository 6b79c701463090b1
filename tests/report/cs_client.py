"""Client side of test_client_server.py: pvpython connected to a pvserver.

argv: port, demo case, mode ('autoloaded' | 'bare').  Prints lines the test reads."""
import sys

from paraview import simple

port, case, mode = int(sys.argv[1]), sys.argv[2], sys.argv[3]
simple.Connect("localhost", port)
from wallloads import batch  # noqa: E402

if mode == "autoloaded":
    print("FILTERS_AT_CONNECT", hasattr(simple, "WallTraction"))
    try:   # what a user gets loading the plugin again on a server that auto-loaded it
        simple.LoadPlugin(batch._plugin_path(), remote=True, ns=vars(simple))
        print("REMOTE_RELOAD ok")
    except RuntimeError as exc:
        print("REMOTE_RELOAD", exc)
simple = batch.load_plugin()
reader = simple.XMLMultiBlockDataReader(FileName=[case])
wt = simple.WallTraction(Input=reader, Pressure=["POINTS", "static_pressure"], ReferencePressure=1.0e5,
                         ShearSource="Wall shear stress array", ShearStressArray=["CELLS", "wall_shear"])
li = simple.LoadIntegration(Input=wt)
rows = batch.load_table(li)
print("REGIONS", ",".join(sorted(rows)))
print("TOTAL_FORCE %r %r %r" % rows["Total"]["Force"])
totals = batch.field_totals(li)
print("FIELD_FORCE %r %r %r" % totals["Force"])
bad = simple.XMLMultiBlockDataReader(FileName=[case + ".missing"])
try:
    batch.load_table(simple.LoadIntegration(Input=simple.WallTraction(Input=bad)))
    print("MISSING_FILE no error")
except batch.PipelineError as exc:
    print("MISSING_FILE raised", str(exc).splitlines()[0])
simple.Disconnect()
print("CLIENT_DONE")
