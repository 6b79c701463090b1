#!/usr/bin/env bash
# CTest wrapper: run the GUI smoke script in the ParaView application under Xvfb.
set -u
result="${WALLLOADS_TEST_OUTPUT:-/tmp}/gui_result.txt"
mkdir -p "$(dirname "$result")"
rm -f "$result"
export WALLLOADS_GUI_RESULT="$result"
timeout 240 xvfb-run -a -s "-screen 0 1280x1024x24" paraview --dr --script="$1" --exit > /dev/null 2>&1
if [ ! -f "$result" ]; then
  echo "FAIL: the GUI wrote no result"
  exit 1
fi
cat "$result"
grep -q "^PASS" "$result"
