// One square-based pyramid (or pit) per tile, centred in the tile, with a
// flat border of width gap/2 on each side.
#include <cmath>
#include <numbers>
#include <stdexcept>
#include <string>
#include <utility>

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

TileMesh shaped_regular_pyramids_tile(double base_um, double facet_deg, double gap_um, bool inverted,
                                      const EtchShape& shape) {
  if (shape.tip_radius_um == 0 && shape.valley_radius_um == 0)
    return regular_pyramids_tile(base_um, facet_deg, gap_um, inverted);
  check(base_um > 0, "base_um = " + std::to_string(base_um) + " (allowed: > 0)");
  check(gap_um >= 0, "gap_um = " + std::to_string(gap_um) + " (allowed: >= 0)");
  const double period = base_um + gap_um;
  // Pits are upright pyramids mirrored in height: their rims are the upright
  // texture's valleys, their bottoms its tips.
  EtchShape upright = shape;
  if (inverted) std::swap(upright.tip_radius_um, upright.valley_radius_um);
  TileMesh m = rounded_envelope_mesh(period, {{0.5 * period, 0.5 * period, base_um, facet_deg}}, upright);
  if (inverted) mirror_to_pits(m);
  return m;
}

}  // namespace lumtrap::geometry

// ---------------------------------------------------------------------------
// texture = "upright_pyramids" / "inverted_pyramids", keys in [….pyramids].

#include <fmt/format.h>

#include "geometry/etch_shape_keys.hpp"
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
      tip_radius_param(), valley_radius_param(), angular_error_param(),
  };
}

double regular_feature(const TextureParams& p) { return p.number("base"); }

// Four facets, and eight border triangles when there is a gap (as built
// above); rounded pyramids as the refined mesh estimates (etch_shape_keys.hpp).
double regular_triangles(const TextureParams& p) {
  const EtchShape shape = etch_shape(p);
  if (shape.tip_radius_um == 0 && shape.valley_radius_um == 0) return p.number("gap") > 0 ? 12.0 : 4.0;
  return rounded_envelope_triangle_estimate(p.number("base") + p.number("gap"), p.number("base"), p.number("base"),
                                            p.number("facet_angle"), shape);
}

std::optional<ParamProblem> check_regular(const TextureParams& p) {
  const EtchShape shape = etch_shape(p);
  const double a = 0.5 * p.number("base");
  // A radius larger than the pyramid leaves no facet (common practice: the
  // rounded part must fit inside the pyramid it rounds).
  for (const char* key : {"tip_radius", "valley_radius"})
    if (p.number(key) > a)
      return ParamProblem{{key}, fmt::format("{} {} um is more than half the base ({} um); allowed: 0 to {} um", key,
                                             p.number(key), a, a)};
  if (shape.tip_radius_um == 0 && shape.valley_radius_um == 0) return std::nullopt;  // the exact sharp mesh
  return check_mesh_size(p.number("base") + p.number("gap"), p.number("base"), p.number("base"),
                         p.number("facet_angle"), shape);
}

TileMesh build_regular(const TextureParams& p, bool inverted) {
  return shaped_regular_pyramids_tile(p.number("base"), p.number("facet_angle"), p.number("gap"), inverted,
                                      etch_shape(p));
}

}  // namespace

extern const TextureDescriptor kUprightPyramidsTexture;
const TextureDescriptor kUprightPyramidsTexture{
    .kind = "upright_pyramids",
    .table = "pyramids",
    .summary = "a square array of square-based upright pyramids",
    .params = regular_params(),
    .regular = true,
    .check = check_regular,
    .smallest_feature_um = regular_feature,
    .build = [](const TextureParams& p) { return build_regular(p, false); },
    .estimate_triangles = regular_triangles,
};

extern const TextureDescriptor kInvertedPyramidsTexture;
const TextureDescriptor kInvertedPyramidsTexture{
    .kind = "inverted_pyramids",
    .table = "pyramids",
    .summary = "a square array of inverted pyramids (pits)",
    .params = regular_params(),
    .regular = true,
    .check = check_regular,
    .smallest_feature_um = regular_feature,
    .build = [](const TextureParams& p) { return build_regular(p, true); },
    .estimate_triangles = regular_triangles,
};

}  // namespace lumtrap::geometry
