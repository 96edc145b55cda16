// Doping profiles and free-carrier absorption along segments
// (optics/doping_profile.hpp): profile shapes by their definitions, uniform
// layers against the closed form e^{-(α_bb + α_fca)L}, Gaussian, erfc and
// tabulated profiles (with and without compensation) against a fine
// trapezoid quadrature written here, the absorption split against a brute
// force cumulative quadrature, the CSV reader and the errors.
#include "optics/doping_profile.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <fstream>
#include <functional>
#include <string>
#include <unistd.h>

using namespace lumtrap;
using ::testing::HasSubstr;
namespace fs = std::filesystem;

namespace {

constexpr FcaParametrization kGreen = FcaParametrization::green1995;
constexpr FcaParametrization kSchroder = FcaParametrization::schroder1978;

/// Trapezoid rule with `steps` equal steps (common practice); error
/// -(b-a) h² f''/12 for smooth f.
double trapezoid(const std::function<double(double)>& f, double a, double b, int steps) {
  const double h = (b - a) / steps;
  double sum = 0.5 * (f(a) + f(b));
  for (int i = 1; i < steps; ++i) sum += f(a + i * h);
  return sum * h;
}

/// α_fca (1/cm) from electron and hole densities, using the recalled
/// power laws (α = K λ^a N with b = 1 for both shipped parametrizations).
double alpha_fca(FcaParametrization p, double wl, double n, double holes) {
  return free_carrier_absorption_per_cm(p, DopingType::n, wl, n) +
         free_carrier_absorption_per_cm(p, DopingType::p, wl, holes);
}

/// τ_fca along a segment by the trapezoid rule in path length, with the
/// carrier densities given by `carriers(depth) -> {n, p}` written in the test.
double trapezoid_tau(FcaParametrization p, double wl, const DepthSegment& s,
                     const std::function<std::pair<double, double>(double)>& carriers, int steps) {
  const auto a = [&](double t) {
    const double z = s.start_depth_um + (s.end_depth_um - s.start_depth_um) * t / s.length_um;
    const auto [n, h] = carriers(z);
    return alpha_fca(p, wl, n, h) * 1e-4;  // 1/µm
  };
  return trapezoid(a, 0.0, s.length_um, steps);
}

/// Free-carrier share of the absorbed flux by brute force: cumulative
/// trapezoid τ(s) and trapezoid ∫ α_fca e^{-τ} ds over `steps` steps.
double brute_force_share(const DopingProfile& prof, FcaParametrization p, double wl,
                         double alpha_bb, const DepthSegment& s, int steps) {
  const double h = s.length_um / steps;
  const auto a_f = [&](double t) {
    const double z = s.start_depth_um + (s.end_depth_um - s.start_depth_um) * t / s.length_um;
    return free_carrier_absorption_at_depth_per_cm(prof, p, wl, z) * 1e-4;
  };
  const double a_bb = alpha_bb * 1e-4;
  double tau = 0.0, num = 0.0;
  double f_prev = a_f(0.0);
  num += 0.5 * h * f_prev;
  for (int i = 1; i <= steps; ++i) {
    const double f = a_f(i * h);
    tau += a_bb * h + 0.5 * h * (f_prev + f);
    num += (i == steps ? 0.5 : 1.0) * h * f * std::exp(-tau);
    f_prev = f;
  }
  return num / -std::expm1(-tau);
}

fs::path scratch(const std::string& name, const std::string& text) {
  const fs::path d = fs::temp_directory_path() / ("lumtrap_doping_" + std::to_string(::getpid()));
  fs::create_directories(d);
  const fs::path p = d / name;
  std::ofstream(p, std::ios::binary) << text;
  return p;
}

std::string csv_error(const fs::path& p) {
  try {
    read_doping_profile_csv(p);
  } catch (const DopingProfileError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

// ---------------------------------------------------------------------------
// Shapes

TEST(DopingProfile, ShapesFollowTheirDefinitions) {
  const DopantLayer u{UniformDoping{1e19, 2.0}, DopingType::n};
  const DopantLayer g{GaussianDoping{2e20, 0.3}, DopingType::n};
  const DopantLayer e{ErfcDoping{5e19, 0.2}, DopingType::p};
  EXPECT_EQ(dopant_density_cm3(u, 0.0), 1e19);
  EXPECT_EQ(dopant_density_cm3(u, 2.0), 1e19);
  EXPECT_EQ(dopant_density_cm3(u, 2.0001), 0.0);
  EXPECT_NEAR(dopant_density_cm3(g, 0.3), 2e20 * std::exp(-1.0), 1e6);   // N_s e^{-1} at x = d
  EXPECT_NEAR(dopant_density_cm3(g, 0.6), 2e20 * std::exp(-4.0), 1e5);
  EXPECT_NEAR(dopant_density_cm3(e, 0.0), 5e19, 1.0);                   // erfc(0) = 1
  EXPECT_NEAR(dopant_density_cm3(e, 0.2), 5e19 * std::erfc(1.0), 1e4);  // erfc(1) = 0.157299...
}

TEST(DopingProfile, TabulatedIsLogLinearConstantToSurfaceAndZeroBeyond) {
  const DopantLayer t{TabulatedDoping{{0.1, 0.5, 1.0}, {1e20, 1e18, 1e16}, "", ""}, DopingType::n};
  EXPECT_EQ(dopant_density_cm3(t, 0.0), 1e20);  // first row holds up to the surface
  EXPECT_EQ(dopant_density_cm3(t, 0.1), 1e20);
  EXPECT_NEAR(dopant_density_cm3(t, 0.3), 1e19, 1e19 * 1e-13);  // geometric mean of the rows
  EXPECT_NEAR(dopant_density_cm3(t, 0.75), 1e17, 1e17 * 1e-13);
  EXPECT_EQ(dopant_density_cm3(t, 1.0), 1e16);
  EXPECT_EQ(dopant_density_cm3(t, 1.0000001), 0.0);
}

TEST(DopingProfile, FreeCarriersAreTheNetDoping) {
  // n-type Gaussian emitter on a p-type base: n = max(N_D - N_A, 0) etc.
  DopingProfile prof;
  prof.layers = {{GaussianDoping{2e20, 0.3}, DopingType::n}};
  prof.base_density_cm3 = 1e16;
  prof.base_type = DopingType::p;
  const FreeCarrierDensity s = free_carriers_cm3(prof, 0.0);
  EXPECT_EQ(s.electrons_cm3, 2e20 - 1e16);
  EXPECT_EQ(s.holes_cm3, 0.0);
  const FreeCarrierDensity deep = free_carriers_cm3(prof, 5.0);
  EXPECT_EQ(deep.electrons_cm3, 0.0);
  EXPECT_NEAR(deep.holes_cm3, 1e16, 1.0);
  // Junction depth x_j = d sqrt(ln(N_s/N_B)) = 0.3 · sqrt(ln 2e4) = 0.94418 µm.
  const double xj = 0.3 * std::sqrt(std::log(2e4));
  EXPECT_GT(free_carriers_cm3(prof, xj - 1e-3).electrons_cm3, 0.0);
  EXPECT_GT(free_carriers_cm3(prof, xj + 1e-3).holes_cm3, 0.0);
}

// ---------------------------------------------------------------------------
// Uniform layers: exact

TEST(DopingProfile, UniformLayerMatchesClosedFormTransmission) {
  // Uniform n-type 1e19 cm⁻³ to 2 µm. A segment from depth 0 to 1.5 µm with
  // path length 3 µm stays inside: τ_fca = α_fca L, and the transmitted
  // fraction is e^{-(α_bb + α_fca) L} (Beer-Lambert, common practice).
  DopingProfile prof;
  prof.layers = {{UniformDoping{1e19, 2.0}, DopingType::n}};
  const double wl = 1100.0, a_bb = 3.5;  // 1/cm
  const DepthSegment s{0.0, 1.5, 3.0};
  const double a_f = 2.6e-27 * std::pow(1100.0, 3) * 1e19;  // green1995 n-type by hand: 34.606 /cm
  const double tau = free_carrier_optical_depth(prof, kGreen, wl, s);
  EXPECT_NEAR(tau, a_f * 3.0e-4, 1e-15);
  const double transmitted = std::exp(-(a_bb * 3.0e-4 + tau));
  EXPECT_NEAR(transmitted, std::exp(-(a_bb + a_f) * 3.0e-4), 1e-15);
  // The split: ∫ α_f e^{-αs} ds / ∫ α e^{-αs} ds = α_f / α exactly.
  const double share = free_carrier_share_of_segment(prof, kGreen, wl, a_bb, s);
  EXPECT_NEAR(share, a_f / (a_bb + a_f), 1e-12);
  std::printf("uniform layer: share %.15f vs closed form %.15f\n", share, a_f / (a_bb + a_f));
  EXPECT_NEAR(free_carrier_share_at(prof, kGreen, wl, a_bb, 1.0), a_f / (a_bb + a_f), 1e-15);
  // Crossing the layer edge: from 1 to 3 µm depth over 4 µm of path, half of
  // the path lies in the layer.
  EXPECT_NEAR(free_carrier_optical_depth(prof, kGreen, wl, {1.0, 3.0, 4.0}), a_f * 2.0e-4, 1e-15);
  // Reversed direction, same τ; horizontal segment α L.
  EXPECT_NEAR(free_carrier_optical_depth(prof, kGreen, wl, {3.0, 1.0, 4.0}), a_f * 2.0e-4, 1e-15);
  EXPECT_NEAR(free_carrier_optical_depth(prof, kGreen, wl, {1.0, 1.0, 5.0}), a_f * 5.0e-4, 1e-15);
}

TEST(DopingProfile, CompensatedUniformLayersAreExact) {
  // n-type 1e19 to 2 µm on a p-type 1e16 base: electrons 1e19 - 1e16 above
  // 2 µm, holes 1e16 below; the GK path integrates piecewise constants exactly.
  DopingProfile prof;
  prof.layers = {{UniformDoping{1e19, 2.0}, DopingType::n}};
  prof.base_density_cm3 = 1e16;
  prof.base_type = DopingType::p;
  const FreeCarrierColumn c = free_carrier_column(prof, kSchroder, {0.5, 6.5, 12.0});
  // 1.5 µm of depth above the edge, 4.5 µm below, path/depth = 2.
  EXPECT_NEAR(c.electrons, (1e19 - 1e16) * 1.5 * 2.0, 1e19 * 1e-12);
  EXPECT_NEAR(c.holes, 1e16 * 4.5 * 2.0, 1e16 * 1e-12);
}

// ---------------------------------------------------------------------------
// Gaussian, erfc, tabulated: against a fine trapezoid

TEST(DopingProfile, DiffusedProfilesMatchFineTrapezoid) {
  // Relative tolerance 2e-8: the trapezoid error with 1e5 steps is bounded by
  // L h² max|f''|/12 ≈ 5e-9 of the column for these profiles (d >= 0.2 µm,
  // segments <= 5 µm deep; f'' <= 2 N_s/d²).
  struct Case {
    const char* what;
    DopingProfile prof;
    DepthSegment seg;
    std::function<std::pair<double, double>(double)> carriers;  // {n, p} written out here
  };
  const double Ns = 2e20, d = 0.3, NB = 1e16;
  std::vector<Case> cases;
  {
    DopingProfile p;  // single type: closed form (erfc differences)
    p.layers = {{GaussianDoping{Ns, d}, DopingType::n}};
    p.base_density_cm3 = 1e15;
    p.base_type = DopingType::n;
    cases.push_back({"gaussian n on n base", p, {0.0, 4.0, 5.0}, [=](double x) {
                       return std::pair{Ns * std::exp(-(x / d) * (x / d)) + 1e15, 0.0};
                     }});
  }
  {
    DopingProfile p;  // single type: closed form (erfc antiderivative)
    p.layers = {{ErfcDoping{5e19, 0.2}, DopingType::p}};
    cases.push_back({"erfc p", p, {0.05, 2.5, 2.9}, [](double x) {
                       return std::pair{0.0, 5e19 * std::erfc(x / 0.2)};
                     }});
  }
  {
    DopingProfile p;  // compensation: adaptive Gauss-Kronrod with the junction kink
    p.layers = {{GaussianDoping{Ns, d}, DopingType::n}};
    p.base_density_cm3 = NB;
    p.base_type = DopingType::p;
    cases.push_back({"gaussian n on p base", p, {0.0, 5.0, 6.0}, [=](double x) {
                       const double net = Ns * std::exp(-(x / d) * (x / d)) - NB;
                       return std::pair{std::max(net, 0.0), std::max(-net, 0.0)};
                     }});
  }
  {
    DopingProfile p;  // compensation: erfc p on n base
    p.layers = {{ErfcDoping{5e19, 0.25}, DopingType::p}};
    p.base_density_cm3 = 3e15;
    p.base_type = DopingType::n;
    cases.push_back({"erfc p on n base", p, {3.0, 0.0, 3.0}, [](double x) {
                       const double net = 5e19 * std::erfc(x / 0.25) - 3e15;
                       return std::pair{std::max(-net, 0.0), std::max(net, 0.0)};
                     }});
  }
  {
    DopingProfile p;  // tabulated, single type: closed form of log-linear pieces
    p.layers = {{TabulatedDoping{{0.05, 0.2, 0.6, 1.0}, {3e20, 1e20, 1e18, 1e17}, "", ""},
                 DopingType::n}};
    cases.push_back({"tabulated n", p, {0.0, 1.5, 2.0}, [](double x) {
                       const double D[] = {0.05, 0.2, 0.6, 1.0}, N[] = {3e20, 1e20, 1e18, 1e17};
                       if (x <= D[0]) return std::pair{N[0], 0.0};
                       for (int i = 0; i < 3; ++i)
                         if (x <= D[i + 1])
                           return std::pair{std::exp(std::log(N[i]) + (std::log(N[i + 1]) - std::log(N[i])) *
                                                                          (x - D[i]) / (D[i + 1] - D[i])),
                                            0.0};
                       return std::pair{0.0, 0.0};
                     }});
  }
  for (const Case& c : cases)
    for (FcaParametrization p : {kGreen, kSchroder})
      for (double wl : {1000.0, 1500.0}) {
        const double lib = free_carrier_optical_depth(c.prof, p, wl, c.seg);
        const double ref = trapezoid_tau(p, wl, c.seg, c.carriers, 100000);
        std::printf("%-22s %-12s %4.0f nm: tau %.10e, trapezoid %.10e, rel %.1e\n", c.what,
                    std::string(fca_parametrization_id(p)).c_str(), wl, lib, ref,
                    std::abs(lib - ref) / ref);
        EXPECT_NEAR(lib, ref, 2e-8 * ref) << c.what << " " << wl;
      }
}

TEST(DopingProfile, ColumnDoesNotDependOnWavelength) {
  // τ(λ) = 1e-4 (K_n(λ) col_n + K_p(λ) col_p): for one carrier type the ratio
  // of τ at two wavelengths is (λ1/λ2)^a of the law.
  DopingProfile prof;
  prof.layers = {{GaussianDoping{1e20, 0.4}, DopingType::n}};
  const DepthSegment s{0.0, 3.0, 3.5};
  const double t1 = free_carrier_optical_depth(prof, kGreen, 1000.0, s);
  const double t2 = free_carrier_optical_depth(prof, kGreen, 1300.0, s);
  EXPECT_NEAR(t2 / t1, std::pow(1.3, 3.0), 1e-12);
  const FreeCarrierColumn c = free_carrier_column(prof, kGreen, s);
  EXPECT_EQ(free_carrier_optical_depth(c, kGreen, 1300.0), t2);
  // Closed form by hand: col = (L/Δz) N_s d sqrt(π)/2 erf(3/0.4), erf(7.5) = 1 - 2.8e-26.
  EXPECT_NEAR(c.electrons, 3.5 / 3.0 * 1e20 * 0.4 * 1.7724538509055160273 / 2.0, 1e20 * 1e-14);
}

// ---------------------------------------------------------------------------
// Absorption split

TEST(DopingProfile, ShareOfSegmentMatchesBruteForce) {
  // Brute force with 2e5 trapezoid steps (relative error ~1e-9 here);
  // tolerance 1e-7 relative.
  DopingProfile prof;
  prof.layers = {{GaussianDoping{2e20, 0.3}, DopingType::n}};
  prof.base_density_cm3 = 1e16;
  prof.base_type = DopingType::p;
  for (double a_bb : {0.0, 3.5, 1.0e4})
    for (const DepthSegment s : {DepthSegment{0.0, 5.0, 7.0}, DepthSegment{2.0, 0.1, 2.5}}) {
      const double lib = free_carrier_share_of_segment(prof, kGreen, 1100.0, a_bb, s);
      const double ref = brute_force_share(prof, kGreen, 1100.0, a_bb, s, 200000);
      std::printf("share alpha_bb = %g /cm, depth %g -> %g um: %.12f vs brute force %.12f\n", a_bb,
                  s.start_depth_um, s.end_depth_um, lib, ref);
      EXPECT_NEAR(lib, ref, 1e-7 * ref);
    }
  // No band-to-band absorption: everything absorbed goes to free carriers.
  EXPECT_NEAR(free_carrier_share_of_segment(prof, kGreen, 1100.0, 0.0, {0.0, 1.0, 1.0}), 1.0, 1e-12);
  // Nothing absorbed at all (undoped, α_bb = 0): 0 by convention.
  EXPECT_EQ(free_carrier_share_of_segment(DopingProfile{}, kGreen, 1100.0, 0.0, {0.0, 1.0, 1.0}), 0.0);
  // At a point: α_fca/(α_bb + α_fca), by hand at the surface:
  // α_fca = 2.6e-27 · 1100³ · (2e20 - 1e16) = 692.05 /cm.
  const double a_f = 2.6e-27 * std::pow(1100.0, 3) * (2e20 - 1e16);
  EXPECT_NEAR(free_carrier_share_at(prof, kGreen, 1100.0, 3.5, 0.0), a_f / (3.5 + a_f), 1e-14);
}

// ---------------------------------------------------------------------------
// CSV reader and errors

TEST(DopingProfile, ReadsCsvAndReportsFileAndLine) {
  const fs::path good = scratch("good.csv",
                                "# measured profile\n# source: illustrative values, not a "
                                "measurement\ndepth_um,N_cm3\n0.01,2e20\n0.2,5e19\n0.8,1e17\n");
  const TabulatedDoping t = read_doping_profile_csv(good);
  EXPECT_EQ(t.depth_um, (std::vector<double>{0.01, 0.2, 0.8}));
  EXPECT_EQ(t.density_cm3, (std::vector<double>{2e20, 5e19, 1e17}));
  EXPECT_EQ(t.source, "illustrative values, not a measurement");

  const fs::path zero = scratch("zero.csv", "depth_um,N_cm3\n0.1,1e20\n0.5,0\n");
  EXPECT_THAT(csv_error(zero), HasSubstr(zero.string() + ":3: N_cm3 = 0; the density must be > 0"));
  const fs::path unsorted = scratch("unsorted.csv", "depth_um,N_cm3\n0.5,1e20\n0.1,1e19\n");
  EXPECT_THAT(csv_error(unsorted), HasSubstr(unsorted.string() + ":3:"));
  EXPECT_THAT(csv_error(unsorted), HasSubstr("strictly increase"));
  const fs::path surface = scratch("surface.csv", "depth_um,N_cm3\n0,1e20\n");
  EXPECT_THAT(csv_error(surface), HasSubstr(surface.string() + ":2: depth_um = 0 must be > 0"));
  const fs::path columns = scratch("columns.csv", "depth_um,N_cm3\n0.1,1e20,3\n");
  EXPECT_THAT(csv_error(columns), HasSubstr(":2: expected 2 columns `depth_um,N_cm3`"));
  EXPECT_THAT(csv_error(scratch("missing_dir/none.csv", "")), HasSubstr("none.csv"));
}

TEST(DopingProfile, ErrorsSayWhatIsAllowed) {
  DopingProfile prof;
  prof.layers = {{GaussianDoping{1e20, 0.0}, DopingType::n}};
  try {
    check_doping_profile(prof);
    FAIL();
  } catch (const DopingProfileError& e) {
    EXPECT_THAT(e.what(), HasSubstr("doping layer 1 (n-type): Gaussian length 0 um; allowed: finite and > 0"));
  }
  const DopingProfile ok;
  EXPECT_THROW(free_carrier_optical_depth(ok, kGreen, 1000.0, {-1.0, 1.0, 3.0}), DopingProfileError);
  try {
    free_carrier_optical_depth(ok, kGreen, 1000.0, {0.0, 2.0, 1.0});
    FAIL();
  } catch (const DopingProfileError& e) {
    EXPECT_THAT(e.what(), HasSubstr("segment length 1 um is not allowed; a straight segment from "
                                    "depth 0 to 2 um is at least 2 um long"));
  }
  EXPECT_THROW(free_carrier_share_of_segment(ok, kGreen, 1000.0, -1.0, {0.0, 1.0, 1.0}),
               DopingProfileError);
  prof.layers = {{TabulatedDoping{{0.1, 0.1}, {1e20, 1e19}, "", ""}, DopingType::p}};
  EXPECT_THROW(check_doping_profile(prof), DopingProfileError);
}
