"""pvpython connected to `mpirun -np 2 pvserver`, as README documents it.

- Server started with PV_PLUGIN_PATH (auto-loads the plugin): the client has
  the filters at connection; loading the plugin again on the server fails in
  ParaView 5.11 with "Problem loading plugin" (printed, the behaviour this
  route avoids); `batch.load_plugin()` uses the server's plugin and the loads
  table, fetched from the server, equals the builtin session's.
- Server started without it: `batch.load_plugin()` loads the plugin there.
In both, a pipeline whose reader fails raises PipelineError in the client
(the error itself happens on the server)."""
import os
import socket
import subprocess

import time

import report_testing as R

DEMO = os.path.join(R.SOURCE, "examples", "demo", "bead.vtm")
CLIENT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "cs_client.py")
PLUGIN_DIR = os.path.dirname(os.environ["WALLLOADS_PLUGIN"])
BASE = {k: v for k, v in os.environ.items() if not k.startswith(("OMPI_COMM", "PMIX_", "PMI_", "OMPI_MCA_ess",
                                                                   "OMPI_MCA_orte", "OMPI_MCA_pmix"))
        and k not in ("PV_PLUGIN_PATH",)}


def free_port():
    s = socket.socket()
    s.bind(("localhost", 0))
    port = s.getsockname()[1]
    s.close()
    return port


def session(mode):
    port = free_port()
    env = dict(BASE)
    if mode == "autoloaded":
        env["PV_PLUGIN_PATH"] = PLUGIN_DIR
    server = subprocess.Popen(["mpirun", "-np", "2", "--oversubscribe", "-x", "PV_PLUGIN_PATH", "pvserver", "--mpi",
                               "--server-port=%d" % port] if mode == "autoloaded" else
                              ["mpirun", "-np", "2", "--oversubscribe", "pvserver", "--mpi", "--server-port=%d" % port],
                              stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True, env=env)
    try:
        t0 = time.time()
        line = ""
        while "Accepting connection" not in line:
            line = server.stdout.readline()
            if not line and server.poll() is not None:
                raise AssertionError("pvserver ended before accepting connections")
            if time.time() - t0 > 120:
                raise AssertionError("pvserver did not start")
        client_env = dict(BASE)
        client_env.pop("PV_PLUGIN_PATH", None)
        client = subprocess.run(["pvpython", CLIENT, str(port), DEMO, mode], capture_output=True, text=True,
                                env=client_env, timeout=180)
        out = client.stdout
        print(out)
        if client.returncode:
            print(client.stderr[-2000:])
        R.expect("%s: client ran to the end" % mode, "CLIENT_DONE" in out and client.returncode == 0)
        server.wait(timeout=60)     # pvserver ends when its client disconnects
        return dict(line.split(" ", 1) for line in out.splitlines() if " " in line)
    finally:
        if server.poll() is None:
            server.kill()
            server.wait()


builtin = subprocess.run(["pvpython", "-c",
                          "from wallloads import batch\nsimple = batch.load_plugin()\n"
                          "r = simple.XMLMultiBlockDataReader(FileName=[%r])\n"
                          "wt = simple.WallTraction(Input=r, Pressure=['POINTS', 'static_pressure'], "
                          "ReferencePressure=1.0e5, ShearSource='Wall shear stress array', "
                          "ShearStressArray=['CELLS', 'wall_shear'])\n"
                          "print('TOTAL_FORCE %%r %%r %%r' %% batch.load_table(simple.LoadIntegration(Input=wt))"
                          "['Total']['Force'])\n" % DEMO], capture_output=True, text=True, env=BASE, timeout=120)
expected = [float(x) for x in [l for l in builtin.stdout.splitlines() if l.startswith("TOTAL_FORCE")][0].split()[1:]]

for mode in ("autoloaded", "bare"):
    got = session(mode)
    if mode == "autoloaded":
        R.expect("autoloaded: the client has the filters at connection", got.get("FILTERS_AT_CONNECT") == "True")
        print("loading the plugin again on that server:", got.get("REMOTE_RELOAD"))
    R.expect("%s: regions of the demo" % mode, got.get("REGIONS") == "Equator Band,Lower Cap,Total,Upper Cap",
             got.get("REGIONS"))
    force = [float(x) for x in got["TOTAL_FORCE"].split()]
    field = [float(x) for x in got["FIELD_FORCE"].split()]
    for k in range(3):
        R.close("%s: table total force %s equals the builtin session's" % (mode, "xyz"[k]), force[k], expected[k],
                rtol=1e-12, atol=1e-18)
        R.close("%s: field-data total force %s" % (mode, "xyz"[k]), field[k], expected[k], rtol=1e-12, atol=1e-18)
    R.expect("%s: a failed reader raises PipelineError" % mode, got.get("MISSING_FILE", "").startswith("raised"),
             got.get("MISSING_FILE"))
R.done(__file__)
