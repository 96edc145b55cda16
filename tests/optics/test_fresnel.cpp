// Fresnel amplitudes of one planar interface (src/optics/fresnel.hpp).
#include "optics/fresnel.hpp"

#include <numbers>
#include <gtest/gtest.h>

#include <cmath>
#include <random>

namespace lumtrap {
namespace {


// Transmitted power fractions of a single interface for a lossless incident
// medium; for p the Poynting flux in an absorbing exit medium is
// Re(n2 conj(c2)) |t_p|² (common practice; Born & Wolf, Principles of
// Optics, 7th ed., 1999, for the lossless case).
double Ts(cplx n1, cplx n2, double c1, const FresnelAmplitudes& f) {
  const cplx c2 = cos_refracted(n1, n2, c1);
  return (n2 * c2).real() / (n1.real() * c1) * std::norm(f.ts);
}
double Tp(cplx n1, cplx n2, double c1, const FresnelAmplitudes& f) {
  const cplx c2 = cos_refracted(n1, n2, c1);
  return (n2 * std::conj(c2)).real() / (n1.real() * c1) * std::norm(f.tp);
}

// Normal incidence air → silicon with n = 4.3: R = ((n-1)/(n+1))² = 38.8 %
// (Fresnel equations; E. Hecht, Optics, 5th ed., 2017).
TEST(Fresnel, NormalIncidenceAirSilicon) {
  const FresnelAmplitudes f = fresnel_amplitudes(1.0, 4.3, 1.0);
  EXPECT_NEAR(std::norm(f.rs), 0.388, 0.0005);
  EXPECT_NEAR(std::norm(f.rs), std::pow(3.3 / 5.3, 2), 1e-15);
  // Convention of fresnel.hpp (Born & Wolf 1999, §1.5.2): r_s = -r_p at normal incidence.
  EXPECT_NEAR(std::abs(f.rs + f.rp), 0.0, 1e-16);
  EXPECT_NEAR(f.rs.real(), -3.3 / 5.3, 1e-15);
  EXPECT_NEAR(f.ts.real(), 2.0 / 5.3, 1e-15);
  EXPECT_NEAR(f.tp.real(), 2.0 / 5.3, 1e-15);
}

// Brewster angle θ_B = arctan(n2/n1): r_p = 0 for a lossless interface
// (E. Hecht, Optics, 5th ed., 2017; Born & Wolf, Principles of Optics, 1999).
TEST(Fresnel, BrewsterAngleBothDirections) {
  for (auto [n1, n2] : {std::pair{1.0, 1.5}, std::pair{1.5, 1.0}, std::pair{1.0, 3.5}}) {
    const double theta_b = std::atan(n2 / n1);
    const FresnelAmplitudes f = fresnel_amplitudes(n1, n2, std::cos(theta_b));
    EXPECT_LT(std::norm(f.rp), 1e-20) << n1 << " -> " << n2;
    EXPECT_GT(std::norm(f.rs), 1e-3);
  }
}

// Total internal reflection from silicon (n = 3.5) into air: |r_s| = |r_p| = 1
// and the phases of Born & Wolf, Principles of Optics, 1999, §1.5.4:
//   tan(δ_s/2) = sqrt(sin²θ - n²)/cos θ,  tan(δ_p/2) = sqrt(sin²θ - n²)/(n² cos θ),
// n = n2/n1. With the exp(-iωt) convention and Im(n2 c2) >= 0 of
// fresnel.hpp, arg r = -δ.
TEST(Fresnel, TotalInternalReflectionSiliconToAir) {
  const double n1 = 3.5, n2 = 1.0, n = n2 / n1;
  const double theta_c = std::asin(n);
  for (double theta = theta_c + 1e-6; theta < std::numbers::pi / 2; theta += 0.002) {
    const double c = std::cos(theta), s = std::sin(theta);
    const FresnelAmplitudes f = fresnel_amplitudes(n1, n2, c);
    EXPECT_NEAR(std::abs(f.rs), 1.0, 1e-14);
    EXPECT_NEAR(std::abs(f.rp), 1.0, 1e-14);
    const double root = std::sqrt(s * s - n * n);
    const double delta_s = 2.0 * std::atan(root / c);
    const double delta_p = 2.0 * std::atan(root / (n * n * c));
    // 1e-10: the phase varies as sqrt(θ - θ_c) next to the critical angle,
    // which magnifies round-off in sin²θ - n².
    EXPECT_NEAR(std::arg(f.rs * std::polar(1.0, delta_s)), 0.0, 1e-10) << theta;
    EXPECT_NEAR(std::arg(f.rp * std::polar(1.0, delta_p)), 0.0, 1e-10) << theta;
    // The transmitted wave is evanescent: c2 purely imaginary, Im(n2 c2) > 0.
    const cplx c2 = cos_refracted(n1, n2, c);
    EXPECT_EQ(c2.real(), 0.0);
    EXPECT_GT(c2.imag(), 0.0);
    EXPECT_EQ(Ts(n1, n2, c, f), 0.0);
    EXPECT_EQ(Tp(n1, n2, c, f), 0.0);
  }
}

// Snell's law n1 sin θ1 = n2 sin θ2 for complex indices and the branch rule
// of fresnel.hpp (decay away from the interface).
TEST(Fresnel, RefractedCosineBranchAndSnell) {
  std::mt19937_64 rng(7);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  for (int i = 0; i < 2000; ++i) {
    const cplx n1(1.0 + 3.0 * u(rng), 0.0);
    const cplx n2(0.05 + 4.0 * u(rng), i % 3 == 0 ? 0.0 : 8.0 * u(rng) * u(rng));
    const double c1 = u(rng);
    const cplx c2 = cos_refracted(n1, n2, c1);
    const cplx q2 = n2 * c2;
    EXPECT_GE(q2.imag(), 0.0);
    EXPECT_GE(q2.real(), 0.0);  // passive media, real invariant: first quadrant
    // n2² sin²θ2 = n1² sin²θ1
    const cplx lhs = n2 * n2 * (1.0 - c2 * c2);
    const cplx rhs = n1 * n1 * (1.0 - c1 * c1);
    EXPECT_NEAR(std::abs(lhs - rhs), 0.0, 1e-12 * (1.0 + std::norm(n2)));
  }
}

// Energy at one interface: R + T = 1 for a lossless incident medium, also for
// an absorbing exit medium where T is the Poynting flux entering it (common
// practice; Born & Wolf, Principles of Optics, 1999).
TEST(Fresnel, EnergyBalanceLosslessAndAbsorbingExit) {
  std::mt19937_64 rng(11);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  for (int i = 0; i < 5000; ++i) {
    const cplx n1(1.0 + 3.0 * u(rng), 0.0);
    const cplx n2(0.05 + 4.0 * u(rng), i % 2 == 0 ? 0.0 : 8.0 * u(rng));
    const double c1 = 1e-3 + (1.0 - 1e-3) * u(rng);
    const FresnelAmplitudes f = fresnel_amplitudes(n1, n2, c1);
    EXPECT_NEAR(std::norm(f.rs) + Ts(n1, n2, c1, f), 1.0, 1e-12);
    EXPECT_NEAR(std::norm(f.rp) + Tp(n1, n2, c1, f), 1.0, 1e-12);
  }
}

// Stokes relations r' = -r and t t' = 1 - r² for the frames of fresnel.hpp
// (Stokes relations; E. Hecht, Optics, 5th ed., 2017).
TEST(Fresnel, StokesRelations) {
  const cplx n1 = 1.45, n2(3.9, 0.02);
  for (double c1 = 1.0; c1 > 0.0; c1 -= 0.01) {
    const FresnelAmplitudes f = fresnel_amplitudes(n1, n2, c1);
    const cplx c2 = cos_refracted(n1, n2, c1);
    const FresnelAmplitudes b = fresnel_amplitudes(n2, n1, c2);
    // The reverse wave recovers c1 from the complex c2 as sqrt(n1² - ξ²)/n1,
    // a square root of a difference: its round-off grows as 1/c1 towards
    // grazing incidence (measured 4.8e-13 at c1 = 0.01).
    const double tol = 1e-14 / c1;
    EXPECT_NEAR(std::abs(f.rs + b.rs), 0.0, tol) << c1;
    EXPECT_NEAR(std::abs(f.rp + b.rp), 0.0, tol) << c1;
    EXPECT_NEAR(std::abs(f.ts * b.ts - (1.0 - f.rs * f.rs)), 0.0, tol) << c1;
    EXPECT_NEAR(std::abs(f.tp * b.tp - (1.0 - f.rp * f.rp)), 0.0, tol) << c1;
  }
}

// Special cases in plain sight: identical media and grazing incidence.
TEST(Fresnel, IdenticalMediaAndGrazing) {
  const FresnelAmplitudes same = fresnel_amplitudes(cplx(1.5, 0.1), cplx(1.5, 0.1), 0.0);
  EXPECT_EQ(same.rs, cplx(0.0));
  EXPECT_EQ(same.rp, cplx(0.0));
  EXPECT_EQ(same.ts, cplx(1.0));
  EXPECT_EQ(same.tp, cplx(1.0));
  // Grazing incidence on a different medium: r → -1 for both polarizations
  // in this convention (limit θ → 90° of the fresnel.hpp formulas, common practice).
  const FresnelAmplitudes g = fresnel_amplitudes(1.0, cplx(3.9, 0.02), 0.0);
  EXPECT_NEAR(std::abs(g.rs + 1.0), 0.0, 1e-15);
  EXPECT_NEAR(std::abs(g.rp + 1.0), 0.0, 1e-15);
  EXPECT_EQ(std::abs(g.ts), 0.0);
  EXPECT_EQ(std::abs(g.tp), 0.0);
}

}  // namespace
}  // namespace lumtrap
