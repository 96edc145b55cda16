// Dispersion formulas (optics/dispersion.hpp): Tauc-Lorentz ε1 against a
// numerical Kramers-Kronig transform of ε2, Drude against hand evaluation,
// Sellmeier against the shipped fused-silica table, Cauchy by hand, doped
// silicon by hand, sampling into Material tables and the refusals.
#include "optics/dispersion.hpp"

#include <numbers>
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

using namespace lumtrap;
using ::testing::HasSubstr;

namespace {


/// Gauss–Legendre nodes and weights on [-1, 1] computed here by Newton's
/// method on the Legendre recurrence (common practice; independent of the
/// library's tabulated rules).
struct GaussRule {
  std::vector<double> x, w;
};

GaussRule gauss_legendre(int n) {
  GaussRule r;
  r.x.resize(n);
  r.w.resize(n);
  for (int i = 0; i < n; ++i) {
    double x = std::cos(std::numbers::pi * (i + 0.75) / (n + 0.5));
    double dp = 0.0;
    for (int it = 0; it < 100; ++it) {
      double p0 = 1.0, p1 = x;
      for (int k = 2; k <= n; ++k) {
        const double p2 = ((2.0 * k - 1.0) * x * p1 - (k - 1.0) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      dp = n * (x * p1 - p0) / (x * x - 1.0);
      const double dx = p1 / dp;
      x -= dx;
      if (std::abs(dx) < 1e-16) break;
    }
    r.x[i] = x;
    r.w[i] = 2.0 / ((1.0 - x * x) * dp * dp);
  }
  return r;
}

/// ∫_a^b f by `panels` equal panels of the rule.
template <class F>
double integrate(const GaussRule& g, F f, double a, double b, int panels) {
  double sum = 0.0;
  const double w = (b - a) / panels;
  for (int j = 0; j < panels; ++j) {
    const double c = a + (j + 0.5) * w, h = 0.5 * w;
    for (std::size_t i = 0; i < g.x.size(); ++i) sum += h * g.w[i] * f(c + h * g.x[i]);
  }
  return sum;
}

/// ε1(E) - ε_inf = (2/π) P∫_Eg^∞ ξ ε2(ξ) / (ξ² - E²) dξ (Kramers-Kronig;
/// e.g. F. Wooten, Optical Properties of Solids, 1972, ch. 6), evaluated by
/// singularity subtraction: with g(ξ) = (2/π) ξ ε2(ξ),
///   P∫ g/(ξ² - E²) = ∫ (g(ξ) - g(E))/(ξ² - E²) dξ + g(E) · (1/2E) ln((E + Eg)/|E - Eg|).
/// The regular integrand is integrated on [Eg, X] with panel edges at E and
/// E0 (so that no node hits the removable point), and on [X, ∞) with ξ = X/t.
double kramers_kronig_eps1(const TaucLorentzOscillator& o, double E) {
  static const GaussRule g20 = gauss_legendre(20);
  const double Eg = o.Eg_eV;
  const auto g = [&](double xi) { return xi > 0.0 ? 2.0 / std::numbers::pi * xi * tauc_lorentz_eps2(o, xi) : 0.0; };
  const double gE = g(E);
  const auto regular = [&](double xi) { return (g(xi) - gE) / (xi * xi - E * E); };
  const double X = 200.0;  // eV
  std::vector<double> edges{Eg, X};
  for (double b : {E, o.E0_eV, 2.0 * o.E0_eV, 10.0, 40.0})
    if (b > Eg && b < X) edges.push_back(b);
  std::sort(edges.begin(), edges.end());
  double sum = 0.0;
  for (std::size_t i = 0; i + 1 < edges.size(); ++i)
    if (edges[i + 1] > edges[i]) sum += integrate(g20, regular, edges[i], edges[i + 1], 400);
  // tail ξ = X/t, dξ = X/t² dt
  sum += integrate(
      g20, [&](double t) { return (g(X / t) - gE) * X / (X * X - E * E * t * t); }, 0.0, 1.0, 200);
  if (gE != 0.0) sum += gE / (2.0 * E) * std::log((E + Eg) / std::abs(E - Eg));
  return sum;
}

DispersionFormula formula(DispersionModel model, double lo = 300.0, double hi = 1200.0) {
  DispersionFormula f;
  f.name = "test";
  f.model = std::move(model);
  f.min_wavelength_nm = lo;
  f.max_wavelength_nm = hi;
  return f;
}

std::string error_of(const DispersionFormula& f) {
  try {
    formula_material(f);
  } catch (const DispersionError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

// ---------------------------------------------------------------------------
// Tauc-Lorentz

TEST(TaucLorentz, ClosedFormEps1MatchesNumericalKramersKronig) {
  // Parameter sets: typical amorphous-film values; the a-Si set of Jellison
  // and Modine, Appl. Phys. Lett. 69, 371 (1996) (A = 122, E0 = 3.45,
  // C = 2.54, Eg = 1.20 eV; from memory); Eg > E0; C > sqrt(2)·E0 (γ² < 0);
  // Eg = 0.
  const std::vector<TaucLorentzOscillator> sets = {{100.0, 3.6, 2.4, 1.6},
                                                   {122.0, 3.45, 2.54, 1.20},
                                                   {50.0, 2.0, 1.0, 3.0},
                                                   {80.0, 3.0, 5.0, 1.2},
                                                   {30.0, 4.0, 1.0, 0.0}};
  double worst = 0.0;
  for (const TaucLorentzOscillator& o : sets) {
    for (double E : {0.3, 0.8, 1.2, 1.6, 2.0, 3.0, 3.45, 3.6, 5.0, 8.0, 20.0}) {
      const double closed = tauc_lorentz_epsilon(o, E).real();
      const double numeric = kramers_kronig_eps1(o, E);
      worst = std::max(worst, std::abs(closed - numeric));
      // Tolerance 1e-10 absolute (ε1 - ε_inf is of order 0.1–20 here); the
      // two agree to ~1e-13.
      EXPECT_NEAR(closed, numeric, 1e-10) << "A=" << o.A_eV << " E0=" << o.E0_eV << " C=" << o.C_eV
                                         << " Eg=" << o.Eg_eV << " E=" << E;
    }
  }
  std::printf("Tauc-Lorentz closed form vs numerical KK: max |Δε1| = %.2e\n", worst);
}

TEST(TaucLorentz, Eps2ZeroBelowGapPositiveAbove) {
  const TaucLorentzOscillator o{100.0, 3.6, 2.4, 1.6};
  for (double E : {0.1, 0.5, 1.0, 1.59, 1.6}) EXPECT_EQ(tauc_lorentz_eps2(o, E), 0.0) << E;
  for (double E : {1.61, 2.0, 3.6, 6.0}) EXPECT_GT(tauc_lorentz_eps2(o, E), 0.0) << E;
  // ε2 by hand at E = E0 = 3.6 eV: A E0 C (E0 - Eg)² / (C² E0²) / E0
  //   = 100 · 3.6 · 2.4 · 2.0² / (2.4² · 3.6²) / 3.6 = 3456 / 74.6496 / 3.6 = 12.860082...
  EXPECT_NEAR(tauc_lorentz_eps2(o, 3.6), 100.0 * 2.0 * 2.0 / (2.4 * 3.6 * 3.6), 1e-12);
  // Finite at E = Eg (the ln|E - Eg| terms cancel there) and continuous.
  const double at = tauc_lorentz_epsilon(o, 1.6).real();
  EXPECT_TRUE(std::isfinite(at));
  EXPECT_NEAR(at, tauc_lorentz_epsilon(o, 1.6 + 1e-7).real(), 1e-5);
  EXPECT_NEAR(at, tauc_lorentz_epsilon(o, 1.6 - 1e-7).real(), 1e-5);
}

TEST(TaucLorentz, SampledTableHasPositiveIndexAndZeroKBelowGap) {
  const DispersionFormula f = formula(TaucLorentzFormula{1.0, {100.0, 3.6, 2.4, 1.6}}, 250.0, 2000.0);
  const Material m = formula_material(f);
  ASSERT_EQ(m.wavelength_nm.size(), 1751u);
  const double gap_nm = kPlanckSpeedOfLight_eV_nm / 1.6;  // 774.9 nm
  for (std::size_t i = 0; i < m.n.size(); ++i) {
    EXPECT_GT(m.n[i], 0.0);
    if (m.wavelength_nm[i] >= gap_nm) {
      EXPECT_EQ(m.k[i], 0.0) << m.wavelength_nm[i];
    } else {
      EXPECT_GT(m.k[i], 0.0) << m.wavelength_nm[i];
    }
  }
}

TEST(TaucLorentz, ParameterChecksSayWhatIsAllowed) {
  const auto msg = [](TaucLorentzOscillator o) {
    try {
      check_tauc_lorentz(o);
    } catch (const DispersionError& e) {
      return std::string(e.what()) + " [" + e.parameter + "]";
    }
    return std::string();
  };
  EXPECT_THAT(msg({100, 3.6, 7.2, 1.6}), HasSubstr("C = 7.2 eV must lie in (0, 2·E0) = (0, 7.2) eV"));
  EXPECT_THAT(msg({100, 3.6, 7.2, 1.6}), HasSubstr("[C]"));
  EXPECT_THAT(msg({-1, 3.6, 2, 1.6}), HasSubstr("A = -1 eV must be finite and > 0"));
  EXPECT_THAT(msg({100, 3.6, 2, -0.1}), HasSubstr("Eg = -0.1 eV must be finite and >= 0"));
  EXPECT_THAT(msg({100, 3.6, 2, -0.1}), HasSubstr("Eg > E0 is allowed"));
  EXPECT_EQ(msg({100, 3.6, 2, 5.0}), "");  // Eg > E0 accepted
  EXPECT_THAT(error_of(formula(TaucLorentzFormula{0.0, {100.0, 3.6, 2.4, 1.6}})),
              HasSubstr("eps_inf = 0 is not allowed"));
}

// ---------------------------------------------------------------------------
// Drude

TEST(Drude, EpsilonAgainstHandEvaluation) {
  // ε = ε_inf - Ep²/(E² + iΓE) with ε_inf = 1, Ep = 1 eV, Γ = 0.1 eV. By hand:
  //  E = 0.5: -1/(0.25 + 0.05i) = -(0.25 - 0.05i)/0.065 = -3.8461538 + 0.7692308i
  //  E = 1.0: -1/(1 + 0.1i)     = -(1 - 0.1i)/1.01     = -0.9900990 + 0.0990099i
  //  E = 2.0: -1/(4 + 0.2i)     = -(4 - 0.2i)/16.04    = -0.2493766 + 0.0124688i
  const DrudeTerm d{1.0, 0.1};
  const struct {
    double E, re, im;
  } hand[] = {{0.5, 1.0 - 0.25 / 0.065, 0.05 / 0.065},
              {1.0, 1.0 - 1.0 / 1.01, 0.1 / 1.01},
              {2.0, 1.0 - 4.0 / 16.04, 0.2 / 16.04}};
  const DispersionFormula f = formula(DrudeFormula{1.0, d}, 400.0, 4000.0);
  for (const auto& h : hand) {
    const cplx eps = 1.0 + drude_epsilon(d, h.E);
    EXPECT_NEAR(eps.real(), h.re, 1e-14) << h.E;
    EXPECT_NEAR(eps.imag(), h.im, 1e-14) << h.E;
    const cplx via_formula = dielectric_function(f, kPlanckSpeedOfLight_eV_nm / h.E);
    EXPECT_NEAR(via_formula.real(), h.re, 1e-12);
    EXPECT_NEAR(via_formula.imag(), h.im, 1e-12);
    // n + ik squares back to ε, with n > 0 and k > 0.
    const cplx n = complex_index(f, kPlanckSpeedOfLight_eV_nm / h.E);
    EXPECT_GT(n.real(), 0.0);
    EXPECT_GT(n.imag(), 0.0);
    EXPECT_NEAR(std::abs(n * n - cplx(h.re, h.im)), 0.0, 1e-12);
  }
  // At E = 0.5 (below the plasma energy) the medium reflects like a metal:
  // k > n (ε1 < 0).
  const cplx metal = complex_index(f, kPlanckSpeedOfLight_eV_nm / 0.5);
  EXPECT_GT(metal.imag(), metal.real());
}

TEST(Drude, PlasmaAndBroadeningFromCarriersByHand) {
  // N = 1e20 cm⁻³ = 1e26 m⁻³, m* = 1, µ = 100 cm²/Vs = 0.01 m²/Vs. By hand with
  // CODATA 2018 constants (from memory: e = 1.602176634e-19 C,
  // ε0 = 8.8541878128e-12 F/m, m_e = 9.1093837015e-31 kg, ħ = 1.054571817e-34 J s):
  //   ω_p = sqrt(1e26 · e² / (ε0 m_e)) = 5.64146e14 rad/s, ħω_p/e = 0.371328 eV
  //   γ = e/(m_e µ) = 1.75882e13 1/s,                        ħγ/e = 0.0115768 eV
  const DrudeTerm d = drude_term_from_carriers(1e20, 100.0, 1.0);
  EXPECT_NEAR(d.plasma_energy_eV, 0.371328, 2e-6);
  EXPECT_NEAR(d.broadening_eV, 0.0115768, 2e-7);
  // Scaling: Ep ∝ sqrt(N/m*), Γ ∝ 1/(m* µ).
  const DrudeTerm d2 = drude_term_from_carriers(4e20, 50.0, 0.25);
  EXPECT_NEAR(d2.plasma_energy_eV, d.plasma_energy_eV * 4.0, 1e-12);
  EXPECT_NEAR(d2.broadening_eV, d.broadening_eV * 8.0, 1e-12);
  EXPECT_THROW(drude_term_from_carriers(0.0, 100.0, 1.0), DispersionError);
  EXPECT_THROW(drude_term_from_carriers(1e20, -1.0, 1.0), DispersionError);
  EXPECT_THROW(drude_term_from_carriers(1e20, 100.0, 0.0), DispersionError);
}

TEST(Drude, LosslessBelowPlasmaEnergyIsRefusedWithTheWavelength) {
  // Γ = 0 and E < Ep: ε real and negative, n = 0 — not a refractive index the
  // tracer can use.
  const std::string e = error_of(formula(DrudeFormula{1.0, {2.0, 0.0}}, 300.0, 1200.0));
  EXPECT_THAT(e, HasSubstr("gives n = 0"));
  EXPECT_THAT(e, HasSubstr("at 620 nm"));  // first grid point with E < 2 eV: 619.92 nm -> 620 nm
}

// ---------------------------------------------------------------------------
// Oscillator sum

TEST(OscillatorSum, IsTheSumOfItsTerms) {
  const DrudeTerm d{1.2, 0.1};
  const TaucLorentzOscillator o{60.0, 5.0, 1.5, 3.8};
  const DispersionFormula sum = formula(OscillatorSumFormula{3.8, {d, d}, {o}});
  for (double wl : {300.0, 500.0, 900.0, 1200.0}) {
    const double E = photon_energy_eV(wl);
    const cplx expected = 3.8 + 2.0 * drude_epsilon(d, E) + tauc_lorentz_epsilon(o, E);
    EXPECT_NEAR(std::abs(dielectric_function(sum, wl) - expected), 0.0, 1e-13) << wl;
  }
  // One TL term alone equals the TL formula.
  const DispersionFormula tl_sum = formula(OscillatorSumFormula{2.0, {}, {o}});
  const DispersionFormula tl = formula(TaucLorentzFormula{2.0, o});
  EXPECT_EQ(complex_index(tl_sum, 400.0), complex_index(tl, 400.0));
}

// ---------------------------------------------------------------------------
// Sellmeier, Cauchy

TEST(Sellmeier, FusedSilicaReproducesShippedTable) {
  // I. H. Malitson, J. Opt. Soc. Am. 55, 1205 (1965) (coefficients from
  // memory): B = 0.6961663, 0.4079426, 0.8974794; C = 0.0684043², 0.1162414²,
  // 9.896161² µm². The shipped table gives n to 5 decimals, so it agrees with
  // the formula within its rounding, 5e-6.
  const DispersionFormula f = formula(
      SellmeierFormula{{{0.6961663, 0.0684043 * 0.0684043},
                        {0.4079426, 0.1162414 * 0.1162414},
                        {0.8974794, 9.896161 * 9.896161}}},
      250.0, 2000.0);
  const Material table = find_material("sio2_malitson1965");
  double worst = 0.0;
  int rows = 0;
  for (std::size_t i = 0; i < table.wavelength_nm.size(); ++i) {
    const double wl = table.wavelength_nm[i];
    if (wl < 250.0 || wl > 2000.0) continue;
    const cplx n = complex_index(f, wl);
    worst = std::max(worst, std::abs(n.real() - table.n[i]));
    EXPECT_NEAR(n.real(), table.n[i], 5.0e-6 + 1e-12) << wl;
    EXPECT_EQ(n.imag(), 0.0);
    ++rows;
  }
  EXPECT_EQ(rows, 351);
  std::printf("fused silica Sellmeier vs shipped table: %d rows, max |Δn| = %.2e\n", rows, worst);
}

TEST(Sellmeier, PoleAndNegativeSquareAreRefused) {
  // A resonance at 0.5 µm inside the range: n² < 0 just above it.
  const std::string e = error_of(formula(SellmeierFormula{{{1.0, 0.25}}}, 300.0, 800.0));
  EXPECT_THAT(e, HasSubstr("Sellmeier formula"));
  EXPECT_THAT(e, HasSubstr("nm"));
  EXPECT_THROW(check_formula(formula(SellmeierFormula{})), DispersionError);
  EXPECT_THROW(check_formula(formula(SellmeierFormula{{{1.0, -0.1}}})), DispersionError);
}

TEST(Cauchy, HandValues) {
  // n = A + B/λ² + C/λ⁴ at 0.5 µm: 1.5 + 0.004/0.25 + 0.0001/0.0625 = 1.5176.
  CauchyFormula c{1.5, 0.004, 0.0001};
  const DispersionFormula f = formula(c);
  EXPECT_NEAR(complex_index(f, 500.0).real(), 1.5176, 1e-14);
  EXPECT_EQ(complex_index(f, 500.0).imag(), 0.0);
  EXPECT_NEAR(dielectric_function(f, 500.0).real(), 1.5176 * 1.5176, 1e-13);
  // Urbach-like tail: k = k_amp at E = E_edge, ×e per E_width above it.
  c.k_amplitude = 0.01;
  c.urbach_edge_eV = photon_energy_eV(400.0);
  c.urbach_width_eV = 0.2;
  const DispersionFormula g = formula(c);
  EXPECT_NEAR(complex_index(g, 400.0).imag(), 0.01, 1e-15);
  const double wl_up = kPlanckSpeedOfLight_eV_nm / (photon_energy_eV(400.0) + 0.2);
  EXPECT_NEAR(complex_index(g, wl_up).imag(), 0.01 * std::exp(1.0), 1e-14);
  // n <= 0 is refused with the wavelength: n = -0.5 + 0.1/λ² <= 0 for
  // λ >= sqrt(0.2) µm = 447.2 nm, so the first bad grid point is 448 nm.
  EXPECT_THAT(error_of(formula(CauchyFormula{-0.5, 0.1, 0.0})), HasSubstr("at 448 nm"));
}

// ---------------------------------------------------------------------------
// Doped crystalline silicon

TEST(DopedSilicon, AddsFreeCarrierExtinctionToBandToBand) {
  DopedSiliconFormula d;
  d.band_to_band = find_material("si_green2008");
  d.type = DopingType::n;
  d.density_cm3 = 1e20;
  d.fca = FcaParametrization::schroder1978;
  const DispersionFormula f = formula(d, 300.0, 1450.0);
  // By hand at 1200 nm: α = 1.0e-18 · 1.2² · 1e20 = 144 /cm = 1.44e-5 /nm;
  // k_fca = α λ / (4π) = 1.44e-5 · 1200 / (4π) = 1.3751e-3; table k = 2.1008e-7, n = 3.52.
  const cplx n = complex_index(f, 1200.0);
  EXPECT_NEAR(n.real(), 3.52, 1e-12);
  EXPECT_NEAR(n.imag(), 2.1008e-7 + 1.44e-5 * 1200.0 / (4.0 * std::numbers::pi), 1e-12);
  const Material m = formula_material(f, 10.0);
  EXPECT_EQ(m.wavelength_nm.front(), 300.0);
  EXPECT_EQ(m.wavelength_nm.back(), 1450.0);
  EXPECT_THAT(m.source, HasSubstr("schroder1978"));
  EXPECT_THAT(m.source, HasSubstr("si_green2008"));
  // A range beyond the table is refused.
  EXPECT_THAT(error_of(formula(d, 300.0, 1600.0)), HasSubstr("exceeds the band-to-band table"));
}

// ---------------------------------------------------------------------------
// Sampling

TEST(FormulaMaterial, GridSourceAndRange) {
  DispersionFormula f = formula(CauchyFormula{1.6, 0.005, 0.0}, 300.0, 1000.5);
  f.source = "illustrative";
  const Material m = formula_material(f);
  ASSERT_EQ(m.wavelength_nm.size(), 702u);  // 300, 301, ..., 1000, 1000.5
  EXPECT_EQ(m.wavelength_nm[1], 301.0);
  EXPECT_EQ(m.wavelength_nm.back(), 1000.5);
  EXPECT_THAT(m.source, HasSubstr("Cauchy"));
  EXPECT_THAT(m.source, HasSubstr("A = 1.6"));
  EXPECT_THAT(m.source, HasSubstr("sampled every 1 nm over 300–1000.5 nm"));
  EXPECT_THAT(m.source, HasSubstr("parameters: illustrative"));
  // Linear interpolation of the 1 nm table against the formula, bounded by
  // h²/8 · max|n''| (common practice) with n'' = 6B/λ⁴:
  // (1e-3 µm)²/8 · 6 · 0.005 / 0.3⁴ µm⁻² = 4.63e-7 at 300 nm.
  for (double wl : {300.5, 633.3, 999.9})
    EXPECT_NEAR(m.index_at(wl).real(), complex_index(f, wl).real(), 4.63e-7);
  try {
    complex_index(f, 1200.0);
    FAIL() << "no error outside the range";
  } catch (const DispersionError& e) {
    EXPECT_THAT(e.what(), HasSubstr("valid for 300–1000.5 nm; 1200 nm requested"));
  }
  EXPECT_THROW(formula_material(formula(CauchyFormula{}, 500.0, 400.0)), DispersionError);
  EXPECT_THROW(formula_material(f, 0.0), DispersionError);
}
