#!/usr/bin/env bash
# Configure and build WallLoads into build/ (or $WALLLOADS_BUILD_DIR). Idempotent.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
BUILD="${WALLLOADS_BUILD_DIR:-$ROOT/build}"
JOBS="${WALLLOADS_JOBS:-$(nproc)}"
cmake -S "$ROOT" -B "$BUILD" -DCMAKE_BUILD_TYPE=Release
cmake --build "$BUILD" -j "$JOBS"
