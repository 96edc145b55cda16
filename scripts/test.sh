#!/usr/bin/env bash
# Installs what is missing, builds, and runs every test (CTest over GoogleTest).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/build.sh
ctest --test-dir build --output-on-failure -j"$(nproc)" --timeout 900
