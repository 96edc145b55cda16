#!/usr/bin/env bash
# `lumtrap texture SCENE` as a user runs it: the files it writes (JSON, CSV,
# PNG, EXR), the pictures decodable, and its height EXR read back as a
# measured map (texture = "height_map", format = "exr") whose statistics,
# run and check agree with the surface it came from; option errors and an
# existing folder refused before any work.
set -euo pipefail
. "${LUMTRAP_SOURCE_DIR:?set LUMTRAP_SOURCE_DIR}/tests/common/shell_fixture.sh" test_texture_command

# 1. random pyramids of recipe B (40 um tile), front only, 400 pixels per side
"$BIN" texture "$SRC/scenes/k7_recipe_b_standard.toml" -o "$W/b" --surface front --image-pixels 400 > "$W/b.out" \
  || fail "lumtrap texture on recipe B"
grep -q "model geometry, not a measurement" "$W/b.out" || fail "no model-estimate note on stdout"
for f in scene.toml front_statistics.json front_facet_angles.csv front_heights.csv front_pyramids.csv \
         front_pyramid_sizes.csv front_relief_top.png front_relief_45deg.png front_height.exr; do
  [ -s "$W/b/$f" ] || fail "missing $f"
done
[ ! -e "$W/b/rear_statistics.json" ] || fail "--surface front wrote the rear"
echo "ok: files"

# 2. the height EXR as a measured map: periodic already (wrap), heights in um,
#    pixel size from the file's header
cat > "$W/measured.toml" <<EOF
[wafer]
thickness = "160 um"
[front]
texture = "height_map"
[front.height_map]
file = "b/front_height.exr"
format = "exr"
height_unit = "um"
level = "none"
tiling = "wrap"
[illumination]
wavelengths = ["600 nm", "1000 nm"]
[run]
photons = 200
EOF
"$BIN" texture "$W/measured.toml" -o "$W/m" --surface front --image-pixels 400 > "$W/m.out" \
  || fail "lumtrap texture on the EXR map: $(cat "$W/m.out")"
grep -q "tiling wrap" "$W/m.out" || fail "no tiling report on stdout"
"$BIN" check "$W/measured.toml" > "$W/check.toml" 2> /dev/null || fail "lumtrap check on the EXR map"
grep -q "file = \"$W/b/front_height.exr\"" "$W/check.toml" || fail "resolved scene lacks the absolute map path"
"$BIN" run "$W/measured.toml" -o "$W/run" > /dev/null 2> "$W/run.err" || fail "lumtrap run on the EXR map: $(cat "$W/run.err")"
echo "ok: EXR read back as a height map (texture, check, run)"

python3 - "$W" <<'PY' || fail "statistics"
import json, sys, zlib, struct
w = sys.argv[1]
b = json.load(open(f"{w}/b/front_statistics.json"))
m = json.load(open(f"{w}/m/front_statistics.json"))
assert "not a measurement" in b["note"]
# random pyramids: {111} facets only (54.74 deg bin), no flat ground (recipe B: flat_fraction 0)
rows = [l.split(",") for l in open(f"{w}/b/front_facet_angles.csv") if l[0].isdigit()]
top = max(rows, key=lambda r: float(r[2]))
assert top[0] == "54" and abs(float(top[2]) - 1) < 1e-9, top
assert b["projected_flat_fraction"] < 1e-9, b["projected_flat_fraction"]
assert abs(b["surface_area_ratio"] - 3 ** 0.5) < 1e-9, b["surface_area_ratio"]  # 1/cos(atan sqrt 2)
assert b["pyramids"]["count"] > 20, b["pyramids"]
# the same surface sampled at 0.1 um and meshed again: ridges and valleys
# between samples round the facets off (measured: area ratio 1.671 against
# sqrt 3 = 1.732 at this pitch, 1.701 at half of it), the heights stay close
assert m["height_map"]["tiling"] == "wrap" and m["height_map"]["pixel_size_from"] == "file"
assert abs(m["tile_um"] - b["tile_um"]) < 1e-9, (m["tile_um"], b["tile_um"])
assert abs(m["surface_area_ratio"] - b["surface_area_ratio"]) < 0.08, (m["surface_area_ratio"], b["surface_area_ratio"])
assert abs(m["heights_um"]["Sq"] - b["heights_um"]["Sq"]) < 0.02 * b["heights_um"]["Sq"], (m["heights_um"], b["heights_um"])
# apexes between samples are cut by up to pitch·tan(54.74°)/2 = 0.07 um
assert abs(m["heights_um"]["Sz"] - b["heights_um"]["Sz"]) < 0.1, (m["heights_um"], b["heights_um"])
# PNG pictures: signature, IHDR size, 8-bit grey
for name, height in (("front_relief_top.png", 400), ("front_relief_45deg.png", None)):
    data = open(f"{w}/b/{name}", "rb").read()
    assert data[:8] == b"\x89PNG\r\n\x1a\n", name
    width, h, depth, colour = struct.unpack(">IIBB", data[16:26])
    assert width == 400 and depth == 8 and colour == 0, (name, width, depth, colour)
    if height: assert h == height, (name, h)
print("statistics and pictures as expected:", b["pyramids"]["count"], "pyramids,",
      "area ratio", round(b["surface_area_ratio"], 4), "vs", round(m["surface_area_ratio"], 4), "resampled")
PY
echo "ok: statistics"

# 3. errors before any work
if "$BIN" texture "$SRC/scenes/k7_recipe_b_standard.toml" -o "$W/b" 2> "$W/e1"; then fail "existing folder accepted"; fi
grep -q "already exists" "$W/e1" || fail "existing folder: $(cat "$W/e1")"
if "$BIN" texture "$SRC/scenes/k7_recipe_b_standard.toml" -o "$W/x" --flat-below 5 2> "$W/e2"; then fail "bare number accepted"; fi
grep -q "option --flat-below: value \"5\"" "$W/e2" || fail "--flat-below message: $(cat "$W/e2")"
[ ! -e "$W/x" ] || fail "a folder was written after an option error"
echo "PASS: test_texture_command"
