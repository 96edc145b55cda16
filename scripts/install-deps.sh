#!/usr/bin/env bash
# Installs the Debian 12 packages lumtrap needs to build, test and run.
# With --runtime: only the shared libraries an installed lumtrap needs to run
# (for compute nodes; README, "Installing on a cluster").
# Idempotent: packages already present are left alone, and nothing is
# downloaded when everything is there. Needs root (apt-get): run as root,
# or as a user with password-less sudo.
set -euo pipefail

PKGS=(
  build-essential cmake pkg-config git
  libembree-dev libtbb-dev libeigen3-dev libopenexr-dev
  libgtest-dev libgmock-dev libbenchmark-dev
  libtomlplusplus-dev libcli11-dev nlohmann-json3-dev libfmt-dev librandom123-dev libstb-dev
  python3
  python3-matplotlib   # lumtrap plot / lumtrap report (scripts/lumtrap_plots)
  chromium             # headless browser for the report test (tests/cli/test_report_chromium.sh)
  clang libclang-rt-14-dev   # libFuzzer and sanitizer runtimes (scripts/sanitize-and-fuzz.sh)
)

if [ "${1:-}" = "--runtime" ]; then
  PKGS=(libembree3-3 libtbb12 libtbbmalloc2 libopenexr-3-1-30 libimath-3-1-29 libfmt9 libtomlplusplus3)
fi

missing=()
for p in "${PKGS[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$p")
  fi
done

if [ ${#missing[@]} -eq 0 ]; then
  echo "install-deps: all ${#PKGS[@]} packages already installed" >&2
  exit 0
fi

SUDO=()
if [ "$(id -u)" -ne 0 ]; then
  if command -v sudo >/dev/null 2>&1 && sudo -n true 2>/dev/null; then
    SUDO=(sudo)
  else
    echo "install-deps: these Debian packages are missing: ${missing[*]}" >&2
    echo "install-deps: installing them needs root: run this script as root (or with sudo)," >&2
    echo "install-deps: or have an administrator run: apt-get install -y ${missing[*]}" >&2
    exit 1
  fi
fi

echo "install-deps: installing ${missing[*]}" >&2
export DEBIAN_FRONTEND=noninteractive
"${SUDO[@]}" apt-get update -qq
"${SUDO[@]}" env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
echo "install-deps: done" >&2
