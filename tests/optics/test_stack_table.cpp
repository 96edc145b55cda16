// Tabulated film-stack responses (src/optics/stack_table.hpp): exactness at
// the nodes, clamping, energy bookkeeping of the interpolated values, layer
// picking, and the interpolation error against solve_stack.
#include "optics/stack_table.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <random>
#include <stdexcept>
#include <string>
#include <vector>

namespace lumtrap {
namespace {

// Realistic constant indices (written here, not read from tables): SiNx
// n = 2.0 + 0.01i, crystalline Si n = 3.9 + 0.02i, SiO2 n = 1.45, Al-like
// metal n = 1.2 + 7i (representative visible values, from memory).
const cplx kSi(3.9, 0.02), kSiNx(2.0, 0.01), kSiO2(1.45, 0.0), kAl(1.2, 7.0);

FilmStack nitride_on_silicon() { return {1.0, {{kSiNx, 75.0}}, kSi}; }
FilmStack oxide_aluminium_rear() { return {kSi, {{kSiO2, 100.0}}, kAl}; }

// Largest deviations of the table from solve_stack over a set of cosines.
struct Deviation {
  double R = 0, T = 0, r = 0, t = 0, A = 0;
};

void accumulate(Deviation& d, const StackTable& table, const FilmStack& st, double lambda,
                Incidence side, double c) {
  const StackResponse x = solve_stack(st, lambda, c, side);
  const InterfaceResponse i = table.at(c);
  d.R = std::max({d.R, std::abs(i.Rs - x.s.R), std::abs(i.Rp - x.p.R)});
  d.T = std::max({d.T, std::abs(i.Ts - x.s.T), std::abs(i.Tp - x.p.T)});
  d.r = std::max({d.r, std::abs(std::abs(i.rs) - std::abs(x.s.r)),
                  std::abs(std::abs(i.rp) - std::abs(x.p.r))});
  d.t = std::max({d.t, std::abs(std::abs(i.ts) - std::abs(x.s.t)),
                  std::abs(std::abs(i.tp) - std::abs(x.p.t))});
  std::vector<double> As(table.layers), Ap(table.layers);
  table.layer_absorptance(c, As.data(), Ap.data());
  for (int j = 0; j < table.layers; ++j)
    d.A = std::max({d.A, std::abs(As[j] - x.s.A[j]), std::abs(Ap[j] - x.p.A[j])});
}

// Dense probe set: a quarter, half and three quarters into every cell of the
// uniform grid (linear interpolation errs most inside a cell), 2000 random
// cosines, and 4000 cosines within ±0.02 of `focus` (when focus >= 0).
std::vector<double> probe_cosines(int samples, double focus) {
  std::vector<double> c;
  for (int k = 0; k + 1 < samples; ++k)
    for (double f : {0.25, 0.5, 0.75}) c.push_back((k + f) / (samples - 1));
  std::mt19937_64 rng(99);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  for (int i = 0; i < 2000; ++i) c.push_back(u(rng));
  if (focus >= 0.0)
    for (int i = 0; i < 4000; ++i) c.push_back(std::clamp(focus + 0.04 * (u(rng) - 0.5), 0.0, 1.0));
  return c;
}

TEST(StackTable, NodesReproduceSolveStack) {
  const FilmStack st = nitride_on_silicon();
  const StackTable t = tabulate_stack(st, 600.0, Incidence::from_a, 1025);
  ASSERT_EQ(t.samples, 1025);
  ASSERT_EQ(t.layers, 1);
  ASSERT_EQ(t.response.size(), 1025u);
  EXPECT_LT(t.cos_critical, 0.0);  // air → nothing beyond a critical angle into Si
  for (int k : {1, 100, 512, 1000, 1024}) {
    const double c = k / 1024.0;  // exact in binary
    const StackResponse x = solve_stack(st, 600.0, c, Incidence::from_a);
    const InterfaceResponse i = t.at(c);
    EXPECT_EQ(i.Rs, x.s.R);
    EXPECT_EQ(i.Tp, x.p.T);
    EXPECT_EQ(i.rp, x.p.r);
    EXPECT_EQ(i.ts, x.s.t);
  }
  // k = 0 is the grazing limit.
  EXPECT_EQ(t.at(0.0).Rs, 1.0);
  EXPECT_EQ(t.at(0.0).Tp, 0.0);
}

TEST(StackTable, ClampsOutOfRangeCosines) {
  const StackTable t = tabulate_stack(nitride_on_silicon(), 600.0, Incidence::from_b, 257);
  EXPECT_EQ(t.at(-0.3).Rs, t.at(0.0).Rs);
  EXPECT_EQ(t.at(1.7).Tp, t.at(1.0).Tp);
  EXPECT_EQ(t.at(1.0 + 1e-12).rs, t.at(1.0).rs);
  EXPECT_EQ(t.pick_absorbing_layer(2.0, 0.5, 0.5, 0.3), t.pick_absorbing_layer(1.0, 0.5, 0.5, 0.3));
}

// Linear interpolation keeps R + T + ΣA = 1 (all three are interpolated with
// the same weights), including in the critical-angle refinement.
TEST(StackTable, InterpolatedValuesConserveEnergy) {
  const FilmStack st{1.0, {{kSiNx, 75.0}, {cplx(1.5, 0.3), 20.0}}, kSi};
  const StackTable t = tabulate_stack(st, 500.0, Incidence::from_b, 1025);
  ASSERT_GT(t.cos_critical, 0.0);
  std::mt19937_64 rng(3);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  for (int i = 0; i < 20000; ++i) {
    const double c = i % 2 ? u(rng) : t.cos_critical + 0.1 * (u(rng) - 0.5);
    const InterfaceResponse r = t.at(c);
    double As[2], Ap[2];
    t.layer_absorptance(c, As, Ap);
    EXPECT_NEAR(r.Rs + r.Ts + As[0] + As[1], 1.0, 1e-12);
    EXPECT_NEAR(r.Rp + r.Tp + Ap[0] + Ap[1], 1.0, 1e-12);
  }
}

// Interpolation error against solve_stack, 1025 samples. The error of linear
// interpolation is at most h²/8 max|f''| with h = 1/1024; the measured
// maxima (this code, λ = 400/600/900/1100 nm) are given beside each
// bound, which leaves a factor >= 2 of margin.
TEST(StackTable, InterpolationErrorNitrideFromAir) {
  const FilmStack st = nitride_on_silicon();
  for (double lambda : {400.0, 600.0, 900.0, 1100.0}) {
    const StackTable t = tabulate_stack(st, lambda, Incidence::from_a);
    Deviation d;
    for (double c : probe_cosines(t.samples, -1.0)) accumulate(d, t, st, lambda, Incidence::from_a, c);
    EXPECT_LT(d.R, 2e-5) << lambda;  // measured 8.2e-6
    EXPECT_LT(d.T, 2e-5) << lambda;  // measured 8.2e-6
    EXPECT_LT(d.r, 5e-6) << lambda;  // measured 1.4e-6
    EXPECT_LT(d.t, 2e-6) << lambda;  // measured 7.3e-7
    EXPECT_LT(d.A, 5e-7) << lambda;  // measured 1.5e-7
  }
}

// From the silicon side the exit medium (air) has a critical angle at
// cos θ_c = sqrt(1 - 1/3.9²) = 0.96657 (Snell, common practice). Without the
// refinement in w the error there reached 0.37 in T (T_p rises from 0 to 0.69
// within Δcos = 1e-3); with it the whole range stays below 1e-3.
TEST(StackTable, InterpolationErrorNitrideFromSiliconAcrossCriticalAngle) {
  const FilmStack st = nitride_on_silicon();
  const double cc = std::sqrt(1.0 - 1.0 / (3.9 * 3.9));
  for (double lambda : {400.0, 600.0, 900.0, 1100.0}) {
    const StackTable t = tabulate_stack(st, lambda, Incidence::from_b);
    EXPECT_NEAR(t.cos_critical, cc, 1e-15);
    Deviation near, far;
    for (double c : probe_cosines(t.samples, cc))
      accumulate(std::abs(c - cc) < 0.05 ? near : far, t, st, lambda, Incidence::from_b, c);
    // within ±0.05 of the critical angle (refined grid)
    EXPECT_LT(near.R, 3e-4) << lambda;  // measured 1.2e-4
    EXPECT_LT(near.T, 3e-4) << lambda;  // measured 1.3e-4
    EXPECT_LT(near.r, 3e-4) << lambda;  // measured 9.6e-5
    EXPECT_LT(near.t, 1e-3) << lambda;  // measured 3.1e-4
    EXPECT_LT(near.A, 2e-5) << lambda;  // measured 4.2e-6
    // elsewhere (total internal reflection, uniform grid)
    EXPECT_LT(far.R, 5e-5) << lambda;   // measured 1.2e-5
    EXPECT_EQ(far.T, 0.0) << lambda;    // T = 0 beyond the critical angle
    EXPECT_LT(far.r, 1e-3) << lambda;   // measured 2.7e-4
    EXPECT_LT(far.t, 5e-4) << lambda;   // measured 1.5e-4
    EXPECT_LT(far.A, 5e-5) << lambda;   // measured 1.2e-5
  }
}

// Rear: Si | 100 nm SiO2 | Al from the silicon. Beyond the SiO2 critical
// angle (cos < 0.928) p light tunnels through the oxide to the metal's
// surface plasmon (attenuated total reflection, common practice): a sharp
// dip in R_p that sets this stack's bound (worst at λ = 400 nm, cos ≈ 0.923).
TEST(StackTable, InterpolationErrorOxideAluminiumRear) {
  const FilmStack st = oxide_aluminium_rear();
  for (double lambda : {400.0, 600.0, 900.0, 1100.0}) {
    const StackTable t = tabulate_stack(st, lambda, Incidence::from_a);
    EXPECT_LT(t.cos_critical, 0.0);  // absorbing exit medium: no branch point
    Deviation d;
    for (double c : probe_cosines(t.samples, 0.923))
      accumulate(d, t, st, lambda, Incidence::from_a, c);
    EXPECT_LT(d.R, 3e-3) << lambda;   // measured 1.2e-3 (400 nm), 1.4e-4 (900 nm)
    EXPECT_LT(d.T, 3e-3) << lambda;   // measured 1.2e-3
    EXPECT_LT(d.r, 8e-3) << lambda;   // measured 3.6e-3 (|r_p| has a V-shaped minimum)
    EXPECT_LT(d.t, 6e-3) << lambda;   // measured 2.7e-3
    EXPECT_LT(d.A, 1e-12) << lambda;  // the oxide is lossless: A = 0 to round-off
  }
}

TEST(StackTable, PickAbsorbingLayerFollowsShares) {
  // Two absorbing layers around a lossless one.
  const FilmStack st{1.0, {{cplx(2.0, 0.1), 40.0}, {1.45, 50.0}, {cplx(1.2, 7.0), 5.0}}, kSi};
  const StackTable t = tabulate_stack(st, 550.0, Incidence::from_a, 513);
  const double c = 0.7, ws = 0.3, wp = 0.7;
  double As[3], Ap[3];
  t.layer_absorptance(c, As, Ap);
  double share[3], total = 0.0;
  for (int j = 0; j < 3; ++j) total += share[j] = ws * As[j] + wp * Ap[j];
  ASSERT_GT(share[0], 0.01);
  ASSERT_GT(share[2], 0.01);
  int count[3] = {0, 0, 0};
  const int n = 100000;
  for (int i = 0; i < n; ++i) {
    const int j = t.pick_absorbing_layer(c, ws, wp, (i + 0.5) / n);
    ASSERT_GE(j, 0);
    ASSERT_LT(j, 3);
    ++count[j];
  }
  EXPECT_EQ(count[1], 0);  // the lossless layer is never chosen
  EXPECT_NEAR(count[0] / double(n), share[0] / total, 2.0 / n);
  EXPECT_NEAR(count[2] / double(n), share[2] / total, 2.0 / n);
  // xi just below 1 still picks a layer that absorbs.
  EXPECT_EQ(t.pick_absorbing_layer(c, ws, wp, std::nextafter(1.0, 0.0)), 2);

  // Documented special cases.
  const StackTable bare = tabulate_stack({1.0, {}, kSi}, 550.0, Incidence::from_a, 17);
  EXPECT_EQ(bare.pick_absorbing_layer(0.5, 0.5, 0.5, 0.5), -1);
  const StackTable lossless = tabulate_stack({1.0, {{2.0, 70.0}, {1.45, 20.0}}, 3.5}, 550.0,
                                             Incidence::from_a, 17);
  EXPECT_EQ(lossless.pick_absorbing_layer(0.5, 0.5, 0.5, 0.5), 0);
}

TEST(StackTable, RejectsTooFewSamples) {
  EXPECT_THROW(tabulate_stack(nitride_on_silicon(), 600.0, Incidence::from_a, 1),
               std::invalid_argument);
  const StackTable two = tabulate_stack(nitride_on_silicon(), 600.0, Incidence::from_a, 2);
  EXPECT_EQ(two.response.size(), 2u);
}

}  // namespace
}  // namespace lumtrap
