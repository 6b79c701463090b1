#!/usr/bin/env bash
# Install, build and run every test (kernels, filters, pvpython, MPI) through CTest.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
BUILD="${WALLLOADS_BUILD_DIR:-$ROOT/build}"
bash "$ROOT/scripts/install-deps.sh"
bash "$ROOT/scripts/build.sh"
cd "$BUILD"
ctest --output-on-failure -j "${WALLLOADS_TEST_JOBS:-2}" "$@"
