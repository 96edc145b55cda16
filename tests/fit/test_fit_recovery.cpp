// Fits of synthetic "measured" curves made by lumtrap itself from known
// parameters plus Gaussian noise of a stated size: the fit must give the
// known parameters back within 4 of its own standard errors (plus a small
// floor). Synthetic data only: no published measured reflectance curve is
// used (none could be written down here with its source).
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <random>
#include <string>

#include <fmt/format.h>

#include "common/temp_dir.hpp"
#include "fit/least_squares_fit.hpp"
#include "fit/model_curve.hpp"
#include "io/scene_reader.hpp"

namespace lumtrap {
namespace {

/// "measured" CSV from a model curve plus noise N(0, noise²) per point; the
/// uncertainty column is the noise and the data's own Monte Carlo error together.
std::string synthetic_csv(const ModelCurve& c, const std::vector<double>& wl, double noise, unsigned seed) {
  std::mt19937_64 gen(seed);
  std::normal_distribution<double> g(0.0, noise);
  std::string csv = "# synthetic: lumtrap model curve + Gaussian noise (test data, not a measurement)\n"
                    "wavelength_nm,reflectance,uncertainty\n";
  for (std::size_t i = 0; i < wl.size(); ++i)
    csv += fmt::format("{},{:.10g},{:.10g}\n", wl[i], std::clamp(c.reflectance[i] + g(gen), 0.0, 1.0),
                       std::hypot(noise, c.reflectance_sigma[i]));
  return csv;
}

const char* kPlanar = R"(
[wafer]
material = "si_green2008"
thickness = "160 um"
[front]
texture = "planar"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "{thickness}"
[rear]
medium = "al_rakic1995"
[[rear.films]]
material = "sio2_malitson1965"
thickness = "100 nm"
[illumination]
wavelengths = {{ from = "350 nm", to = "1150 nm", step = "25 nm" }}
{fit}
)";

TEST(FitRecovery, PlanarSinxThicknessExactSolver) {
  const test::TempDir dir;
  const double truth_nm = 78.0, noise = 0.003;
  const auto truth_scene = parse_scene_file(
      dir.write("truth.toml", fmt::format(fmt::runtime(kPlanar), fmt::arg("thickness", "78 nm"), fmt::arg("fit", ""))));
  const ModelCurve truth = model_curve(truth_scene, CompareQuantity::total_reflectance);
  ASSERT_TRUE(truth.exact);
  const auto measured = dir.write("measured.csv", synthetic_csv(truth, truth_scene.illumination.wavelengths_nm, noise, 11));
  const auto scene = dir.write(
      "fit.toml",
      fmt::format(fmt::runtime(kPlanar), fmt::arg("thickness", "70 nm"),
                  fmt::arg("fit", "[fit.parameters]\n\"front.films[0].thickness\" = { start = \"65 nm\", min = \"40 nm\", "
                                  "max = \"110 nm\" }\n")));
  const FitSetup setup = prepare_fit(scene, measured);
  ASSERT_TRUE(setup.exact);
  const FitResult r = fit_model(setup);
  const double dev = r.best[0] - truth_nm;
  std::cout << fmt::format("planar SiNx: best {:.4f} nm +- {:.4f} nm (truth {} nm, deviation {:.2f} sigma), chi2 "
                           "{:.2f} for {} dof, {} evaluations\n",
                           r.best[0], r.standard_error[0], truth_nm, dev / r.standard_error[0], r.chi2, r.dof,
                           r.evaluations);
  EXPECT_GT(r.standard_error[0], 0.0);
  EXPECT_LE(std::abs(dev), 4 * r.standard_error[0] + 1e-3);
  // chi2 of a correct model with Gaussian noise: mean dof, sd sqrt(2 dof) (common practice)
  EXPECT_LE(std::abs(r.chi2 - double(r.dof)), 4 * std::sqrt(2.0 * double(r.dof)));
}

// A wafer that transmits (rear in air, no metal): the measured file has a
// transmittance column too, and the fit uses both curves. Transmittance
// above ~950 nm is what fixes the wafer thickness (Beer-Lambert through the
// bulk); reflectance fixes the SiNx thickness.
const char* kTransmitting = R"(
[wafer]
material = "si_green2008"
thickness = "{wafer}"
[front]
texture = "planar"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "{thickness}"
[illumination]
wavelengths = {{ from = "400 nm", to = "1150 nm", step = "25 nm" }}
{fit}
)";

TEST(FitRecovery, PlanarReflectanceAndTransmittanceExactSolver) {
  const test::TempDir dir;
  const double truth_nm = 78.0, truth_um = 150.0, noise = 0.003;
  const auto truth_scene = parse_scene_file(dir.write(
      "truth.toml", fmt::format(fmt::runtime(kTransmitting), fmt::arg("wafer", "150 um"),
                                fmt::arg("thickness", "78 nm"), fmt::arg("fit", ""))));
  const ModelCurve truth = model_curve(truth_scene, CompareQuantity::total_reflectance);
  ASSERT_TRUE(truth.exact);
  const auto& wl = truth_scene.illumination.wavelengths_nm;
  ASSERT_EQ(truth.transmittance.size(), wl.size());
  double t_max = 0;
  std::mt19937_64 gen(23);
  std::normal_distribution<double> g(0.0, noise);
  std::string csv = "# synthetic: lumtrap planar solver + Gaussian noise (test data, not a measurement)\n"
                    "wavelength_nm,reflectance,uncertainty,transmittance\n";
  for (std::size_t i = 0; i < wl.size(); ++i) {
    t_max = std::max(t_max, truth.transmittance[i]);
    const double r = std::clamp(truth.reflectance[i] + g(gen), 0.0, 1.0);
    const double t = std::clamp(truth.transmittance[i] + g(gen), 0.0, 1.0);
    csv += fmt::format("{},{:.10g},{:.10g},{:.10g}\n", wl[i], r, noise, t);
  }
  ASSERT_GT(t_max, 0.1) << "the wafer should transmit in the infrared";
  const auto measured = dir.write("measured.csv", csv);
  const auto scene = dir.write(
      "fit.toml",
      fmt::format(fmt::runtime(kTransmitting), fmt::arg("wafer", "170 um"), fmt::arg("thickness", "70 nm"),
                  fmt::arg("fit", "[fit.parameters]\n"
                                  "\"front.films[0].thickness\" = { start = \"70 nm\", min = \"40 nm\", max = \"110 nm\" }\n"
                                  "\"wafer.thickness\" = { start = \"170 um\", min = \"100 um\", max = \"250 um\" }\n")));
  const FitSetup setup = prepare_fit(scene, measured);
  ASSERT_TRUE(setup.exact);
  ASSERT_EQ(setup.measured.transmittance.size(), setup.measured.wavelength_nm.size());
  const FitResult r = fit_model(setup);
  const double dev_t = r.best[0] - truth_nm, dev_w = r.best[1] - truth_um;
  std::cout << fmt::format("R and T: SiNx {:.3f} +- {:.3f} nm (truth {}, {:.2f} sigma); wafer {:.3f} +- {:.3f} um "
                           "(truth {}, {:.2f} sigma); chi2 {:.1f} for {} dof\n",
                           r.best[0], r.standard_error[0], truth_nm, dev_t / r.standard_error[0], r.best[1],
                           r.standard_error[1], truth_um, dev_w / r.standard_error[1], r.chi2, r.dof);
  EXPECT_GT(r.standard_error[1], 0.0);
  EXPECT_LE(std::abs(dev_t), 4 * r.standard_error[0] + 1e-3);
  EXPECT_LE(std::abs(dev_w), 4 * r.standard_error[1] + 1e-3);
  // residuals are R and T: 2 per wavelength; chi2 of a correct model: mean dof, sd sqrt(2 dof) (common practice)
  EXPECT_EQ(r.dof, 2 * wl.size() - 2);
  EXPECT_LE(std::abs(r.chi2 - double(r.dof)), 4 * std::sqrt(2.0 * double(r.dof)));
}

const char* kTextured = R"(
[wafer]
material = "si_green2008"
thickness = "160 um"
[front]
texture = "upright_pyramids"
[front.pyramids]
base = "4 um"
gap = "{gap}"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "{thickness}"
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = {{ from = "400 nm", to = "1000 nm", step = "50 nm" }}
[run]
photons = {photons}
seed = {seed}
{fit}
)";

// The flat fraction of the regular pyramids is set by their gap:
// flat = 1 - (base / (base + gap))² (plain geometry), so fitting the gap
// fits the flat fraction.
TEST(FitRecovery, TexturedFilmThicknessAndFlatFractionTraced) {
  const test::TempDir dir;
  const double truth_nm = 80.0, truth_gap_um = 1.0, noise = 0.004;
  const auto truth_scene = parse_scene_file(dir.write(
      "truth.toml", fmt::format(fmt::runtime(kTextured), fmt::arg("gap", "1 um"), fmt::arg("thickness", "80 nm"),
                                fmt::arg("photons", 20000), fmt::arg("seed", 2), fmt::arg("fit", ""))));
  const ModelCurve truth = model_curve(truth_scene, CompareQuantity::total_reflectance);
  ASSERT_FALSE(truth.exact);
  const auto measured = dir.write("measured.csv", synthetic_csv(truth, truth_scene.illumination.wavelengths_nm, noise, 5));
  const auto scene = dir.write(
      "fit.toml",
      fmt::format(fmt::runtime(kTextured), fmt::arg("gap", "0.5 um"), fmt::arg("thickness", "70 nm"),
                  fmt::arg("photons", 4000), fmt::arg("seed", 1),
                  fmt::arg("fit", "[fit.parameters]\n"
                                  "\"front.films[0].thickness\" = { start = \"70 nm\", min = \"50 nm\", max = \"110 nm\" }\n"
                                  "\"front.pyramids.gap\" = { start = \"0.6 um\", min = \"0 um\", max = \"3 um\" }\n")));
  const FitSetup setup = prepare_fit(scene, measured);
  ASSERT_FALSE(setup.exact);
  const FitResult r = fit_model(setup);
  const double dev_t = r.best[0] - truth_nm, dev_g = r.best[1] - truth_gap_um;
  std::cout << fmt::format("textured: thickness {:.3f} +- {:.3f} nm (truth {}, {:.2f} sigma); gap {:.4f} +- {:.4f} um "
                           "(truth {}, {:.2f} sigma); correlation {:.3f}; chi2 {:.2f} for {} dof; {} evaluations; {}\n",
                           r.best[0], r.standard_error[0], truth_nm, dev_t / r.standard_error[0], r.best[1],
                           r.standard_error[1], truth_gap_um, dev_g / r.standard_error[1], r.correlation(0, 1), r.chi2,
                           r.dof, r.evaluations, r.stop_reason);
  EXPECT_LE(std::abs(dev_t), 4 * r.standard_error[0] + 0.05);
  EXPECT_LE(std::abs(dev_g), 4 * r.standard_error[1] + 0.005);
}

}  // namespace
}  // namespace lumtrap
