#pragma once
// The exact polyhedral upper envelope z(x, y) = max(0, max_i p_i(x, y)) of a
// layout of square-based upright pyramids, periodic images included, where
//   p_i(x, y) = tan(facet)·(base_i/2 - max(|x - cx_i|, |y - cy_i|))
// is the minimum of pyramid i's four facet planes.
//
// Pyramids hidden whole under one other pyramid are dropped first (the
// others all show their apex). Each facet triangle (apex and two base
// corners, in projection) then loses the regions where another pyramid image
// is higher than the facet's plane (each such region is convex: the
// intersection of half-planes plane_kj > f); what is left is star-shaped
// from the apex and is found exactly as a one-dimensional envelope
// (facet_horizon.hpp), then fanned from the apex into triangles with z from
// the facet plane, and clipped to the tile where the pyramid crosses its
// edge. The flat part (tile minus the union of base squares) comes from the
// layout at z = 0. Where two facet planes coincide (equal pyramids in line)
// the pyramid with the lower index (then lower image shift) keeps the area,
// so no part is covered twice. Boundary vertices on x = 0 and x = period (y
// likewise) are made to match one for one, so every boundary edge has its
// periodic twin.
#include <cstddef>

#include "geometry/mesh.hpp"
#include "geometry/random_pyramid_layout.hpp"

namespace lumtrap::geometry {

struct EnvelopeStats {
  std::size_t visible_pyramids = 0;  ///< pyramids with at least one visible facet piece
  std::size_t facet_pieces = 0;      ///< visible facet outlines emitted
  std::size_t flat_pieces = 0;       ///< flat rectangles emitted
};

/// Mesh of one tile (µm); facet_deg is the facet angle to the base plane.
TileMesh pyramid_envelope_mesh(const RandomPyramidLayout& layout, double facet_deg,
                               EnvelopeStats* stats = nullptr);

}  // namespace lumtrap::geometry
