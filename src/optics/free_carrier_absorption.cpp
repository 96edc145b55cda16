// Free-carrier absorption of crystalline silicon by power-law
// parametrizations. See free_carrier_absorption.hpp for the formulas, their
// sources and what is recalled from memory.
#include "optics/free_carrier_absorption.hpp"

#include <fmt/format.h>

#include <cmath>

namespace lumtrap {
namespace {

void check_wavelength(double wavelength_nm) {
  if (!(std::isfinite(wavelength_nm) && wavelength_nm > 0.0))
    throw FreeCarrierError(fmt::format(
        "free-carrier absorption: wavelength {:g} nm is not allowed; it must be finite and > 0",
        wavelength_nm));
}

}  // namespace

FcaPowerLaw fca_power_law(FcaParametrization p, DopingType type) {
  switch (p) {
    case FcaParametrization::schroder1978:
      // Schroder, Thomas, Swartz, IEEE Trans. Electron Devices 25, 254 (1978);
      // coefficients from memory, λ in µm.
      return type == DopingType::n ? FcaPowerLaw{1.0e-18, 1000.0, 2.0, 1.0}
                                   : FcaPowerLaw{2.7e-18, 1000.0, 2.0, 1.0};
    case FcaParametrization::green1995:
      // Green, Silicon Solar Cells: Advanced Principles and Practice (1995);
      // coefficients from memory, λ in nm.
      return type == DopingType::n ? FcaPowerLaw{2.6e-27, 1.0, 3.0, 1.0}
                                   : FcaPowerLaw{2.7e-24, 1.0, 2.0, 1.0};
  }
  throw FreeCarrierError("free-carrier absorption: unknown parametrization");
}

FcaValidity fca_validity(FcaParametrization, DopingType) {
  // From memory, approximate (see the header): the same window for both.
  return {1000.0, 2000.0, 1e16, 1e20};
}

std::string_view fca_parametrization_id(FcaParametrization p) {
  switch (p) {
    case FcaParametrization::schroder1978: return "schroder1978";
    case FcaParametrization::green1995: return "green1995";
  }
  return "?";
}

std::vector<FcaParametrization> all_fca_parametrizations() {
  return {FcaParametrization::schroder1978, FcaParametrization::green1995};
}

FcaParametrization fca_parametrization_from_id(std::string_view id) {
  std::string allowed;
  for (FcaParametrization p : all_fca_parametrizations()) {
    if (fca_parametrization_id(p) == id) return p;
    allowed += (allowed.empty() ? "\"" : ", \"") + std::string(fca_parametrization_id(p)) + "\"";
  }
  throw FreeCarrierError(fmt::format(
      "unknown free-carrier absorption parametrization \"{}\"; allowed: {}", id, allowed));
}

std::string fca_citation(FcaParametrization p) {
  switch (p) {
    case FcaParametrization::schroder1978:
      return "D. K. Schroder, R. N. Thomas, J. C. Swartz, IEEE Trans. Electron Devices 25, 254 "
             "(1978)";
    case FcaParametrization::green1995:
      return "M. A. Green, Silicon Solar Cells: Advanced Principles and Practice, UNSW (1995)";
  }
  return "?";
}

std::string_view doping_type_name(DopingType t) { return t == DopingType::n ? "n" : "p"; }

double fca_wavelength_factor(FcaParametrization p, DopingType type, double wavelength_nm) {
  check_wavelength(wavelength_nm);
  const FcaPowerLaw law = fca_power_law(p, type);
  return law.coefficient_per_cm *
         std::pow(wavelength_nm / law.reference_wavelength_nm, law.wavelength_exponent);
}

double free_carrier_absorption_per_cm(FcaParametrization p, DopingType type,
                                      double wavelength_nm, double density_cm3) {
  if (!(std::isfinite(density_cm3) && density_cm3 >= 0.0))
    throw FreeCarrierError(fmt::format(
        "free-carrier absorption: carrier density {:g} cm^-3 is not allowed; it must be finite "
        "and >= 0",
        density_cm3));
  const double factor = fca_wavelength_factor(p, type, wavelength_nm);
  if (density_cm3 == 0.0) return 0.0;
  return factor * std::pow(density_cm3, fca_power_law(p, type).density_exponent);
}

bool fca_within_validity(FcaParametrization p, DopingType type, double wavelength_nm,
                         double density_cm3) {
  const FcaValidity v = fca_validity(p, type);
  return wavelength_nm >= v.min_wavelength_nm && wavelength_nm <= v.max_wavelength_nm &&
         density_cm3 >= v.min_density_cm3 && density_cm3 <= v.max_density_cm3;
}

}  // namespace lumtrap
