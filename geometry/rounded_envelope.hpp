#pragma once
// The surface of a layout of upright pyramids as an etch shapes it: each
// pyramid with its own facet angle, its apex and ridges rounded by a ball of
// radius tip_radius (rounded_pyramid.hpp), the surface the upper envelope
// max(0, max_i pyramid_i) with every concave crease (pyramid against
// pyramid, pyramid against flat ground) filled by an arc of radius
// valley_radius (valley_fillet.hpp; the two highest surfaces at a point are
// blended, so where three meet within a fillet the arc follows the highest
// pair).
//
// Meshed on a quadtree (adaptive_height_mesh.hpp): a cell is kept whole
// only where it is provably one facet plane (or flat ground) throughout:
// its 3 × 3 sample points all lie on the same facet of the same pyramid,
// inside that facet's region, and every other surface is lower there by
// more than the fillet reach plus what the slopes (<= tan of the steepest
// facet) can close over the distance to the nearest sample. Such cells are
// exact. Everything else (rounded parts, creases) is refined to the finest
// cell side
//   h = √2 · angular_error · R · cos(steepest facet angle)   for the smallest R > 0.
// A chord of length c on an arc of radius R is tilted by at most c / (2R)
// from the arc (common practice); the longest chord of a cell, its diagonal,
// spans √2·h / cos(slope) of surface, so the triangles' normals stay within
// about `angular_error` of the surface's. Sharp creases (a radius of 0) are resolved
// to h = angular_error · smallest base · cos(steepest facet) / 4 (or the
// rounded h if smaller): the triangles within one cell of a sharp crease are
// tilted between the two facets' normals.
#include <cstddef>
#include <vector>

#include "geometry/adaptive_height_mesh.hpp"
#include "geometry/mesh.hpp"

namespace lumtrap::geometry {

struct ShapedPyramid {
  double cx = 0, cy = 0;   ///< apex in projection, [0, period)², µm
  double base = 0;         ///< base side, µm
  double facet_deg = 0;    ///< facet angle to the wafer plane, (0, 90) degrees
};

struct EtchShape {
  double tip_radius_um = 0;     ///< >= 0
  double valley_radius_um = 0;  ///< >= 0
  double angular_error_deg = 5; ///< > 0
};

struct RoundedEnvelopeStats {
  QuadtreeStats cells;
};

/// The mesh of one tile (mesh.hpp conventions, z >= 0 up to rounding where a
/// fillet meets flat ground at z = 0).
TileMesh rounded_envelope_mesh(double period_um, const std::vector<ShapedPyramid>& pyramids, const EtchShape& shape,
                               RoundedEnvelopeStats* stats = nullptr);

/// The finest cell side the mesh uses, µm (see above).
double rounded_envelope_finest_cell(const std::vector<ShapedPyramid>& pyramids, const EtchShape& shape);

/// Mirror of an upright texture into pits: z -> max_z - z (triangles keep
/// their winding: the projection is unchanged).
void mirror_to_pits(TileMesh& mesh);

}  // namespace lumtrap::geometry
