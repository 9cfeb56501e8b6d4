#!/usr/bin/env bash
# Installs what Aggrade needs on a fresh Debian machine: system packages for the window (software
# rendering, no GPU needed), Xvfb and PDF tools for the tests, and the Python reference libraries
# the tests use as independent oracles. Safe to run again; skips what is already there.
set -euo pipefail
cd "$(dirname "$0")/.."

SUDO=""
if [[ $(id -u) -ne 0 ]]; then SUDO="sudo"; fi

APT_PACKAGES=(gcc libc6-dev pkg-config xvfb xauth libx11-xcb1 libxcursor1 libxi6 libxrandr2
  libxkbcommon-x11-0 libegl1 libegl-mesa0 libgl1-mesa-dri mesa-vulkan-drivers libvulkan1
  poppler-utils imagemagick xdotool python3-pip fonts-dejavu-core)
missing=()
for p in "${APT_PACKAGES[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if ((${#missing[@]})); then
  echo "setup: installing system packages: ${missing[*]}"
  $SUDO apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
fi

if ! python3 -c 'import pypdf, pdfplumber, numpy, scipy, astropy, lasio' 2>/dev/null; then
  echo "setup: installing Python reference libraries (scripts/requirements-test.txt)"
  python3 -m pip install -q --disable-pip-version-check -r scripts/requirements-test.txt 2>&1 \
    | grep -v "Running pip as the 'root' user" || true
  python3 -c 'import pypdf, pdfplumber, numpy, scipy, astropy, lasio'
fi

if [[ -z ${XDG_RUNTIME_DIR:-} ]]; then
  export XDG_RUNTIME_DIR="${TMPDIR:-/tmp}/aggrade-runtime-$(id -u)"
  mkdir -p "$XDG_RUNTIME_DIR" && chmod 700 "$XDG_RUNTIME_DIR"
fi
