// The ray tracer on planar wafers against the exact planar solver
// (optics/planar_wafer.hpp, itself checked against closed forms in
// tests/optics): per wavelength and per bin, |Δ| <= 4σ + 1e-4 with σ the
// tracer's own binomial standard error.
#include <fmt/format.h>

#include "trace/planar_run.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

struct Case {
  const char* name;
  const char* front_films;
  const char* rear;  // [rear] body
};

const Case kCases[] = {
    {"bare_in_air", "", "medium = \"air\"\n"},
    {"sinx_al", "[[front.films]]\nmaterial = \"sinx_pecvd_n209\"\nthickness = \"75 nm\"\n",
     "medium = \"al_rakic1995\"\n"},
    {"sinx_sio2_al", "[[front.films]]\nmaterial = \"sinx_pecvd_n209\"\nthickness = \"75 nm\"\n",
     "medium = \"al_rakic1995\"\n[[rear.films]]\nmaterial = \"sio2_malitson1965\"\nthickness = \"100 nm\"\n"},
};

std::string scene_text(const Case& c, double polar_deg, const char* polarization = "unpolarized") {
  return fmt::format(R"(
[wafer]
thickness = "180 um"
[front]
texture = "planar"
{}
[rear]
{}
[illumination]
polar_angle = "{} deg"
polarization = "{}"
wavelengths = ["400 nm", "800 nm", "1000 nm", "1100 nm", "1150 nm"]
[run]
photons = 1
seed = 11
)",
                     c.front_films, c.rear, polar_deg, polarization);
}

void compare(const Scene& scene, std::uint64_t photons) {
  const Results exact = planar_results(scene);
  auto run = prepare_run(scene);
  const auto tallies = test::trace_all(*run, photons);
  const Results traced = results_from_tallies(*run, tallies);
  for (const auto& b : exact.bins) {
    const ResultBin& t = traced.bin(b.bin.name);
    for (std::size_t i = 0; i < b.fraction.size(); ++i) {
      // σ: the tracer's own standard error (or the binomial one of the exact
      // value when the tracer saw no photon in this bin)
      const double p = std::clamp(b.fraction[i], 0.0, 1.0);  // exact values may be -1e-17
      const double tol = 4.0 * std::max(t.sigma[i], std::sqrt(p * (1 - p) / double(photons))) + 1e-4;
      EXPECT_NEAR(t.fraction[i], b.fraction[i], tol)
          << scene.name << " bin " << b.bin.name << " at " << exact.wavelength_nm[i] << " nm";
    }
  }
  EXPECT_EQ(traced.bin("lost").fraction, std::vector<double>(exact.wavelength_nm.size(), 0.0));
  EXPECT_EQ(traced.bin("unresolved").fraction, std::vector<double>(exact.wavelength_nm.size(), 0.0));
}

TEST(TransportPlanar, MatchesPlanarSolverAtNormalIncidence) {
  for (const Case& c : kCases) compare(test::scene_from_text(scene_text(c, 0), c.name), 20000);
}

TEST(TransportPlanar, MatchesPlanarSolverAt45Degrees) {
  for (const Case& c : kCases) compare(test::scene_from_text(scene_text(c, 45), c.name), 20000);
}

TEST(TransportPlanar, MatchesPlanarSolverAt60DegreesSAndPSeparately) {
  for (const char* pol : {"s", "p"})
    compare(test::scene_from_text(scene_text(kCases[2], 60, pol), std::string("sp_") + pol), 20000);
}

}  // namespace
}  // namespace lumtrap
