#pragma once
// A measured reflectance curve (spectrophotometer with an integrating
// sphere: hemispherical reflectance) read from a CSV file:
//
//   # comment lines first (any number)
//   wavelength_nm,reflectance[,uncertainty][,transmittance]
//   400,0.112,0.003
//   ...
//
// Columns: wavelength in nm (> 0, strictly increasing); reflectance as a
// fraction 0..1 (not percent); uncertainty: one standard error of the
// reflectance, > 0, same unit; transmittance: fraction 0..1 (optional).
// Errors name FILE:LINE, the column, the value and what is allowed.
#include <filesystem>
#include <stdexcept>
#include <vector>

namespace lumtrap {

struct MeasuredCurveError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

struct MeasuredCurve {
  std::filesystem::path file;
  std::vector<double> wavelength_nm;
  std::vector<double> reflectance;     ///< fraction
  std::vector<double> uncertainty;     ///< standard error of reflectance; empty when not given
  std::vector<double> transmittance;   ///< fraction; empty when not given
  std::vector<int> line;               ///< line of each row in the file
};

MeasuredCurve read_measured_curve(const std::filesystem::path& file);

}  // namespace lumtrap
