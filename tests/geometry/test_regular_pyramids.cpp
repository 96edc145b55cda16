// Regular upright and inverted pyramids, one per tile.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "geometry/textures.hpp"
#include "mesh_checks.hpp"

namespace lumtrap::geometry {
namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

// Each sample point lies in exactly one triangle, whose height there is the
// analytic surface; boundary edges have periodic twins.
template <class Height>
void check_tile(const TileMesh& m, Height height) {
  const double P = m.period;
  EXPECT_NEAR(m.projected_area(), P * P, 1e-12 * P * P);
  double worst = 0;
  const auto cov = testing::check_coverage(m, 120, 3, [&](double x, double y, double z) {
    worst = std::max(worst, std::abs(z - height(x, y)));
  });
  EXPECT_EQ(cov.uncovered, 0);
  EXPECT_EQ(cov.overlapped, 0);
  EXPECT_EQ(cov.undecided, 0);
  EXPECT_LT(worst, 1e-12);
  for (int axis = 0; axis < 2; ++axis) {
    const auto seam = testing::check_seam(m, axis, 1e-12);
    EXPECT_TRUE(seam.chains_ok) << axis;
    EXPECT_TRUE(seam.twins_ok) << axis;
  }
}

TEST(RegularPyramids, ApexHeightIsHalfBaseTimesTanFacet) {
  for (double facet : {kFacet111Deg, 45.0, 30.0}) {
    const TileMesh m = regular_pyramids_tile(10.0, facet, 0.0, false);
    EXPECT_NEAR(m.max_z(), 5.0 * std::tan(facet * kDeg), 1e-12) << facet;
    EXPECT_EQ(m.min_z(), 0.0);
    EXPECT_EQ(m.period, 10.0);
  }
  // {111} on (100): tan(54.7356°) = √2 (common practice: crystallography of
  // alkaline-textured (100) silicon), so a 10 µm base gives a 5√2 µm apex.
  EXPECT_NEAR(regular_pyramids_tile(10.0, kFacet111Deg, 0, false).max_z(), 5.0 * std::sqrt(2.0), 1e-12);
}

TEST(RegularPyramids, MeanHeightIsAThirdOfTheApexWithoutGap) {
  // volume of a pyramid = base²·h/3 (common practice), spread over base².
  const double h = 3.0 * std::tan(kFacet111Deg * kDeg);
  EXPECT_NEAR(regular_pyramids_tile(6.0, kFacet111Deg, 0.0, false).mean_z(), h / 3.0, 1e-12);
  // with a gap the same volume is spread over (base + gap)²
  EXPECT_NEAR(regular_pyramids_tile(6.0, kFacet111Deg, 2.0, false).mean_z(), h / 3.0 * 36.0 / 64.0, 1e-12);
}

TEST(RegularPyramids, SurfaceAreaIsBaseOverCosFacetPlusFlatGap) {
  for (double gap : {0.0, 1.5}) {
    const TileMesh m = regular_pyramids_tile(4.0, kFacet111Deg, gap, false);
    const double P = 4.0 + gap;
    // tilted facets: projected area / cos(facet); cos(54.74°) = 1/√3
    EXPECT_NEAR(m.surface_area(), P * P - 16.0 + 16.0 * std::sqrt(3.0), 1e-12) << gap;
  }
}

TEST(RegularPyramids, UprightTileCoversOnceWithTheAnalyticHeight) {
  for (double gap : {0.0, 0.8}) {
    const double base = 5.0, P = base + gap, t = std::tan(kFacet111Deg * kDeg);
    const TileMesh m = regular_pyramids_tile(base, kFacet111Deg, gap, false);
    check_tile(m, [&](double x, double y) {
      return std::max(0.0, t * (base / 2 - std::max(std::abs(x - P / 2), std::abs(y - P / 2))));
    });
  }
}

TEST(RegularPyramids, InvertedPitIsShiftedToMinZeroWithRimsAtTheDepth) {
  for (double gap : {0.0, 0.8}) {
    const double base = 5.0, P = base + gap, t = std::tan(kFacet111Deg * kDeg), depth = base / 2 * t;
    const TileMesh m = regular_pyramids_tile(base, kFacet111Deg, gap, true);
    EXPECT_NEAR(m.min_z(), 0.0, 1e-15);
    EXPECT_NEAR(m.max_z(), depth, 1e-12);
    // volume above the bottom: the box to the rim minus the pit (base²·depth/3)
    EXPECT_NEAR(m.mean_z(), depth - base * base * depth / 3.0 / (P * P), 1e-12);
    check_tile(m, [&](double x, double y) {
      return depth - std::max(0.0, t * (base / 2 - std::max(std::abs(x - P / 2), std::abs(y - P / 2))));
    });
  }
}

TEST(RegularPyramids, FacetNormalsAtTheFacetAngleAlongXOrY) {
  // {111} facets of a (100) wafer at atan(√2) = 54.74° (common practice:
  // crystallography of alkaline-textured (100) silicon); normals of a pit
  // lean toward its centre, those of a pyramid away from its apex.
  for (bool inverted : {false, true})
    for (double gap : {0.0, 1.0}) {
      const TileMesh m = regular_pyramids_tile(4.0, kFacet111Deg, gap, inverted);
      const auto fa = testing::check_facet_angles(m, kFacet111Deg * kDeg, 1e-12);
      EXPECT_EQ(fa.facets, 4u);
      EXPECT_EQ(fa.flat, gap > 0 ? 8u : 0u);
      EXPECT_EQ(fa.bad_angle + fa.bad_azimuth + fa.downward, 0u);
      const double c = m.period / 2;
      for (std::size_t i = 0; i < m.triangles.size(); ++i) {
        const Eigen::Vector3d n = m.normal(i);
        if (n.z() > 1 - 1e-12) continue;
        Eigen::Vector3d centroid = Eigen::Vector3d::Zero();
        for (auto v : m.triangles[i]) centroid += m.vertices[v] / 3.0;
        const double outward = n.x() * (centroid.x() - c) + n.y() * (centroid.y() - c);
        EXPECT_EQ(outward > 0, !inverted) << i;
      }
    }
}

TEST(RegularPyramids, BadArgumentsAreRejected) {
  EXPECT_THROW(regular_pyramids_tile(0.0, kFacet111Deg, 0, false), std::invalid_argument);
  EXPECT_THROW(regular_pyramids_tile(1.0, 90.0, 0, false), std::invalid_argument);
  EXPECT_THROW(regular_pyramids_tile(1.0, 0.0, 0, false), std::invalid_argument);
  EXPECT_THROW(regular_pyramids_tile(1.0, kFacet111Deg, -0.1, true), std::invalid_argument);
  try {
    regular_pyramids_tile(1.0, 95.0, 0, false);
  } catch (const std::invalid_argument& e) {
    EXPECT_NE(std::string(e.what()).find("facet_deg"), std::string::npos);
  }
}

}  // namespace
}  // namespace lumtrap::geometry
