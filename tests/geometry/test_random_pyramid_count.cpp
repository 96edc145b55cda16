// The estimate of placed and visible pyramids and of triangles of a random-
// pyramid tile (geometry/random_pyramid_count.hpp) against what the
// generator actually builds; and its limits far beyond what can be built.
#include <gtest/gtest.h>

#include <cstdio>

#include "geometry/random_pyramid_count.hpp"
#include "geometry/textures.hpp"

namespace lumtrap::geometry {
namespace {

RandomPyramidsSpec spec(SizeDistribution d, double a, double b, double tile, double flat = 0.0) {
  RandomPyramidsSpec s;
  s.distribution = d;
  s.size_a_um = a;
  s.size_b_um = b;
  s.tile_um = tile;
  s.flat_fraction = flat;
  return s;
}

// The model (Boolean-model coverage, Poisson hiding; see the header) must
// follow the generator within a factor 1.35 for the distributions in use;
// the triangle count is what sets memory and time.
TEST(RandomPyramidCount, FollowsTheGeneratorWithinAFactor) {
  const RandomPyramidsSpec cases[] = {
      spec(SizeDistribution::fixed, 5, 0, 100),       spec(SizeDistribution::uniform, 1, 5, 100),
      spec(SizeDistribution::uniform, 1, 5, 200),     spec(SizeDistribution::uniform, 2, 3, 100),
      spec(SizeDistribution::normal, 3, 1, 100),      spec(SizeDistribution::lognormal, 3, 1, 100),
      spec(SizeDistribution::uniform, 1, 5, 100, 0.05), spec(SizeDistribution::uniform, 1, 5, 100, 0.3),
      spec(SizeDistribution::fixed, 5, 0, 100, 0.1),
  };
  for (const RandomPyramidsSpec& s : cases) {
    const RandomPyramidCount e = estimate_random_pyramids(s);
    RandomPyramidsReport r;
    const TileMesh m = random_pyramids_tile(s, &r);
    const double ratio = double(m.triangles.size()) / e.triangles;
    std::printf("tile %g um, sizes %g/%g, flat %g: triangles built %zu, estimated %.0f (ratio %.2f); placed %zu/%.0f, "
                "visible %zu/%.0f\n",
                s.tile_um, s.size_a_um, s.size_b_um, s.flat_fraction, m.triangles.size(), e.triangles, ratio,
                r.pyramids_placed, e.placed, r.pyramids_visible, e.visible);
    EXPECT_GT(ratio, 1 / 1.35) << s.tile_um;
    EXPECT_LT(ratio, 1.35) << s.tile_um;
  }
}

// Cases far too large to build are estimated (without building) as such:
// 1-5 um pyramids in a 10 mm tile, 1 nm pyramids in a 50 um tile.
TEST(RandomPyramidCount, HugeTilesAreEstimatedWithoutBuilding) {
  const RandomPyramidCount big = estimate_random_pyramids(spec(SizeDistribution::uniform, 1, 5, 10000));
  EXPECT_GT(big.triangles, 5e8);
  RandomPyramidsSpec tiny = spec(SizeDistribution::fixed, 0.001, 0, 50);
  tiny.min_size_um = 0.0005;
  const RandomPyramidCount nm = estimate_random_pyramids(tiny);
  EXPECT_GT(nm.triangles, 1e9);
  // The placement stops at the generator's safety cap of 2e8 pyramids.
  EXPECT_LE(nm.placed, 2e8);
  // A 1 mm tile: about 10^7 triangles (measured: see src/trace/build_estimate.cpp).
  const RandomPyramidCount mm = estimate_random_pyramids(spec(SizeDistribution::uniform, 1, 5, 1000));
  EXPECT_GT(mm.triangles, 5e6);
  EXPECT_LT(mm.triangles, 2e7);
}

}  // namespace
}  // namespace lumtrap::geometry
