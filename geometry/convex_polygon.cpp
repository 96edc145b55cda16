#include "geometry/convex_polygon.hpp"

#include <cmath>
#include <stdexcept>
#include <string>

namespace lumtrap::geometry {

namespace {

bool near(Point2 p, Point2 q, double eps) {
  return std::abs(p.x - q.x) <= eps && std::abs(p.y - q.y) <= eps;
}

bool lex_less(Point2 p, Point2 q) { return p.x < q.x || (p.x == q.x && p.y < q.y); }

// Crossing of the edge p-q with value = 0, computed from the lexicographically
// smaller end so that both polygons sharing the edge get the same point.
Point2 crossing(Point2 p, double dp, Point2 q, double dq) {
  if (lex_less(q, p)) {
    std::swap(p, q);
    std::swap(dp, dq);
  }
  const double s = dp / (dp - dq);
  return {p.x + s * (q.x - p.x), p.y + s * (q.y - p.y)};
}

}  // namespace

void ConvexPolygon::push(Point2 p, double eps) {
  if (n > 0 && near(v[n - 1], p, eps)) return;
  if (n == kCapacity)
    throw std::logic_error("geometry/convex_polygon.cpp: a convex polygon exceeded " +
                           std::to_string(kCapacity) + " vertices (numerical breakdown of the cuts)");
  v[n++] = p;
}

void ConvexPolygon::close(double eps) {
  while (n > 1 && near(v[n - 1], v[0], eps)) --n;
  if (n < 3) n = 0;
}

double signed_area(const ConvexPolygon& poly) {
  if (poly.n < 3) return 0.0;
  // Shoelace about the first vertex (smaller rounding for polygons far from 0).
  const Point2 o = poly.v[0];
  double twice = 0.0;
  for (int i = 1; i + 1 < poly.n; ++i) {
    const double ax = poly.v[i].x - o.x, ay = poly.v[i].y - o.y;
    const double bx = poly.v[i + 1].x - o.x, by = poly.v[i + 1].y - o.y;
    twice += ax * by - ay * bx;
  }
  return 0.5 * twice;
}

double perimeter(const ConvexPolygon& poly) {
  double sum = 0.0;
  for (int i = 0; i < poly.n; ++i) {
    const Point2 p = poly.v[i], q = poly.v[(i + 1) % poly.n];
    sum += std::hypot(q.x - p.x, q.y - p.y);
  }
  return sum;
}

double thickness(const ConvexPolygon& poly) {
  const double per = perimeter(poly);
  return per > 0.0 ? 2.0 * signed_area(poly) / per : 0.0;
}

void split(const ConvexPolygon& poly, const HalfPlane& h, double eps, ConvexPolygon& inside,
           ConvexPolygon& outside) {
  std::array<double, ConvexPolygon::kCapacity> d{};
  for (int i = 0; i < poly.n; ++i) d[i] = h.value(poly.v[i]);
  inside.n = 0;
  outside.n = 0;
  for (int i = 0; i < poly.n; ++i) {
    const int j = (i + 1) % poly.n;
    const Point2 p = poly.v[i];
    if (d[i] >= -eps) inside.push(p, eps);
    if (d[i] <= eps) outside.push(p, eps);
    if ((d[i] > eps && d[j] < -eps) || (d[i] < -eps && d[j] > eps)) {
      const Point2 q = crossing(p, d[i], poly.v[j], d[j]);
      inside.push(q, eps);
      outside.push(q, eps);
    }
  }
  inside.close(eps);
  outside.close(eps);
}

ConvexPolygon clip(const ConvexPolygon& poly, const HalfPlane& h, double eps) {
  ConvexPolygon in, out;
  split(poly, h, eps, in, out);
  return in;
}

}  // namespace lumtrap::geometry
