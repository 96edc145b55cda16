// The build estimate and the memory limit (trace/build_estimate.hpp): a tile
// above the limit is refused with the key, the numbers and the tile that
// would fit; small tiles pass.
#include <gmock/gmock.h>

#include "trace/build_estimate.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

using ::testing::HasSubstr;

Scene pyramids(const std::string& body) {
  return test::scene_from_text("[front]\ntexture = \"random_pyramids\"\n[front.random_pyramids]\n" + body +
                                   "[illumination]\nwavelengths = [\"1000 nm\"]\n",
                               "pyramids");
}

std::string refusal(const Scene& s, double max_bytes) {
  try {
    check_build_cost(s, estimate_build(s), max_bytes, "test limit");
  } catch (const SceneError& e) {
    return e.what();
  }
  return "";
}

TEST(BuildEstimate, TenMillimetreTileIsRefusedWithTheNumbers) {
  const Scene s = pyramids("tile = \"10 mm\"\n");
  const BuildCost c = estimate_build(s);
  EXPECT_GT(c.front.triangles, 5e8);
  EXPECT_EQ(c.rear.triangles, 2.0);  // planar
  const std::string e = refusal(s, 8.0 * 1024 * 1024 * 1024);
  EXPECT_THAT(e, HasSubstr("pyramids.toml:4:"));  // the line of the tile key
  EXPECT_THAT(e, HasSubstr("key 'front.random_pyramids.tile'"));
  EXPECT_THAT(e, HasSubstr("value \"10 mm\""));
  EXPECT_THAT(e, HasSubstr("triangles"));
  EXPECT_THAT(e, HasSubstr("8 GiB (test limit)"));
  EXPECT_THAT(e, HasSubstr("tile = "));  // the tile that would fit
  EXPECT_THAT(e, HasSubstr("larger pyramids"));
}

TEST(BuildEstimate, NanometrePyramidsAreRefused) {
  const Scene s = pyramids("distribution = \"fixed\"\nsize = \"1 nm\"\nmin_size = \"0.5 nm\"\n");
  EXPECT_THAT(refusal(s, 8.0 * 1024 * 1024 * 1024), HasSubstr("key 'front.random_pyramids.tile'"));
}

TEST(BuildEstimate, ShippedScenesPassAndRegularTexturesAreTiny) {
  const Scene s = pyramids("tile = \"40 um\"\n");
  EXPECT_EQ(refusal(s, 1e9), "");
  EXPECT_LT(estimate_build(s).bytes, 1e8);
  // A 1 mm tile: 1.67e9 bytes measured (peak resident memory of lumtrap run,
  // see build_estimate.cpp); the estimate within 10 %.
  const BuildCost mm = estimate_build(pyramids("tile = \"1 mm\"\n"));
  EXPECT_NEAR(mm.bytes, 1590.0 * 1024 * 1024, 0.1 * 1590.0 * 1024 * 1024);
  const Scene r = test::scene_from_text("[front]\ntexture = \"upright_pyramids\"\n[front.pyramids]\ngap = \"1 um\"\n",
                                        "regular");
  EXPECT_EQ(estimate_build(r).front.triangles, 12.0);
  // The limit also applies to small scenes: a tiny limit refuses them.
  EXPECT_THAT(refusal(s, 1e6), HasSubstr("front.random_pyramids.tile"));
}

}  // namespace
}  // namespace lumtrap
