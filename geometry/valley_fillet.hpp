#pragma once
// A concave crease between two surfaces filled by a circular arc of radius
// R, as an etch leaves valleys between pyramids (and between a pyramid and
// flat ground) rounded.
//
// Where surface a is the higher one and b the next, both are taken as their
// tangent planes at the point. Across the crease (horizontal direction
// n = (∇a - ∇b)/|∇a - ∇b|) their sections are two lines of slopes
// sa = ∇a·n > sb = ∇b·n meeting at the crease; the fillet is the arc of
// radius R tangent to both lines in that vertical section (common practice:
// the constant-radius fillet of two lines). The radius is exactly R where the
// crease runs level (a facet meeting flat ground, facing facets of pyramids
// of one height) and close to it where the crease is inclined.
//
// Units: heights and R in µm, gradients dimensionless.
#include "geometry/rounded_pyramid.hpp"

namespace lumtrap::geometry {

/// The height at the point: a.z outside the fillet, the arc inside it
/// (>= a.z). Needs a.z >= b.z; R = 0 gives a.z.
double valley_fillet(const SurfacePoint& a, const SurfacePoint& b, double radius);

/// How far below a the surface b may be while the fillet of the two (as
/// tangent planes at the point) still reaches the point, µm: the fillet acts
/// where a.z - b.z < fillet_depth(a, b, R).
double fillet_depth(const SurfacePoint& a, const SurfacePoint& b, double radius);

/// An upper bound of how far below a the surface b may be while the fillet
/// still reaches the point, per µm of R, for surfaces no steeper than
/// tan_max: the fillet acts only where a.z - b.z < R·fillet_reach(tan_max).
double fillet_reach(double tan_max);

}  // namespace lumtrap::geometry
