// Generation profile: planar wafer, no front reflection (ideal front),
// non-reflecting rear (index-matched, lossless rear medium), one wavelength:
// the absorbed photons per depth follow Beer-Lambert, G(z) = Φ α e^(-αz)
// (A. Beer 1852 / J. H. Lambert 1760; any semiconductor-device text, e.g.
// S. M. Sze, Physics of Semiconductor Devices, 3rd ed., 2007). Per bin:
// |Δ| <= 4σ + 1e-4. And q ∫ G dz = J_G to round-off.
#include <fmt/format.h>

#include <sstream>

#include "io/result_files.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

TEST(GenerationProfile, PlanarBeerLambertMatchesClosedForm) {
  const Scene scene = test::scene_from_text(R"(
[wafer]
material = "si_green2008"
thickness = "50 um"
[front]
interface = "ideal"
[rear]
medium = { n = 3.6, k = 0 }
[illumination]
wavelengths = ["700 nm"]
)");
  // make the rear medium index-matched to the silicon at 700 nm
  Scene matched = scene;
  auto probe = prepare_run(scene);
  const auto optics0 = wavelength_optics(*probe, 0);
  matched.rear_medium = MaterialRef{"", true, optics0.n_bulk, 0.0};
  auto run = prepare_run(matched);
  const auto optics = wavelength_optics(*run, 0);
  const std::uint64_t N = 100000;
  const WavelengthTally t = trace_wavelength(*run, optics, 0, 0, N);
  EXPECT_EQ(ended_in(run->layout, t, EndState::reflected_front) + ended_in(run->layout, t, EndState::escaped_front), 0u);  // nothing reflected anywhere
  const double a = optics.alpha_per_um;
  const auto& edges = run->layout.depth_edges_um;
  for (std::size_t b = 0; b + 1 < edges.size(); ++b) {
    const double expected = std::exp(-a * edges[b]) - std::exp(-a * std::min(edges[b + 1], 50.0));
    const double got = double(t.depth[b]) / double(N);
    EXPECT_NEAR(got, expected, 4.0 * std::sqrt(expected * (1 - expected) / double(N)) + 1e-4)
        << "bin " << edges[b] << "-" << edges[b + 1] << " um";
  }
  // total absorbed = 1 - e^{-αW}
  EXPECT_NEAR(double(ended_in(run->layout, t, EndState::absorbed_silicon)) / N, 1 - std::exp(-a * 50.0), 4 * test::sigma_of(ended_in(run->layout, t, EndState::absorbed_silicon), N));

  // q ∫ G dz from generation.csv equals J_G of the summary.
  const Results r = results_from_tallies(*run, {t});
  double qG = 0;
  for (const auto& f : result_files(r, "")) {
    if (f.name != "generation.csv") continue;
    std::istringstream in(f.content);
    std::string line;
    while (std::getline(in, line)) {
      if (line.empty() || line[0] == '#' || line[0] == 'd') continue;
      double top, bottom, g, sg;
      ASSERT_EQ(std::sscanf(line.c_str(), "%lf,%lf,%lf,%lf", &top, &bottom, &g, &sg), 4);
      qG += g * (bottom - top) * 1e-4;  // cm^-2 s^-1
    }
  }
  const double j_from_g = 1.602176634e-19 * qG * 1e3;  // mA/cm²
  EXPECT_NEAR(j_from_g, r.bin("absorbed_silicon").current_mA_cm2, 1e-6 * r.bin("absorbed_silicon").current_mA_cm2);
}

}  // namespace
}  // namespace lumtrap
