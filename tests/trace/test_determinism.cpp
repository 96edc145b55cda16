// Counter-based random numbers make tallies independent of how photons are
// split: the same scene and seed give bit-identical tallies with 1 or 2
// threads, and photon ranges traced separately add up to the whole range.
#include <tbb/global_control.h>

#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

const char* kScene = R"(
[wafer]
thickness = "160 um"
[front]
texture = "random_pyramids"
[front.random_pyramids]
distribution = "lognormal"
mean = "3 um"
sd = "1 um"
tile = "30 um"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
scattering = "mixed"
diffuse_fraction = 0.4
[illumination]
wavelengths = ["500 nm", "1100 nm"]
[run]
seed = 42
)";

std::vector<WavelengthTally> with_threads(const PreparedRun& run, int threads) {
  tbb::global_control limit(tbb::global_control::max_allowed_parallelism, std::size_t(threads));
  return test::trace_all(run, 4000);
}

TEST(Determinism, OneAndTwoThreadsGiveBitIdenticalTallies) {
  auto run = prepare_run(test::scene_from_text(kScene));
  const auto one = with_threads(*run, 1);
  const auto two = with_threads(*run, 2);
  ASSERT_EQ(one.size(), two.size());
  for (std::size_t i = 0; i < one.size(); ++i) EXPECT_TRUE(one[i] == two[i]) << "wavelength " << i;
}

TEST(Determinism, PhotonRangesAdd) {
  auto run = prepare_run(test::scene_from_text(kScene));
  const auto optics = wavelength_optics(*run, 1);
  const WavelengthTally whole = trace_wavelength(*run, optics, 1, 0, 3000);
  WavelengthTally parts = trace_wavelength(*run, optics, 1, 0, 1234);
  parts += trace_wavelength(*run, optics, 1, 1234, 3000);
  EXPECT_TRUE(whole == parts);
}

// The cell features (measured rear reflector) keep both invariances.
const char* kCellScene = R"(
[wafer]
thickness = "160 um"
[front]
texture = "upright_pyramids"
[rear]
medium = { reflectance = 0.7, diffuse_fraction = 0.5 }
[illumination]
polar_angle = "30 deg"
wavelengths = ["1050 nm"]
[run]
seed = 42
)";

TEST(Determinism, CellFeaturesKeepThreadAndSplitInvariance) {
  auto run = prepare_run(test::scene_from_text(kCellScene, "cell"));
  const auto one = with_threads(*run, 1);
  const auto two = with_threads(*run, 2);
  ASSERT_EQ(one.size(), two.size());
  for (std::size_t i = 0; i < one.size(); ++i) EXPECT_TRUE(one[i] == two[i]) << "wavelength " << i;
  const auto optics = wavelength_optics(*run, 0);
  const WavelengthTally whole = trace_wavelength(*run, optics, 0, 0, 3000);
  WavelengthTally parts = trace_wavelength(*run, optics, 0, 0, 1234);
  parts += trace_wavelength(*run, optics, 0, 1234, 3000);
  EXPECT_TRUE(whole == parts);
  EXPECT_GT(ended_in(run->layout, whole, EndState::absorbed_rear_reflector), 0u);
}

// A front grid and a patterned rear (macro frame, start position from its
// own random stream) keep both invariances.
const char* kPatternScene = R"(
[wafer]
thickness = "160 um"
[front]
texture = "upright_pyramids"
[rear]
medium = "al_rakic1995"
[[rear.films]]
material = "sinx_pecvd_n209"
thickness = "100 nm"
[front.grid]
finger_shape = "round_wire"
finger_width = "40 um"
finger_pitch = "300 um"
busbar_pitch = "3 mm"
busbar_width = "200 um"
material = "ag_mcpeak2015"
[rear.pattern]
layout = "dots"
lattice = "hexagonal"
pitch = "150 um"
diameter = "60 um"
medium = "al_rakic1995"
[illumination]
polar_angle = "20 deg"
wavelengths = ["1100 nm"]
[run]
seed = 42
)";

TEST(Determinism, GridAndRearPatternKeepThreadAndSplitInvariance) {
  auto run = prepare_run(test::scene_from_text(kPatternScene, "pattern"));
  const auto one = with_threads(*run, 1);
  const auto two = with_threads(*run, 2);
  ASSERT_EQ(one.size(), two.size());
  for (std::size_t i = 0; i < one.size(); ++i) EXPECT_TRUE(one[i] == two[i]) << "wavelength " << i;
  const auto optics = wavelength_optics(*run, 0);
  const WavelengthTally whole = trace_wavelength(*run, optics, 0, 0, 3000);
  WavelengthTally parts = trace_wavelength(*run, optics, 0, 0, 1234);
  parts += trace_wavelength(*run, optics, 0, 1234, 3000);
  EXPECT_TRUE(whole == parts);
  EXPECT_GT(ended_in(run->layout, whole, EndState::absorbed_rear_opening_medium), 0u);
  EXPECT_GT(ended_in(run->layout, whole, EndState::absorbed_rear_medium), 0u);
  EXPECT_GT(ended_in(run->layout, whole, EndState::absorbed_grid), 0u);
  EXPECT_GT(ended_in(run->layout, whole, EndState::reflected_grid), 0u);
}

TEST(Determinism, DifferentSeedsDiffer) {
  Scene a = test::scene_from_text(kScene);
  Scene b = a;
  b.run.seed = 43;
  auto ra = prepare_run(a), rb = prepare_run(b);
  EXPECT_FALSE(test::trace_all(*ra, 2000)[0] == test::trace_all(*rb, 2000)[0]);
}

}  // namespace
}  // namespace lumtrap
