#!/usr/bin/env bash
# CTest wrapper: run the GUI smoke script in the ParaView application under Xvfb.
set -u
result="${WALLLOADS_TEST_OUTPUT:-/tmp}/gui_result.txt"
mkdir -p "$(dirname "$result")"
rm -f "$result"
export WALLLOADS_GUI_RESULT="$result"
timeout 240 bash "$(dirname "$0")/../../scripts/with-xvfb.sh" paraview --dr --script="$1" --exit > "${result%.txt}.log" 2>&1
if [ ! -f "$result" ]; then
  echo "FAIL: the GUI wrote no result; its output:"; tail -n 40 "${result%.txt}.log"
  exit 1
fi
cat "$result"
grep -q "^PASS" "$result"
