#!/usr/bin/env bash
# Installs everything WallLoads needs on a fresh Debian 12 machine. Idempotent.
set -euo pipefail

PKGS=(
  cmake g++ make
  paraview paraview-dev python3-paraview
  libdouble-conversion-dev libopenmpi-dev openmpi-bin python3-dev python3-numpy
  libeigen3-dev libgtest-dev libexpat1-dev
  qtbase5-dev qttools5-dev qtxmlpatterns5-dev-tools
  xvfb xauth
  xdotool imagemagick
  chromium
)

missing=()
for p in "${PKGS[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done

if [ "${#missing[@]}" -eq 0 ]; then
  echo "install-deps: all packages present"
  exit 0
fi

SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi
echo "install-deps: installing ${missing[*]}"
export DEBIAN_FRONTEND=noninteractive
$SUDO apt-get update -q
$SUDO apt-get install -y -q --no-install-recommends "${missing[@]}"
