"""Bad command lines, configurations and files: the right exit code (2 for the
command line and configuration, 1 for a case), a message that names the
problem, and no partial output.  And `--help` documents every configuration
key and its flag."""
import os

import report_testing as R
from wallloads import config as C

W = R.workdir("errors")
DEMO = os.path.join(R.SOURCE, "examples", "demo", "bead.vtm")
NO_X = {"DISPLAY": "", "WALLLOADS_XVFB": "0"}


def nothing_written(folder):
    return not os.path.exists(folder) or not os.listdir(folder)


# --- --help covers every key ---------------------------------------------------
code, text, _ = R.run(["--help"])
R.expect("--help: exit code 0", code == 0)
missing = [o.key for o in C.OPTIONS if o.key not in text]
R.expect("--help names every TOML key (%d keys)" % len(C.OPTIONS), not missing, missing)
missing = [o.flag for o in C.OPTIONS if o.flag not in text]
R.expect("--help names every flag", not missing, missing)
for opt in C.OPTIONS:
    if opt.choices:
        absent = [c for c in opt.choices if c not in text]
        R.expect("--help lists the choices of %s" % opt.key, not absent, absent)
R.expect("--help states the exit codes", "exit codes: 0" in text and "2 bad command line" in text)


# --- configuration errors: exit 2, message, nothing written --------------------
def config_error(label, args, parts, toml=None):
    out = os.path.join(W, "out-" + label.replace(" ", "-"))
    if toml is not None:
        path = os.path.join(W, label.replace(" ", "-") + ".toml")
        with open(path, "w") as handle:
            handle.write(toml)
        args = ["--config", path] + args
    code, _, err = R.run(args + ["-o", out], env=NO_X)
    R.expect("%s: exit code 2" % label, code == 2, "exit %d" % code)
    absent = [p for p in parts if p not in err]
    R.expect("%s: message names the problem" % label, not absent, err.strip().splitlines()[-1:])
    R.expect("%s: nothing written" % label, nothing_written(out))


# Through the command: exit code 2, the message, nothing written.
config_error("unknown flag", ["--no-such-flag", DEMO], ["unrecognized arguments", "--no-such-flag"])
config_error("unknown key", [DEMO], ["unknown key 'pressure.arry'", "did you mean 'pressure.array'"],
             toml='[pressure]\narry = "p"\n')
config_error("zero reference area", ["--reference-area", "0", DEMO], ["reference.area", "must be a finite number > 0"])
config_error("pictures without display", ["--images", "yes", DEMO], ["output.images", "no X display"])
code, _, err = R.run(["--images", "no", "-o", "/proc/wallloads-cannot-write", DEMO], env=NO_X)
R.expect("unwritable output folder: exit 2 naming it", code == 2
         and "output directory /proc/wallloads-cannot-write cannot be written" in err, err[-300:])


# The same parser in-process for the other rules (each message checked).
def parse_error(label, args, parts, toml=None):
    if toml is not None:
        path = os.path.join(W, label.replace(" ", "-") + ".toml")
        with open(path, "w") as handle:
            handle.write(toml)
        args = ["--config", path] + args
    try:
        C.parse(args)
        message = ""
    except C.ConfigError as exc:
        message = str(exc)
    absent = [p for p in parts if p not in message]
    R.expect("%s: ConfigError naming the problem" % label, message and not absent, message)


parse_error("invalid toml", [DEMO], ["is not valid TOML"], toml="[pressure\n")
parse_error("wrong type", [DEMO], ["fluid.density", "expected a number"], toml='[fluid]\ndensity = "heavy"\n')
parse_error("negative density", ["--density=-1", DEMO], ["fluid.density", "> 0"])
parse_error("bad choice", ["--shear-source", "vol", DEMO], ["shear.source", "one of", "did you mean 'volume'"])
parse_error("parallel axes", ["--drag-direction", "1,0,0", "--lift-direction", "2,0,0", DEMO],
            ["axes.lift", "parallel to axes.drag"])
parse_error("bad vector", ["--moment-centre", "1,2", DEMO], ["axes.moment_centre", "3 numbers"])
parse_error("bad range", ["--time-range", "2,1", DEMO], ["time.range", "first < second"])
parse_error("missing config", ["--config", os.path.join(W, "absent.toml"), DEMO], ["absent.toml", "not found"])
parse_error("no case", [], ["no case given"])
parse_error("convergence needs three", ["--convergence", DEMO, DEMO, DEMO], ["three different cases"])


# --print-config writes TOML that reads back to the same settings.
import tomllib  # noqa: E402
settings, _ = C.parse(["--density", "998", "--walls", "floor,lid", "--angle-of-attack", "4", DEMO])
text = C.to_toml(settings)
tomllib.loads(text)
again = os.path.join(W, "printed.toml")
with open(again, "w") as handle:
    handle.write(text)
back, _ = C.parse(["--config", again])
R.expect("--print-config TOML reads back to the same settings", back == settings,
         [k for k in settings if back.get(k) != settings[k]])


# --- case errors: exit 1, message naming the problem, no output for the case ----
def case_error(label, cases, parts, extra=()):
    out = os.path.join(W, "out-" + label.replace(" ", "-"))
    code, _, err = R.run(list(extra) + ["--images", "no", "-o", out] + cases, env=NO_X)
    R.expect("%s: exit code 1" % label, code == 1, "exit %d" % code)
    absent = [p for p in parts if p not in err]
    R.expect("%s: message names the problem" % label, not absent,
             [line for line in err.splitlines() if "error" in line][-1:])
    return out, err


garbage = os.path.join(W, "garbage.vtp")
with open(garbage, "w") as handle:
    handle.write("<VTKFile type=\"PolyData\"><PolyData><Piece NumberOfPoints=\"4\"")
unknown = os.path.join(W, "case.qqq")
with open(unknown, "w") as handle:
    handle.write("1 2 3\n")
# Four bad cases in one run (each fails on its own): a missing file, a corrupt
# file, a format no reader takes, and the demo with a wall block it does not have.
out, err = case_error("bad cases", [os.path.join(W, "nowhere.vtm"), garbage, unknown, DEMO],
                      ["nowhere.vtm not found", "garbage.vtp cannot be read", "Error parsing XML",
                       "case.qqq", "no ParaView reader for files ending in '.qqq'",
                       "wall block 'Top Cap' not found", "'Upper Cap' (surface, 864 cells)", "'Lower Cap'",
                       "4 cases, 0 done, 4 failed"],
                      extra=["--walls", "Top Cap"])
R.expect("bad cases: nothing written at all (no output folder)", not os.path.exists(out))

out, _ = case_error("unknown array", [DEMO], ["pressure array 'pressure' not found on the walls",
                                              "static_pressure (1)", "wall_shear (3)"],
                    extra=["--pressure", "pressure"])
R.expect("unknown array: nothing written", nothing_written(out))

out, _ = case_error("wrong width", [DEMO], ["wall shear stress array 'static_pressure' has 1 components, 3 expected"],
                    extra=["--shear-source", "array", "--shear-array", "static_pressure"])

# One bad case in a sweep: the good one is reported, the index and summary say which failed.
out, err = case_error("sweep with a bad case", [DEMO, os.path.join(W, "nowhere.vtm")], ["nowhere.vtm", "not found"])
R.expect("sweep: the good case is written", os.path.exists(os.path.join(out, "bead", "report.html")))
R.expect("sweep: no folder for the failed case", not os.path.exists(os.path.join(out, "nowhere")))
summary = R.csv_table(os.path.join(out, "summary.csv"))
R.expect("sweep: summary marks the failed case", summary["nowhere"]["Status"] == "failed"
         and "not found" in summary["nowhere"]["Error"], summary.get("nowhere"))
R.expect("sweep: summary line counts the failure", "2 cases, 1 done, 1 failed" in err)
R.expect("sweep: no staging left", not [f for f in os.listdir(out) if f.startswith(".")])

# An earlier complete run stays whole when a rerun of the case fails.
before = sorted(os.listdir(os.path.join(out, "bead")))
code, _, err = R.run(["--images", "no", "-o", out, "--walls", "nowhere", DEMO], env=NO_X)
R.expect("failed rerun: exit 1, earlier files untouched", code == 1
         and sorted(os.listdir(os.path.join(out, "bead"))) == before)
R.done(__file__)
