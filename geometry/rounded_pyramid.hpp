#pragma once
// The height of one square-based upright pyramid whose apex and four ridges
// are rounded by a ball of radius R, as an etch that attacks edges faster
// than faces leaves them: the pyramid's morphological opening by the ball
// (the union of all balls of radius R that fit inside the solid pyramid,
// J. Serra, "Image Analysis and Mathematical Morphology", 1982). Every convex
// edge becomes part of a cylinder of radius R tangent to its two facets, the
// apex part of a sphere of radius R; the facets keep their planes.
//
// Computed exactly: the opening of the convex pyramid cone is the ball-offset
// of the cone shrunk by R (its facet planes lowered by R/cos(facet)). The
// offset surface at (u, v) is the highest point of a ball centred on the
// shrunk surface, reached from a facet (the facet plane itself, where the
// contact point lies inside that facet), a ridge (a cylinder) or the shrunk
// apex (a sphere).
//
// Inputs: (u, v) relative to the apex in projection (µm), half base a (µm),
// tan of the facet angle t > 0, radius R >= 0 (µm; 0: the sharp pyramid
// t·(a - max(|u|, |v|))). The cone continues below z = 0 outside the base.
namespace lumtrap::geometry {

/// Height, gradient and which part of the surface a point lies on.
struct SurfacePoint {
  double z = 0;         ///< µm
  double gx = 0, gy = 0;  ///< dz/dx, dz/dy
  /// Facet 0..3 (outward normal +x, -x, +y, -y) where the surface is that
  /// facet's plane; -1 on the rounded part (cylinder or sphere).
  int facet = -1;
};

SurfacePoint rounded_pyramid_point(double u, double v, double half_base, double tan_facet, double radius);

/// Whether (u, v) lies in the region where facet `facet` is the surface
/// (a convex wedge: the facet's sector, shrunk by R·sin(facet) from its ridges).
bool in_facet_region(double u, double v, int facet, double tan_facet, double radius);

}  // namespace lumtrap::geometry
