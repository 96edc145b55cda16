// One square-based pyramid (or pit) per tile, centred in the tile, with a
// flat border of width gap/2 on each side.
#include <cmath>
#include <numbers>
#include <stdexcept>
#include <string>

#include "geometry/textures.hpp"

namespace lumtrap::geometry {

namespace {

void check(bool ok, const std::string& what) {
  if (!ok) throw std::invalid_argument("geometry/regular_pyramids.cpp: " + what);
}

}  // namespace

TileMesh regular_pyramids_tile(double base_um, double facet_deg, double gap_um, bool inverted) {
  check(base_um > 0, "base_um = " + std::to_string(base_um) + " (allowed: > 0)");
  check(facet_deg > 0 && facet_deg < 90,
        "facet_deg = " + std::to_string(facet_deg) + " (allowed: 0 < facet_deg < 90)");
  check(gap_um >= 0, "gap_um = " + std::to_string(gap_um) + " (allowed: >= 0)");

  const double period = base_um + gap_um;
  const double half = 0.5 * base_um;
  const double height = half * std::tan(facet_deg * std::numbers::pi / 180.0);
  // Base square [lo, hi]² centred in the tile.
  const double lo = 0.5 * gap_um;
  const double hi = lo + base_um;
  const double c = 0.5 * period;
  // Upright: rims (base) at 0, apex at +height. Inverted: rims at height,
  // bottom at 0 (the pit shifted up by its depth so that min_z = 0).
  const double rim = inverted ? height : 0.0;
  const double tip = inverted ? 0.0 : height;

  TileMesh m;
  m.period = period;
  // 0..3: base square corners counter-clockwise from (lo, lo); 4: apex/bottom.
  m.vertices = {{lo, lo, rim}, {hi, lo, rim}, {hi, hi, rim}, {lo, hi, rim}, {c, c, tip}};
  // Four facets, counter-clockwise seen from +z: (corner, next corner, apex).
  m.triangles = {{0, 1, 4}, {1, 2, 4}, {2, 3, 4}, {3, 0, 4}};
  if (gap_um > 0) {
    // Flat border as four trapezoids between the tile edge and the base
    // square; they share the base edges and the corner diagonals exactly, and
    // each tile edge is one segment, so the tiling has no T-junctions.
    const std::uint32_t o = 5;  // 5..8: tile corners counter-clockwise from (0, 0)
    m.vertices.push_back({0, 0, rim});
    m.vertices.push_back({period, 0, rim});
    m.vertices.push_back({period, period, rim});
    m.vertices.push_back({0, period, rim});
    for (std::uint32_t k = 0; k < 4; ++k) {
      const std::uint32_t k1 = (k + 1) % 4;
      // trapezoid (tile k, tile k+1, base k+1, base k)
      m.triangles.push_back({o + k, o + k1, k1});
      m.triangles.push_back({o + k, k1, k});
    }
  }
  return m;
}

}  // namespace lumtrap::geometry

// ---------------------------------------------------------------------------
// texture = "upright_pyramids" / "inverted_pyramids", keys in [….pyramids].

#include "geometry/texture_descriptor.hpp"

namespace lumtrap::geometry {

namespace {

std::vector<ParamSpec> regular_params() {
  return {
      {.key = "base", .kind = ParamKind::length_um, .doc = "pyramid base side", .fallback = 5.0, .lo = 0,
       .lo_open = true, .example = "5 um"},
      {.key = "gap", .kind = ParamKind::length_um,
       .doc = "flat strip between neighbouring pyramids (period = base + gap)", .fallback = 0.0, .lo = 0,
       .example = "0.5 um"},
      {.key = "facet_angle", .kind = ParamKind::angle_deg,
       .doc = "facet angle to the wafer plane; default atan(sqrt 2), the {111} facets of alkaline-etched (100) "
              "silicon (common practice)",
       .fallback = kFacet111Deg, .lo = 0, .hi = 90, .lo_open = true, .hi_open = true, .example = "54.74 deg"},
  };
}

double regular_feature(const TextureParams& p) { return p.number("base"); }

// Four facets, and eight border triangles when there is a gap (as built above).
double regular_triangles(const TextureParams& p) { return p.number("gap") > 0 ? 12.0 : 4.0; }

}  // namespace

extern const TextureDescriptor kUprightPyramidsTexture;
const TextureDescriptor kUprightPyramidsTexture{
    .kind = "upright_pyramids",
    .table = "pyramids",
    .summary = "a square array of square-based upright pyramids",
    .params = regular_params(),
    .regular = true,
    .check = nullptr,
    .smallest_feature_um = regular_feature,
    .build =
        [](const TextureParams& p) {
          return regular_pyramids_tile(p.number("base"), p.number("facet_angle"), p.number("gap"), false);
        },
    .estimate_triangles = regular_triangles,
};

extern const TextureDescriptor kInvertedPyramidsTexture;
const TextureDescriptor kInvertedPyramidsTexture{
    .kind = "inverted_pyramids",
    .table = "pyramids",
    .summary = "a square array of inverted pyramids (pits)",
    .params = regular_params(),
    .regular = true,
    .check = nullptr,
    .smallest_feature_um = regular_feature,
    .build =
        [](const TextureParams& p) {
          return regular_pyramids_tile(p.number("base"), p.number("facet_angle"), p.number("gap"), true);
        },
    .estimate_triangles = regular_triangles,
};

}  // namespace lumtrap::geometry
