# Source this to use a WallLoads build from pvpython/pvbatch:
#   source scripts/env.sh && pvpython my_script.py
_wl_root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
_wl_build="${WALLLOADS_BUILD_DIR:-$_wl_root/build}"
export WALLLOADS_PLUGIN="$_wl_build/lib/paraview-plugins/WallLoads/WallLoads.so"
export PV_PLUGIN_PATH="$_wl_build/lib/paraview-plugins/WallLoads${PV_PLUGIN_PATH:+:$PV_PLUGIN_PATH}"
export PYTHONPATH="$_wl_build/python${PYTHONPATH:+:$PYTHONPATH}"
export VTK_SMP_BACKEND_IN_USE="${VTK_SMP_BACKEND_IN_USE:-STDThread}"
unset _wl_root _wl_build
# Read appended-mode VTK XML files despite Debian 12's patched expat
# (plugin/expat): preload the fix when it was built.
_wl_fix="${WALLLOADS_BUILD_DIR:-$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)/build}/lib/libwallloads_expat_fix.so"
if [ -f "$_wl_fix" ]; then
  export WALLLOADS_EXPAT_FIX="$_wl_fix"
  case ":${LD_PRELOAD:-}:" in *":$_wl_fix:"*) ;; *) export LD_PRELOAD="$_wl_fix${LD_PRELOAD:+:$LD_PRELOAD}" ;; esac
fi
unset _wl_fix
