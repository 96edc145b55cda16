# Sourced by the shell tests in tests/cli/ (". tests/common/shell_fixture.sh NAME"):
#   BIN   the lumtrap executable under test (env LUMTRAP_BINARY, set by CTest)
#   SRC   the source tree (env LUMTRAP_SOURCE_DIR, set by CTest)
#   W     a fresh work folder, removed when the test exits
#   fail  prints "FAIL: NAME: message" on stderr and exits 1; ok prints "ok: message"
TEST_NAME=${1:?shell_fixture.sh needs the test name}
BIN=${LUMTRAP_BINARY:?set LUMTRAP_BINARY}
SRC=${LUMTRAP_SOURCE_DIR:?set LUMTRAP_SOURCE_DIR}
W=$(mktemp -d "${TMPDIR:-/tmp}/lumtrap-$TEST_NAME.XXXXXX")
trap 'rm -rf "$W"' EXIT
fail() { echo "FAIL: $TEST_NAME: $*" >&2; exit 1; }
ok() { echo "ok: $*"; }
#   PY    the Python interpreter the plotting commands use (env LUMTRAP_PYTHON)
PY=${LUMTRAP_PYTHON:-$( [ -x /usr/bin/python3 ] && echo /usr/bin/python3 || echo python3 )}
