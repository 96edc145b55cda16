// A patterned rear ([rear.pattern]: openings of a second region in the rear)
// and the macro frame that carries each photon's lateral position.
//
// Checks (closed forms written here; the planar references come from the
// planar solver, optics/planar_wafer.hpp):
// - the opening fractions of lines, square and hexagonal dots equal their
//   area closed forms (geometry, common practice);
// - opening fraction 0 gives bit-identical tallies to the uniform rear of
//   [rear], fraction 1 to the uniform rear of the openings (the macro start
//   position has a random stream of its own, so the transport's numbers are
//   those of the plain scene);
// - planar wafer, specular surfaces, normal incidence: every photon returns
//   to the lateral position where it entered, so each end state equals the
//   area-weighted mix of the two planar solutions, per wavelength;
// - oblique incidence: each crossing of the wafer shifts the photon by
//   W·tan θ_Si (θ_Si from Snell's law). With a lossless bulk, a mirror rear
//   around black line openings and a bare front (Fresnel reflectance R_f at
//   θ_Si, s polarization), the light absorbed in the openings is
//     A = (1 - R_0) (1/P) ∫_0^P Σ_k R_f^(k-1) Π_{j<k} B(x + (2j-1)s) O(x + (2k-1)s) dx,
//   s = W tan θ_Si, B, O the indicators of base and opening, R_0 the
//   first-surface reflectance (= R_f for a lossless interface, reciprocity).
//   The integral is summed on a fine grid here. Without the shift (every
//   hit in the same place) A would be (1 - R_0)·width/pitch, far away.
// Monte Carlo comparisons: |Δ| <= 4σ + 1e-4, σ the binomial standard error.
#include <cmath>
#include <cstdio>
#include <numbers>

#include "io/rear_pattern.hpp"
#include "trace/planar_run.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

double sampled_fraction(const RearPatternGeometry& g) {
  const int N = 1000;
  const double Px = pattern_period_x(g), Py = pattern_period_y(g);
  long in = 0;
  for (int i = 0; i < N; ++i)
    for (int j = 0; j < N; ++j) in += in_opening(g, (i + 0.5) * Px / N, (j + 0.5) * Py / N);
  return double(in) / (double(N) * N);
}

TEST(RearPattern, OpeningFractionsMatchAreaClosedForms) {
  RearPatternGeometry lines{RearPatternLayout::lines, DotLattice::square, 500, 50};
  EXPECT_DOUBLE_EQ(opening_fraction(lines), 0.1);
  EXPECT_NEAR(sampled_fraction(lines), 0.1, 2e-3);
  RearPatternGeometry square{RearPatternLayout::dots, DotLattice::square, 400, 100};
  EXPECT_NEAR(opening_fraction(square), std::numbers::pi * 100 * 100 / 4 / (400.0 * 400), 1e-15);
  EXPECT_NEAR(sampled_fraction(square), opening_fraction(square), 2e-3);
  RearPatternGeometry hex{RearPatternLayout::dots, DotLattice::hexagonal, 400, 150};
  EXPECT_NEAR(opening_fraction(hex), std::numbers::pi * 150 * 150 / 4 / (400.0 * 400 * std::sqrt(3.0) / 2), 1e-15);
  EXPECT_NEAR(sampled_fraction(hex), opening_fraction(hex), 2e-3);
  EXPECT_DOUBLE_EQ(pattern_period_y(hex), 400 * std::sqrt(3.0));
}

// A textured cell: passivated rear (Al2O3 | SiNx | Al) with line openings
// where Al touches the silicon.
const char* kTextured = R"(
[wafer]
thickness = "170 um"
[front]
texture = "upright_pyramids"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
%REAR%
[illumination]
wavelengths = ["900 nm", "1100 nm"]
[run]
seed = 7
)";

const char* kPassivated = R"(medium = "al_rakic1995"
[[rear.films]]
material = "al2o3_malitson1962"
thickness = "10 nm"
[[rear.films]]
material = "sinx_pecvd_n209"
thickness = "100 nm")";

std::string with_rear(const char* base, const std::string& rear) {
  std::string s = base;
  s.replace(s.find("%REAR%"), 6, rear);
  return s;
}

std::string lines_pattern(const std::string& width) {
  return std::string(kPassivated) + "\n[rear.pattern]\nlayout = \"lines\"\npitch = \"500 um\"\nwidth = \"" + width +
         "\"\nmedium = \"al_rakic1995\"\n";
}

std::uint64_t count(const PreparedRun& r, const WavelengthTally& t, EndState s, int k = 0) {
  return t.ended[r.layout.bins.slot(s, k)];
}

TEST(RearPattern, FractionZeroAndOneReproduceTheUniformRears) {
  auto base = prepare_run(test::scene_from_text(with_rear(kTextured, kPassivated), "base"));
  auto contact = prepare_run(test::scene_from_text(with_rear(kTextured, "medium = \"al_rakic1995\""), "contact"));
  auto none = prepare_run(test::scene_from_text(with_rear(kTextured, lines_pattern("0 um")), "none"));
  auto all = prepare_run(test::scene_from_text(with_rear(kTextured, lines_pattern("500 um")), "all"));
  const auto tb = test::trace_all(*base, 3000), tc = test::trace_all(*contact, 3000);
  const auto tn = test::trace_all(*none, 3000), ta = test::trace_all(*all, 3000);
  for (std::size_t i = 0; i < tb.size(); ++i) {
    for (EndState s : {EndState::absorbed_silicon, EndState::reflected_front, EndState::escaped_front,
                       EndState::absorbed_rear_medium, EndState::transmitted_rear, EndState::unresolved,
                       EndState::lost}) {
      EXPECT_EQ(count(*none, tn[i], s), count(*base, tb[i], s)) << end_state_info(s).name;
      const EndState in_all = s == EndState::absorbed_rear_medium ? EndState::absorbed_rear_opening_medium : s;
      EXPECT_EQ(count(*all, ta[i], in_all), count(*contact, tc[i], s)) << end_state_info(s).name;
    }
    for (int k = 0; k < 2; ++k)
      EXPECT_EQ(count(*none, tn[i], EndState::absorbed_rear_film, k), count(*base, tb[i], EndState::absorbed_rear_film, k));
    EXPECT_EQ(count(*none, tn[i], EndState::absorbed_rear_opening_medium), 0u);
    EXPECT_EQ(count(*all, ta[i], EndState::absorbed_rear_medium), 0u);
    EXPECT_EQ(count(*all, ta[i], EndState::absorbed_rear_film, 0) + count(*all, ta[i], EndState::absorbed_rear_film, 1), 0u);
    EXPECT_EQ(tn[i].ended_total(), tn[i].photons);
    EXPECT_EQ(ta[i].ended_total(), ta[i].photons);
  }
  // scenes without a pattern have no opening bins
  EXPECT_EQ(base->layout.bins.count[std::size_t(EndState::absorbed_rear_opening_medium)], 0u);
  EXPECT_EQ(base->layout.bins.count[std::size_t(EndState::absorbed_rear_opening_film)], 0u);
}

// Planar, specular, normal incidence: the mix of the two planar solutions.
const char* kPlanar = R"(
[wafer]
thickness = "180 um"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
%REAR%
[illumination]
wavelengths = ["950 nm", "1050 nm", "1100 nm", "1150 nm"]
[run]
seed = 3
)";

TEST(RearPattern, PlanarNormalIncidenceIsTheAreaWeightedMixOfTwoPlanarSolutions) {
  const std::string base_rear = "medium = \"al_rakic1995\"\n[[rear.films]]\nmaterial = \"sinx_pecvd_n209\"\nthickness = \"120 nm\"";
  const std::string open_rear = "medium = \"al_rakic1995\"";
  const Results pb = planar_results(test::scene_from_text(with_rear(kPlanar, base_rear), "pbase"));
  const Results po = planar_results(test::scene_from_text(with_rear(kPlanar, open_rear), "popen"));
  for (const char* layout : {"layout = \"lines\"\npitch = \"300 um\"\nwidth = \"90 um\"",
                             "layout = \"dots\"\nlattice = \"hexagonal\"\npitch = \"200 um\"\ndiameter = \"120 um\""}) {
    const std::string rear = base_rear + "\n[rear.pattern]\n" + layout + "\nmedium = \"al_rakic1995\"\n";
    auto run = prepare_run(test::scene_from_text(with_rear(kPlanar, rear), "patterned"));
    const double f = opening_fraction(run->scene.rear_pattern->geometry);
    const auto tallies = test::trace_all(*run, 40000);
    double worst = 0;
    const EndBinLayout lb = end_bin_layout(test::scene_from_text(with_rear(kPlanar, base_rear), "pbase"));
    const auto frac = [&](const Results& r, EndState s, int k, std::size_t i) { return r.bins[lb.slot(s, k)].fraction[i]; };
    for (std::size_t i = 0; i < tallies.size(); ++i) {
      const WavelengthTally& t = tallies[i];
      const auto check = [&](EndState s, int k, double expected) {
        const std::uint64_t c = count(*run, t, s, k);
        const double dev = (double(c) / double(t.photons) - expected) / test::sigma_of(c, t.photons);
        worst = std::max(worst, std::abs(dev));
        EXPECT_NEAR(double(c) / double(t.photons), expected, 4 * test::sigma_of(c, t.photons) + 1e-4)
            << end_state_info(s).name << k << " at " << run->scene.illumination.wavelengths_nm[i] << " nm, " << layout;
      };
      // the opening scene has no rear film: its states sit at the same slots except the rear film
      const auto open_frac = [&](EndState s) {
        const EndBinLayout lo = end_bin_layout(test::scene_from_text(with_rear(kPlanar, open_rear), "popen"));
        return po.bins[lo.slot(s)].fraction[i];
      };
      for (EndState s : {EndState::absorbed_silicon, EndState::reflected_front, EndState::escaped_front})
        check(s, 0, (1 - f) * frac(pb, s, 0, i) + f * open_frac(s));
      check(EndState::absorbed_front_film, 0,
            (1 - f) * frac(pb, EndState::absorbed_front_film, 0, i) + f * open_frac(EndState::absorbed_front_film));
      check(EndState::absorbed_rear_film, 0, (1 - f) * frac(pb, EndState::absorbed_rear_film, 0, i));
      check(EndState::absorbed_rear_medium, 0, (1 - f) * frac(pb, EndState::absorbed_rear_medium, 0, i));
      check(EndState::absorbed_rear_opening_medium, 0, f * open_frac(EndState::absorbed_rear_medium));
      EXPECT_EQ(t.ended_total(), t.photons);
    }
    std::printf("normal-incidence mix, opening fraction %.4f: largest deviation %.2f sigma\n", f, worst);
  }
}

// Oblique incidence: the lateral shift W tan θ_Si on every crossing.
TEST(RearPattern, ObliqueIncidenceShiftsByWTanThetaPerCrossing) {
  const double W = 180, P = 100, w = 30, n = 3.5, theta = 40 * std::numbers::pi / 180;
  auto run = prepare_run(test::scene_from_text(R"(
[wafer]
material = { n = 3.5, k = 0 }
thickness = "180 um"
[rear]
medium = { reflectance = 1.0, diffuse_fraction = 0 }
[rear.pattern]
layout = "lines"
pitch = "100 um"
width = "30 um"
medium = { reflectance = 0.0 }
[illumination]
polar_angle = "40 deg"
polarization = "s"
wavelengths = ["1000 nm"]
[run]
seed = 11
)"));
  const auto t = test::trace_all(*run, 40000)[0];
  // closed form
  const double ci = std::cos(theta), st = std::sin(theta) / n, ct = std::sqrt(1 - st * st);
  const double rs = (ci - n * ct) / (ci + n * ct), Rf = rs * rs;
  const double s = W * st / ct;
  const auto open = [&](double x) {
    const double u = std::fmod(std::fmod(x, P) + P, P);
    return std::min(u, P - u) < 0.5 * w;
  };
  const int N = 200000;
  double sum = 0;
  for (int i = 0; i < N; ++i) {
    const double x0 = (i + 0.5) * P / N;
    double reach = 1;  // probability of reaching rear hit k
    for (int k = 1; k < 60 && reach > 1e-16; ++k) {
      if (open(x0 + (2 * k - 1) * s)) {
        sum += reach;
        break;
      }
      reach *= Rf;
    }
  }
  const double A = (1 - Rf) * sum / N;
  const double got_A = double(count(*run, t, EndState::absorbed_rear_opening_reflector)) / double(t.photons);
  const double got_R0 = double(count(*run, t, EndState::reflected_front)) / double(t.photons);
  EXPECT_NEAR(got_R0, Rf, 4 * test::sigma_of(count(*run, t, EndState::reflected_front), t.photons) + 1e-4);
  EXPECT_NEAR(got_A, A, 4 * test::sigma_of(count(*run, t, EndState::absorbed_rear_opening_reflector), t.photons) + 1e-4)
      << "shift s = " << s << " um; without the shift A would be " << (1 - Rf) * w / P;
  std::printf("oblique: opening absorption %.5f, closed form %.5f (%.2f sigma), without shift %.5f; R0 %.5f vs %.5f\n",
              got_A, A, (got_A - A) / test::sigma_of(count(*run, t, EndState::absorbed_rear_opening_reflector), t.photons),
              (1 - Rf) * w / P, got_R0, Rf);
  EXPECT_GT(std::abs(A - (1 - Rf) * w / P), 0.05);  // the check can tell a frame that does not move
  EXPECT_EQ(count(*run, t, EndState::absorbed_silicon), 0u);
  EXPECT_EQ(t.ended_total(), t.photons);
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

TEST(RearPattern, BadInputIsRefusedWithKeyAndValue) {
  const auto scene = [](const std::string& pattern) {
    return "[rear]\nmedium = \"al_rakic1995\"\n[rear.pattern]\n" + pattern + "\n[illumination]\nwavelengths = [\"1000 nm\"]\n";
  };
  expect_refused(scene("pitch = \"1 mm\"\nwidth = \"10 um\""), "rear.pattern.layout");
  expect_refused(scene("layout = \"stripes\"\npitch = \"1 mm\"\nwidth = \"10 um\""), "unknown word");
  expect_refused(scene("layout = \"lines\"\npitch = \"0 um\"\nwidth = \"10 um\""), "rear.pattern.pitch");
  expect_refused(scene("layout = \"lines\"\npitch = \"100 um\"\nwidth = \"200 um\""), "larger than the pitch");
  expect_refused(scene("layout = \"lines\"\npitch = \"100 um\"\ndiameter = \"20 um\""), "rear.pattern.diameter");
  expect_refused(scene("layout = \"dots\"\npitch = \"100 um\"\ndiameter = \"20 um\"\nlattice = \"triangular\""),
                 "rear.pattern.lattice");
  expect_refused(scene("layout = \"lines\"\npitch = \"100 um\"\nwidth = \"20 um\"\nmedium = \"nothing_known\""),
                 "rear.pattern.medium");
}

}  // namespace
}  // namespace lumtrap
