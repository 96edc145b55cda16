// TileMesh measures (heights, areas, normals) and the planar tile.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "geometry/mesh.hpp"
#include "geometry/textures.hpp"
#include "mesh_checks.hpp"

namespace lumtrap::geometry {
namespace {

TEST(TileMesh, PlanarTileIsTwoUpwardTrianglesAtZeroCoveringTheTile) {
  const TileMesh m = planar_tile(7.5);
  EXPECT_EQ(m.period, 7.5);
  EXPECT_EQ(m.triangles.size(), 2u);
  EXPECT_EQ(m.min_z(), 0.0);
  EXPECT_EQ(m.max_z(), 0.0);
  EXPECT_EQ(m.mean_z(), 0.0);
  EXPECT_DOUBLE_EQ(m.projected_area(), 7.5 * 7.5);
  EXPECT_DOUBLE_EQ(m.surface_area(), 7.5 * 7.5);
  for (std::size_t i = 0; i < m.triangles.size(); ++i) EXPECT_EQ(m.normal(i), Eigen::Vector3d(0, 0, 1));
  const auto cov = testing::check_coverage(m, 50, 1, [](double, double, double z) { EXPECT_EQ(z, 0.0); });
  EXPECT_EQ(cov.uncovered + cov.overlapped + cov.undecided, 0);
  for (int axis = 0; axis < 2; ++axis) {
    const auto seam = testing::check_seam(m, axis, 0.0);
    EXPECT_TRUE(seam.chains_ok && seam.twins_ok);
    EXPECT_EQ(seam.segments, 1u);
  }
  EXPECT_THROW(planar_tile(0.0), std::invalid_argument);
}

TEST(TileMesh, TiltedPlaneAreasAndNormal) {
  // z = x·tan(30°) over [0, 2]²: surface area = projected area / cos(30°).
  const double t = std::tan(std::numbers::pi / 6);
  TileMesh m;
  m.period = 2.0;
  m.vertices = {{0, 0, 0}, {2, 0, 2 * t}, {2, 2, 2 * t}, {0, 2, 0}};
  m.triangles = {{0, 1, 2}, {0, 2, 3}};
  EXPECT_DOUBLE_EQ(m.projected_area(), 4.0);
  EXPECT_NEAR(m.surface_area(), 4.0 / std::cos(std::numbers::pi / 6), 1e-12);
  const Eigen::Vector3d n = m.normal(0);
  EXPECT_NEAR(n.norm(), 1.0, 1e-15);
  EXPECT_NEAR(n.x(), -std::sin(std::numbers::pi / 6), 1e-15);
  EXPECT_NEAR(n.y(), 0.0, 1e-15);
  EXPECT_NEAR(n.z(), std::cos(std::numbers::pi / 6), 1e-15);
  EXPECT_EQ(m.min_z(), 0.0);
  EXPECT_DOUBLE_EQ(m.max_z(), 2 * t);
  // wedge: mean height over the tile is half the top height
  EXPECT_NEAR(m.mean_z(), t, 1e-15);
  EXPECT_THROW(m.normal(2), std::out_of_range);
}

TEST(TileMesh, MeanHeightIsMeasuredFromTheLowestPoint) {
  // The same wedge lifted by 5: min_z = 5, mean_z unchanged.
  TileMesh m;
  m.period = 1.0;
  m.vertices = {{0, 0, 5}, {1, 0, 6}, {1, 1, 6}, {0, 1, 5}};
  m.triangles = {{0, 1, 2}, {0, 2, 3}};
  EXPECT_EQ(m.min_z(), 5.0);
  EXPECT_NEAR(m.mean_z(), 0.5, 1e-15);
}

TEST(TileMesh, EmptyMesh) {
  const TileMesh m;
  EXPECT_EQ(m.min_z(), 0.0);
  EXPECT_EQ(m.max_z(), 0.0);
  EXPECT_EQ(m.mean_z(), 0.0);
  EXPECT_EQ(m.projected_area(), 0.0);
  EXPECT_EQ(m.surface_area(), 0.0);
}

}  // namespace
}  // namespace lumtrap::geometry
