// Texture statistics against closed forms (regular pyramids, a flat plane)
// and against the random-pyramid generator's own layout and report.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numbers>

#include "geometry/height_map.hpp"
#include "geometry/random_pyramid_layout.hpp"
#include "geometry/texture_statistics.hpp"
#include "geometry/textures.hpp"

namespace lumtrap::geometry {
namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

TEST(TextureStatistics, RegularPyramidsMatchClosedForms) {
  // One square pyramid of base b, facet angle a, apex H = b/2·tan a:
  // every facet at a (one 1° bin), area ratio 1/cos a, no flat ground;
  // heights: the area above h is a square of side b(1 - h/H), so
  // F(h) = 1 - (1 - h/H)², mean H/3, Sq = H/√18, Sa = 16H/81 (elementary
  // integrals of that distribution); one pyramid of base b.
  for (double a : {kFacet111Deg, 40.0}) {
    const double b = 6.0, H = 0.5 * b * std::tan(a * kDeg);
    const TextureStatistics s = texture_statistics(regular_pyramids_tile(b, a, 0.0, false));
    const std::size_t bin = std::size_t(a);
    for (std::size_t k = 0; k < s.facet_angles.size(); ++k) {
      EXPECT_NEAR(s.facet_angles[k].surface_fraction, k == bin ? 1.0 : 0.0, 1e-12) << k;
      EXPECT_NEAR(s.facet_angles[k].projected_fraction, k == bin ? 1.0 : 0.0, 1e-12) << k;
    }
    EXPECT_NEAR(s.surface_area_ratio, 1.0 / std::cos(a * kDeg), 1e-12);
    EXPECT_EQ(s.flat_fraction, 0.0);
    EXPECT_NEAR(s.mean_facet_deg, a, 1e-9);
    EXPECT_NEAR(s.mean_z_um, H / 3.0, 1e-12);
    EXPECT_NEAR(s.sq_um, H / std::sqrt(18.0), 1e-12);
    EXPECT_NEAR(s.sa_um, 16.0 * H / 81.0, 1e-12);
    EXPECT_NEAR(s.sz_um, H, 1e-12);
    ASSERT_EQ(s.heights.size(), 100u);
    for (const auto& hb : s.heights) {
      const auto F = [H](double h) { return 1.0 - (1.0 - h / H) * (1.0 - h / H); };
      EXPECT_NEAR(hb.projected_fraction, F(hb.to_um) - F(hb.from_um), 1e-12);
    }
    ASSERT_EQ(s.pyramids.size(), 1u);
    EXPECT_NEAR(s.pyramids[0].base_from_height_um, b, 1e-9);
    EXPECT_NEAR(s.pyramids[0].visible_side_um, b, 1e-9);
    EXPECT_NEAR(s.pyramids[0].apex_z_um, H, 1e-12);
    EXPECT_NEAR(s.pyramids[0].x_um, 3.0, 1e-12);
    EXPECT_NEAR(s.pyramids_per_mm2, 1e6 / 36.0, 1e-6);
  }
}

TEST(TextureStatistics, RegularPyramidsWithAGap) {
  // base 4, gap 1: flat fraction 1 - 16/25; area ratio (16/cos a + 9)/25.
  const double a = kFacet111Deg;
  const TextureStatistics s = texture_statistics(regular_pyramids_tile(4.0, a, 1.0, false));
  EXPECT_NEAR(s.flat_fraction, 9.0 / 25.0, 1e-12);
  EXPECT_NEAR(s.surface_area_ratio, (16.0 / std::cos(a * kDeg) + 9.0) / 25.0, 1e-12);
  EXPECT_NEAR(s.facet_angles[0].projected_fraction, 9.0 / 25.0, 1e-12);
  EXPECT_NEAR(s.facet_angles[54].projected_fraction, 16.0 / 25.0, 1e-12);
  ASSERT_EQ(s.pyramids.size(), 1u);
  EXPECT_NEAR(s.pyramids[0].visible_side_um, 4.0, 1e-9);
  EXPECT_NEAR(s.pyramids[0].base_from_height_um, 4.0, 1e-9);
}

TEST(TextureStatistics, FlatPlaneIsAllAtZeroDegrees) {
  const TextureStatistics s = texture_statistics(planar_tile(10.0));
  EXPECT_EQ(s.facet_angles[0].surface_fraction, 1.0);
  EXPECT_EQ(s.surface_area_ratio, 1.0);
  EXPECT_EQ(s.flat_fraction, 1.0);
  EXPECT_EQ(s.sq_um, 0.0);
  EXPECT_EQ(s.sa_um, 0.0);
  EXPECT_EQ(s.heights[0].projected_fraction, 1.0);
  EXPECT_TRUE(s.pyramids.empty());
}

TEST(TextureStatistics, SampledPyramidLatticeCountsEveryPyramid) {
  // 3 × 3 pyramids of 5 µm sampled every 0.25 µm (a height-map tile): nine
  // pyramids of base 5, and the statistics of the regular pyramid.
  HeightGrid g;
  g.columns = g.rows = 60;
  const double t = std::tan(kFacet111Deg * kDeg);
  for (std::size_t j = 0; j < 60; ++j)
    for (std::size_t i = 0; i < 60; ++i) {
      const double dx = std::abs(std::fmod(i * 0.25, 5.0) - 2.5), dy = std::abs(std::fmod(j * 0.25, 5.0) - 2.5);
      g.values.push_back(t * (2.5 - std::max(dx, dy)));
    }
  HeightMapSpec spec;
  spec.pixel_size_um = 0.25;
  spec.level = false;
  spec.tiling = TilingMethod::wrap;
  const TextureStatistics s = texture_statistics(height_map_tile(g, spec));
  ASSERT_EQ(s.pyramids.size(), 9u);
  for (const auto& p : s.pyramids) {
    EXPECT_NEAR(p.base_from_height_um, 5.0, 1e-9);
    EXPECT_NEAR(p.visible_side_um, 5.0, 1e-9);
    EXPECT_NEAR(std::fmod(p.x_um, 5.0), 2.5, 1e-12);
  }
  EXPECT_NEAR(s.surface_area_ratio, std::sqrt(3.0), 1e-12);  // 1/cos(atan √2)
  EXPECT_NEAR(s.facet_angles[54].surface_fraction, 1.0, 1e-12);
}

// The pyramids of a layout whose apex no other pyramid image covers: the
// visible ones (with equal facet angles, a pyramid whose apex is covered is
// covered whole).
std::vector<PlacedPyramid> visible_pyramids(const RandomPyramidLayout& l) {
  std::vector<PlacedPyramid> out;
  const double P = l.period;
  for (std::size_t i = 0; i < l.pyramids.size(); ++i) {
    const auto& a = l.pyramids[i];
    bool covered = false;
    for (std::size_t j = 0; j < l.pyramids.size() && !covered; ++j) {
      if (j == i) continue;
      const auto& b = l.pyramids[j];
      double dx = std::abs(a.cx - b.cx), dy = std::abs(a.cy - b.cy);
      dx = std::abs(dx - P * std::round(dx / P));
      dy = std::abs(dy - P * std::round(dy / P));
      covered = 0.5 * b.base - std::max(dx, dy) >= 0.5 * a.base;
    }
    if (!covered) out.push_back(a);
  }
  return out;
}

TEST(TextureStatistics, RandomPyramidsAgreeWithTheGeneratorsOwnReport) {
  // The generator reports the pyramids it placed, how many are visible and
  // the exact flat fraction; the statistics of its mesh must find the same
  // count, flat fraction and, from the apex heights, the same base sizes.
  for (double flat : {0.0, 0.3}) {
    RandomPyramidsSpec spec;
    spec.distribution = SizeDistribution::uniform;
    spec.size_a_um = 1.0;
    spec.size_b_um = 5.0;
    spec.tile_um = 40.0;
    spec.flat_fraction = flat;
    spec.seed = 21;
    RandomPyramidsReport rep;
    const TileMesh m = random_pyramids_tile(spec, &rep);
    const TextureStatistics s = texture_statistics(m);
    EXPECT_EQ(s.pyramids.size(), rep.pyramids_visible) << "flat " << flat;
    EXPECT_NEAR(s.flat_fraction, rep.flat_fraction, 1e-9);
    const auto visible = visible_pyramids(random_pyramids_layout(spec));
    ASSERT_EQ(visible.size(), s.pyramids.size());
    std::vector<double> expected, found;
    for (const auto& p : visible) expected.push_back(p.base);
    for (const auto& p : s.pyramids) found.push_back(p.base_from_height_um);
    std::sort(expected.begin(), expected.end());
    std::sort(found.begin(), found.end());
    for (std::size_t k = 0; k < expected.size(); ++k) EXPECT_NEAR(found[k], expected[k], 1e-9) << k;
    std::size_t histogram_total = 0;
    for (const auto& b : s.pyramid_sizes) histogram_total += b.by_base_from_height;
    EXPECT_EQ(histogram_total, s.pyramids.size());
    std::printf("flat %.1f: %zu placed, %zu visible; found %zu; flat fraction %.6f vs %.6f\n", flat,
                rep.pyramids_placed, rep.pyramids_visible, s.pyramids.size(), s.flat_fraction, rep.flat_fraction);
  }
}

TEST(TextureStatistics, ProminenceThresholdIgnoresNoise) {
  // Pyramids with ±0.2 µm of sample noise (a facet drops 0.35 µm per
  // sample): noise makes strict peaks on the facets, and a 1 µm prominence
  // threshold (the pyramids rise 3.5 µm) leaves the nine pyramids.
  HeightGrid g;
  g.columns = g.rows = 60;
  const double t = std::tan(kFacet111Deg * kDeg);
  std::uint64_t state = 12345;
  for (std::size_t j = 0; j < 60; ++j)
    for (std::size_t i = 0; i < 60; ++i) {
      state = state * 6364136223846793005ull + 1442695040888963407ull;
      const double noise = 0.2 * (double(state >> 11) / double(1ull << 53) * 2 - 1);
      const double dx = std::abs(std::fmod(i * 0.25, 5.0) - 2.5), dy = std::abs(std::fmod(j * 0.25, 5.0) - 2.5);
      g.values.push_back(t * (2.5 - std::max(dx, dy)) + noise);
    }
  HeightMapSpec spec;
  spec.pixel_size_um = 0.25;
  spec.level = false;
  spec.tiling = TilingMethod::wrap;
  const TileMesh m = height_map_tile(g, spec);
  StatisticsOptions o;
  EXPECT_GT(texture_statistics(m, o).pyramids.size(), 9u);
  o.min_prominence_um = 1.0;
  const TextureStatistics s = texture_statistics(m, o);
  ASSERT_EQ(s.pyramids.size(), 9u);
  for (const auto& p : s.pyramids) EXPECT_NEAR(p.visible_side_um, 5.0, 0.5);
}

}  // namespace
}  // namespace lumtrap::geometry
