// A rear given by its measured internal reflectance R (rear.medium =
// { reflectance = ..., diffuse_fraction = ... }), checked on a planar wafer
// with an ideal front at normal incidence against the closed-form
// incoherent series of intensities (common practice):
//
//   mirror rear (diffuse_fraction 0), τ = exp(-αW): the ideal front lets
//   everything out, so there is one round trip only:
//     silicon = (1 - τ)(1 + Rτ), reflector = τ(1 - R), escape = Rτ².
//
//   Lambertian rear (diffuse_fraction 1): the rear sends cosine-distributed
//   light up (flux 2μ dμ per direction cosine μ); it reaches the front
//   attenuated by e^(-αW/μ); the specular ideal front lets out what lies
//   inside the escape cone, μ > μ_c = sqrt(1 - 1/n²), and totally reflects
//   the rest, which returns to the rear at the same μ. With
//     I(y, a, b) = ∫_a^b 2μ e^(-y/μ) dμ   (Simpson's rule in the test),
//     out = I(αW, μ_c, 1), back = I(2αW, 0, μ_c):
//     escape = Rτ out / (1 - R back),
//     reflector = τ(1 - R) + (1 - R) Rτ back / (1 - R back).
//   (Attenuation makes the light reaching the front more normal than
//   Lambertian, so the escape share is above the 1/n² of a Lambertian front.)
//
// Every comparison is |Δ| <= 4σ + 1e-4 with σ the binomial standard error.
#include <fstream>
#include <functional>

#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

constexpr std::uint64_t kPhotons = 40000;

struct Expected {
  double silicon, reflector, escape;
};

void compare(const PreparedRun& run, const std::vector<WavelengthTally>& tallies,
             const std::function<Expected(double R, double alpha_W, double n)>& closed_form) {
  const double W = run.scene.wafer.thickness_um;
  for (std::size_t i = 0; i < tallies.size(); ++i) {
    const WavelengthTally& t = tallies[i];
    const WavelengthOptics o = wavelength_optics(run, i);
    const Expected e = closed_form(o.rear.reflector_R, o.alpha_per_um * W, o.n_bulk);
    const auto check = [&](EndState s, double expected) {
      const std::uint64_t c = ended_in(run.layout, t, s);
      const double got = double(c) / double(t.photons);
      EXPECT_NEAR(got, expected, 4 * test::sigma_of(c, t.photons) + 1e-4)
          << "state " << end_state_info(s).name << " at " << o.wavelength_nm << " nm";
    };
    EXPECT_EQ(t.ended_total(), t.photons);
    check(EndState::absorbed_silicon, e.silicon);
    check(EndState::absorbed_rear_reflector, e.reflector);
    check(EndState::escaped_front, e.escape);
    EXPECT_EQ(ended_in(run.layout, t, EndState::reflected_front), 0u);
    EXPECT_EQ(ended_in(run.layout, t, EndState::transmitted_rear), 0u);
    EXPECT_EQ(ended_in(run.layout, t, EndState::absorbed_rear_medium), 0u);
  }
}

// I(y, a, b) = ∫_a^b 2μ e^(-y/μ) dμ by Simpson's rule (the integrand and all
// its derivatives vanish at μ -> 0, so 4000 intervals give ~1e-12).
double flux_integral(double y, double a, double b) {
  const int N = 4000;
  const double h = (b - a) / N;
  double s = 0;
  for (int i = 0; i <= N; ++i) {
    const double mu = a + i * h;
    const double f = mu > 0 ? 2 * mu * std::exp(-y / mu) : 0.0;
    s += f * (i == 0 || i == N ? 1 : (i % 2 ? 4 : 2));
  }
  return s * h / 3;
}

const char* kScene = R"(
[wafer]
thickness = "180 um"
[front]
interface = "ideal"
[rear]
medium = { reflectance = %R%, diffuse_fraction = %D% }
[illumination]
wavelengths = ["950 nm", "1050 nm", "1100 nm", "1150 nm"]
[run]
photons = 1
)";

std::string scene_text(const std::string& R, const std::string& D) {
  std::string s = kScene;
  s.replace(s.find("%R%"), 3, R);
  s.replace(s.find("%D%"), 3, D);
  return s;
}

TEST(RearReflector, MirrorRearMatchesSingleRoundTripSeries) {
  auto run = prepare_run(test::scene_from_text(scene_text("0.65", "0.0")));
  compare(*run, test::trace_all(*run, kPhotons), [](double R, double aW, double) {
    const double tau = std::exp(-aW);
    return Expected{(1 - tau) * (1 + R * tau), tau * (1 - R), R * tau * tau};
  });
}

TEST(RearReflector, LambertianRearFromCsvMatchesDiffuseSeries) {
  const auto dir = test::temp_dir();
  std::ofstream(dir / "rear_r.csv") << "# K7 alloyed rear, illustrative\nwavelength_nm,reflectance\n900,0.55\n1000,0.6\n"
                                       "1200,0.8\n";
  auto run = prepare_run(test::scene_from_text(scene_text("\"rear_r.csv\"", "1.0")));
  // linear interpolation of the CSV (the closed form's R, read back)
  EXPECT_NEAR(wavelength_optics(*run, 2).rear.reflector_R, 0.6 + 0.2 * 100.0 / 200.0, 1e-12);
  compare(*run, test::trace_all(*run, kPhotons), [](double R, double aW, double n) {
    const double tau = std::exp(-aW), mu_c = std::sqrt(1 - 1 / (n * n));
    const double out = flux_integral(aW, mu_c, 1), back = flux_integral(2 * aW, 0, mu_c);
    const double escape = R * tau * out / (1 - R * back);
    const double reflector = tau * (1 - R) + (1 - R) * R * tau * back / (1 - R * back);
    return Expected{1 - escape - reflector, reflector, escape};
  });
}

TEST(RearReflector, ScenesWithoutItHaveNoReflectorColumn) {
  auto run = prepare_run(test::scene_from_text(R"(
[illumination]
wavelengths = ["1000 nm"]
)"));
  EXPECT_EQ(run->layout.bins.count[std::size_t(EndState::absorbed_rear_reflector)], 0u);
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

TEST(RearReflector, BadInputIsRefusedWithKeyAndValue) {
  expect_refused(scene_text("1.2", "0"), "rear.medium.reflectance");
  expect_refused(scene_text("0.5", "-1"), "rear.medium.diffuse_fraction");
  expect_refused(scene_text("\"missing.csv\"", "0"), "no file");
  expect_refused(scene_text("0.5", "0") + "[[rear.films]]\nmaterial = \"air\"\nthickness = \"10 nm\"\n",
                 "cannot have films");
  std::ofstream(test::temp_dir() / "short.csv") << "wavelength_nm,reflectance\n1000,0.5\n1100,0.6\n";
  expect_refused(scene_text("\"short.csv\"", "0"), "lies outside");
  std::ofstream(test::temp_dir() / "bad.csv") << "wavelength_nm,reflectance\n900,0.5\n1000,1.5\n";
  expect_refused(scene_text("\"bad.csv\"", "0"), "bad.csv:3");
}

}  // namespace
}  // namespace lumtrap
