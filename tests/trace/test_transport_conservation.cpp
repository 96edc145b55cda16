// Bookkeeping of the tracer: every photon ends in exactly one bin (integer
// counts add up to the photons launched), and with a lossless bulk and a
// perfectly reflecting, non-absorbing rear no absorption appears from
// nowhere: everything leaves through the front (energy conservation, common
// practice for Monte Carlo transport checks).
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

TEST(TransportConservation, LosslessTexturedWaferWithPerfectMirrorReflectsEverything) {
  const Scene scene = test::scene_from_text(R"(
[wafer]
material = { n = 3.5, k = 0 }
thickness = "100 um"
[front]
texture = "random_pyramids"
[front.random_pyramids]
distribution = "uniform"
min = "1 um"
max = "5 um"
tile = "30 um"
seed = 3
[rear]
medium = "perfect_mirror"
[illumination]
polar_angle = "20 deg"
wavelengths = ["600 nm", "1000 nm"]
[run]
photons = 1
max_bounces = 100000
)");
  auto run = prepare_run(scene);
  for (const auto& t : test::trace_all(*run, 5000)) {
    EXPECT_EQ(t.ended_total(), t.photons);
    EXPECT_EQ(ended_in(run->layout, t, EndState::absorbed_silicon), 0u);
    EXPECT_EQ(ended_in(run->layout, t, EndState::absorbed_rear_medium), 0u);
    EXPECT_EQ(ended_in(run->layout, t, EndState::transmitted_rear), 0u);
    EXPECT_EQ(ended_in(run->layout, t, EndState::reflected_front) + ended_in(run->layout, t, EndState::escaped_front) + ended_in(run->layout, t, EndState::unresolved) + ended_in(run->layout, t, EndState::lost), t.photons);
    EXPECT_LE(ended_in(run->layout, t, EndState::unresolved) + ended_in(run->layout, t, EndState::lost), t.photons / 1000);
  }
}

TEST(TransportConservation, LosslessWaferTexturedOnBothSidesOnlyReflectsAndTransmits) {
  const Scene scene = test::scene_from_text(R"(
[wafer]
material = { n = 3.5, k = 0 }
thickness = "100 um"
[front]
texture = "random_pyramids"
[front.random_pyramids]
tile = "30 um"
[rear]
texture = "inverted_pyramids"
medium = "air"
[rear.pyramids]
base = "8 um"
gap = "1 um"
[illumination]
wavelengths = ["800 nm"]
[run]
max_bounces = 100000
)");
  auto run = prepare_run(scene);
  const auto t = test::trace_all(*run, 5000)[0];
  EXPECT_EQ(ended_in(run->layout, t, EndState::reflected_front) + ended_in(run->layout, t, EndState::escaped_front) + ended_in(run->layout, t, EndState::transmitted_rear) + ended_in(run->layout, t, EndState::unresolved) + ended_in(run->layout, t, EndState::lost), t.photons);
  EXPECT_GT(ended_in(run->layout, t, EndState::transmitted_rear), 0u);
  EXPECT_LE(ended_in(run->layout, t, EndState::unresolved) + ended_in(run->layout, t, EndState::lost), t.photons / 1000);
}

TEST(TransportConservation, EveryPhotonEndsInExactlyOneBin) {
  const Scene scene = test::scene_from_text(R"(
[wafer]
thickness = "160 um"
[front]
texture = "random_pyramids"
[front.random_pyramids]
distribution = "uniform"
min = "1 um"
max = "5 um"
tile = "30 um"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[[rear.films]]
material = "sio2_malitson1965"
thickness = "100 nm"
[illumination]
wavelengths = ["350 nm", "700 nm", "1050 nm", "1200 nm"]
)");
  auto run = prepare_run(scene);
  for (const auto& t : test::trace_all(*run, 3000)) {
    EXPECT_EQ(t.photons, 3000u);
    EXPECT_EQ(t.ended_total(), t.photons);
    std::uint64_t depth_total = 0;
    for (auto c : t.depth) depth_total += c;
    EXPECT_EQ(depth_total, ended_in(run->layout, t, EndState::absorbed_silicon));
  }
}

}  // namespace
}  // namespace lumtrap
