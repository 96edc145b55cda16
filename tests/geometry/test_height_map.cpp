// texture = "height_map" in geometry: grids sampled from analytic surfaces
// (regular pyramid lattices, planes, periodic waves) meshed, made periodic,
// cropped, binned and levelled, against the analytic surfaces themselves.
#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <numbers>
#include <random>

#include "geometry/height_map.hpp"
#include "geometry/height_map_mesh.hpp"
#include "geometry/relief_image.hpp"
#include "geometry/textures.hpp"
#include "mesh_checks.hpp"

namespace lumtrap::geometry {
namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

// Square pyramids of base b on a square lattice with a corner at (x0, y0):
// z = tan(a)·(b/2 - max(|dx|, |dy|)) around the nearest centre (common
// practice: a pyramid is the minimum of its four facet planes).
double pyramid_field(double x, double y, double b, double a_deg, double x0, double y0, bool inverted) {
  const auto d = [b](double u) {
    const double r = std::fmod(u, b);
    const double w = r < 0 ? r + b : r;  // in [0, b)
    return std::abs(w - 0.5 * b);
  };
  const double z = std::tan(a_deg * kDeg) * (0.5 * b - std::max(d(x - x0), d(y - y0)));
  return inverted ? -z : z;
}

HeightGrid sample(std::size_t n, double pitch, const std::function<double(double, double)>& f) {
  HeightGrid g;
  g.columns = g.rows = n;
  g.values.resize(n * n);
  for (std::size_t j = 0; j < n; ++j)
    for (std::size_t i = 0; i < n; ++i) g.at(i, j) = f(double(i) * pitch, double(j) * pitch);
  return g;
}

HeightMapSpec spec_of(TilingMethod tiling, double pitch, bool level = false) {
  HeightMapSpec s;
  s.source = {"test", "csv_grid", 1.0};
  s.pixel_size_um = pitch;
  s.level = level;
  s.tiling = tiling;
  return s;
}

void check_mesh(const TileMesh& m, const std::function<double(double, double)>& height, double tol) {
  const double P = m.period;
  EXPECT_NEAR(m.projected_area(), P * P, 1e-9 * P * P);
  double worst = 0;
  const auto cov = testing::check_coverage(m, 150, 5, [&](double x, double y, double z) {
    worst = std::max(worst, std::abs(z - height(x, y)));
  });
  EXPECT_EQ(cov.uncovered, 0);
  EXPECT_EQ(cov.overlapped, 0);
  EXPECT_EQ(cov.undecided, 0);
  EXPECT_LT(worst, tol) << "mesh height vs the surface sampled";
  for (int axis = 0; axis < 2; ++axis) {
    const auto seam = testing::check_seam(m, axis, 0.0);
    EXPECT_TRUE(seam.chains_ok) << axis;
    EXPECT_TRUE(seam.twins_ok) << axis << " worst " << seam.worst;
  }
}

TEST(HeightMap, SampledRegularPyramidsAreMeshedOnTheirFacetPlanes) {
  // 2 × 2 pyramids of 10 µm sampled every 0.25 µm with the apex and the
  // base corners on samples: with the steeper-diagonal rule every triangle
  // lies on one of the four facet planes (tilt exactly atan(√2), horizontal
  // normal along ±x or ±y), and the mesh is the pyramid field everywhere.
  for (bool inverted : {false, true}) {
    const double b = 10.0, p = 0.25;
    const auto f = [&](double x, double y) { return pyramid_field(x, y, b, kFacet111Deg, 0, 0, inverted); };
    HeightMapReport rep;
    const TileMesh m = height_map_tile(sample(80, p, f), spec_of(TilingMethod::wrap, p), &rep);
    EXPECT_EQ(m.period, 20.0);
    EXPECT_EQ(m.triangles.size(), 2u * 80 * 80);
    EXPECT_EQ(m.vertices.size(), 81u * 81);
    EXPECT_EQ(m.min_z(), 0.0);
    const double H = 0.5 * b * std::sqrt(2.0);  // tan(54.74°) = √2 (common practice)
    EXPECT_NEAR(m.max_z(), H, 1e-12);
    const auto fa = testing::check_facet_angles(m, kFacet111Deg * kDeg, 1e-9);
    EXPECT_EQ(fa.flat, 0u);
    EXPECT_EQ(fa.bad_angle, 0u) << "worst " << fa.worst_angle;
    EXPECT_EQ(fa.bad_azimuth, 0u);
    EXPECT_EQ(fa.downward, 0u);
    check_mesh(m, [&](double x, double y) { return f(x, y) + (inverted ? H : 0.0); }, 1e-12);
    // a surface of pyramids without flat ground: area ratio 1/cos(facet) = √3
    EXPECT_NEAR(m.surface_area() / m.projected_area(), std::sqrt(3.0), 1e-12);
    // a periodic map has no cliff at the seam: no step there exceeds a facet's rise per sample
    EXPECT_LE(rep.tiling.seam_rms_step, std::sqrt(2.0) * p + 1e-12);
  }
}

TEST(HeightMap, MirrorDoublesTheTileAndIsSeamless) {
  // A random map, mirrored: period 2(n - 1) samples, z(2L - x) = z(x).
  const std::size_t n = 17;
  const double p = 0.5;
  std::mt19937_64 rng(3);
  std::uniform_real_distribution<double> u(0.0, 2.0);
  HeightGrid g;
  g.columns = g.rows = n;
  for (std::size_t k = 0; k < n * n; ++k) g.values.push_back(u(rng));
  HeightMapReport rep;
  const TileMesh m = height_map_tile(g, spec_of(TilingMethod::mirror, p), &rep);
  EXPECT_EQ(rep.plan.period_samples, 2 * (n - 1));
  EXPECT_DOUBLE_EQ(m.period, 2.0 * double(n - 1) * p);
  const double zmin = *std::min_element(g.values.begin(), g.values.end());
  const std::size_t side = 2 * (n - 1) + 1;
  for (std::size_t j = 0; j < side; ++j)
    for (std::size_t i = 0; i < side; ++i) {
      const std::size_t si = i < n ? i : 2 * (n - 1) - i, sj = j < n ? j : 2 * (n - 1) - j;
      ASSERT_EQ(m.vertices[j * side + i].z(), g.at(si, sj) - zmin) << i << " " << j;
    }
  for (int axis = 0; axis < 2; ++axis) EXPECT_TRUE(testing::check_seam(m, axis, 0.0).twins_ok);
}

TEST(HeightMap, MirrorOfASymmetricWindowIsTheOriginalLattice) {
  // Pyramids sampled over one period from apex line to apex line are mirror
  // symmetric: mirroring gives back the lattice (tile side doubled).
  const double b = 8.0, p = 0.5;
  const auto f = [&](double x, double y) { return pyramid_field(x, y, b, 50.0, -4.0, -4.0, false); };
  const TileMesh m = height_map_tile(sample(9, p, f), spec_of(TilingMethod::mirror, p));
  EXPECT_EQ(m.period, 8.0);
  check_mesh(m, f, 1e-12);
}

TEST(HeightMap, BlendOfAPeriodicMapExtendedPastOnePeriodIsExact) {
  // z = sin(2πx/L)·cos(2πy/L) sampled over one period L plus w samples:
  // the cross-faded samples are equal, so the blend returns one period.
  const std::size_t M = 40, w = 6;
  const double p = 0.25, L = double(M) * p;
  const auto f = [&](double x, double y) { return std::sin(2 * std::numbers::pi * x / L) * std::cos(2 * std::numbers::pi * y / L); };
  HeightMapSpec s = spec_of(TilingMethod::blend, p);
  s.seam_width_um = double(w) * p;
  HeightMapReport rep;
  const TileMesh m = height_map_tile(sample(M + w, p, f), s, &rep);
  EXPECT_EQ(rep.tiling.blend_samples, w);
  EXPECT_EQ(rep.plan.period_samples, M);
  EXPECT_NEAR(m.period, L, 1e-12);
  for (std::size_t j = 0; j < M; ++j)
    for (std::size_t i = 0; i < M; ++i)
      ASSERT_NEAR(m.vertices[j * (M + 1) + i].z(), f(double(i) * p, double(j) * p) + 1.0, 1e-12);
}

TEST(HeightMap, BlendJoinsUnrelatedEdgesContinuously) {
  // A ramp z = x has a cliff of (n - 1)·p across a wrapped seam; blended over
  // w samples the largest step between neighbours is a fraction of it.
  const std::size_t n = 50, w = 10;
  const double p = 1.0;
  const auto ramp = [](double x, double) { return x; };
  HeightMapReport wrap_rep;
  height_map_tile(sample(n, p, ramp), spec_of(TilingMethod::wrap, p), &wrap_rep);
  EXPECT_NEAR(wrap_rep.tiling.seam_rms_step, std::sqrt(0.5) * 49.0, 1e-9);  // x seam 49, y seam 0
  HeightMapSpec s = spec_of(TilingMethod::blend, p);
  s.seam_width_um = double(w) * p;
  const TileMesh m = height_map_tile(sample(n, p, ramp), s);
  const std::size_t M = n - w;
  double worst = 0;
  for (std::size_t i = 0; i < M; ++i)
    worst = std::max(worst, std::abs(m.vertices[i + 1].z() - m.vertices[i].z()));
  // in the fade each step is 1 - M/(w + 1) = -2.64 samples' worth, against 49 across the wrapped seam
  EXPECT_NEAR(worst, std::abs(1.0 - double(M) / double(w + 1)) * p, 1e-12);
}

TEST(HeightMap, LevellingRemovesATiltedPlaneExactly) {
  // A tilted plane plus pyramids: levelling removes the least-squares plane,
  // which for a lattice mirror-symmetric about the window's centre (apexes
  // at x = 4.75 µm, the centre of 20 samples 0.5 µm apart) is the tilt alone.
  const double p = 0.5, b = 5.0;
  const double bx = 0.02, cy = -0.035;
  const auto pyr = [&](double x, double y) { return pyramid_field(x, y, b, 54.0, 2.25, 2.25, false); };
  const auto f = [&](double x, double y) { return 3.0 + bx * x + cy * y + pyr(x, y); };
  HeightMapReport rep;
  const TileMesh m = height_map_tile(sample(20, p, f), spec_of(TilingMethod::wrap, p, true), &rep);
  EXPECT_NEAR(rep.removed_plane.slope_x, bx, 1e-12);
  EXPECT_NEAR(rep.removed_plane.slope_y, cy, 1e-12);
  double zmin = 1e300;
  for (std::size_t j = 0; j < 20; ++j)
    for (std::size_t i = 0; i < 20; ++i) zmin = std::min(zmin, pyr(i * p, j * p));
  for (std::size_t j = 0; j < 20; ++j)
    for (std::size_t i = 0; i < 20; ++i) ASSERT_NEAR(m.vertices[j * 21 + i].z(), pyr(i * p, j * p) - zmin, 1e-11);
}

TEST(HeightMap, LevelledTiltedPlaneIsFlat) {
  const double p = 0.1;
  const TileMesh m = height_map_tile(sample(30, p, [](double x, double y) { return 0.5 * x - 0.2 * y + 7; }),
                                     spec_of(TilingMethod::mirror, p, true));
  EXPECT_LT(m.max_z() - m.min_z(), 1e-12);
  EXPECT_NEAR(m.surface_area(), m.projected_area(), 1e-9);
}

TEST(HeightMap, CropBinAndUnitsFollowTheSpec) {
  // Sample (i, j) holds 1000·i + j (nm): a crop, a 2 × 2 bin and the unit.
  HeightGrid g;
  g.columns = 12;
  g.rows = 10;
  for (std::size_t j = 0; j < g.rows; ++j)
    for (std::size_t i = 0; i < g.columns; ++i) g.values.push_back(1000.0 * double(i) + double(j));
  HeightMapSpec s = spec_of(TilingMethod::wrap, 0.1);
  s.height_unit_um = 1e-3;
  s.crop = CropMode::pixels;
  s.crop_pixels = {3, 2, 8, 8};
  s.bin = 2;
  HeightMapReport rep;
  const TileMesh m = height_map_tile(g, s, &rep);
  EXPECT_EQ(rep.plan.map_samples, 4u);
  EXPECT_DOUBLE_EQ(rep.plan.pitch_um, 0.2);
  EXPECT_NEAR(m.period, 0.8, 1e-15);
  // binned sample (a, b) = mean of columns 3+2a, 4+2a and rows 2+2b, 3+2b; minus the lowest (a = b = 0)
  for (std::size_t bb = 0; bb < 4; ++bb)
    for (std::size_t a = 0; a < 4; ++a) {
      const double v = (1000.0 * (3.5 + 2.0 * double(a)) + (2.5 + 2.0 * double(bb))) * 1e-3;
      const double v0 = (1000.0 * 3.5 + 2.5) * 1e-3;
      EXPECT_NEAR(m.vertices[bb * 5 + a].z(), v - v0, 1e-12);
    }
  // the same crop in µm: samples with 0.3 <= x < 1.1, 0.2 <= y < 1.0
  HeightMapSpec sl = s;
  sl.crop = CropMode::length;
  sl.crop_x_um = 0.3;
  sl.crop_y_um = 0.2;
  sl.crop_width_um = 0.8;
  sl.crop_height_um = 0.8;
  HeightMapReport rl;
  const TileMesh ml = height_map_tile(g, sl, &rl);
  EXPECT_EQ(rl.plan.rect.column, 3u);
  EXPECT_EQ(rl.plan.rect.row, 2u);
  EXPECT_EQ(rl.plan.rect.columns, 8u);
  EXPECT_EQ(rl.plan.rect.rows, 8u);
  EXPECT_EQ(ml.vertices.size(), m.vertices.size());
  for (std::size_t k = 0; k < m.vertices.size(); ++k) EXPECT_EQ(ml.vertices[k], m.vertices[k]);
}

TEST(HeightMap, PlanProblemsNameTheirKeys) {
  HeightGrid g;
  g.columns = 6;
  g.rows = 5;
  g.values.assign(30, 0.0);
  HeightMapPlan plan;
  HeightMapSpec s = spec_of(TilingMethod::mirror, 0.0);
  auto problem = plan_height_map(g, s, plan);  // no pixel size anywhere
  ASSERT_TRUE(problem);
  EXPECT_EQ(problem->keys.front(), "pixel_size");
  g.pixel_size_um = 0.2;  // the file states it
  s.pixel_size_um = 0.3;  // and the scene contradicts it
  problem = plan_height_map(g, s, plan);
  ASSERT_TRUE(problem);
  EXPECT_EQ(problem->keys.front(), "pixel_size");
  s.pixel_size_um = 0;  // from the file: 6 × 5 is not square
  problem = plan_height_map(g, s, plan);
  ASSERT_TRUE(problem);
  EXPECT_EQ(problem->keys.front(), "file");
  s.crop = CropMode::pixels;
  s.crop_pixels = {2, 0, 5, 5};  // columns 2..6: one too many
  problem = plan_height_map(g, s, plan);
  ASSERT_TRUE(problem);
  EXPECT_EQ(problem->keys.front(), "crop_columns");
  s.crop_pixels = {1, 0, 5, 5};
  EXPECT_FALSE(plan_height_map(g, s, plan));
  EXPECT_TRUE(plan.pixel_from_file);
  EXPECT_EQ(plan.period_samples, 8u);  // mirrored: 2 (5 - 1)
  EXPECT_EQ(plan.triangles, 128.0);
  s.max_triangles = 100;
  problem = plan_height_map(g, s, plan);
  ASSERT_TRUE(problem);
  EXPECT_EQ(problem->keys.front(), "max_triangles");
  s.max_triangles = 1e9;
  s.tiling = TilingMethod::blend;
  s.seam_width_um = 0.4;  // 2 samples of 5: needs 2·2 + 2 = 6
  problem = plan_height_map(g, s, plan);
  ASSERT_TRUE(problem);
  EXPECT_EQ(problem->keys.front(), "seam_width");
  s.bin = 3;
  problem = plan_height_map(g, s, plan);
  ASSERT_TRUE(problem);
  EXPECT_EQ(problem->keys.front(), "bin");
}

TEST(HeightMap, HeightRasterAtTheMapPitchHoldsTheSamples) {
  // The raster samples the mesh at its nodes: at the map's own pitch it
  // returns the (shifted) samples, as a float.
  const std::size_t n = 24;
  const double p = 0.5;
  std::mt19937_64 rng(9);
  std::uniform_real_distribution<double> u(-1.0, 1.0);
  HeightGrid g;
  g.columns = g.rows = n;
  for (std::size_t k = 0; k < n * n; ++k) g.values.push_back(u(rng));
  const TileMesh m = height_map_tile(g, spec_of(TilingMethod::wrap, p));
  const HeightRaster r = height_raster(m, int(n));
  EXPECT_DOUBLE_EQ(r.pixel_um, p);
  const double zmin = *std::min_element(g.values.begin(), g.values.end());
  for (std::size_t k = 0; k < n * n; ++k) EXPECT_EQ(r.z[k], float(g.values[k] - zmin)) << k;
}

TEST(HeightMap, ReliefImagesHaveTheExpectedSizeAndShading) {
  // A flat tile seen from above is uniformly lit: 0.2 + 0.8·sin(50°)
  // (Lambert, the light 50° above the plane); seen at 45° it is a band
  // sin(45°) as tall as the tile is wide.
  const TileMesh flat = planar_tile(10.0);
  const GreyImage top = relief_from_above(flat, 50, 2);
  EXPECT_EQ(top.width, 100);
  EXPECT_EQ(top.height, 100);
  for (float v : top.value) ASSERT_NEAR(v, 0.2 + 0.8 * std::sin(50.0 * kDeg), 1e-6);
  const GreyImage side = relief_oblique(flat, 100, 1, 45.0);
  EXPECT_EQ(side.width, 100);
  EXPECT_EQ(side.height, int(std::ceil(100 * std::sqrt(0.5))) + 1);
  std::size_t lit = 0;
  for (float v : side.value) lit += v > 0;
  EXPECT_NEAR(double(lit), 100.0 * 100.0 * std::sqrt(0.5), 150.0);
}

}  // namespace
}  // namespace lumtrap::geometry
