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

std::string cell(const char* sinx, int seed = 7) {
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
seed = )" + std::to_string(seed) + "\n";
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
  // Four seeds pooled, so that the error estimates (each from 32 groups,
  // relative error 1/sqrt(62) = 13 %) are good to about 6 %.
  double var_common = 0, var_indep = 0, var_combined = 0;
  for (int seed : {7, 8, 9, 10}) {
    const Scene thin = test::scene_from_text(cell("75 nm", seed), "thin");
    const Scene thick = test::scene_from_text(cell("80 nm", seed), "thick");
    const Summary a = traced(thin, 0);
    const Summary common = traced(thick, 0);       // same streams
    const Summary independent = traced(thick, 1);  // other streams
    const Difference d_common =
        paired_difference(common.J_G_mA_cm2, common.J_G_groups_mA_cm2, a.J_G_mA_cm2, a.J_G_groups_mA_cm2);
    const Difference d_indep = paired_difference(independent.J_G_mA_cm2, independent.J_G_groups_mA_cm2,
                                                 a.J_G_mA_cm2, a.J_G_groups_mA_cm2);
    std::cout << "seed " << seed << ": J_G(80 nm) - J_G(75 nm): common streams " << d_common.value << " +- "
              << d_common.sigma << " mA/cm2, independent streams " << d_indep.value << " +- " << d_indep.sigma
              << " mA/cm2\n";
    // Both estimate the same difference: within 4 sigma of each other.
    EXPECT_LE(std::abs(d_common.value - d_indep.value), 4 * std::hypot(d_indep.sigma, d_common.sigma) + 1e-6);
    var_common += d_common.sigma * d_common.sigma;
    var_indep += d_indep.sigma * d_indep.sigma;
    var_combined += independent.J_G_sigma_mA_cm2 * independent.J_G_sigma_mA_cm2 + a.J_G_sigma_mA_cm2 * a.J_G_sigma_mA_cm2;
  }
  const double s_common = std::sqrt(var_common / 4), s_indep = std::sqrt(var_indep / 4),
               s_combined = std::sqrt(var_combined / 4);
  std::cout << "pooled error of the difference: common " << s_common << ", independent " << s_indep
            << " (binomial errors combined " << s_combined << "), ratio " << s_indep / s_common << "\n";
  EXPECT_GE(s_indep, 3 * s_common);
  // Independent streams: the paired error is the two errors combined, within
  // the pooled estimate's relative error (4 x 1/sqrt(4 x 62)).
  EXPECT_NEAR(s_indep / s_combined, 1.0, 4 / std::sqrt(4 * 62.0));
}

}  // namespace
}  // namespace lumtrap
