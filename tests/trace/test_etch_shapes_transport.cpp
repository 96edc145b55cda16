// Traced etch shapes: a radius of 0 traces exactly as the sharp texture
// (same tallies, bit for bit), and random inverted pyramids on bare silicon
// reflect within the range published for such textures.
#include <fmt/format.h>

#include <iostream>

#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

std::string pyramid_scene(const std::string& texture, const std::string& table, const std::string& keys) {
  return fmt::format(R"(
[wafer]
thickness = "180 um"
[front]
texture = "{}"
[front.{}]
{}
[rear]
medium = "air"
[illumination]
wavelengths = ["600 nm", "1000 nm"]
[run]
photons = 1
seed = 3
)",
                     texture, table, keys);
}

TEST(EtchShapesTransport, RadiusZeroTracesAsTheSharpTexture) {
  const std::uint64_t N = 3000;
  const std::pair<std::string, std::string> cases[] = {
      {"upright_pyramids", "pyramids"}, {"inverted_pyramids", "pyramids"}, {"random_pyramids", "random_pyramids"}};
  for (const auto& [texture, table] : cases) {
    const std::string base = table == "pyramids" ? "base = \"5 um\"\n" : "tile = \"16 um\"\n";
    const auto sharp = prepare_run(test::scene_from_text(pyramid_scene(texture, table, base), texture + "_sharp"));
    const auto zero = prepare_run(test::scene_from_text(
        pyramid_scene(texture, table, base + "tip_radius = \"0 um\"\nvalley_radius = \"0 nm\"\n"), texture + "_zero"));
    const auto a = test::trace_all(*sharp, N), b = test::trace_all(*zero, N);
    ASSERT_EQ(a.size(), b.size());
    for (std::size_t i = 0; i < a.size(); ++i) EXPECT_TRUE(a[i] == b[i]) << texture << " wavelength " << i;
  }
}

TEST(EtchShapesTransport, RandomInvertedPyramidsReflectLikePublishedPitTextures) {
  // Bare silicon with random inverted pyramids (pits of 2-4 µm, full
  // coverage), 600 nm, a wafer thick enough that nothing returns from the
  // bulk: front reflectance of such textures, made by metal-assisted etching
  // followed by alkaline etching, is reported at about 8-16 % in the visible
  // (from memory). Tolerance: the range widened by 4σ of the run.
  const std::uint64_t N = 20000;
  const Scene scene = test::scene_from_text(R"(
[wafer]
thickness = "1000 um"
[front]
texture = "random_inverted_pyramids"
[front.random_pyramids]
min = "2 um"
max = "4 um"
tile = "14 um"
seed = 2
[rear]
medium = "air"
[illumination]
wavelengths = ["600 nm"]
[run]
photons = 1
seed = 9
)");
  const auto run = prepare_run(scene);
  const WavelengthTally t = test::trace_all(*run, N)[0];
  const std::uint64_t n = ended_in(run->layout, t, EndState::reflected_front);
  const double R = double(n) / N, s = test::sigma_of(n, N);
  std::cout << fmt::format("random inverted pyramids, bare Si, 600 nm: R = {:.4f} ± {:.4f}\n", R, s);
  EXPECT_GE(R, 0.08 - 4 * s);
  EXPECT_LE(R, 0.16 + 4 * s);
}

}  // namespace
}  // namespace lumtrap
