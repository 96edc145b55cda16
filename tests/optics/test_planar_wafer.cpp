// Exact planar wafer (src/optics/planar_wafer.hpp) against closed forms
// written here. Indices are constants written in this file.
#include "optics/closed_forms.hpp"
#include "optics/planar_wafer.hpp"

#include <numbers>
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numeric>
#include <random>
#include <stdexcept>
#include <string>

namespace lumtrap {
namespace {


double total(const PlanarResult& r) {
  return r.R + r.absorbed_silicon + r.absorbed_rear_medium + r.T +
         std::accumulate(r.absorbed_front_films.begin(), r.absorbed_front_films.end(), 0.0) +
         std::accumulate(r.absorbed_rear_films.begin(), r.absorbed_rear_films.end(), 0.0);
}

PlanarWafer bare_wafer(cplx ambient, cplx si, double thickness_nm, cplx rear) {
  return {{ambient, {}, si}, thickness_nm, {si, {}, rear}};
}

// ---------------------------------------------------------------------------
// Independent closed form for ambient | one film | Si slab | metal.
// Physics of one interface/film, written out here from the formulas in
// fresnel.hpp (Born & Wolf, Principles of Optics, 7th ed., 1999) and the
// single-film Airy summation
//   r = (r01 + r12 e^{2iβ}) / (1 + r01 r12 e^{2iβ}),
//   t = t01 t12 e^{iβ} / (1 + r01 r12 e^{2iβ}),  β = 2π n1 cos θ1 d / λ
// (Born & Wolf 1999; H. A. Macleod, Thin-Film Optical Filters, 2010).
// Powers for a lossless incident medium n0: T_s = Re(n2 c2)/(n0 c0)|t_s|²,
// T_p = Re(n2 conj c2)/(n0 c0)|t_p|² (Poynting flux entering the exit
// medium, common practice); the film absorbs 1 - R - T.
struct Powers {
  double R, T, A;
};

cplx q_of(cplx n, double xi2) {  // n cos θ on the decaying branch
  cplx q = std::sqrt(n * n - xi2);
  if (q.imag() < 0.0) q = -q;
  return q;
}

Powers single_film(double n0, cplx n1, double d, cplx n2, double lambda, double c0, bool p) {
  const double xi2 = n0 * n0 * (1.0 - c0 * c0);
  const cplx q0 = n0 * c0, q1 = q_of(n1, xi2), q2 = q_of(n2, xi2);
  const cplx c1 = q1 / n1, c2 = q2 / n2;
  cplx r01, r12, t01, t12;
  if (!p) {
    r01 = (q0 - q1) / (q0 + q1);
    t01 = 2.0 * q0 / (q0 + q1);
    r12 = (q1 - q2) / (q1 + q2);
    t12 = 2.0 * q1 / (q1 + q2);
  } else {
    r01 = (n1 * c0 - n0 * c1) / (n1 * c0 + n0 * c1);
    t01 = 2.0 * q0 / (n1 * c0 + n0 * c1);
    r12 = (n2 * c1 - n1 * c2) / (n2 * c1 + n1 * c2);
    t12 = 2.0 * q1 / (n2 * c1 + n1 * c2);
  }
  const cplx e1 = std::exp(cplx(0.0, 2.0 * std::numbers::pi / lambda * d) * q1);
  const cplx den = 1.0 + r01 * r12 * e1 * e1;
  const cplx r = (r01 + r12 * e1 * e1) / den;
  const cplx t = t01 * t12 * e1 / den;
  const double flux_ratio = (p ? (n2 * std::conj(c2)).real() : q2.real()) / q0.real();
  const double R = std::norm(r), T = flux_ratio * std::norm(t);
  return {R, T, 1.0 - R - T};
}

double bare_interface_R(double n1, cplx n2, double c1, bool p) {
  const double xi2 = n1 * n1 * (1.0 - c1 * c1);
  const cplx q1 = n1 * c1, q2 = q_of(n2, xi2), c2 = q2 / n2;
  const cplx r = p ? (n2 * c1 - n1 * c2) / (n2 * c1 + n1 * c2) : (q1 - q2) / (q1 + q2);
  return std::norm(r);
}

struct Expected {
  double R, absorbed_silicon, A_metal, A_film;
};

// Follows the power pass by pass (no closed-form series) until < 1e-18.
Expected film_si_metal(cplx n_film, double d_film, cplx n_si, double W, cplx n_metal,
                       double lambda, double c0, bool p) {
  const Powers front = single_film(1.0, n_film, d_film, n_si, lambda, c0, p);
  const double s_si = std::sqrt(1.0 - c0 * c0) / n_si.real();  // Snell with real indices
  const double c_si = std::sqrt(1.0 - s_si * s_si);
  const Powers inside = single_film(n_si.real(), n_film, d_film, 1.0, lambda, c_si, p);
  const double R_rear = bare_interface_R(n_si.real(), n_metal, c_si, p);
  // Beer-Lambert, α = 4πk/λ, path W / cos θ_Si (common practice).
  const double tau = std::exp(-4.0 * std::numbers::pi * n_si.imag() / lambda * W / c_si);

  Expected e{front.R, 0.0, 0.0, front.A};
  double down = front.T;  // power leaving the front surface downwards
  while (down > 1e-18) {
    e.absorbed_silicon += down * (1.0 - tau);
    const double at_rear = down * tau;
    e.A_metal += at_rear * (1.0 - R_rear);
    const double up = at_rear * R_rear;
    e.absorbed_silicon += up * (1.0 - tau);
    const double at_front = up * tau;
    e.R += at_front * inside.T;
    e.A_film += at_front * inside.A;
    down = at_front * inside.R;
  }
  return e;
}

// Single film on silicon on a metal, s and p, several wavelengths, indices
// and angles, film with and without absorption: planar wafer vs the closed
// form above to 1e-10.
TEST(PlanarWafer, FilmSiliconMetalMatchesClosedForm) {
  struct Case {
    double lambda;
    cplx film;
    double d;
    cplx si;
    double W;
    cplx metal;
  };
  const Case cases[] = {
      {900.0, cplx(2.0, 0.0), 75.0, cplx(3.8, 0.006), 20000.0, cplx(2.0, 8.0)},
      {900.0, cplx(2.0, 0.05), 75.0, cplx(3.8, 0.006), 20000.0, cplx(2.0, 8.0)},
      {1050.0, cplx(1.95, 0.02), 80.0, cplx(3.57, 0.0005), 180000.0, cplx(1.5, 9.0)},
      {500.0, cplx(2.1, 0.1), 60.0, cplx(4.3, 0.07), 20000.0, cplx(0.8, 6.0)},
      {1150.0, cplx(2.0, 0.01), 75.0, cplx(3.55, 1e-5), 50000.0, cplx(1.2, 11.0)},
  };
  for (const Case& k : cases) {
    const PlanarWafer w{{1.0, {{k.film, k.d}}, k.si}, k.W, {k.si, {}, k.metal}};
    for (double deg : {0.0, 30.0, 45.0, 60.0, 80.0}) {
      const double c0 = std::cos(deg * std::numbers::pi / 180.0);
      for (bool p : {false, true}) {
        const Expected e = film_si_metal(k.film, k.d, k.si, k.W, k.metal, k.lambda, c0, p);
        const PlanarResult r =
            solve_planar_wafer(w, k.lambda, c0, p ? Polarization::p : Polarization::s);
        EXPECT_NEAR(r.R, e.R, 1e-10) << k.lambda << " " << deg << " p=" << p;
        EXPECT_NEAR(r.absorbed_silicon, e.absorbed_silicon, 1e-10) << k.lambda << " " << deg << " p=" << p;
        EXPECT_NEAR(r.absorbed_rear_medium, e.A_metal, 1e-10) << k.lambda << " " << deg << " p=" << p;
        ASSERT_EQ(r.absorbed_front_films.size(), 1u);
        EXPECT_NEAR(r.absorbed_front_films[0], e.A_film, 1e-10) << k.lambda << " " << deg << " p=" << p;
        EXPECT_EQ(r.T, 0.0);  // metal rear medium: what enters is absorbed
        EXPECT_TRUE(r.absorbed_rear_films.empty());
        EXPECT_NEAR(total(r), 1.0, 1e-12);
        if (k.film.imag() > 0.0) {
          EXPECT_GT(r.absorbed_front_films[0], 1e-4);
        }
      }
    }
  }
}

// Normal incidence, air | thick incoherent layer n = sqrt(4.3) | n = 4.3.
// One interface air/4.3: R = 38.8 % (Fresnel; E. Hecht, Optics, 5th ed.,
// 2017). Through the intermediate layer both interfaces reflect
// R1 = R2 = ((sqrt(4.3) - 1)/(sqrt(4.3) + 1))² = 12.2 %:
// two-interface estimate 1 - (1 - R1)(1 - R2) = 22.9 % (common practice);
// incoherent sum of all multiple reflections
// R = R1 + (1 - R1)² R2 / (1 - R1 R2) = 21.7 % (common practice; each
// round trip inside the layer returns R1 R2 of the power).
TEST(PlanarWafer, IntermediateIncoherentLayer) {
  const double n = 4.3, m = std::sqrt(n);
  const double R_single = std::pow((n - 1.0) / (n + 1.0), 2);
  EXPECT_NEAR(R_single, 0.388, 5e-4);
  const PlanarResult single = solve_planar_wafer(bare_wafer(1.0, n, 1e6, n), 600.0, 1.0,
                                                 Polarization::unpolarized);
  EXPECT_NEAR(single.R, R_single, 1e-15);  // identical media: no rear interface

  const double R1 = std::pow((m - 1.0) / (m + 1.0), 2);
  const double R2 = std::pow((n - m) / (n + m), 2);
  const double two_interface = 1.0 - (1.0 - R1) * (1.0 - R2);
  const double incoherent = incoherent_slab(R1, R2, 1.0).R;  // R1 + (1 - R1)² R2 / (1 - R1 R2)
  EXPECT_NEAR(two_interface, 0.229, 5e-4);  // the quoted percentages, to 0.1 %
  EXPECT_NEAR(incoherent, 0.217, 5e-4);

  const PlanarResult r = solve_planar_wafer(bare_wafer(1.0, m, 1e6, n), 600.0, 1.0,
                                            Polarization::unpolarized);
  EXPECT_NEAR(r.R, incoherent, 1e-12);
  EXPECT_NEAR(r.T, 1.0 - incoherent, 1e-12);
  EXPECT_EQ(r.absorbed_silicon, 0.0);
  EXPECT_EQ(r.absorbed_rear_medium, 0.0);
}

// Non-absorbing slab in air: R_total = 2R/(1 + R), T_total = (1 - R)/(1 + R)
// (incoherent multiple reflections in a plate; Born & Wolf 1999 / common
// practice). Normal incidence with n = 3.5, and per polarization at 50°.
TEST(PlanarWafer, LosslessSlabInAir) {
  const PlanarWafer w = bare_wafer(1.0, 3.5, 200000.0, 1.0);
  const double R = std::pow(2.5 / 4.5, 2);
  const PlanarResult r = solve_planar_wafer(w, 1000.0, 1.0, Polarization::unpolarized);
  EXPECT_NEAR(r.R, 2.0 * R / (1.0 + R), 1e-12);
  EXPECT_NEAR(r.T, (1.0 - R) / (1.0 + R), 1e-12);
  EXPECT_EQ(r.absorbed_silicon, 0.0);

  const double c0 = std::cos(50.0 * std::numbers::pi / 180.0);
  for (bool p : {false, true}) {
    const double Ri = bare_interface_R(1.0, 3.5, c0, p);
    const PlanarResult o = solve_planar_wafer(w, 1000.0, c0, p ? Polarization::p : Polarization::s);
    EXPECT_NEAR(o.R, 2.0 * Ri / (1.0 + Ri), 1e-12) << p;
  }
}

// Beer-Lambert attenuation along the refracted path (α = 4πk/λ, path
// W / cos θ_Si with Snell on real indices; common practice): a rear medium
// equal to the silicon's real index reflects nothing, so
// absorbed_silicon = T_f (1 - τ) and T = T_f τ.
TEST(PlanarWafer, BeerLambertAlongRefractedPath) {
  const cplx si(3.6, 0.002);
  const double lambda = 1000.0, W = 100000.0;
  const PlanarWafer w = bare_wafer(1.0, si, W, si.real());
  for (double deg : {0.0, 45.0, 70.0}) {
    const double c0 = std::cos(deg * std::numbers::pi / 180.0);
    const double s_si = std::sin(deg * std::numbers::pi / 180.0) / si.real();
    const double tau = std::exp(-4.0 * std::numbers::pi * si.imag() / lambda * W / std::sqrt(1.0 - s_si * s_si));
    for (bool p : {false, true}) {
      const PlanarResult r = solve_planar_wafer(w, lambda, c0, p ? Polarization::p : Polarization::s);
      const StackResponse f = solve_stack(w.front, lambda, c0, Incidence::from_a);
      const double Tf = p ? f.p.T : f.s.T;
      EXPECT_NEAR(r.absorbed_silicon, Tf * (1.0 - tau), 1e-13);
      EXPECT_NEAR(r.T, Tf * tau, 1e-13);
      EXPECT_NEAR(r.R, p ? f.p.R : f.s.R, 1e-15);
    }
  }
}

// Oblique incidence: s and p differ, the unpolarized result is their mean.
TEST(PlanarWafer, ObliqueIncidencePolarizations) {
  const PlanarWafer w{{1.0, {{cplx(2.0, 0.02), 75.0}}, cplx(3.7, 0.005)},
                      150000.0,
                      {cplx(3.7, 0.005), {{1.45, 100.0}, {cplx(2.0, 0.0), 20.0}}, cplx(1.2, 7.0)}};
  for (double deg : {45.0, 60.0}) {
    const double c0 = std::cos(deg * std::numbers::pi / 180.0);
    const PlanarResult s = solve_planar_wafer(w, 800.0, c0, Polarization::s);
    const PlanarResult p = solve_planar_wafer(w, 800.0, c0, Polarization::p);
    const PlanarResult u = solve_planar_wafer(w, 800.0, c0, Polarization::unpolarized);
    EXPECT_GT(std::abs(s.R - p.R), 1e-2) << deg;
    EXPECT_GT(std::abs(s.absorbed_silicon - p.absorbed_silicon), 1e-3) << deg;
    EXPECT_NEAR(u.R, 0.5 * (s.R + p.R), 1e-15);
    EXPECT_NEAR(u.absorbed_silicon, 0.5 * (s.absorbed_silicon + p.absorbed_silicon), 1e-15);
    EXPECT_NEAR(u.absorbed_rear_medium, 0.5 * (s.absorbed_rear_medium + p.absorbed_rear_medium), 1e-15);
    EXPECT_NEAR(u.absorbed_front_films[0], 0.5 * (s.absorbed_front_films[0] + p.absorbed_front_films[0]), 1e-15);
    for (int j = 0; j < 2; ++j) EXPECT_NEAR(u.absorbed_rear_films[j], 0.5 * (s.absorbed_rear_films[j] + p.absorbed_rear_films[j]), 1e-15);
    for (const PlanarResult* r : {&s, &p, &u}) EXPECT_NEAR(total(*r), 1.0, 1e-12);
  }
}

// Every photon ends somewhere: the fractions add up to 1 to 1e-12 for
// random wafers with absorbing films on both sides, absorbing or lossless
// rear media, thin and thick silicon, all angles.
TEST(PlanarWafer, FractionsAddUpToOne) {
  std::mt19937_64 rng(17);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  double worst = 0.0;
  for (int trial = 0; trial < 300; ++trial) {
    const cplx si(3.4 + 1.5 * u(rng), std::pow(10.0, -6.0 + 5.5 * u(rng)));
    PlanarWafer w{{1.0 + 0.5 * u(rng), {}, si}, std::pow(10.0, 2.0 + 4.0 * u(rng)), {si, {}, 1.0}};
    const int nf = static_cast<int>(4 * u(rng)), nr = static_cast<int>(4 * u(rng));
    for (int j = 0; j < nf; ++j)
      w.front.layers.push_back({cplx(1.3 + 1.5 * u(rng), u(rng) < 0.5 ? 0.0 : 0.2 * u(rng)), 150.0 * u(rng)});
    for (int j = 0; j < nr; ++j)
      w.rear.layers.push_back({cplx(0.2 + 2.5 * u(rng), u(rng) < 0.5 ? 0.0 : 5.0 * u(rng)), 150.0 * u(rng)});
    w.rear.n_b = trial % 2 ? cplx(1.0 + 0.5 * u(rng), 0.0) : cplx(0.5 + 2.0 * u(rng), 3.0 + 7.0 * u(rng));
    const double lambda = 300.0 + 900.0 * u(rng);
    for (double c0 = 0.02; c0 <= 1.0; c0 += 0.07) {
      for (Polarization pol : {Polarization::s, Polarization::p, Polarization::unpolarized}) {
        const PlanarResult r = solve_planar_wafer(w, lambda, c0, pol);
        worst = std::max(worst, std::abs(total(r) - 1.0));
        ASSERT_NEAR(total(r), 1.0, 1e-12) << trial;
        EXPECT_GE(r.absorbed_silicon, 0.0);
        if (w.rear.n_b.imag() > 0.0) {
          EXPECT_EQ(r.T, 0.0);
        } else {
          EXPECT_EQ(r.absorbed_rear_medium, 0.0);
        }
      }
    }
  }
  RecordProperty("worst_sum_deviation", std::to_string(worst));
}

TEST(PlanarWafer, RejectsInconsistentInput) {
  PlanarWafer w = bare_wafer(1.0, cplx(3.6, 0.01), 1e5, 1.0);
  EXPECT_THROW(solve_planar_wafer(w, 800.0, 0.0, Polarization::s), std::invalid_argument);
  w.rear.n_a = cplx(3.5, 0.01);  // silicon index must agree on both sides
  EXPECT_THROW(solve_planar_wafer(w, 800.0, 1.0, Polarization::s), std::invalid_argument);
  w = bare_wafer(1.0, cplx(3.6, 0.01), -1.0, 1.0);
  EXPECT_THROW(solve_planar_wafer(w, 800.0, 1.0, Polarization::s), std::invalid_argument);
}

}  // namespace
}  // namespace lumtrap
