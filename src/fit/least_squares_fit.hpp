#pragma once
// Fitting scene parameters to a measured reflectance curve by weighted
// least squares.
//
// Minimiser: Eigen's Levenberg-Marquardt (unsupported/Eigen/LevenbergMarquardt,
// Debian libeigen3-dev; a port of the MINPACK lmder routine: J. J. Moré,
// "The Levenberg-Marquardt algorithm: implementation and theory", Lecture
// Notes in Mathematics 630, 1978). Chosen because Eigen is already a
// dependency and the problems are tiny (a few parameters, at most some
// hundred points); Ceres would add a large dependency for no gain here.
// It has no bounds, so each bounded parameter x in [lo, hi] is fitted
// through an unbounded u with x = lo + (hi - lo) (1 + sin u) / 2 (the sine
// transform, common practice): every trial value lies inside the bounds.
// A start exactly on a bound is moved inward by 1e-6 of the range (dx/du
// vanishes on the bound).
//
// Residuals r_i = (M_i(x) - D_i) / w_i at the measured wavelengths used
// (and, when the curve has transmittance, T as well):
//   with an uncertainty column: w_i = sqrt(u_i² + s_i²), s_i the Monte Carlo
//     standard error of the model at the start (0 for the exact solver);
//   without: w_i = 1 (unweighted), and the covariance is scaled by
//     χ²/(m - p), so the scatter of the residuals (measurement and Monte
//     Carlo noise together) sets the errors.
// Jacobian: forward differences in x with a step of 1e-6 (exact solver) or
// 1e-2 (ray tracer) of each parameter's range, at the scene's fixed seed
// (common random numbers: every evaluation traces the same photon streams).
// A traced curve is then smooth on the scale of the parameter ranges but
// piecewise constant on the scale where no photon changes its fate, so a
// column that is exactly zero is retried with a 10 times larger step, and
// a parameter is refused as a flat direction only when the curve does not
// change up to its farther bound either.
// Covariance C = (JᵀJ)⁻¹ (× χ²/(m - p) when unweighted) at the best fit,
// with the weights recomputed there; standard errors sqrt(C_jj),
// correlation C_jk / sqrt(C_jj C_kk) (common practice; W. H. Press et al.,
// Numerical Recipes, 3rd ed., 2007, §15.5). Results are model estimates.
#include <filesystem>
#include <functional>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

#include <Eigen/Dense>
#include <toml++/toml.h>

#include "fit/fit_spec.hpp"
#include "fit/model_curve.hpp"
#include "io/measured_curve.hpp"
#include "io/scene.hpp"

namespace lumtrap {

/// Bad input (found before tracing) or a fit that cannot go on (a flat direction).
struct FitError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// Everything a fit needs, read and checked before any tracing.
struct FitSetup {
  std::filesystem::path scene_file;
  toml::table root;          ///< the scene file's table, [fit] included
  FitSpec spec;
  MeasuredCurve measured;    ///< only the points used (inside fit.from..to)
  bool exact = false;        ///< the start scene is in the planar solver's domain
  Scene start_scene;         ///< at the start values, run wavelengths = the measured ones
};

/// Reads and checks: the scene file (no [sweep]), its [fit], the measured
/// curve, the wavelength overlap, and the scene at the start and at each
/// parameter's bounds. `photons` > 0 overrides run.photons.
FitSetup prepare_fit(const std::filesystem::path& scene_file, const std::filesystem::path& measured_file,
                     long long photons = 0);

/// The scene at parameter values x (physical units of each parameter).
/// `measured_wavelengths`: run at the measured wavelengths used (true) or
/// at the scene's own wavelengths (false: the fitted scene to run).
Scene scene_at(const FitSetup& setup, const std::vector<double>& x, bool measured_wavelengths);

struct FitResult {
  std::vector<double> best;            ///< per parameter, in its unit
  std::vector<double> standard_error;
  Eigen::MatrixXd correlation;
  double chi2 = 0;                     ///< Σ r_i² at the best fit
  std::size_t points = 0;              ///< residuals m
  std::size_t dof = 0;                 ///< m - p
  bool weighted = false;               ///< uncertainty column given
  int evaluations = 0;                 ///< model curves computed
  int iterations = 0;
  std::string stop_reason;
  ModelCurve fitted;                   ///< at the best fit
  std::vector<double> weight;          ///< w_i of the reflectance points at the best fit
};

using FitProgress = std::function<void(int evaluations, double chi2)>;

/// Runs the fit. FitError when a parameter does not change the curve at
/// the start (a zero Jacobian column: flat direction).
FitResult fit_model(const FitSetup& setup, const FitProgress& progress = {});

}  // namespace lumtrap
