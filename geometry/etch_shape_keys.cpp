#include "geometry/etch_shape_keys.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <numbers>

#include "geometry/valley_fillet.hpp"

namespace lumtrap::geometry {

ParamSpec tip_radius_param() {
  return {.key = "tip_radius", .kind = ParamKind::length_um,
          .doc = "radius of curvature of the apexes and ridges (pits: of the rims between pits); 0: sharp",
          .fallback = 0.0, .lo = 0, .example = "0.2 um"};
}

ParamSpec valley_radius_param() {
  return {.key = "valley_radius", .kind = ParamKind::length_um,
          .doc = "radius of the valleys where pyramids meet each other or flat ground (pits: of the pit bottoms "
                 "and their edges); 0: sharp",
          .fallback = 0.0, .lo = 0, .example = "0.1 um"};
}

ParamSpec angular_error_param() {
  return {.key = "angular_error", .kind = ParamKind::angle_deg,
          .doc = "largest turn of the surface normal across one triangle of a rounded part (used only when a "
                 "radius or a facet-angle spread is given)",
          .fallback = 5.0, .lo = 0.5, .hi = 20, .example = "5 deg"};
}

EtchShape etch_shape(const TextureParams& p) {
  return {p.number("tip_radius"), p.number("valley_radius"), p.number("angular_error")};
}

double rounded_envelope_triangle_estimate(double P, double mean_base, double min_base, double steepest_deg,
                                          const EtchShape& shape) {
  const std::vector<ShapedPyramid> one = {{0, 0, min_base, steepest_deg}};
  const double h = rounded_envelope_finest_cell(one, shape);
  const double t = std::tan(steepest_deg * std::numbers::pi / 180.0);
  const double crease = 6.8 * P * P / std::max(mean_base, 1e-9);
  const double band = 2.0 * shape.tip_radius_um + shape.valley_radius_um * fillet_reach(t) + 6.0 * h;
  return 2.0 * crease * band / (h * h) + 2.0 * std::pow(P / (0.5 * mean_base), 2);
}

std::optional<ParamProblem> check_mesh_size(double P, double mean_base, double min_base, double steepest_deg,
                                            const EtchShape& shape) {
  const double h = rounded_envelope_finest_cell({{0, 0, min_base, steepest_deg}}, shape);
  if (P / h > kMaxFinestCellsPerSide)
    return ParamProblem{{"angular_error", "tip_radius", "valley_radius"},
                        fmt::format("the finest mesh cell ({:.3g} um) would split the {} um tile into {:.3g} cells per "
                                    "side (angular_error {} deg, tip_radius {} um, valley_radius {} um); allowed: at "
                                    "most {}: raise angular_error or the radii, or make the tile smaller",
                                    h, P, P / h, shape.angular_error_deg, shape.tip_radius_um, shape.valley_radius_um,
                                    kMaxFinestCellsPerSide)};
  const double n = rounded_envelope_triangle_estimate(P, mean_base, min_base, steepest_deg, shape);
  if (n <= kMaxShapedTriangles) return std::nullopt;
  return ParamProblem{
      {"angular_error", "tip_radius", "valley_radius"},
      fmt::format("the rounded mesh would need about {:.2g} triangles (angular_error {} deg, tip_radius {} um, "
                  "valley_radius {} um); allowed: at most {:.2g}: raise angular_error or the radii, or make the tile "
                  "smaller",
                  n, shape.angular_error_deg, shape.tip_radius_um, shape.valley_radius_um, kMaxShapedTriangles)};
}

}  // namespace lumtrap::geometry
