// Coherent thin-film stacks by the characteristic-matrix method
// (src/optics/thin_film_stack.hpp). Indices are constants written here.
#include "optics/thin_film_stack.hpp"

#include <numbers>
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <numeric>
#include <random>
#include <stdexcept>

#include "optics/fresnel.hpp"

namespace lumtrap {
namespace {


double sum_A(const PolarizedResponse& r) { return std::accumulate(r.A.begin(), r.A.end(), 0.0); }
double balance(const PolarizedResponse& r) { return r.R + r.T + sum_A(r) - 1.0; }

// Independent single-film formula (Airy summation; Born & Wolf, Principles
// of Optics, 7th ed., 1999; H. A. Macleod, Thin-Film Optical Filters, 4th
// ed., 2010): r = (r01 + r12 e^{2iβ}) / (1 + r01 r12 e^{2iβ}),
// t = t01 t12 e^{iβ} / (1 + r01 r12 e^{2iβ}), β = 2π n1 cos θ1 d / λ,
// with the interface coefficients written out from fresnel.hpp's formulas.
struct Airy {
  cplx rs, rp, ts, tp;
};
Airy airy_single_film(double n0, cplx n1, double d, cplx n2, double lambda, double c0) {
  const double xi2 = n0 * n0 * (1.0 - c0 * c0);
  auto q_of = [&](cplx n) {  // n cos θ, decaying branch
    cplx q = std::sqrt(n * n - xi2);
    if (q.imag() < 0.0) q = -q;
    return q;
  };
  const cplx q0 = n0 * c0, q1 = q_of(n1), q2 = q_of(n2);
  const cplx c1 = q1 / n1, c2 = q2 / n2;
  const cplx rs01 = (q0 - q1) / (q0 + q1), rs12 = (q1 - q2) / (q1 + q2);
  const cplx ts01 = 2.0 * q0 / (q0 + q1), ts12 = 2.0 * q1 / (q1 + q2);
  const cplx rp01 = (n1 * c0 - n0 * c1) / (n1 * c0 + n0 * c1);
  const cplx rp12 = (n2 * c1 - n1 * c2) / (n2 * c1 + n1 * c2);
  const cplx tp01 = 2.0 * q0 / (n1 * c0 + n0 * c1);
  const cplx tp12 = 2.0 * q1 / (n2 * c1 + n1 * c2);
  const cplx beta = 2.0 * std::numbers::pi * q1 * d / lambda;
  const cplx e1 = std::exp(cplx(0, 1) * beta), e2 = e1 * e1;
  return {(rs01 + rs12 * e2) / (1.0 + rs01 * rs12 * e2), (rp01 + rp12 * e2) / (1.0 + rp01 * rp12 * e2),
          ts01 * ts12 * e1 / (1.0 + rs01 * rs12 * e2), tp01 * tp12 * e1 / (1.0 + rp01 * rp12 * e2)};
}

// A stack with no layers is one interface: it reproduces fresnel_amplitudes
// (fresnel.hpp) to round-off, from both sides, in the same frame.
TEST(ThinFilmStack, NoLayersReproducesFresnel) {
  const FilmStack stacks[] = {{1.0, {}, cplx(3.9, 0.02)},
                              {1.5, {}, cplx(1.2, 7.0)},
                              {3.5, {}, 1.0},
                              {1.0, {}, 1.45}};
  double worst = 0.0;
  for (const FilmStack& st : stacks) {
    for (double c = 0.001; c <= 1.0; c += 0.0137) {
      for (Incidence side : {Incidence::from_a, Incidence::from_b}) {
        const cplx n_in = side == Incidence::from_a ? st.n_a.real() : st.n_b.real();
        const cplx n_out = side == Incidence::from_a ? st.n_b : st.n_a;
        const FresnelAmplitudes f = fresnel_amplitudes(n_in, n_out, c);
        const StackResponse r = solve_stack(st, 600.0, c, side);
        worst = std::max({worst, std::abs(r.s.r - f.rs), std::abs(r.p.r - f.rp),
                          std::abs(r.s.t - f.ts), std::abs(r.p.t - f.tp)});
        EXPECT_NEAR(r.s.R, std::norm(f.rs), 1e-14);
        EXPECT_NEAR(r.p.R, std::norm(f.rp), 1e-14);
        EXPECT_TRUE(r.s.A.empty());
      }
    }
  }
  // Round-off only (the p coefficients are evaluated as (γa - γb)/(γa + γb)
  // with γ = n cos θ / n² rather than in the fresnel.hpp form).
  EXPECT_LT(worst, 1e-14);
}

// A layer of zero thickness is invisible: its matrix is the identity.
TEST(ThinFilmStack, ZeroThicknessLayerIsInvisible) {
  const FilmStack bare{1.0, {{2.0, 75.0}}, cplx(3.9, 0.02)};
  const FilmStack with{1.0, {{cplx(4.0, 0.5), 0.0}, {2.0, 75.0}, {cplx(1.2, 7.0), 0.0}},
                       cplx(3.9, 0.02)};
  for (double c : {1.0, 0.7, 0.2}) {
    for (Incidence side : {Incidence::from_a, Incidence::from_b}) {
      const StackResponse a = solve_stack(bare, 700.0, c, side);
      const StackResponse b = solve_stack(with, 700.0, c, side);
      EXPECT_NEAR(std::abs(a.s.r - b.s.r), 0.0, 1e-15);
      EXPECT_NEAR(std::abs(a.p.r - b.p.r), 0.0, 1e-15);
      EXPECT_NEAR(std::abs(a.s.t - b.s.t), 0.0, 1e-15);
      EXPECT_NEAR(std::abs(a.p.t - b.p.t), 0.0, 1e-15);
      ASSERT_EQ(b.s.A.size(), 3u);
      EXPECT_EQ(b.s.A[0], 0.0);
      EXPECT_EQ(b.p.A[2], 0.0);
      EXPECT_NEAR(b.s.A[1], a.s.A[0], 1e-15);
      EXPECT_NEAR(b.p.A[1], a.p.A[0], 1e-15);
    }
  }
}

// Quarter-wave antireflection layer of index sqrt(n0 n2) and optical
// thickness λ/4: R = 0 at the design wavelength, normal incidence
// (H. A. Macleod, Thin-Film Optical Filters, 4th ed., 2010).
TEST(ThinFilmStack, QuarterWaveAntireflection) {
  for (double n2 : {1.52, 3.5, 4.3}) {
    const double lambda = 600.0, n1 = std::sqrt(n2);
    const FilmStack st{1.0, {{n1, lambda / (4.0 * n1)}}, n2};
    const StackResponse r = solve_stack(st, lambda, 1.0, Incidence::from_a);
    EXPECT_LT(r.s.R, 1e-10);
    EXPECT_LT(r.p.R, 1e-10);
    EXPECT_NEAR(r.s.T, 1.0, 1e-10);
    // Away from the design wavelength the layer reflects.
    EXPECT_GT(solve_stack(st, 2.0 * lambda, 1.0, Incidence::from_a).s.R, 1e-3);
  }
}

// One absorbing film against the independent Airy formula above, all
// angles, both polarizations, with an absorbing exit medium.
TEST(ThinFilmStack, SingleFilmMatchesAiryFormula) {
  const double n0 = 1.0, lambda = 550.0, d = 75.0;
  const cplx n1(2.0, 0.05), n2(3.9, 0.02);
  const FilmStack st{n0, {{n1, d}}, n2};
  for (double c = 0.01; c <= 1.0; c += 0.01) {
    const Airy a = airy_single_film(n0, n1, d, n2, lambda, c);
    const StackResponse r = solve_stack(st, lambda, c, Incidence::from_a);
    EXPECT_NEAR(std::abs(r.s.r - a.rs), 0.0, 1e-13) << c;
    EXPECT_NEAR(std::abs(r.p.r - a.rp), 0.0, 1e-13) << c;
    EXPECT_NEAR(std::abs(r.s.t - a.ts), 0.0, 1e-13) << c;
    EXPECT_NEAR(std::abs(r.p.t - a.tp), 0.0, 1e-13) << c;
    // T into an absorbing exit medium: Re(n2 cos θ2) |t_s|² and
    // Re(n2 conj(cos θ2)) |t_p|² over n0 cos θ0 (common practice).
    const cplx c2 = cos_refracted(n0, n2, c);
    EXPECT_NEAR(r.s.T, (n2 * c2).real() / (n0 * c) * std::norm(a.ts), 1e-13);
    EXPECT_NEAR(r.p.T, (n2 * std::conj(c2)).real() / (n0 * c) * std::norm(a.tp), 1e-13);
    EXPECT_GT(r.s.A[0], 0.0);
    EXPECT_GT(r.p.A[0], 0.0);
  }
}

// Energy conservation R + T + ΣA = 1 for random absorbing stacks, absorbing
// and lossless exit media, both sides, all angles including beyond the
// critical angle (common practice: Poynting's theorem).
TEST(ThinFilmStack, EnergyConservationRandomStacks) {
  std::mt19937_64 rng(2024);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  double worst = 0.0;
  int beyond_critical_with_absorption = 0;
  for (int trial = 0; trial < 400; ++trial) {
    FilmStack st;
    st.n_a = cplx(1.0 + 0.6 * u(rng), trial % 5 == 0 ? 0.1 * u(rng) : 0.0);
    st.n_b = cplx(1.0 + 3.0 * u(rng), trial % 3 == 0 ? 0.0 : (trial % 3 == 1 ? 0.05 * u(rng) : 8.0 * u(rng)));
    const int layers = static_cast<int>(6 * u(rng));
    for (int j = 0; j < layers; ++j) {
      const double k = u(rng) < 0.3 ? 0.0 : (u(rng) < 0.7 ? 0.3 * u(rng) : 7.0 * u(rng));
      st.layers.push_back({cplx(0.1 + 4.0 * u(rng), k), 400.0 * u(rng) * u(rng)});
    }
    const double lambda = 300.0 + 900.0 * u(rng);
    for (double c = 0.0; c <= 1.0; c += 1.0 / 64) {
      for (Incidence side : {Incidence::from_a, Incidence::from_b}) {
        const StackResponse r = solve_stack(st, lambda, c, side);
        for (const PolarizedResponse* p : {&r.s, &r.p}) {
          worst = std::max(worst, std::abs(balance(*p)));
          ASSERT_NEAR(balance(*p), 0.0, 1e-10) << trial << " c=" << c;
          EXPECT_GE(p->T, -1e-12);
          EXPECT_LE(p->R, 1.0 + 1e-12);
          for (double a : p->A) EXPECT_GE(a, -1e-12);
        }
        // Beyond the critical angle into a lossless exit medium: T = 0, but
        // absorbing films still absorb.
        const double n_in = side == Incidence::from_a ? st.n_a.real() : st.n_b.real();
        const cplx n_out = side == Incidence::from_a ? st.n_b : st.n_a;
        if (n_out.imag() == 0.0 && n_in * std::sqrt(1.0 - c * c) > n_out.real()) {
          EXPECT_EQ(r.s.T, 0.0);
          EXPECT_EQ(r.p.T, 0.0);
          if (sum_A(r.s) > 1e-6) ++beyond_critical_with_absorption;
        }
      }
    }
  }
  EXPECT_GT(beyond_critical_with_absorption, 100);  // the case was exercised
  RecordProperty("worst_energy_balance", std::to_string(worst));
}

// Total internal reflection, silicon (n = 3.5) to air beyond the critical
// angle: R = 1 and T = 0 for a lossless stack (Born & Wolf 1999, §1.5.4);
// with an absorbing film T stays 0 but the film absorbs (frustrated by loss).
TEST(ThinFilmStack, TotalInternalReflectionFromSilicon) {
  const FilmStack lossless{1.0, {{2.0, 75.0}, {1.45, 120.0}}, 3.5};
  const FilmStack lossy{1.0, {{cplx(2.0, 0.05), 75.0}}, 3.5};
  const double cos_critical = std::sqrt(1.0 - 1.0 / (3.5 * 3.5));
  for (double c = 0.0; c < cos_critical - 1e-9; c += cos_critical / 200) {
    const StackResponse r = solve_stack(lossless, 800.0, c, Incidence::from_b);
    EXPECT_NEAR(r.s.R, 1.0, 1e-12) << c;
    EXPECT_NEAR(r.p.R, 1.0, 1e-12) << c;
    EXPECT_EQ(r.s.T, 0.0);
    EXPECT_EQ(r.p.T, 0.0);
    const StackResponse a = solve_stack(lossy, 800.0, c, Incidence::from_b);
    EXPECT_EQ(a.s.T, 0.0);
    EXPECT_EQ(a.p.T, 0.0);
    if (c > 0.0) {
      EXPECT_GT(a.s.A[0], 1e-6);
      EXPECT_GT(a.p.A[0], 1e-6);
    }
    EXPECT_NEAR(balance(a.s), 0.0, 1e-12);
    EXPECT_NEAR(balance(a.p), 0.0, 1e-12);
  }
  // Below the critical angle light escapes.
  EXPECT_GT(solve_stack(lossless, 800.0, 1.0, Incidence::from_b).s.T, 0.5);
}

// Reciprocity of transmission: T(a → b at θa) = T(b → a at θb) with
// n_a sin θa = n_b sin θb, for lossless outer media and any passive stack
// (Stokes relations / reciprocity theorem; Born & Wolf, Principles of
// Optics, 1999; H. A. Macleod, Thin-Film Optical Filters, 2010).
TEST(ThinFilmStack, TransmissionReciprocity) {
  const FilmStack stacks[] = {
      {1.0, {{2.0, 75.0}, {1.45, 100.0}, {2.3, 40.0}}, 3.5},    // lossless
      {1.5, {{cplx(2.0, 0.05), 80.0}, {cplx(0.2, 3.0), 10.0}}, 3.9}};  // absorbing films
  for (const FilmStack& st : stacks) {
    for (double ca = 0.02; ca <= 1.0; ca += 0.02) {
      const double sb = st.n_a.real() * std::sqrt(1.0 - ca * ca) / st.n_b.real();
      const double cb = std::sqrt(1.0 - sb * sb);
      const StackResponse fa = solve_stack(st, 650.0, ca, Incidence::from_a);
      const StackResponse fb = solve_stack(st, 650.0, cb, Incidence::from_b);
      EXPECT_NEAR(fa.s.T, fb.s.T, 1e-12) << ca;
      EXPECT_NEAR(fa.p.T, fb.p.T, 1e-12) << ca;
    }
  }
}

// Incidence from b equals incidence from a on the mirrored stack, with A
// reported in FilmStack order.
TEST(ThinFilmStack, FromBIsMirroredStack) {
  const FilmStack st{cplx(1.0, 0.0), {{cplx(2.0, 0.1), 60.0}, {1.45, 90.0}, {cplx(3.0, 1.0), 20.0}},
                     cplx(3.9, 0.0)};
  FilmStack mirrored{st.n_b, {st.layers.rbegin(), st.layers.rend()}, st.n_a};
  for (double c : {1.0, 0.8, 0.3}) {
    const StackResponse b = solve_stack(st, 500.0, c, Incidence::from_b);
    const StackResponse m = solve_stack(mirrored, 500.0, c, Incidence::from_a);
    EXPECT_EQ(b.s.r, m.s.r);
    EXPECT_EQ(b.p.t, m.p.t);
    for (std::size_t j = 0; j < 3; ++j) {
      EXPECT_EQ(b.s.A[j], m.s.A[2 - j]);
      EXPECT_EQ(b.p.A[j], m.p.A[2 - j]);
    }
    EXPECT_GT(b.s.A[0], 0.0);
    EXPECT_NEAR(b.s.A[1], 0.0, 1e-14);  // the lossless middle layer absorbs nothing
  }
}

// A thick metal layer (5 µm of n = 1.2 + 7i at 300 nm, Im δ ≈ 700) must not
// overflow: the transmission vanishes, everything else is finite.
TEST(ThinFilmStack, ThickAbsorberDoesNotOverflow) {
  const FilmStack st{1.0, {{cplx(1.2, 7.0), 5000.0}, {1.45, 100.0}}, 3.9};
  for (double c : {1.0, 0.5, 0.05}) {
    for (Incidence side : {Incidence::from_a, Incidence::from_b}) {
      const StackResponse r = solve_stack(st, 300.0, c, side);
      for (const PolarizedResponse* p : {&r.s, &r.p}) {
        EXPECT_TRUE(std::isfinite(p->R));
        EXPECT_LT(p->T, 1e-300);
        EXPECT_NEAR(balance(*p), 0.0, 1e-12);
        EXPECT_TRUE(std::isfinite(std::abs(p->t)));
      }
    }
  }
}

// Grazing incidence (cos = 0) is the documented limit, and solve_stack
// approaches it continuously.
TEST(ThinFilmStack, GrazingLimit) {
  const FilmStack st{1.0, {{cplx(2.0, 0.05), 75.0}}, cplx(3.9, 0.02)};
  const StackResponse g = solve_stack(st, 600.0, 0.0, Incidence::from_a);
  EXPECT_EQ(g.s.r, cplx(-1.0));
  EXPECT_EQ(g.p.r, cplx(-1.0));
  EXPECT_EQ(g.s.R, 1.0);
  EXPECT_EQ(g.p.T, 0.0);
  EXPECT_EQ(g.s.A[0], 0.0);
  const StackResponse near = solve_stack(st, 600.0, 1e-7, Incidence::from_a);
  EXPECT_NEAR(std::abs(near.s.r + 1.0), 0.0, 1e-5);
  EXPECT_NEAR(std::abs(near.p.r + 1.0), 0.0, 1e-5);
  EXPECT_NEAR(near.s.R, 1.0, 1e-5);
}

TEST(ThinFilmStack, RejectsInvalidInput) {
  const FilmStack ok{1.0, {{2.0, 75.0}}, 3.9};
  EXPECT_THROW(solve_stack(ok, 600.0, 1.5, Incidence::from_a), std::invalid_argument);
  EXPECT_THROW(solve_stack(ok, 600.0, -0.1, Incidence::from_a), std::invalid_argument);
  EXPECT_THROW(solve_stack(ok, 0.0, 0.5, Incidence::from_a), std::invalid_argument);
  FilmStack bad = ok;
  bad.layers[0].thickness_nm = -1.0;
  EXPECT_THROW(solve_stack(bad, 600.0, 0.5, Incidence::from_a), std::invalid_argument);
  bad = ok;
  bad.layers[0].n = cplx(2.0, -0.1);
  EXPECT_THROW(solve_stack(bad, 600.0, 0.5, Incidence::from_a), std::invalid_argument);
  try {
    solve_stack(bad, 600.0, 0.5, Incidence::from_a);
  } catch (const std::invalid_argument& e) {
    EXPECT_NE(std::string(e.what()).find("layer 0"), std::string::npos) << e.what();
  }
}

}  // namespace
}  // namespace lumtrap
