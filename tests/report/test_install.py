"""Install like a user who keeps the plugin, in a temporary prefix (the machine
is not changed):

1. `cmake --install build --prefix P`: the plugin, the plugin list (auto-load),
   the Python package with the wrapped classes, the command, the expat fix and
   the examples; pvpython with only `PV_PLUGIN_PATH=P/lib/paraview-plugins/WallLoads`
   (the one line a user adds) has the filters without loading anything; the
   `PV_PLUGIN_CONFIG_FILE` route works too; the installed command reports on
   the installed demo with nothing else set (no PYTHONPATH, no LD_PRELOAD).
2. `cpack -G DEB`: a .deb whose files sit under /usr with ParaView as a
   dependency; unpacked (dpkg-deb -x, not installed) into a temporary root,
   its command runs the installed demo the same way.
"""
import glob
import os
import shutil
import subprocess

import report_testing as R

BUILD = os.environ["WALLLOADS_BINARY_DIR"]
W = R.workdir("install")
CLEAN = {k: v for k, v in os.environ.items()
         if k not in ("PYTHONPATH", "LD_PRELOAD", "WALLLOADS_PLUGIN", "PV_PLUGIN_PATH", "WALLLOADS_EXPAT_FIX",
                      "WALLLOADS_REPORT")
         and not k.startswith(("OMPI_COMM", "PMIX_", "PMI_"))}
CLEAN["WALLLOADS_XVFB"] = "0"
CLEAN.pop("DISPLAY", None)


def sh(cmd, env=None, cwd=None):
    proc = subprocess.run(cmd, capture_output=True, text=True, env=env or CLEAN, cwd=cwd, timeout=600)
    print("$ %s -> %d" % (" ".join(cmd), proc.returncode))
    return proc


def check_tree(prefix, label, lib="lib"):
    want = ["bin/wallloads-report", lib + "/paraview-plugins/WallLoads/WallLoads.so",
            lib + "/paraview-plugins/wallloads.plugins.xml",
            "lib/python3/dist-packages/wallloads/batch.py", "lib/python3/dist-packages/wallloads/report.py",
            "lib/python3/dist-packages/wallloads/_paths.py",
            "lib/python3/dist-packages/wallloads/WallLoadsFilters.so",
            lib + "/wallloads/libwallloads_expat_fix.so", "share/wallloads/examples/demo/bead.vtm",
            "share/wallloads/examples/report.toml", "share/wallloads/with-xvfb.sh"]
    missing = [w for w in want if not os.path.exists(os.path.join(prefix, w))]
    R.expect("%s: every file in place" % label, not missing, missing)
    R.expect("%s: nothing left under python/" % label, not os.path.exists(os.path.join(prefix, "python")))
    with open(os.path.join(prefix, lib, "paraview-plugins", "wallloads.plugins.xml")) as handle:
        R.expect("%s: plugin list asks for auto-load" % label, 'auto_load="1"' in handle.read())


def run_demo(prefix, label):
    out = os.path.join(W, label + "-out")
    proc = sh([os.path.join(prefix, "bin", "wallloads-report"), "--config",
               os.path.join(prefix, "share", "wallloads", "examples", "report.toml"), "-o", out, "--images", "no"])
    R.expect("%s: the installed command reports on the installed demo" % label, proc.returncode == 0,
             proc.stderr[-1500:])
    rows = R.csv_table(os.path.join(out, "bead", "loads.csv"))
    R.expect("%s: loads of the three bead regions and the total" % label,
             sorted(rows) == ["Equator Band", "Lower Cap", "Total", "Upper Cap"], sorted(rows))
    rec = R.read_json(os.path.join(out, "bead", "loads.json"))
    R.expect("%s: version recorded" % label, rec["software"]["version"] not in ("", "unknown"))


# --- 1. cmake --install into a temporary prefix ------------------------------------
prefix = os.path.join(W, "prefix")
proc = sh(["cmake", "--install", BUILD, "--prefix", prefix])
R.expect("cmake --install: exit 0", proc.returncode == 0, proc.stderr[-1500:])
check_tree(prefix, "prefix")

probe = ("from paraview import simple\n"
         "print('AUTOLOADED', hasattr(simple, 'WallTraction'))\n"
         "from wallloads import batch\n"
         "simple = batch.load_plugin()\n"
         "from wallloads import WallLoadsFilters\n"
         "print('CLASSES', WallLoadsFilters.vtkWallTraction().GetClassName())\n"
         "print('DEMO', batch.example_path('demo', 'bead.vtm'))\n")
env = dict(CLEAN)
env["PV_PLUGIN_PATH"] = os.path.join(prefix, "lib", "paraview-plugins", "WallLoads")
env["PYTHONPATH"] = os.path.join(prefix, "lib", "python3", "dist-packages")
proc = sh(["pvpython", "-c", probe], env=env)
R.expect("PV_PLUGIN_PATH alone: pvpython has the filters at start", "AUTOLOADED True" in proc.stdout,
         proc.stdout + proc.stderr[-800:])
R.expect("the wrapped classes import from the installed package", "CLASSES vtkWallTraction" in proc.stdout)
R.expect("batch finds the installed examples", "DEMO " + os.path.join(prefix, "share") in proc.stdout)
env.pop("PV_PLUGIN_PATH")
env["PV_PLUGIN_CONFIG_FILE"] = os.path.join(prefix, "lib", "paraview-plugins", "wallloads.plugins.xml")
proc = sh(["pvpython", "-c", probe], env=env)
R.expect("PV_PLUGIN_CONFIG_FILE route: the plugin auto-loads", "AUTOLOADED True" in proc.stdout,
         proc.stdout + proc.stderr[-800:])
run_demo(prefix, "prefix")

# --- 2. the .deb ----------------------------------------------------------------------------
pkg = os.path.join(W, "pkg")
proc = sh(["cpack", "-G", "DEB", "-B", pkg], cwd=BUILD)
R.expect("cpack -G DEB: exit 0", proc.returncode == 0, proc.stdout[-1500:] + proc.stderr[-800:])
debs = glob.glob(os.path.join(pkg, "*.deb"))
R.expect("one .deb made", len(debs) == 1, debs)
info = sh(["dpkg-deb", "-I", debs[0]]).stdout
R.expect(".deb depends on ParaView", "Depends: paraview" in info, info)
listing = sh(["dpkg-deb", "-c", debs[0]]).stdout
R.expect(".deb installs under /usr", "./usr/bin/wallloads-report" in listing
         and "./usr/lib/python3/dist-packages/wallloads/report.py" in listing)
root = os.path.join(W, "root")
proc = sh(["dpkg-deb", "-x", debs[0], root])
R.expect("dpkg-deb -x: exit 0", proc.returncode == 0)
lib = os.path.relpath(os.path.dirname(glob.glob(os.path.join(root, "usr", "lib*", "**", "paraview-plugins"),
                                                recursive=True)[0]), os.path.join(root, "usr"))
check_tree(os.path.join(root, "usr"), ".deb", lib=lib)
run_demo(os.path.join(root, "usr"), "deb")
print(".deb size %.1f kB" % (os.path.getsize(debs[0]) / 1024.0))
shutil.rmtree(os.path.join(pkg, "_CPack_Packages"), ignore_errors=True)
R.done(__file__)
