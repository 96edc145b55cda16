// Precision mode of the driver (run.target_jg_error): the run stops once the
// standard error of J_G is at most the target, having spread its photons over
// the wavelengths by Neyman allocation, N_i ∝ w_i sqrt(p_i (1 - p_i)) (the
// allocation that minimises Var(J_G) for a given total; W. G. Cochran,
// Sampling Techniques, 3rd ed., 1977, §5.5); run.photons caps each wavelength.
#include <algorithm>
#include <atomic>
#include <cmath>

#include "trace/driver.hpp"
#include "trace_test_util.hpp"
#include "common/temp_dir.hpp"

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

  // Wavelengths topped up beyond their pilot hold photons in proportion
  // to w_i s_i, s_i = sqrt(p_i (1 - p_i)) from their own tallies, within the
  // statistical wobble of the p_i estimated along the way (±25 %).
  const auto pilot = precision_pilot(*run, 1000000, 0.05);
  std::vector<double> ratio;  // N_i / (w_i s_i)
  for (std::size_t i = 0; i < r.tallies.size(); ++i) {
    const auto& t = r.tallies[i];
    ASSERT_GE(t.photons, pilot[i]);
    if (t.photons <= pilot[i]) continue;
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
  // A loose target: the smallest pilot (kFewestPilotPhotons) already meets it.
  auto run = prepare_run(test::scene_from_text(scene_text("1000000", "5 mA/cm2")));
  const DriveResult r = drive_run(*run, DriveOptions{});
  ASSERT_TRUE(r.complete);
  for (const auto& t : r.tallies) EXPECT_EQ(t.photons, kFewestPilotPhotons);
}

TEST(PrecisionMode, PilotIsSizedFromTheTarget) {
  auto run = prepare_run(test::scene_from_text(scene_text("1000000", "0.05 mA/cm2")));
  const double target = 0.05;
  const auto pilot = precision_pilot(*run, 1000000, target);
  // Closed form of the bound: with s_i <= 1/2 and N_i ∝ w_i, σ² = Σ w_i² s_i² / N_i
  // <= (Σ w_i)² / (4 N); a quarter of the N that gives σ = target.
  double sum_w = 0;
  for (double w : run->band_weight) sum_w += w;
  const double sigma_flux = target / current_mA_per_cm2(1.0);
  const double n_bound = sum_w * sum_w / (4 * sigma_flux * sigma_flux);
  for (std::size_t i = 0; i < pilot.size(); ++i) {
    const double want = std::ceil(0.25 * n_bound * run->band_weight[i] / sum_w);
    EXPECT_EQ(double(pilot[i]), std::clamp(want, double(kFewestPilotPhotons), double(kMostPilotPhotons))) << i;
  }
  // The pilot alone, whatever the absorptances, stays above the target
  // (at most twice it) unless clamped: here σ(pilot) computed with s_i = 1/2.
  double var = 0;
  for (std::size_t i = 0; i < pilot.size(); ++i)
    var += run->band_weight[i] * run->band_weight[i] * 0.25 / double(pilot[i]);
  EXPECT_GT(current_mA_per_cm2(std::sqrt(var)), target);
  // A tight target or a small cap: the pilot is capped.
  for (auto n : precision_pilot(*run, 1000000, 1e-6)) EXPECT_EQ(n, kMostPilotPhotons);
  for (auto n : precision_pilot(*run, 50, 1e-6)) EXPECT_EQ(n, 50u);
}

TEST(PrecisionMode, InterruptedRunResumesToBitIdenticalTallies) {
  // Stops after a few slices (the progress callback raises the stop flag),
  // resumes from the checkpoint, and must end exactly where an uninterrupted
  // run ends: the same allocation rounds, the same photons, the same tallies.
  auto run = prepare_run(test::scene_from_text(scene_text("1000000", "0.05 mA/cm2")));
  DriveOptions plain;
  plain.batch = 500;
  const DriveResult whole = drive_run(*run, plain);
  ASSERT_TRUE(whole.complete);

  for (int stop_after : {3, 9, 25}) {
    test::TempDir dir;
    std::atomic<bool> stop{false};
    int calls = 0;
    DriveOptions d;
    d.batch = 500;
    d.checkpoint = dir.path() / "checkpoint.json";
    d.scene_hash = "h";
    d.stop = &stop;
    d.progress = [&](double) {
      if (++calls == stop_after) stop = true;
    };
    DriveResult r = drive_run(*run, d);
    int resumes = 0;
    while (!r.complete && resumes < 100) {
      stop = false;
      calls = 0;
      r = drive_run(*run, d);
      ++resumes;
    }
    ASSERT_TRUE(r.complete) << stop_after;
    EXPECT_GE(resumes, 1) << stop_after;
    ASSERT_EQ(r.tallies.size(), whole.tallies.size());
    for (std::size_t i = 0; i < r.tallies.size(); ++i) {
      EXPECT_EQ(r.tallies[i].photons, whole.tallies[i].photons) << stop_after << " wavelength " << i;
      EXPECT_EQ(r.tallies[i].ended, whole.tallies[i].ended) << stop_after << " wavelength " << i;
    }
    EXPECT_EQ(r.jg_sigma_mA_cm2, whole.jg_sigma_mA_cm2);
  }
}

}  // namespace
}  // namespace lumtrap
