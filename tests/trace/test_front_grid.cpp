// The front grid ([front.grid]): fingers and busbars in the macro frame.
//
// Checks (closed forms written here, "common practice" for the geometry and
// the Fresnel equations):
// - coverage f + b - f b of fingers (f = w / pitch) and busbars (b), and the
//   contact footprint, against sampling the macro frame;
// - a perfectly absorbing (ambient-matched: n = 1, k = 0, so R = 0 at every
//   angle) flat-topped grid in air on a textured, coated wafer at normal
//   incidence: light lost to the grid = coverage, per wavelength, and
//   J lost = coverage × J_max;
// - a flat-topped silver finger on a planar wafer at normal incidence:
//   reflected by the grid = coverage × R(air|Ag), R = |(1 - N)/(1 + N)|²
//   with N = n + ik of the shipped silver table (K. M. McPeak et al.,
//   "Plasmonic films can easily be better: rules and recipes", ACS Photonics
//   2, 326 (2015)); absorbed = coverage × (1 - R);
// - a round silver wire at normal incidence: light meeting the wire at
//   angle φ from its top (u = r sin φ across) is reflected downwards onto
//   the cell when φ > 45°, so the effective shading in air is
//     ratio = 1 - ∫_{π/4}^{π/2} cos φ R(φ) dφ,
//   R(φ) the unpolarized air|Ag Fresnel reflectance (Simpson's rule here).
//   (Light the cell then reflects back onto the wire is not traced: see
//   docs/scene-format.md.)
// Monte Carlo comparisons: |Δ| <= 4σ + 1e-4, σ the binomial standard error.
#include <cmath>
#include <complex>
#include <cstdio>
#include <numbers>

#include "io/front_grid.hpp"
#include "optics/material.hpp"
#include "trace/front_grid_hit.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

std::uint64_t count(const PreparedRun& r, const WavelengthTally& t, EndState s, int k = 0) {
  return t.ended[r.layout.bins.slot(s, k)];
}

void expect_fraction(const PreparedRun& run, const WavelengthTally& t, EndState s, double expected,
                     const std::string& what) {
  const std::uint64_t c = count(run, t, s);
  const double got = double(c) / double(t.photons);
  std::printf("%s %s: %.5f vs %.5f (%.2f sigma)\n", what.c_str(), std::string(end_state_info(s).name).c_str(), got,
              expected, (got - expected) / test::sigma_of(c, t.photons));
  EXPECT_NEAR(got, expected, 4 * test::sigma_of(c, t.photons) + 1e-4) << what << " " << end_state_info(s).name;
}

TEST(FrontGrid, CoverageAndContactMatchSampling) {
  FrontGridGeometry g{FingerShape::half_ellipse, 50, 20, 1000, 5000, 400};
  const int N = 2000;
  long on = 0, shadow = 0;
  for (int i = 0; i < N; ++i)
    for (int j = 0; j < N; ++j) {
      const double x = (i + 0.5) * 1000.0 / N, y = (j + 0.5) * 5000.0 / N;
      on += on_contact(g, x, y);
      shadow += first_grid_hit(g, Eigen::Vector3d(x, y, 100), Eigen::Vector3d(0, 0, -1)).hit;
    }
  const double f = 0.05, b = 0.08;
  EXPECT_DOUBLE_EQ(grid_coverage(g), f + b - f * b);
  EXPECT_NEAR(double(on) / (double(N) * N), f + b - f * b, 2e-3);
  EXPECT_NEAR(double(shadow) / (double(N) * N), f + b - f * b, 2e-3);
  g.shape = FingerShape::round_wire;
  EXPECT_DOUBLE_EQ(contact_fraction(g), b);
}

const char* kTexturedAbsorbing = R"(
[wafer]
thickness = "170 um"
[front]
texture = "random_pyramids"
[front.random_pyramids]
distribution = "uniform"
min = "2 um"
max = "4 um"
tile = "20 um"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[front.grid]
finger_width = "60 um"
finger_height = "15 um"
finger_pitch = "1 mm"
busbar_pitch = "10 mm"
busbar_width = "1 mm"
material = { n = 1, k = 0 }
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = ["400 nm", "700 nm", "1000 nm"]
[run]
seed = 5
)";

TEST(FrontGrid, AbsorbingFlatGridOnTextureLosesCoverageTimesJmax) {
  auto run = prepare_run(test::scene_from_text(kTexturedAbsorbing));
  const double cov = grid_coverage(run->scene.front_grid->geometry);
  const auto tallies = test::trace_all(*run, 20000);
  for (const auto& t : tallies) {
    expect_fraction(*run, t, EndState::absorbed_grid, cov, "absorbing grid");
    EXPECT_EQ(count(*run, t, EndState::reflected_grid), 0u);
    EXPECT_EQ(t.ended_total(), t.photons);
  }
  const Results r = results_from_tallies(*run, tallies);
  const ResultBin& g = r.bin(EndState::absorbed_grid);
  std::printf("J lost to the grid %.4f ± %.4f mA/cm2, coverage × J_max %.4f (J_max %.4f over the run's bands)\n",
              g.current_mA_cm2, g.current_sigma_mA_cm2, cov * r.J_max_mA_cm2, r.J_max_mA_cm2);
  EXPECT_NEAR(g.current_mA_cm2, cov * r.J_max_mA_cm2, 4 * g.current_sigma_mA_cm2 + 1e-6);
  EXPECT_NEAR(r.summary.closure_mA_cm2, 0.0, 1e-9);  // J_G + every end state = J_max
  EXPECT_GT(count(*run, tallies[2], EndState::absorbed_front_contact), 0u);  // trapped light meets the contacts
}

std::string planar_silver(const std::string& shape_keys) {
  return R"(
[wafer]
thickness = "180 um"
[front.grid]
)" + shape_keys + R"(
finger_pitch = "1 mm"
material = "ag_mcpeak2015"
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = ["500 nm", "800 nm", "1100 nm"]
[run]
seed = 9
)";
}

double air_silver_R(std::complex<double> N, double cos_i, int pol) {  // pol 0: s, 1: p
  const double s2 = 1 - cos_i * cos_i;
  const std::complex<double> cos_t = std::sqrt(1.0 - s2 / (N * N));
  const std::complex<double> r = pol == 0 ? (cos_i - N * cos_t) / (cos_i + N * cos_t)
                                          : (N * cos_i - cos_t) / (N * cos_i + cos_t);
  return std::norm(r);
}

TEST(FrontGrid, FlatSilverFingerReflectsCoverageTimesFresnel) {
  auto run = prepare_run(test::scene_from_text(planar_silver("finger_width = \"80 um\"\nfinger_height = \"10 um\"")));
  const double cov = grid_coverage(run->scene.front_grid->geometry);
  const Material ag = find_material("ag_mcpeak2015", {});
  const auto tallies = test::trace_all(*run, 40000);
  for (std::size_t i = 0; i < tallies.size(); ++i) {
    const double lam = run->scene.illumination.wavelengths_nm[i];
    const std::complex<double> N = ag.index_at(lam);
    const double R = std::norm((1.0 - N) / (1.0 + N));
    expect_fraction(*run, tallies[i], EndState::reflected_grid, cov * R, "flat Ag finger " + std::to_string(int(lam)));
    expect_fraction(*run, tallies[i], EndState::absorbed_grid, cov * (1 - R), "flat Ag finger " + std::to_string(int(lam)));
  }
}

TEST(FrontGrid, RoundWireShadesLessThanItsWidth) {
  auto run = prepare_run(test::scene_from_text(planar_silver("finger_shape = \"round_wire\"\nfinger_width = \"100 um\"")));
  const double cov = grid_coverage(run->scene.front_grid->geometry);
  const Material ag = find_material("ag_mcpeak2015", {});
  const auto tallies = test::trace_all(*run, 40000);
  for (std::size_t i = 0; i < tallies.size(); ++i) {
    const double lam = run->scene.illumination.wavelengths_nm[i];
    const std::complex<double> N = ag.index_at(lam);
    const int M = 2000;
    const double a = std::numbers::pi / 4, h = (std::numbers::pi / 2 - a) / M;
    double integral = 0;
    for (int k = 0; k <= M; ++k) {
      const double phi = a + k * h;
      const double R = 0.5 * (air_silver_R(N, std::cos(phi), 0) + air_silver_R(N, std::cos(phi), 1));
      integral += std::cos(phi) * R * (k == 0 || k == M ? 1 : (k % 2 ? 4 : 2));
    }
    integral *= h / 3;
    const double ratio = 1 - integral;
    const WavelengthTally& t = tallies[i];
    const std::uint64_t c = count(*run, t, EndState::absorbed_grid) + count(*run, t, EndState::reflected_grid);
    const double got = double(c) / double(t.photons);
    std::printf("round Ag wire at %g nm: effective/geometric shading %.4f (closed form %.4f), %.2f sigma\n", lam,
                got / cov, ratio, (got - cov * ratio) / test::sigma_of(c, t.photons));
    EXPECT_NEAR(got, cov * ratio, 4 * test::sigma_of(c, t.photons) + 1e-4);
  }
}

TEST(FrontGrid, HalfEllipseShadingRatioIsMeasured) {
  // No closed form here: the ratio is reported (README) and must lie between
  // the round wire's and 1 for a flat-ish finger.
  auto run = prepare_run(test::scene_from_text(
      planar_silver("finger_shape = \"half_ellipse\"\nfinger_width = \"60 um\"\nfinger_height = \"20 um\"")));
  const double cov = grid_coverage(run->scene.front_grid->geometry);
  const auto tallies = test::trace_all(*run, 40000);
  for (std::size_t i = 0; i < tallies.size(); ++i) {
    const WavelengthTally& t = tallies[i];
    const double got =
        double(count(*run, t, EndState::absorbed_grid) + count(*run, t, EndState::reflected_grid)) / double(t.photons);
    std::printf("half-ellipse Ag finger 60 x 20 um at %g nm: effective/geometric shading %.4f\n",
                run->scene.illumination.wavelengths_nm[i], got / cov);
    EXPECT_LE(got, cov * (1 + 4 * std::sqrt(1.0 / (cov * double(t.photons)))));
    EXPECT_EQ(t.ended_total(), t.photons);
  }
}

void expect_refused(const std::string& text, const std::string& needle) {
  try {
    test::scene_from_text(text);
    FAIL() << "accepted: " << text;
  } catch (const SceneError& e) {
    EXPECT_NE(std::string(e.what()).find(needle), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("scene.toml:"), std::string::npos) << e.what();
  }
}

TEST(FrontGrid, BadInputIsRefusedWithKeyAndValue) {
  const auto scene = [](const std::string& grid) {
    return "[front.grid]\n" + grid + "\n[illumination]\nwavelengths = [\"1000 nm\"]\n";
  };
  const std::string ok = "finger_height = \"10 um\"\nfinger_pitch = \"1 mm\"\nmaterial = \"ag_mcpeak2015\"";
  expect_refused(scene(ok), "front.grid.finger_width");
  expect_refused(scene("finger_width = \"2 mm\"\n" + ok), "front.grid.finger_pitch");
  expect_refused(scene("finger_width = \"50 um\"\nfinger_shape = \"oval\"\n" + ok), "front.grid.finger_shape");
  expect_refused(scene("finger_width = \"50 um\"\nfinger_shape = \"round_wire\"\n" + ok), "front.grid.finger_height");
  expect_refused(scene("finger_width = \"50 um\"\nbusbar_pitch = \"5 mm\"\n" + ok), "front.grid.busbar_width");
  expect_refused(scene("finger_width = \"50 um\"\nfinger_height = \"10 um\"\nfinger_pitch = \"1 mm\""),
                 "front.grid.material");
}

}  // namespace
}  // namespace lumtrap
