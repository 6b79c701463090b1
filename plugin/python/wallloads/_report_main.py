"""Entry script of `wallloads-report`, run by pvbatch (see the launcher).

pvbatch runs this file on rank 0 (the other ranks serve the pipeline).  The
exit code goes to the file named by WALLLOADS_STATUS_FILE: under MPI, a
script that calls sys.exit() stops rank 0 without finalising the other ranks,
so the launcher reads the code from the file after pvbatch has ended cleanly.
"""
import os
import sys

_here = os.path.dirname(os.path.abspath(__file__))
# This folder is the package itself: keep its modules from shadowing others.
sys.path[:] = [p for p in sys.path if os.path.abspath(p or os.curdir) != _here]
sys.path.insert(0, os.path.dirname(_here))

from wallloads import report  # noqa: E402

_code = report.run(sys.argv[1:])
_status = os.environ.get("WALLLOADS_STATUS_FILE")
if _status:
    with open(_status, "w") as _handle:
        _handle.write("%d\n" % _code)
elif _code:
    sys.exit(_code)
