#pragma once
// The files of a fit's result folder, from a FitSetup and its FitResult:
//   parameters.csv   key, unit, start, min, max, best, standard_error
//   correlation.csv  correlation matrix of the parameters
//   curve.csv        measured vs fitted curve per wavelength with residuals
//   fit.json         everything above plus chi2, chi2 per point, stop reason
//   fitted_scene.toml  the scene at the best values, [fit] removed, its own
//                    wavelengths: ready for `lumtrap run`
// Fitted values are model estimates, not measurements.
#include <string>
#include <vector>

#include "fit/least_squares_fit.hpp"
#include "io/result_files.hpp"

namespace lumtrap {

std::vector<OutputFile> fit_files(const FitSetup& setup, const FitResult& result, double seconds, int threads);

}  // namespace lumtrap
