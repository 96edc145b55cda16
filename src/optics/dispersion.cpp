// Dispersion formulas evaluated as n + ik and sampled into Material tables.
// See dispersion.hpp for the models, units and references.
#include "optics/dispersion.hpp"

#include <numbers>
#include <fmt/format.h>

#include <cmath>

namespace lumtrap {
namespace {


// SI constants. h, c, e are exact since 2019; ε0, m_e are CODATA 2018
// recommended values (from memory).
constexpr double kElementaryCharge_C = 1.602176634e-19;
constexpr double kReducedPlanck_Js = 1.054571817e-34;
constexpr double kVacuumPermittivity_F_m = 8.8541878128e-12;
constexpr double kElectronMass_kg = 9.1093837015e-31;

template <class... Ts>
struct Overloaded : Ts... {
  using Ts::operator()...;
};
template <class... Ts>
Overloaded(Ts...) -> Overloaded<Ts...>;

bool finite(double x) { return std::isfinite(x); }

void check_eps_inf(double eps_inf) {
  if (!(finite(eps_inf) && eps_inf > 0.0))
    throw DispersionError("eps_inf", fmt::format("eps_inf = {:g} is not allowed; eps_inf must be "
                                                 "finite and > 0",
                                                 eps_inf));
}

void check_energy(double energy_eV) {
  if (!(finite(energy_eV) && energy_eV > 0.0))
    throw DispersionError("energy", fmt::format("photon energy {:g} eV is not allowed; it must "
                                                "be finite and > 0",
                                                energy_eV));
}

/// x² ln|x|, continued by 0 at x = 0.
double square_log(double x) { return x == 0.0 ? 0.0 : x * x * std::log(std::abs(x)); }

/// ε → n + ik by the principal square root; a signed zero ε2 is made +0 so
/// that a negative real ε gives n = 0, k > 0 (refused later) rather than k < 0.
cplx index_from_epsilon(cplx eps) {
  return std::sqrt(cplx(eps.real(), eps.imag() == 0.0 ? 0.0 : eps.imag()));
}

/// ε of the models that are defined by ε (TL, Drude, oscillator sum); the
/// range is not checked here.
cplx epsilon_of_oscillators(double eps_inf, const std::vector<DrudeTerm>& drude,
                            const std::vector<TaucLorentzOscillator>& tl, double energy_eV) {
  cplx eps = eps_inf;
  for (const DrudeTerm& d : drude) eps += drude_epsilon(d, energy_eV);
  for (const TaucLorentzOscillator& o : tl) eps += tauc_lorentz_epsilon(o, energy_eV);
  return eps;
}

/// n + ik without range or sign checks.
cplx raw_index(const DispersionFormula& f, double wavelength_nm) {
  const double um = wavelength_nm / 1000.0;
  const double E = photon_energy_eV(wavelength_nm);
  return std::visit(
      Overloaded{
          [&](const CauchyFormula& c) -> cplx {
            const double l2 = um * um;
            const double n = c.A + c.B_um2 / l2 + c.C_um4 / (l2 * l2);
            const double k = c.k_amplitude > 0.0
                                 ? c.k_amplitude * std::exp((E - c.urbach_edge_eV) / c.urbach_width_eV)
                                 : 0.0;
            return {n, k};
          },
          [&](const SellmeierFormula& s) -> cplx {
            const double l2 = um * um;
            double n2 = 1.0;
            for (const SellmeierTerm& t : s.terms) {
              if (l2 == t.C_um2)
                throw DispersionError(
                    "wavelength",
                    fmt::format("Sellmeier formula: {:g} nm is a pole (λ² = C = {:g} µm²); "
                                "choose a validity range without poles",
                                wavelength_nm, t.C_um2));
              n2 += t.B * l2 / (l2 - t.C_um2);
            }
            if (!(n2 > 0.0))
              throw DispersionError(
                  "wavelength",
                  fmt::format("Sellmeier formula gives n² = {:g} <= 0 at {:g} nm; n must be > 0 "
                              "over the whole validity range",
                              n2, wavelength_nm));
            return {std::sqrt(n2), 0.0};
          },
          [&](const TaucLorentzFormula& t) -> cplx {
            return index_from_epsilon(t.eps_inf + tauc_lorentz_epsilon(t.oscillator, E));
          },
          [&](const DrudeFormula& d) -> cplx {
            return index_from_epsilon(d.eps_inf + drude_epsilon(d.term, E));
          },
          [&](const OscillatorSumFormula& s) -> cplx {
            return index_from_epsilon(epsilon_of_oscillators(s.eps_inf, s.drude, s.tauc_lorentz, E));
          },
          [&](const DopedSiliconFormula& d) -> cplx {
            const cplx bb = d.band_to_band.index_at(wavelength_nm);
            const double alpha_per_nm =
                free_carrier_absorption_per_cm(d.fca, d.type, wavelength_nm, d.density_cm3) * 1e-7;
            return {bb.real(), bb.imag() + alpha_per_nm * wavelength_nm / (4.0 * std::numbers::pi)};
          },
      },
      f.model);
}

void check_range(const DispersionFormula& f, double wavelength_nm) {
  if (!(wavelength_nm >= f.min_wavelength_nm && wavelength_nm <= f.max_wavelength_nm))
    throw DispersionError(
        "wavelength",
        fmt::format("formula '{}' is valid for {:g}–{:g} nm; {:g} nm requested", f.name,
                    f.min_wavelength_nm, f.max_wavelength_nm, wavelength_nm));
}

std::string tl_text(const TaucLorentzOscillator& o) {
  return fmt::format("A = {:g} eV, E0 = {:g} eV, C = {:g} eV, Eg = {:g} eV", o.A_eV, o.E0_eV,
                     o.C_eV, o.Eg_eV);
}

std::string drude_text(const DrudeTerm& d) {
  return fmt::format("plasma energy = {:g} eV, broadening = {:g} eV", d.plasma_energy_eV,
                     d.broadening_eV);
}

}  // namespace

DrudeTerm drude_term_from_carriers(double density_cm3, double mobility_cm2_per_Vs,
                                   double effective_mass_ratio) {
  if (!(finite(density_cm3) && density_cm3 > 0.0))
    throw DispersionError("carrier_density",
                          fmt::format("carrier density {:g} cm^-3 is not allowed; it must be "
                                      "finite and > 0",
                                      density_cm3));
  if (!(finite(mobility_cm2_per_Vs) && mobility_cm2_per_Vs > 0.0))
    throw DispersionError("mobility",
                          fmt::format("mobility {:g} cm2/Vs is not allowed; it must be finite "
                                      "and > 0",
                                      mobility_cm2_per_Vs));
  if (!(finite(effective_mass_ratio) && effective_mass_ratio > 0.0))
    throw DispersionError("effective_mass",
                          fmt::format("effective mass {:g} (in electron masses) is not "
                                      "allowed; it must be finite and > 0",
                                      effective_mass_ratio));
  const double N_m3 = density_cm3 * 1e6;
  const double mu_m2 = mobility_cm2_per_Vs * 1e-4;
  const double m = effective_mass_ratio * kElectronMass_kg;
  const double e = kElementaryCharge_C;
  const double omega_p = std::sqrt(N_m3 * e * e / (kVacuumPermittivity_F_m * m));  // rad/s
  const double gamma = e / (m * mu_m2);                                            // 1/s
  return {kReducedPlanck_Js * omega_p / e, kReducedPlanck_Js * gamma / e};
}

double tauc_lorentz_eps2(const TaucLorentzOscillator& o, double E) {
  check_energy(E);
  if (E <= o.Eg_eV) return 0.0;
  const double E2 = E * E, E02 = o.E0_eV * o.E0_eV;
  const double d = E - o.Eg_eV;
  return o.A_eV * o.E0_eV * o.C_eV * d * d /
         ((E2 - E02) * (E2 - E02) + o.C_eV * o.C_eV * E2) / E;
}

cplx tauc_lorentz_epsilon(const TaucLorentzOscillator& o, double E) {
  check_energy(E);
  // Jellison and Modine, Appl. Phys. Lett. 69, 371 (1996) and erratum
  // (citation from memory), closed-form ε1 - ε_inf (from memory; verified
  // against a numerical Kramers-Kronig transform in
  // tests/optics/test_dispersion.cpp):
  //   α = sqrt(4E0² - C²), γ² = E0² - C²/2, ζ⁴ = (E² - γ²)² + α²C²/4
  //   a_ln   = (Eg² - E0²)E² + Eg²C² - E0²(E0² + 3Eg²)
  //   a_atan = (E² - E0²)(E0² + Eg²) + Eg²C²
  //   ε1 - ε_inf =  A C a_ln / (2π ζ⁴ α E0) · ln[(E0² + Eg² + αEg)/(E0² + Eg² - αEg)]
  //              -  A a_atan / (π ζ⁴ E0) · [π - atan((2Eg + α)/C) + atan((α - 2Eg)/C)]
  //              +  2 A E0 Eg (E² - γ²) / (π ζ⁴ α) · [π + 2 atan(2(γ² - Eg²)/(αC))]
  //              -  A E0 C (E² + Eg²) / (π ζ⁴ E) · ln(|E - Eg|/(E + Eg))
  //              +  2 A E0 C Eg / (π ζ⁴) · ln[|E - Eg|(E + Eg) / sqrt((E0² - Eg²)² + Eg²C²)]
  // The last two terms are regrouped (algebraically identical) so that the
  // ln|E - Eg| singularity appears as (E - Eg)² ln|E - Eg|, which is finite
  // (0) at E = Eg:
  //   A E0 C / (π ζ⁴) · [-(E - Eg)²/E · ln|E - Eg| + (E + Eg)²/E · ln(E + Eg)
  //                      - Eg ln((E0² - Eg²)² + Eg²C²)]
  const double A = o.A_eV, E0 = o.E0_eV, C = o.C_eV, Eg = o.Eg_eV;
  const double E2 = E * E, E02 = E0 * E0, Eg2 = Eg * Eg, C2 = C * C;
  const double alpha = std::sqrt(4.0 * E02 - C2);
  const double gamma2 = E02 - 0.5 * C2;
  const double zeta4 = (E2 - gamma2) * (E2 - gamma2) + 0.25 * alpha * alpha * C2;
  const double a_ln = (Eg2 - E02) * E2 + Eg2 * C2 - E02 * (E02 + 3.0 * Eg2);
  const double a_atan = (E2 - E02) * (E02 + Eg2) + Eg2 * C2;

  const double t1 = A * C * a_ln / (2.0 * std::numbers::pi * zeta4 * alpha * E0) *
                    std::log((E02 + Eg2 + alpha * Eg) / (E02 + Eg2 - alpha * Eg));
  const double t2 = -A * a_atan / (std::numbers::pi * zeta4 * E0) *
                    (std::numbers::pi - std::atan((2.0 * Eg + alpha) / C) + std::atan((alpha - 2.0 * Eg) / C));
  const double t3 = 2.0 * A * E0 * Eg * (E2 - gamma2) / (std::numbers::pi * zeta4 * alpha) *
                    (std::numbers::pi + 2.0 * std::atan(2.0 * (gamma2 - Eg2) / (alpha * C)));
  const double t45 =
      A * E0 * C / (std::numbers::pi * zeta4) *
      ((-square_log(E - Eg) + square_log(E + Eg)) / E -
       Eg * std::log((E02 - Eg2) * (E02 - Eg2) + Eg2 * C2));
  return {t1 + t2 + t3 + t45, tauc_lorentz_eps2(o, E)};
}

cplx drude_epsilon(const DrudeTerm& d, double E) {
  check_energy(E);
  const double Ep2 = d.plasma_energy_eV * d.plasma_energy_eV;
  // -Ep² / (E² + iΓE) = -Ep² (E² - iΓE) / (E⁴ + Γ²E²)
  const double G = d.broadening_eV;
  const double denom = E * E * (E * E + G * G);
  return {-Ep2 * E * E / denom, Ep2 * G * E / denom};
}

void check_tauc_lorentz(const TaucLorentzOscillator& o) {
  const std::string allowed = "allowed: A > 0, E0 > 0, 0 < C < 2·E0, Eg >= 0 (Eg > E0 is allowed)";
  if (!(finite(o.A_eV) && o.A_eV > 0.0))
    throw DispersionError("A", fmt::format("Tauc-Lorentz A = {:g} eV must be finite and > 0; {}",
                                           o.A_eV, allowed));
  if (!(finite(o.E0_eV) && o.E0_eV > 0.0))
    throw DispersionError("E0", fmt::format("Tauc-Lorentz E0 = {:g} eV must be finite and > 0; {}",
                                            o.E0_eV, allowed));
  if (!(finite(o.C_eV) && o.C_eV > 0.0 && o.C_eV < 2.0 * o.E0_eV))
    throw DispersionError(
        "C", fmt::format("Tauc-Lorentz C = {:g} eV must lie in (0, 2·E0) = (0, {:g}) eV (the "
                         "closed-form ε1 needs a real sqrt(4E0² - C²)); {}",
                         o.C_eV, 2.0 * o.E0_eV, allowed));
  if (!(finite(o.Eg_eV) && o.Eg_eV >= 0.0))
    throw DispersionError("Eg", fmt::format("Tauc-Lorentz Eg = {:g} eV must be finite and >= 0; {}",
                                            o.Eg_eV, allowed));
}

void check_drude(const DrudeTerm& d) {
  if (!(finite(d.plasma_energy_eV) && d.plasma_energy_eV >= 0.0))
    throw DispersionError("plasma_energy",
                          fmt::format("Drude plasma energy {:g} eV must be finite and >= 0",
                                      d.plasma_energy_eV));
  if (!(finite(d.broadening_eV) && d.broadening_eV >= 0.0))
    throw DispersionError("broadening",
                          fmt::format("Drude broadening {:g} eV must be finite and >= 0",
                                      d.broadening_eV));
}

void check_sellmeier_term(const SellmeierTerm& t) {
  if (!finite(t.B))
    throw DispersionError("B", fmt::format("Sellmeier B = {:g} must be a finite number", t.B));
  if (!(finite(t.C_um2) && t.C_um2 >= 0.0))
    throw DispersionError("C", fmt::format("Sellmeier C = {:g} um2 must be finite and >= 0",
                                           t.C_um2));
}

void check_formula(const DispersionFormula& f) {
  if (!(finite(f.min_wavelength_nm) && finite(f.max_wavelength_nm) && f.min_wavelength_nm > 0.0 &&
        f.min_wavelength_nm <= f.max_wavelength_nm))
    throw DispersionError(
        "wavelength_range",
        fmt::format("validity range {:g}–{:g} nm is not allowed; it must be finite with "
                    "0 < minimum <= maximum",
                    f.min_wavelength_nm, f.max_wavelength_nm));
  std::visit(
      Overloaded{
          [](const CauchyFormula& c) {
            for (const auto& [name, v] : {std::pair{"A", c.A}, {"B", c.B_um2}, {"C", c.C_um4}})
              if (!finite(v))
                throw DispersionError(name, fmt::format("Cauchy {} = {:g} must be a finite number",
                                                        name, v));
            if (!(finite(c.k_amplitude) && c.k_amplitude >= 0.0))
              throw DispersionError("k_amplitude",
                                    fmt::format("Cauchy k_amplitude = {:g} must be finite and >= 0",
                                                c.k_amplitude));
            if (!finite(c.urbach_edge_eV))
              throw DispersionError("urbach_edge", fmt::format("Cauchy urbach_edge = {:g} eV must "
                                                               "be finite",
                                                               c.urbach_edge_eV));
            if (!(finite(c.urbach_width_eV) && c.urbach_width_eV > 0.0))
              throw DispersionError("urbach_width",
                                    fmt::format("Cauchy urbach_width = {:g} eV must be finite and "
                                                "> 0",
                                                c.urbach_width_eV));
          },
          [](const SellmeierFormula& s) {
            if (s.terms.empty())
              throw DispersionError("term", "Sellmeier formula without terms; give at least one "
                                            "term (B, C)");
            for (const SellmeierTerm& t : s.terms) check_sellmeier_term(t);
          },
          [](const TaucLorentzFormula& t) {
            check_eps_inf(t.eps_inf);
            check_tauc_lorentz(t.oscillator);
          },
          [](const DrudeFormula& d) {
            check_eps_inf(d.eps_inf);
            check_drude(d.term);
          },
          [](const OscillatorSumFormula& s) {
            check_eps_inf(s.eps_inf);
            for (const DrudeTerm& d : s.drude) check_drude(d);
            for (const TaucLorentzOscillator& o : s.tauc_lorentz) check_tauc_lorentz(o);
          },
          [&](const DopedSiliconFormula& d) {
            if (!(finite(d.density_cm3) && d.density_cm3 >= 0.0))
              throw DispersionError("carrier_density",
                                    fmt::format("carrier density {:g} cm^-3 must be finite and "
                                                ">= 0",
                                                d.density_cm3));
            if (d.band_to_band.wavelength_nm.empty())
              throw DispersionError("band_to_band", "doped silicon needs a band-to-band n, k table");
            if (f.min_wavelength_nm < d.band_to_band.min_wavelength_nm() ||
                f.max_wavelength_nm > d.band_to_band.max_wavelength_nm())
              throw DispersionError(
                  "wavelength_range",
                  fmt::format("validity range {:g}–{:g} nm exceeds the band-to-band table '{}' "
                              "({:g}–{:g} nm); allowed: a range inside the table",
                              f.min_wavelength_nm, f.max_wavelength_nm, d.band_to_band.name,
                              d.band_to_band.min_wavelength_nm(),
                              d.band_to_band.max_wavelength_nm()));
          },
      },
      f.model);
}

cplx dielectric_function(const DispersionFormula& f, double wavelength_nm) {
  check_range(f, wavelength_nm);
  const double E = photon_energy_eV(wavelength_nm);
  if (const auto* t = std::get_if<TaucLorentzFormula>(&f.model))
    return t->eps_inf + tauc_lorentz_epsilon(t->oscillator, E);
  if (const auto* d = std::get_if<DrudeFormula>(&f.model))
    return d->eps_inf + drude_epsilon(d->term, E);
  if (const auto* s = std::get_if<OscillatorSumFormula>(&f.model))
    return epsilon_of_oscillators(s->eps_inf, s->drude, s->tauc_lorentz, E);
  const cplx n = raw_index(f, wavelength_nm);
  return n * n;
}

cplx complex_index(const DispersionFormula& f, double wavelength_nm) {
  check_range(f, wavelength_nm);
  const cplx n = raw_index(f, wavelength_nm);
  if (!(finite(n.real()) && finite(n.imag()) && n.real() > 0.0 && n.imag() >= 0.0))
    throw DispersionError(
        "wavelength",
        fmt::format("formula '{}' gives n = {:g}, k = {:g} at {:g} nm; n must be > 0 and k >= 0 "
                    "(finite) over the whole validity range {:g}–{:g} nm: change the parameters "
                    "or narrow the range",
                    f.name, n.real(), n.imag(), wavelength_nm, f.min_wavelength_nm,
                    f.max_wavelength_nm));
  return n;
}

std::string describe_formula(const DispersionFormula& f) {
  return std::visit(
      Overloaded{
          [](const CauchyFormula& c) {
            std::string s = fmt::format("Cauchy n = A + B/λ² + C/λ⁴ (λ in µm): A = {:g}, B = {:g} "
                                        "um2, C = {:g} um4",
                                        c.A, c.B_um2, c.C_um4);
            if (c.k_amplitude > 0.0)
              s += fmt::format("; k = {:g}·exp((E - {:g} eV)/{:g} eV)", c.k_amplitude,
                               c.urbach_edge_eV, c.urbach_width_eV);
            return s;
          },
          [](const SellmeierFormula& s) {
            std::string out = "Sellmeier n² = 1 + Σ B λ²/(λ² - C) (λ in µm):";
            for (std::size_t i = 0; i < s.terms.size(); ++i)
              out += fmt::format("{} B{} = {:g}, C{} = {:g} um2", i ? ";" : "", i + 1, s.terms[i].B,
                                 i + 1, s.terms[i].C_um2);
            return out;
          },
          [](const TaucLorentzFormula& t) {
            return fmt::format("Tauc-Lorentz (Jellison and Modine 1996): eps_inf = {:g}, {}",
                               t.eps_inf, tl_text(t.oscillator));
          },
          [](const DrudeFormula& d) {
            return fmt::format("Drude: eps_inf = {:g}, {}", d.eps_inf, drude_text(d.term));
          },
          [](const OscillatorSumFormula& s) {
            std::string out = fmt::format("oscillator sum: eps_inf = {:g}", s.eps_inf);
            for (const DrudeTerm& d : s.drude) out += "; Drude " + drude_text(d);
            for (const TaucLorentzOscillator& o : s.tauc_lorentz)
              out += "; Tauc-Lorentz (Jellison and Modine 1996) " + tl_text(o);
            return out;
          },
          [](const DopedSiliconFormula& d) {
            return fmt::format(
                "doped crystalline silicon: band-to-band n, k of '{}' ({}) + free-carrier "
                "absorption {} ({}), {}-type, N = {:g} cm^-3",
                d.band_to_band.name, d.band_to_band.source, fca_parametrization_id(d.fca),
                fca_citation(d.fca), doping_type_name(d.type), d.density_cm3);
          },
      },
      f.model);
}

Material formula_material(const DispersionFormula& f, double step_nm) {
  check_formula(f);
  if (!(finite(step_nm) && step_nm > 0.0))
    throw DispersionError("step", fmt::format("sampling step {:g} nm is not allowed; it must be "
                                              "finite and > 0",
                                              step_nm));
  Material m;
  m.name = f.name;
  m.file = f.file;
  m.source = fmt::format("{}; sampled every {:g} nm over {:g}–{:g} nm", describe_formula(f),
                         step_nm, f.min_wavelength_nm, f.max_wavelength_nm);
  if (!f.source.empty()) m.source += "; parameters: " + f.source;

  const double lo = f.min_wavelength_nm, hi = f.max_wavelength_nm;
  const double steps = std::floor((hi - lo) / step_nm + 1e-9);
  if (steps > 1e7)
    throw DispersionError("step", fmt::format("sampling {:g}–{:g} nm every {:g} nm gives more than "
                                              "1e7 points; use a larger step",
                                              lo, hi, step_nm));
  const auto count = static_cast<std::size_t>(steps);
  for (std::size_t i = 0; i <= count; ++i) m.wavelength_nm.push_back(lo + static_cast<double>(i) * step_nm);
  // The last point is the maximum itself (a last step shorter than step_nm if needed).
  if (m.wavelength_nm.back() < hi - 1e-9 * step_nm) m.wavelength_nm.push_back(hi);
  else m.wavelength_nm.back() = hi;
  for (double wl : m.wavelength_nm) {
    const cplx n = complex_index(f, wl);
    m.n.push_back(n.real());
    m.k.push_back(n.imag());
  }
  return m;
}

}  // namespace lumtrap
