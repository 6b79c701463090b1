#!/usr/bin/env bash
# The main job on the bundled demo scenario: install, build, then compute the
# loads on the spinning bead and write out/bead_loads.csv and a PNG.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
bash "$ROOT/scripts/install-deps.sh"
bash "$ROOT/scripts/build.sh"
source "$ROOT/scripts/env.sh"
cd "$ROOT"
bash "$ROOT/scripts/with-xvfb.sh" pvbatch examples/bead_loads.py "$ROOT/out"
