#pragma once
// How many pyramids random_pyramids_layout places, how many of them show on
// the surface and how many triangles pyramid_envelope_mesh makes, estimated
// from the spec alone (no drawing), so that a tile far too large for the
// machine is refused before any work.
//
// Model (sizes s from the spec's distribution, redrawn below min_size):
//  - Placed pyramids N = λ·tile², with the density λ from the coverage of a
//    Boolean model of squares, flat fraction = exp(-λ·E[s²]) (common
//    practice; e.g. J. Serra, Image Analysis and Mathematical Morphology,
//    1982, from memory). flat_fraction = 0 asks that no flat spot at all be
//    left: λ·E[s²] ≈ ln(tile²/E[s²]) + 5.5, fitted to measured layouts (the
//    last uncovered spots set it).
//  - A pyramid of size s is hidden whole when a larger one (s') stands with
//    its centre within (s' - s)/2 of its own in x and in y (same facet
//    angle): visible V = N·E_s[exp(-λ·E_s'[(s' - s)₊²])] (Poisson count of
//    such neighbours).
//  - Triangles ≈ (14.5 + 15·flat_fraction)·V: the envelope fans each visible
//    pyramid into about 14.5 triangles, flat rectangles add the rest
//    (fitted to measured tiles; see random_pyramid_count.cpp).
#include "geometry/textures.hpp"

namespace lumtrap::geometry {

struct RandomPyramidCount {
  double mean_square_um2 = 0;  ///< E[s²] of the base size after redrawing
  double placed = 0;           ///< pyramids drawn and placed
  double visible = 0;          ///< pyramids that show on the surface
  double triangles = 0;        ///< triangles of the tile mesh
};

/// The estimate of `spec` (the spec's sizes must be valid: PyramidSizeSampler
/// rules). Cost: a few thousand operations, whatever the tile.
RandomPyramidCount estimate_random_pyramids(const RandomPyramidsSpec& spec);

}  // namespace lumtrap::geometry
