// Precision mode of the driver (run.target_jg_error): the run stops once the
// standard error of J_G is at most the target, having spread its photons over
// the wavelengths by Neyman allocation, N_i ∝ w_i sqrt(p_i (1 - p_i)) (the
// allocation that minimises Var(J_G) for a given total; W. G. Cochran,
// Sampling Techniques, 3rd ed., 1977, §5.5); run.photons caps each wavelength.
#include <cmath>

#include "trace/driver.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

std::string scene_text(const char* photons, const char* target) {
  return std::string(R"(
[wafer]
thickness = "160 um"
[front]
texture = "upright_pyramids"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = ["350 nm", "600 nm", "900 nm", "1050 nm", "1150 nm"]
[run]
photons = )") + photons + "\ntarget_jg_error = \"" + target + "\"\n";
}

TEST(PrecisionMode, StopsAtTheTargetWithNeymanAllocation) {
  auto run = prepare_run(test::scene_from_text(scene_text("1000000", "0.05 mA/cm2")));
  const DriveResult r = drive_run(*run, DriveOptions{});
  ASSERT_TRUE(r.complete);
  EXPECT_LE(r.jg_sigma_mA_cm2, 0.05);
  EXPECT_EQ(r.jg_sigma_mA_cm2, jg_sigma(*run, r.tallies));
  // The reported σ is the one of the results (same binomial formula).
  const Results res = results_from_tallies(*run, r.tallies);
  EXPECT_NEAR(res.bins.at(0).current_sigma_mA_cm2, r.jg_sigma_mA_cm2, 1e-12);

  // Wavelengths topped up beyond the pilot (2000) hold photons in proportion
  // to w_i s_i, s_i = sqrt(p_i (1 - p_i)) from their own tallies, within the
  // statistical wobble of the p_i estimated along the way (±25 %).
  std::vector<double> ratio;  // N_i / (w_i s_i)
  for (std::size_t i = 0; i < r.tallies.size(); ++i) {
    const auto& t = r.tallies[i];
    ASSERT_GE(t.photons, 2000u);
    if (t.photons <= 2000) continue;
    const double p = double(ended_in(run->layout, t, EndState::absorbed_silicon)) / double(t.photons);
    ratio.push_back(double(t.photons) / (run->band_weight[i] * std::sqrt(p * (1 - p))));
  }
  ASSERT_GE(ratio.size(), 2u);
  for (double x : ratio) EXPECT_NEAR(x / ratio[0], 1.0, 0.25);
}

TEST(PrecisionMode, CapsEveryWavelengthAtRunPhotons) {
  // A target far below what 3000 photons per wavelength can give.
  auto run = prepare_run(test::scene_from_text(scene_text("3000", "0.001 mA/cm2")));
  const DriveResult r = drive_run(*run, DriveOptions{});
  ASSERT_TRUE(r.complete);
  EXPECT_GT(r.jg_sigma_mA_cm2, 0.001);
  for (const auto& t : r.tallies) EXPECT_EQ(t.photons, 3000u);
}

TEST(PrecisionMode, PilotAloneWhenItMeetsTheTarget) {
  auto run = prepare_run(test::scene_from_text(scene_text("1000000", "5 mA/cm2")));
  const DriveResult r = drive_run(*run, DriveOptions{});
  ASSERT_TRUE(r.complete);
  for (const auto& t : r.tallies) EXPECT_EQ(t.photons, 2000u);
}

}  // namespace
}  // namespace lumtrap
