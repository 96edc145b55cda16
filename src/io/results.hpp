#pragma once
// The result of a run (ray tracer or planar solver) as plain data, ready to
// be written: per-wavelength fractions of the incident photons in each bin,
// with standard errors, and their currents under the chosen spectrum.
#include <cstdint>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

namespace lumtrap {

/// One bin (where photons end): fraction per wavelength and its current.
struct ResultBin {
  std::string name;            ///< column name, e.g. "A_si", "A_front_1_sinx_pecvd_n209"
  std::string meaning;         ///< one line for the JSON summary
  bool loss = true;            ///< counts as a loss (everything except A_si)
  std::vector<double> fraction;  ///< per wavelength
  std::vector<double> sigma;     ///< standard error per wavelength (0 for exact results)
  double current_mA_cm2 = 0;
  double current_sigma_mA_cm2 = 0;
};

struct Results {
  std::string method;                 ///< "ray tracing" or "planar (exact)"
  std::string spectrum;               ///< "AM1.5G", ...
  std::vector<double> wavelength_nm;
  std::vector<double> band_weight;    ///< photons m^-2 s^-1 of each wavelength's band
  std::vector<std::uint64_t> photons; ///< per wavelength (0 for exact results)
  std::vector<ResultBin> bins;        ///< the first one is A_si (J_G)
  double J_max_mA_cm2 = 0;
  nlohmann::json summary;             ///< further facts for summary.json (seed, hash, timing, ...)

  const ResultBin& bin(const std::string& name) const;
};

/// Fills every bin's current and its standard error from band weights:
/// J = q Σ_i w_i f_i, σ_J = q sqrt(Σ_i w_i² σ_i²) (wavelengths independent).
void compute_currents(Results& r);

}  // namespace lumtrap
