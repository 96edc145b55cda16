#!/usr/bin/env bash
# lumtrap report, opened in a real headless Chromium (Debian's chromium):
#  - the report of a traced result, of a planar result and of a sweep is one
#    HTML file with no http(s) URL, no external resource (every src is a data:
#    URI) and a Content-Security-Policy that forbids fetching anything;
#  - loaded from disk (the traced result and the sweep; the planar report is
#    the same page with fewer charts), the page logs nothing to the console (no JS error, no
#    blocked resource), its script runs (body data-ready="yes"), and the
#    rendered DOM (--dump-dom) holds every chart (an inline <svg> with its
#    series, or a data-URI image) and every table by id, and says "model
#    estimate";
#  - a screenshot (--screenshot) decodes and is not blank;
#  - a report that takes its charts from lumtrap plot's files is byte-identical
#    to one that draws them afresh.
# Skips (exit 77) with a message only when chromium is not installed and
# scripts/install-deps.sh cannot install it.
# Env: LUMTRAP_BINARY, LUMTRAP_SOURCE_DIR.
set -uo pipefail
. "${LUMTRAP_SOURCE_DIR:?set LUMTRAP_SOURCE_DIR}/tests/common/shell_fixture.sh" test_report_chromium

find_chromium() { command -v chromium || command -v chromium-browser || true; }
CHROME=$(find_chromium)
if [ -z "$CHROME" ]; then
  echo "test_report_chromium: chromium not found; trying scripts/install-deps.sh" >&2
  bash "$SRC/scripts/install-deps.sh" >&2 || true
  CHROME=$(find_chromium)
fi
if [ -z "$CHROME" ]; then
  echo "SKIP: test_report_chromium: Debian's chromium package is not installed and could not be installed" \
       "(scripts/install-deps.sh needs root and a reachable Debian mirror)" >&2
  exit 77
fi
cd "$W" || fail "cannot enter $W"

"$BIN" run "$SRC/scenes/k7_recipe_b_standard.toml" --photons 200 -o traced > /dev/null 2>&1 || fail "lumtrap run"
"$BIN" planar "$SRC/scenes/k7_polished_reference.toml" -o planar > /dev/null 2>&1 || fail "lumtrap planar"
cat > sweep.toml <<'TOML'
[scene]
name = "K7 report test sweep"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = ["700 nm", "1000 nm"]
[run]
photons = 300
[sweep.grid]
"wafer.thickness" = ["120 um", "160 um"]
"front.films[0].thickness" = ["65 nm", "75 nm", "85 nm"]
TOML
{ "$BIN" sweep plan sweep.toml --out sweep && "$BIN" sweep local sweep && "$BIN" sweep merge sweep; } > /dev/null 2>&1 \
  || fail "sweep"
"$BIN" report traced planar sweep > written.txt 2> notes.txt || { cat notes.txt; fail "lumtrap report"; }
for d in traced planar sweep; do grep -qx "$d/report.html" written.txt || fail "$d/report.html not listed"; done
# charts drawn by lumtrap plot since the folder changed are reused: the report stays byte for byte the same
cp traced/report.html fresh.html
"$BIN" plot traced > /dev/null 2>&1 && "$BIN" report traced > /dev/null 2>&1 || fail "plot + report"
cmp -s fresh.html traced/report.html || fail "the report built from lumtrap plot's files differs from a fresh one"
ok "report from plots/ equals the freshly drawn report"

# ids every report must show, and the charts of each kind of folder
COMMON="report-title model-estimate list-warnings scene-toml"
declare -A WANT=(
  [traced]="$COMMON table-currents table-run chart-spectra chart-losses chart-generation chart-angles chart-passes chart-escape_angles chart-rear_angles"
  [sweep]="$COMMON table-sweep table-variants best-variant chart-sweep_lines chart-sweep_heatmap"
)
for d in traced planar sweep; do
  html=$d/report.html
  if grep -qE 'https?://' "$html"; then grep -oE 'https?://[^"<> ]*' "$html" | sort -u | head >&2; fail "$html references a URL"; fi
  grep -q "Content-Security-Policy\" content=\"default-src 'none'" "$html" || fail "$html has no CSP"
  "$PY" - "$html" <<'PY' || fail "$html loads something from outside"
import re, sys
t = open(sys.argv[1], encoding="utf-8").read()
bad = [m for m in re.findall(r'\b(?:src|href)="([^"]*)"', t) if not (m.startswith("data:") or m.startswith("#"))]
assert not bad and "<link" not in t, bad[:5]
PY
  # in the browser: the traced result and the sweep (the planar report is the same page with fewer charts)
  [ "$d" = planar ] && continue
  prof=$W/profile-$d
  timeout 120 "$CHROME" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
    --disable-background-networking --disable-component-update --disable-sync --user-data-dir="$prof" \
    --enable-logging=stderr --v=0 --window-size=1280,2200 --screenshot="$W/$d.png" \
    --dump-dom "file://$W/$html" > "$d.dom" 2> "$d.log" || { tail -5 "$d.log"; fail "chromium on $html"; }
  if grep -q ':CONSOLE' "$d.log"; then grep ':CONSOLE' "$d.log" >&2; fail "$html: console messages"; fi
  "$PY" - "$d.dom" ${WANT[$d]} <<'PY' || fail "$d: rendered DOM"
import re, sys
dom = open(sys.argv[1], encoding="utf-8").read()
want = sys.argv[2:]
assert 'data-ready="yes"' in dom, "the page script did not run"
assert "model estimate" in dom.lower(), "no 'model estimate' in the page"
for i in want:
    assert f'id="{i}"' in dom, f"element {i} missing"
    if i.startswith("chart-"):
        m = re.search(rf'<figure class="chart" id="{i}">(<svg id="{i}-svg"|<img id="{i}-img"[^>]*src="data:image/png;base64,)', dom)
        assert m, f"{i}: no inline <svg> or data-URI image"
        if m.group(1).startswith("<svg"):
            assert f'id="{i}-svg--series-0-' in dom, f"{i}: the chart's series are not in the DOM"
    if i.startswith("table-"):
        body = dom.split(f'id="{i}"', 1)[1].split("</table>", 1)[0]
        assert body.count("<tr") >= 3, f"{i}: fewer than 2 data rows"
n = len([i for i in want if i.startswith("chart-")])
assert f'data-charts="{n}"' in dom, f"expected {n} charts: {re.search(r'data-charts=.[0-9]*.', dom)}"
print(f"ok: {sys.argv[1]}: {len(want)} ids present, {n} charts rendered, script ran, no console messages")
PY
  "$PY" "$SRC/tests/cli/chart_checks.py" png "$W/$d.png" || fail "$d screenshot"
done
echo "PASS: test_report_chromium"
