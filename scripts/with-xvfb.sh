#!/usr/bin/env bash
# Run a command under a private Xvfb server: `scripts/with-xvfb.sh cmd args...`.
#
# Two causes of "bad X server connection" seen with `xvfb-run -a` under
# `ctest -j2`, both handled here:
# - An X server resets when its last client disconnects, and refuses
#   connections while it does. pvbatch and paraview probe the display, close
#   it and connect again at once; on a loaded machine the second connection
#   falls into the reset. Xvfb runs with -noreset.
# - Servers started together can try the same display number. Each number is
#   claimed first with flock(1) on a lock file of our own, held for the life
#   of this script (released by the kernel even if it is killed); Xvfb's own
#   lock still guards against servers started by other programs (we then
#   move on to the next number).
# WALLLOADS_XVFB_LOG=<file> keeps the server's output for diagnosis.
set -u
lockdir="${TMPDIR:-/tmp}"
xvfb_pid=""
cleanup() {
  if [ -n "$xvfb_pid" ]; then
    kill "$xvfb_pid" 2>/dev/null
    wait "$xvfb_pid" 2>/dev/null
  fi
}
trap cleanup EXIT
trap "exit 143" TERM INT

start_on() { # start Xvfb on display $1; succeed once it accepts connections
  local n="$1" sock="/tmp/.X11-unix/X$1"
  [ -e "/tmp/.X$n-lock" ] && return 1 # another program's server
  Xvfb ":$n" -screen 0 1280x1024x24 -nolisten tcp -noreset >"${WALLLOADS_XVFB_LOG:-/dev/null}${WALLLOADS_XVFB_LOG:+.$$}" 2>&1 &
  xvfb_pid=$!
  for _ in $(seq 1 600); do
    if ! kill -0 "$xvfb_pid" 2>/dev/null; then
      wait "$xvfb_pid" 2>/dev/null
      xvfb_pid=""
      return 1
    fi
    [ -S "$sock" ] && return 0
    sleep 0.05
  done
  return 1
}

display=""
for n in $(seq 300 399); do
  exec 9>"$lockdir/wallloads-xvfb-$n.lock"
  if flock -n 9; then
    if start_on "$n"; then
      display="$n"
      break
    fi
    flock -u 9
  fi
  exec 9>&-
done
if [ -z "$display" ]; then
  echo "with-xvfb: could not start Xvfb on any display from :300 to :399" >&2
  exit 1
fi
DISPLAY=":$display" "$@"
