#pragma once
// Convex polygons in the plane and their cutting by half-planes: the one
// primitive the exact texture meshes are built from (successive half-plane
// cuts of a convex polygon give convex pieces).
//
// Conventions: vertices counter-clockwise, lengths in µm. A cut tolerance
// `eps` (µm) treats a vertex within eps of a cut line as lying on it, so no
// piece thinner than about eps is ever produced by a cut.
#include <array>

namespace lumtrap::geometry {

struct Point2 {
  double x = 0;
  double y = 0;
};

/// The half-plane {p : a·p.x + b·p.y + c > 0}; value(p) is its signed level.
struct HalfPlane {
  double a = 0;
  double b = 0;
  double c = 0;
  double value(Point2 p) const { return a * p.x + b * p.y + c; }
};

/// A convex polygon with at most kCapacity vertices (the texture meshes need
/// at most 8 edge directions, so 8 vertices plus rounding slack).
struct ConvexPolygon {
  static constexpr int kCapacity = 24;
  std::array<Point2, kCapacity> v{};
  int n = 0;

  bool empty() const { return n < 3; }
  /// Appends p unless it lies within eps (max-norm) of the last vertex.
  /// Throws std::logic_error past kCapacity.
  void push(Point2 p, double eps);
  /// Removes a last vertex that repeats the first; empties a polygon of < 3 vertices.
  void close(double eps);
};

/// Signed area (> 0 for counter-clockwise), µm².
double signed_area(const ConvexPolygon& poly);
/// Perimeter, µm.
double perimeter(const ConvexPolygon& poly);
/// Thickness measure 2·area/perimeter (the width of a long thin strip), µm.
double thickness(const ConvexPolygon& poly);

/// Cuts `poly` by the line value = 0 of `h`: `inside` receives the part with
/// value >= 0, `outside` the part with value <= 0 (vertices with |value| <= eps
/// go to both). A crossing point is computed from the lexicographically smaller
/// end of its edge, so two pieces cut along the same edge share it bit for bit.
void split(const ConvexPolygon& poly, const HalfPlane& h, double eps, ConvexPolygon& inside,
           ConvexPolygon& outside);

/// The part of `poly` with value >= 0 (see split).
ConvexPolygon clip(const ConvexPolygon& poly, const HalfPlane& h, double eps);

}  // namespace lumtrap::geometry
