// A perfectly regular texture with a flat specular rear is deterministic:
// where a ray meets the front again depends on thickness / period, so weakly
// absorbed light swings with the thickness. Real wafers are not that
// regular; the default (run.randomize_lateral = true) draws a new lateral
// position on every bulk crossing, which removes the swing. Both modes are
// tested on 10 µm regular pyramids at 178 and 182 µm, 1100 nm (the effect is
// known in the trade, e.g. between thicknesses a few µm apart; common
// practice). The seeded runs are deterministic; the checks compare with the
// runs' own standard errors.
#include <fmt/format.h>

#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

struct Absorbed {
  double A, sigma;
};

Absorbed absorptance(double thickness_um, bool randomize) {
  const Scene scene = test::scene_from_text(fmt::format(R"(
[wafer]
thickness = "{} um"
[front]
texture = "upright_pyramids"
[front.pyramids]
base = "10 um"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = ["1100 nm"]
[run]
randomize_lateral = {}
)",
                                                        thickness_um, randomize),
                                            fmt::format("w{}_{}", thickness_um, randomize));
  auto run = prepare_run(scene);
  const std::uint64_t N = 40000;
  const auto t = test::trace_all(*run, N)[0];
  return {double(ended_in(run->layout, t, EndState::absorbed_silicon)) / N, test::sigma_of(ended_in(run->layout, t, EndState::absorbed_silicon), N)};
}

TEST(LateralRandomization, RegularTextureSwingsWithThicknessOnlyWithoutRandomization) {
  const Absorbed fixed178 = absorptance(178, false), fixed182 = absorptance(182, false);
  const Absorbed rand178 = absorptance(178, true), rand182 = absorptance(182, true);
  const double s_fixed = std::hypot(fixed178.sigma, fixed182.sigma);
  const double s_rand = std::hypot(rand178.sigma, rand182.sigma);
  std::cout << fmt::format("A(1100 nm) 178 / 182 um: deterministic lateral {:.4f} / {:.4f}, randomized {:.4f} / "
                           "{:.4f}\n",
                           fixed178.A, fixed182.A, rand178.A, rand182.A);
  // deterministic: a swing far beyond the statistics
  EXPECT_GT(std::abs(fixed178.A - fixed182.A), 8 * s_fixed);
  // randomized: only the small, smooth thickness effect (about 1 % relative
  // for 4 µm here) plus statistics
  EXPECT_LT(std::abs(rand178.A - rand182.A), 4 * s_rand + 0.01 * rand182.A);
}

}  // namespace
}  // namespace lumtrap
