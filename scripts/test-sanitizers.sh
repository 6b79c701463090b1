#!/usr/bin/env bash
# Build WallLoads with AddressSanitizer and UndefinedBehaviorSanitizer into
# build-sanitize/ (or $WALLLOADS_SANITIZE_BUILD_DIR) and run the C++ tests
# (kernels, filters) and the bounded fuzz run under them. Part of CI (.ci/run).
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
BUILD="${WALLLOADS_SANITIZE_BUILD_DIR:-$ROOT/build-sanitize}"
JOBS="${WALLLOADS_JOBS:-$(nproc)}"
bash "$ROOT/scripts/install-deps.sh"
cmake -S "$ROOT" -B "$BUILD" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DWALLLOADS_SANITIZE=ON -DWALLLOADS_FUZZ_TEST=ON
cmake --build "$BUILD" -j "$JOBS"
cd "$BUILD"
ctest --output-on-failure -j "${WALLLOADS_TEST_JOBS:-2}" "$@"
