#pragma once
// The visible part of one pyramid facet among its neighbours, found as a
// one-dimensional upper envelope.
//
// Facet frame: u along the facet's outward horizontal normal n, w along m =
// n turned +90° (so (u, w) is right-handed like (x, y)), origin at the apex.
// The facet triangle is 0 <= u <= a, |w| <= u (a = half base). Along each ray
// from the apex the facet height falls at the steepest rate any pyramid
// can fall, so once a neighbour is higher than the facet's plane it stays
// higher further out: the part a neighbour hides is "outward closed", and the
// visible part is star-shaped from the apex. In the coordinates
//   v = w/u  (in [-1, 1], which ray)      s = 1/u  (how far: large near the apex)
// straight lines stay straight, and the region neighbour k hides is
//   s < h_k(v) = min(kappa, alpha·(1 - v), beta·(1 + v))
// (a constant from k's facet facing back, two slopes from k's side facets;
// each may be absent = +infinity). The visible part of the facet is
//   s >= g(v) = max(1/a, max_k h_k(v)),
// a polygon fanned from the apex: every piece of g is one triangle.
#include <vector>

#include "geometry/convex_polygon.hpp"

namespace lumtrap::geometry {

/// Neighbour k's hidden region in facet coordinates; +infinity = absent.
struct FacetOccluder {
  double kappa;  ///< s < kappa (k's facet opposite to this one)
  double alpha;  ///< s < alpha·(1 - v)
  double beta;   ///< s < beta·(1 + v)
};

class FacetHorizon {
 public:
  /// Starts a facet of half base a (µm): nothing hidden yet, g = 1/a.
  void reset(double a);

  /// Adds a neighbour. Returns false if the facet became hidden entirely
  /// (an occluder with no finite bound: the neighbour is higher everywhere).
  bool add(const FacetOccluder& occ);

  /// The outline from the corner ray v = -1 to v = +1 as points (u, w); the
  /// visible polygon is the apex (0, 0) followed by these points
  /// (counter-clockwise). Points on the base line have u = a exactly.
  void outline(std::vector<Point2>& out) const;

  /// Number of pieces of g.
  int pieces() const { return static_cast<int>(env_.size()); }

 private:
  struct Piece {
    double v0;      ///< start of the piece (the next piece's v0, or 1, ends it)
    double c0, c1;  ///< g = c0 + c1·v on the piece
    int src;        ///< which line (0 = the facet base)
  };
  void insert(double lo, double hi, double c0, double c1, int src);
  static void push(Piece* out, std::size_t& n, double v0, double c0, double c1, int src);

  double a_ = 0;
  double tol_ = 0;
  int next_src_ = 1;
  std::vector<Piece> env_, scratch_;
};

}  // namespace lumtrap::geometry
