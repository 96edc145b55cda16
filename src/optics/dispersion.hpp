#pragma once
// Dispersion formulas: a film's optical constants given by a formula instead
// of a table, evaluated as the complex index n + ik (k >= 0, α = 4πk/λ,
// complex_index.hpp) or the dielectric function ε = ε1 + iε2 = (n + ik)²
// (ε2 >= 0 absorbs) at a wavelength λ in nm, and sampled into a Material
// table so that the rest of the code uses it unchanged.
//
// Photon energy E = hc/λ, hc = 1239.841984 eV nm (SI 2019 exact h, c, e).
//
// Models (inputs and units):
//  * Cauchy (common practice):  n = A + B/λ² + C/λ⁴, λ in µm, B in µm², C in
//    µm⁴; optional Urbach-like tail k = k_amp · exp((E - E_edge)/E_width)
//    (k_amp = 0 by default: transparent).
//  * Sellmeier (common practice): n² = 1 + Σ_i B_i λ² / (λ² - C_i), λ in µm,
//    C_i in µm² (as commonly printed; C_i = λ_i², λ_i a resonance
//    wavelength); k = 0.
//  * Tauc-Lorentz: G. E. Jellison Jr. and F. A. Modine, Appl. Phys. Lett. 69,
//    371 (1996), and its erratum, Appl. Phys. Lett. 69, 2137 (1996)
//    (erratum citation from memory):
//      ε2(E) = A E0 C (E - Eg)² / ((E² - E0²)² + C² E²) / E   for E > Eg,
//      ε2(E) = 0                                              for E <= Eg,
//    ε1 = ε_inf + the closed-form Kramers-Kronig integral of that paper
//    (written out in dispersion.cpp from memory; which terms the erratum
//    corrected is not recalled with certainty, so the form is justified by
//    tests/optics/test_dispersion.cpp, which checks it against a numerical
//    principal-value transform of ε2 to ~1e-13). A, E0, C, Eg in eV.
//    Allowed: A > 0, E0 > 0, 0 < C < 2 E0 (the closed form needs the real
//    α = sqrt(4E0² - C²)), Eg >= 0. Eg > E0 is allowed: ε2 and the closed
//    form stay valid (checked by the same numerical transform).
//  * Drude (free carriers, common practice):
//      ε(E) = ε_inf - Ep² / (E² + i Γ E),   Ep = ħω_p, Γ = ħγ in eV,
//    with the unscreened plasma frequency and the damping rate from carrier
//    density N, mobility µ and effective mass m* (in electron masses):
//      ω_p² = N e² / (ε0 m* m_e),   γ = e / (m* m_e µ)
//    (SI constants: CODATA 2018 values, from memory). Allowed: Ep >= 0,
//    Γ >= 0; N > 0, µ > 0, m* > 0.
//  * Oscillator sum (as used for transparent conductive oxides):
//      ε = ε_inf + Σ Drude terms + Σ Tauc-Lorentz terms,
//    each term without its own ε_inf.
//  * Doped crystalline silicon: the band-to-band n, k of a Material table
//    plus free-carrier absorption k_fca = α_fca λ / (4π) of the chosen
//    parametrization (free_carrier_absorption.hpp) at the free-carrier
//    density; the small free-carrier change of n is neglected (stated
//    approximation).
//
// ε_inf must be > 0 in every model that has it. n = Re sqrt(ε) (principal
// root, so k >= 0 whenever ε2 >= 0); a formula whose n is <= 0 or not finite
// at a wavelength of its validity range is refused, naming the wavelength.
#include <stdexcept>
#include <string>
#include <variant>
#include <vector>

#include "optics/complex_index.hpp"
#include "optics/free_carrier_absorption.hpp"
#include "optics/material.hpp"

namespace lumtrap {

/// hc in eV nm (exact with the SI 2019 values of h, c and e).
inline constexpr double kPlanckSpeedOfLight_eV_nm = 1239.8419843320026;

/// Photon energy in eV of a wavelength in nm.
inline double photon_energy_eV(double wavelength_nm) {
  return kPlanckSpeedOfLight_eV_nm / wavelength_nm;
}

struct CauchyFormula {
  double A = 1.0;                 ///< dimensionless
  double B_um2 = 0.0;             ///< µm²
  double C_um4 = 0.0;             ///< µm⁴
  double k_amplitude = 0.0;       ///< >= 0; 0 = transparent
  double urbach_edge_eV = 0.0;    ///< E_edge of the tail (only used when k_amplitude > 0)
  double urbach_width_eV = 1.0;   ///< E_width > 0
};

struct SellmeierTerm {
  double B = 0.0;      ///< dimensionless strength
  double C_um2 = 0.0;  ///< µm², >= 0
};

struct SellmeierFormula {
  std::vector<SellmeierTerm> terms;  ///< at least one
};

struct TaucLorentzOscillator {
  double A_eV = 0.0, E0_eV = 0.0, C_eV = 0.0, Eg_eV = 0.0;
};

struct TaucLorentzFormula {
  double eps_inf = 1.0;
  TaucLorentzOscillator oscillator;
};

struct DrudeTerm {
  double plasma_energy_eV = 0.0;  ///< Ep = ħω_p
  double broadening_eV = 0.0;     ///< Γ = ħγ
};

struct DrudeFormula {
  double eps_inf = 1.0;
  DrudeTerm term;
};

struct OscillatorSumFormula {
  double eps_inf = 1.0;
  std::vector<DrudeTerm> drude;
  std::vector<TaucLorentzOscillator> tauc_lorentz;
};

struct DopedSiliconFormula {
  Material band_to_band;  ///< n, k of undoped crystalline silicon (e.g. si_green2008)
  DopingType type = DopingType::n;
  double density_cm3 = 0.0;  ///< free-carrier density, >= 0
  FcaParametrization fca = FcaParametrization::schroder1978;
};

using DispersionModel = std::variant<CauchyFormula, SellmeierFormula, TaucLorentzFormula,
                                     DrudeFormula, OscillatorSumFormula, DopedSiliconFormula>;

/// A material given by a formula, valid on [min_wavelength_nm, max_wavelength_nm].
struct DispersionFormula {
  std::string name;    ///< id (file stem of a formula file) or a caller's label
  std::string source;  ///< citation of the parameters ("" if none)
  std::string file;    ///< formula file as opened; empty when built in code
  DispersionModel model;
  double min_wavelength_nm = 0.0, max_wavelength_nm = 0.0;
};

/// A non-physical parameter or a refused evaluation. `parameter` names the
/// offending parameter as in the model structs and the formula files ("C",
/// "eps_inf", "wavelength", ...), so that a file reader can point at it.
struct DispersionError : std::runtime_error {
  DispersionError(const std::string& parameter_name, const std::string& what)
      : std::runtime_error(what), parameter(parameter_name) {}
  std::string parameter;
};

/// Drude term from carriers: N in cm⁻³, µ in cm²/(V s), m* in electron
/// masses (formulas above). Throws DispersionError unless all are finite and > 0.
DrudeTerm drude_term_from_carriers(double density_cm3, double mobility_cm2_per_Vs,
                                   double effective_mass_ratio);

/// Tauc-Lorentz ε2 alone (0 for E <= Eg), E in eV > 0.
double tauc_lorentz_eps2(const TaucLorentzOscillator& o, double energy_eV);
/// Tauc-Lorentz contribution to ε (closed-form ε1 without ε_inf, plus iε2).
cplx tauc_lorentz_epsilon(const TaucLorentzOscillator& o, double energy_eV);
/// Drude contribution to ε: -Ep² / (E² + iΓE), E in eV > 0.
cplx drude_epsilon(const DrudeTerm& d, double energy_eV);

/// Parameter checks of single components and of whole formulas (including
/// the validity range: 0 < min <= max, finite). Throw DispersionError whose
/// message says what is wrong and what is allowed. They do not scan the
/// wavelength range; formula_material() does.
void check_tauc_lorentz(const TaucLorentzOscillator& o);
void check_drude(const DrudeTerm& d);
void check_sellmeier_term(const SellmeierTerm& t);
void check_formula(const DispersionFormula& f);

/// ε = ε1 + iε2 at λ (nm); for Cauchy, Sellmeier and doped silicon, (n + ik)².
/// Throws DispersionError when λ lies outside the validity range.
cplx dielectric_function(const DispersionFormula& f, double wavelength_nm);

/// n + ik at λ (nm). Throws DispersionError when λ lies outside the validity
/// range, or when the formula gives n <= 0, k < 0 or a non-finite value there.
cplx complex_index(const DispersionFormula& f, double wavelength_nm);

/// Model name and parameters with units, e.g. "Tauc-Lorentz (Jellison and
/// Modine 1996): eps_inf = 1, A = 100 eV, E0 = 3.6 eV, C = 2.4 eV, Eg = 1.6 eV".
std::string describe_formula(const DispersionFormula& f);

/// The formula sampled every step_nm (> 0) from min to max wavelength (the
/// last point is the maximum itself), as a Material: name = f.name, source =
/// describe_formula + the sampling + f.source, file = f.file. Checks the
/// parameters and refuses (DispersionError naming the wavelength) when n <= 0,
/// k < 0 or a value is not finite at any grid point.
Material formula_material(const DispersionFormula& f, double step_nm = 1.0);

}  // namespace lumtrap
