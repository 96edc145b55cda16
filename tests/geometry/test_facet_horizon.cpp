// The visible outline of a pyramid facet as an envelope in (v, s) = (w/u, 1/u).
#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <random>

#include "geometry/facet_horizon.hpp"

namespace lumtrap::geometry {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

// Distance u along a ray v where the outline lies, from a list of points.
double outline_u(const std::vector<Point2>& pts, double v) {
  for (std::size_t j = 0; j + 1 < pts.size(); ++j) {
    const double v0 = pts[j].y / pts[j].x, v1 = pts[j + 1].y / pts[j + 1].x;
    if (v >= v0 && v <= v1) {
      // intersect the ray w = v·u with the segment
      const Point2 p = pts[j], q = pts[j + 1];
      const double dx = q.x - p.x, dy = q.y - p.y;
      const double s = (v * p.x - p.y) / (dy - v * dx);
      return p.x + s * dx;
    }
  }
  return -1;
}

TEST(FacetHorizon, NothingHiddenGivesTheWholeTriangle) {
  FacetHorizon h;
  h.reset(2.0);
  std::vector<Point2> out;
  h.outline(out);
  ASSERT_EQ(out.size(), 2u);
  EXPECT_EQ(out[0].x, 2.0);
  EXPECT_EQ(out[0].y, -2.0);
  EXPECT_EQ(out[1].x, 2.0);
  EXPECT_EQ(out[1].y, 2.0);
}

TEST(FacetHorizon, ACoverEverywhereBuriesTheFacet) {
  FacetHorizon h;
  h.reset(1.0);
  EXPECT_FALSE(h.add({kInf, kInf, kInf}));
}

TEST(FacetHorizon, OutlineIsTheUpperEnvelopeOfTheOccluders) {
  // Random occluders; the outline must follow s = max(1/a, max_k h_k(v)).
  std::mt19937_64 rng(4);
  std::uniform_real_distribution<double> u(0.3, 3.0);
  for (int trial = 0; trial < 200; ++trial) {
    const double a = 1.0;
    FacetHorizon h;
    h.reset(a);
    std::vector<FacetOccluder> occ;
    const int n = 1 + trial % 6;
    for (int k = 0; k < n; ++k) {
      FacetOccluder o{u(rng), u(rng), u(rng)};
      if (k % 3 == 1) o.kappa = kInf;
      if (k % 4 == 2) o.alpha = kInf;
      if (k % 5 == 3) o.beta = kInf;
      if (o.kappa == kInf && o.alpha == kInf && o.beta == kInf) o.kappa = 1.5;
      occ.push_back(o);
      ASSERT_TRUE(h.add(o));
    }
    std::vector<Point2> pts;
    h.outline(pts);
    EXPECT_EQ(pts.front().y, -pts.front().x);
    EXPECT_EQ(pts.back().y, pts.back().x);
    for (int i = 0; i <= 100; ++i) {
      const double v = -1.0 + 2.0 * i / 100.0;
      double g = 1.0 / a;
      for (const auto& o : occ) {
        double hk = o.kappa;  // (an absent bound is +infinity; avoid inf·0)
        if (o.alpha < kInf) hk = std::min(hk, o.alpha * (1 - v));
        if (o.beta < kInf) hk = std::min(hk, o.beta * (1 + v));
        g = std::max(g, hk);
      }
      EXPECT_NEAR(outline_u(pts, v), 1.0 / g, 1e-12) << "trial " << trial << " v " << v;
    }
  }
}

}  // namespace
}  // namespace lumtrap::geometry
