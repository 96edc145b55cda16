#pragma once
// Free-carrier absorption (FCA) coefficient of crystalline silicon at 300 K
// as a function of wavelength and free-carrier density, by published
// power-law parametrizations the caller chooses between:
//
//   α_fca(λ, N) = K · (λ / λ_ref)^a · N^b        [α in 1/cm, N in cm⁻³]
//
// Inputs:  wavelength λ in nm (> 0), free-carrier density N in cm⁻³ (>= 0),
//          doping type (n: electrons are the free carriers, p: holes).
// Output:  α_fca in 1/cm (the trade's unit; 1/cm = 1e-7 /nm, so
//          k_fca = α λ / (4π) with α converted to 1/nm, complex_index.hpp).
//
// Parametrizations (coefficients recalled, not read from the papers: every
// number below is "from memory"; verify against the publications before
// quantitative use):
//
//   schroder1978 — D. K. Schroder, R. N. Thomas, J. C. Swartz, "Free carrier
//     absorption in silicon", IEEE Trans. Electron Devices 25, 254 (1978):
//       n-type  α = 1.0e-18 · (λ/µm)² · N      (from memory)
//       p-type  α = 2.7e-18 · (λ/µm)² · N      (from memory)
//
//   green1995 — the form given in M. A. Green, "Silicon Solar Cells:
//     Advanced Principles and Practice", UNSW, Sydney (1995) (attribution
//     from memory):
//       n-type  α = 2.6e-27 · (λ/nm)³ · N      (from memory)
//       p-type  α = 2.7e-24 · (λ/nm)² · N      (from memory; the same
//                                               p-type law as schroder1978)
//
// Validity: neither paper's stated range is recalled with confidence. Both
// laws describe the near infrared below the band gap energy, where FCA can be
// measured, for doping up to about 1e20 cm⁻³; fca_validity() reports the
// window λ 1000–2000 nm, N 1e16–1e20 cm⁻³ for both (from memory,
// approximate), so that callers can warn outside it. The laws are still
// evaluated outside the window (at shorter wavelengths band-to-band
// absorption dominates by orders of magnitude anyway).
//
// Not included: the parametrization of S. C. Baker-Finch et al., J. Appl.
// Phys. 116, 063106 (2014). Its coefficients could not be recalled reliably
// and are not invented here; it fits the power-law form above (with b != 1
// allowed), so adding it is one more case in fca_power_law().
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace lumtrap {

/// Doping type of silicon: n (donors, free electrons) or p (acceptors, free holes).
enum class DopingType { n, p };

enum class FcaParametrization { schroder1978, green1995 };

/// α[1/cm] = coefficient_per_cm · (λ / reference_wavelength_nm)^wavelength_exponent
///           · (N / 1 cm⁻³)^density_exponent
struct FcaPowerLaw {
  double coefficient_per_cm;
  double reference_wavelength_nm;  ///< 1000 for laws written with λ in µm, 1 for λ in nm
  double wavelength_exponent;
  double density_exponent;
};

/// The stated range of a parametrization (see the header comment).
struct FcaValidity {
  double min_wavelength_nm, max_wavelength_nm;
  double min_density_cm3, max_density_cm3;
};

struct FreeCarrierError : std::invalid_argument {
  using std::invalid_argument::invalid_argument;
};

FcaPowerLaw fca_power_law(FcaParametrization p, DopingType type);
FcaValidity fca_validity(FcaParametrization p, DopingType type);

/// "schroder1978", "green1995": the ids used in files and messages.
std::string_view fca_parametrization_id(FcaParametrization p);
/// Inverse of fca_parametrization_id; throws FreeCarrierError listing the ids.
FcaParametrization fca_parametrization_from_id(std::string_view id);
/// All parametrizations, in the order of the enum.
std::vector<FcaParametrization> all_fca_parametrizations();
/// Author, journal/book, year of a parametrization.
std::string fca_citation(FcaParametrization p);
/// "n" or "p".
std::string_view doping_type_name(DopingType t);

/// The wavelength factor K·(λ/λ_ref)^a of the power law, in 1/cm per
/// (cm⁻³)^b: α = fca_wavelength_factor · N^b. Lets a caller integrate N^b
/// over a path once and reuse it at every wavelength.
double fca_wavelength_factor(FcaParametrization p, DopingType type, double wavelength_nm);

/// α_fca in 1/cm. Throws FreeCarrierError for λ <= 0 or non-finite, or
/// N < 0 or non-finite. N = 0 gives 0.
double free_carrier_absorption_per_cm(FcaParametrization p, DopingType type,
                                      double wavelength_nm, double density_cm3);

/// True when (λ, N) lies inside fca_validity(p, type) (bounds included).
bool fca_within_validity(FcaParametrization p, DopingType type, double wavelength_nm,
                         double density_cm3);

}  // namespace lumtrap
