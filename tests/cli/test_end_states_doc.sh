#!/usr/bin/env bash
# The README's table of end states is the one the program prints
# (`lumtrap end-states`, generated from src/io/end_states.cpp).
set -euo pipefail
BIN=${LUMTRAP_BINARY:?set LUMTRAP_BINARY}
SRC=${LUMTRAP_SOURCE_DIR:?set LUMTRAP_SOURCE_DIR}
printed=$("$BIN" end-states)
in_readme=$(sed -n '/<!-- end-states begin -->/,/<!-- end-states end -->/p' "$SRC/README.md" | sed '1d;$d')
if [ "$printed" != "$in_readme" ]; then
  echo "FAIL: README.md's end-state table differs from 'lumtrap end-states'; paste its output between the markers" >&2
  diff <(echo "$printed") <(echo "$in_readme") >&2 || true
  exit 1
fi
echo "PASS: test_end_states_doc"
