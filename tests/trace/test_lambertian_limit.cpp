// The ideal Lambertian light-trapping limit: every incident photon enters,
// light inside is Lambertian, the rear is a perfect Lambertian reflector, the
// front lets Lambertian light out with probability 1/n² (all of it inside
// the escape cone, none outside). Exact absorptance (M. A. Green, "Lambertian
// light trapping in textured solar cells and light-emitting diodes:
// analytical solutions", Prog. Photovolt. 10, 235-241, 2002):
//   A = 1 - (t²/n²) / (1 - (1 - 1/n²) t²),  t = 2 E3(αW)
// and its weak-absorption limit A ≈ 4 n² α W (E. Yablonovitch, "Statistical
// ray optics", J. Opt. Soc. Am. 72, 899-907, 1982).
// Tracer vs exact: |Δ| <= 4σ (σ: the tracer's binomial standard error).
#include <numbers>
#include <fmt/format.h>

#include <cmath>
#include <iostream>

#include "optics/closed_forms.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

// Green's exact absorptance (closed form in optics/closed_forms.hpp).
double green_absorptance(double alpha_W, double n) { return lambertian_absorptance(alpha_W, n); }

std::string lambertian_scene(const std::string& thickness, const std::string& material,
                             const std::string& wavelengths) {
  return fmt::format(R"(
[wafer]
material = {}
thickness = "{}"
[front]
interface = "ideal"
scattering = "lambertian"
[rear]
medium = "perfect_mirror"
scattering = "lambertian"
[illumination]
wavelengths = {}
)",
                     material, thickness, wavelengths);
}

TEST(LambertianLimit, TracerReproducesGreensExactAbsorptance) {
  for (const char* W : {"100 um", "180 um"}) {
    const Scene scene = test::scene_from_text(
        lambertian_scene(W, "\"si_green2008\"", R"(["900 nm", "1000 nm", "1050 nm", "1100 nm", "1150 nm", "1200 nm"])"),
        std::string("lambert_") + W[0]);
    auto run = prepare_run(scene);
    const std::uint64_t N = 20000;
    const auto tallies = test::trace_all(*run, N);
    for (std::size_t i = 0; i < tallies.size(); ++i) {
      const auto optics = wavelength_optics(*run, i);
      const double aW = optics.alpha_per_um * scene.wafer.thickness_um;
      const double exact = green_absorptance(aW, optics.n_bulk);
      const double traced = double(ended_in(run->layout, tallies[i], EndState::absorbed_silicon)) / double(N);
      std::cout << fmt::format("W = {}, {} nm: A traced {:.4f}, exact {:.4f}\n", W,
                               scene.illumination.wavelengths_nm[i], traced, exact);
      EXPECT_NEAR(traced, exact, 4.0 * test::sigma_of(ended_in(run->layout, tallies[i], EndState::absorbed_silicon), N)) << W << " " << i;
      EXPECT_EQ(ended_in(run->layout, tallies[i], EndState::reflected_front), 0u);  // all light enters
      EXPECT_EQ(ended_in(run->layout, tallies[i], EndState::lost), 0u);
    }
  }
}

TEST(LambertianLimit, WeakAbsorptionPathEnhancementIsFourNSquared) {
  // n = 3.5 and k such that αW = 2e-4 at 1000 nm for W = 100 µm.
  const double n = 3.5, W_um = 100.0, lam_nm = 1000.0, aW = 2e-4;
  const double k = aW / (W_um * 1e3) * lam_nm / (4 * std::numbers::pi);
  const Scene scene = test::scene_from_text(
      lambertian_scene("100 um", fmt::format("{{ n = {}, k = {:.17g} }}", n, k), R"(["1000 nm"])"));
  auto run = prepare_run(scene);
  const std::uint64_t N = 200000;
  const auto t = test::trace_all(*run, N)[0];
  const double A = double(ended_in(run->layout, t, EndState::absorbed_silicon)) / double(N);
  const double enhancement = A / aW;
  std::cout << fmt::format("path enhancement: traced {:.2f} (± {:.2f}), 4n² = {:.2f}, Green exact {:.2f}\n",
                           enhancement, test::sigma_of(ended_in(run->layout, t, EndState::absorbed_silicon), N) / aW, 4 * n * n,
                           green_absorptance(aW, n) / aW);
  // Green's exact value tends to the 4n² limit (within 2 % at this αW, within
  // 0.1 % at αW = 1e-6) ...
  EXPECT_NEAR(green_absorptance(aW, n) / aW, 4 * n * n, 0.02 * 4 * n * n);
  EXPECT_NEAR(green_absorptance(1e-6, n) / 1e-6, 4 * n * n, 0.001 * 4 * n * n);
  // ... and the tracer matches it statistically.
  EXPECT_NEAR(A, green_absorptance(aW, n), 4.0 * test::sigma_of(ended_in(run->layout, t, EndState::absorbed_silicon), N));
}

TEST(LambertianLimit, PhotogeneratedCurrentOfTheShippedLimitScenes) {
  // J_G of scenes/lambertian_limit_{100,180}um.toml (AM1.5G, 300-1200 nm):
  // the tracer against Green's exact absorptance integrated with the same
  // band weights, within 4σ of the traced J_G.
  for (const char* W : {"100", "180"}) {
    Scene scene = parse_scene_file(std::string(LUMTRAP_SOURCE_DIR) + "/scenes/lambertian_limit_" + W + "um.toml");
    auto run = prepare_run(scene);
    const auto tallies = test::trace_all(*run, 4000);
    const Results r = results_from_tallies(*run, tallies);
    double exact_flux = 0;
    for (std::size_t i = 0; i < tallies.size(); ++i) {
      const auto optics = wavelength_optics(*run, i);
      exact_flux += run->band_weight[i] * green_absorptance(optics.alpha_per_um * scene.wafer.thickness_um,
                                                            optics.n_bulk);
    }
    const double exact = current_mA_per_cm2(exact_flux);
    const ResultBin& jg = r.bin("absorbed_silicon");
    std::cout << fmt::format("Lambertian limit {} um: J_G traced {:.3f} ± {:.3f}, exact {:.3f} mA/cm2 (J_max {:.3f})\n",
                             W, jg.current_mA_cm2, jg.current_sigma_mA_cm2, exact, r.J_max_mA_cm2);
    EXPECT_NEAR(jg.current_mA_cm2, exact, 4 * jg.current_sigma_mA_cm2);
  }
}

}  // namespace
}  // namespace lumtrap
