#pragma once
// The scene keys of an etch's shape shared by the pyramid textures
// (tip_radius, valley_radius, angular_error; texture_descriptor.hpp), the
// EtchShape they give, and the size check of the refined mesh
// (rounded_envelope.hpp) made before any work.
#include <optional>

#include "geometry/rounded_envelope.hpp"
#include "geometry/texture_descriptor.hpp"

namespace lumtrap::geometry {

ParamSpec tip_radius_param();
ParamSpec valley_radius_param();
ParamSpec angular_error_param();

/// The shape the keys give (all three keys must be in `params`).
EtchShape etch_shape(const TextureParams& params);

/// About how many triangles rounded_envelope_mesh makes for a tile of side
/// `period_um` covered by pyramids of mean base `mean_base_um` (smallest
/// `min_base_um`, steepest facet `steepest_deg`): the creases (ridges and
/// base outlines, about 6.8 × base per pyramid) times the refined band
/// around them (rounded width plus a few finest cells of grading), twice
/// for two triangles per cell.
double rounded_envelope_triangle_estimate(double period_um, double mean_base_um, double min_base_um,
                                          double steepest_deg, const EtchShape& shape);

/// Largest estimated triangle count accepted (about 2.5 GB of traced mesh
/// at the 125 B per triangle measured for height maps).
inline constexpr double kMaxShapedTriangles = 2e7;

/// Largest number of finest cells per tile side (the quadtree keeps one byte
/// per finest cell: 16384² is 268 MB).
inline constexpr double kMaxFinestCellsPerSide = 16384;

/// A problem naming the shape keys when the estimate is above the limit, or
/// the finest cell too small for the tile.
std::optional<ParamProblem> check_mesh_size(double period_um, double mean_base_um, double min_base_um,
                                            double steepest_deg, const EtchShape& shape);

}  // namespace lumtrap::geometry
