// Common random numbers and paired photon groups (trace/tallies.hpp,
// io/paired_difference.hpp). Two runs with the same seed and random streams
// draw the same numbers for photon i of wavelength j, so a film-thickness
// difference is measured with a far smaller error than two independent runs
// give; the groups' batch-means error agrees with the binomial error of J_G;
// and the groups add up to the run.
#include <cmath>

#include "io/paired_difference.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

std::string cell(const char* sinx) {
  return std::string(R"(
[wafer]
thickness = "160 um"
[front]
texture = "random_pyramids"
[front.random_pyramids]
distribution = "uniform"
min = "1 um"
max = "5 um"
tile = "25 um"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = ")") + sinx + R"("
[rear]
medium = "al_rakic1995"
[[rear.films]]
material = "sio2_malitson1965"
thickness = "100 nm"
[illumination]
wavelengths = { from = "400 nm", to = "1150 nm", step = "50 nm" }
[run]
seed = 7
)";
}

constexpr std::uint64_t kPhotons = 6400;  // 200 per group

Summary traced(const Scene& scene, std::uint64_t variant) {
  auto run = prepare_run(scene, variant);
  return results_from_tallies(*run, test::trace_all(*run, kPhotons)).summary;
}

TEST(CommonRandomNumbers, GroupsAddUpToTheRunAndMatchItsBinomialError) {
  const Summary s = traced(test::scene_from_text(cell("75 nm"), "a"), 0);
  ASSERT_EQ(s.J_G_groups_mA_cm2.size(), 32u);
  // Equal photons per group (6400 = 32 x 200): the mean of the groups is J_G.
  double mean = 0;
  for (double g : s.J_G_groups_mA_cm2) mean += g;
  mean /= double(s.J_G_groups_mA_cm2.size());
  EXPECT_NEAR(mean, s.J_G_mA_cm2, 1e-9 * s.J_G_mA_cm2);
  // The batch-means error estimates the same sigma as the binomial one; an
  // estimate of sigma from G groups has relative error 1/sqrt(2(G-1)) (common
  // practice), so they agree within 4 of those.
  const double rel = 1.0 / std::sqrt(2.0 * 31.0);
  EXPECT_NEAR(s.J_G_sigma_groups_mA_cm2 / s.J_G_sigma_mA_cm2, 1.0, 4 * rel)
      << "groups " << s.J_G_sigma_groups_mA_cm2 << ", binomial " << s.J_G_sigma_mA_cm2;
}

TEST(CommonRandomNumbers, FilmThicknessDifferenceHasAtLeastThreeTimesSmallerError) {
  const Scene thin = test::scene_from_text(cell("75 nm"), "thin");
  const Scene thick = test::scene_from_text(cell("80 nm"), "thick");
  const Summary a = traced(thin, 0);
  const Summary common = traced(thick, 0);       // same streams
  const Summary independent = traced(thick, 1);  // other streams
  const Difference d_common =
      paired_difference(common.J_G_mA_cm2, common.J_G_groups_mA_cm2, a.J_G_mA_cm2, a.J_G_groups_mA_cm2);
  const Difference d_indep =
      paired_difference(independent.J_G_mA_cm2, independent.J_G_groups_mA_cm2, a.J_G_mA_cm2, a.J_G_groups_mA_cm2);
  std::cout << "J_G(80 nm) - J_G(75 nm): common streams " << d_common.value << " +- " << d_common.sigma
            << " mA/cm2, independent streams " << d_indep.value << " +- " << d_indep.sigma << " mA/cm2 (ratio of "
            << "errors " << d_indep.sigma / d_common.sigma << ")\n";
  EXPECT_GE(d_indep.sigma, 3 * d_common.sigma);
  // Independent streams: the paired error is the two errors combined
  // (within the batch-means estimate's own relative error, 4 x 1/sqrt(62)).
  const double combined = std::hypot(independent.J_G_sigma_mA_cm2, a.J_G_sigma_mA_cm2);
  EXPECT_NEAR(d_indep.sigma / combined, 1.0, 4 / std::sqrt(62.0));
  // Both estimate the same difference: they agree within 4 sigma of the
  // independent one (the common estimate's error is the smaller).
  EXPECT_LE(std::abs(d_common.value - d_indep.value), 4 * std::hypot(d_indep.sigma, d_common.sigma) + 1e-6);
}

}  // namespace
}  // namespace lumtrap
