"""README's scripting example, run literally from a directory far from the
source tree (issue 8: it printed 0.0 and exited 0 after the reader failed):
it must print the demo's drag, and the same script with a case that does not
exist must stop with PipelineError naming the file."""
import os
import re
import subprocess

import report_testing as R

with open(os.path.join(R.SOURCE, "README.md")) as handle:
    readme = handle.read()
block = re.search(r"## Scripting\s+```python\n(.*?)```", readme, re.S)
R.expect("README has the scripting example", block is not None)
code = block.group(1)
W = R.workdir("readme")
script = os.path.join(W, "example.py")
with open(script, "w") as handle:
    handle.write(code)
env = {k: v for k, v in os.environ.items() if not k.startswith(("OMPI_COMM", "PMIX_", "PMI_"))}
run = subprocess.run(["pvpython", script], cwd=W, capture_output=True, text=True, env=env, timeout=120)
print(run.stdout[-400:], run.stderr[-600:] if run.returncode else "")
R.expect("example from another directory: exit 0", run.returncode == 0)
printed = [line for line in run.stdout.splitlines() if line[:1] in "-0123456789"]   # the example's print
R.expect("example printed the totals", len(printed) >= 1, run.stdout[-300:])
drag = float(printed[-1].split()[0])
R.expect("example prints a non-zero drag (%.6e N)" % drag, drag != 0.0)
R.expect("example wrote loads.csv", os.path.exists(os.path.join(W, "loads.csv")))

broken = code.replace('demo = batch.example_path("demo", "bead.vtm")', 'demo = "no/such/bead.vtm"')
R.expect("the example names its case in one line", broken != code)
with open(script, "w") as handle:
    handle.write(broken)
run = subprocess.run(["pvpython", script], cwd=W, capture_output=True, text=True, env=env, timeout=120)
R.expect("missing case: non-zero exit", run.returncode != 0)
R.expect("missing case: PipelineError naming the file", "PipelineError" in run.stderr
         and "no/such/bead.vtm" in run.stderr, run.stderr[-400:])
R.done(__file__)
