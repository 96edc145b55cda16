#include <stdexcept>
#include <string>

#include "geometry/textures.hpp"

namespace lumtrap::geometry {

TileMesh planar_tile(double period_um) {
  if (!(period_um > 0))
    throw std::invalid_argument("geometry/planar.cpp: period_um = " + std::to_string(period_um) +
                                " (allowed: > 0)");
  TileMesh m;
  m.period = period_um;
  const double p = period_um;
  m.vertices = {{0, 0, 0}, {p, 0, 0}, {p, p, 0}, {0, p, 0}};
  m.triangles = {{0, 1, 2}, {0, 2, 3}};
  return m;
}

}  // namespace lumtrap::geometry

// ---------------------------------------------------------------------------
// texture = "planar": a flat surface (no keys).

#include "geometry/texture_descriptor.hpp"

namespace lumtrap::geometry {

extern const TextureDescriptor kPlanarTexture;
const TextureDescriptor kPlanarTexture{
    .kind = "planar",
    .table = "",
    .summary = "a flat (polished) surface",
    .params = {},
    .regular = false,
    .check = nullptr,
    .smallest_feature_um = [](const TextureParams&) { return 0.0; },
    .build = [](const TextureParams&) { return planar_tile(10.0); },
    .estimate_triangles = [](const TextureParams&) { return 2.0; },
};

}  // namespace lumtrap::geometry
