#pragma once
// The model's reflectance (and transmittance) of one scene at its run
// wavelengths: the exact planar solver when the scene is in its domain
// (trace/planar_run.hpp; sigma 0), otherwise the ray tracer with the
// scene's seed and photons (random streams keyed by seed, wavelength and
// photon only, so two scenes that differ a little trace nearly the same
// photon histories: the curve is a repeatable function of a scene parameter
// at a fixed seed, smooth but for steps of single photons changing fate). Model estimates, not measurements.
//
// total_reflectance = reflected_front + escaped_front; first surface =
// reflected_front. Standard errors of a traced sum of end states:
// sqrt(p (1 - p) / N), the binomial error of N independent photons (common
// practice). Threads: those of the current TBB arena.
#include <vector>

#include "fit/fit_spec.hpp"
#include "io/scene.hpp"

namespace lumtrap {

struct ModelCurve {
  bool exact = false;               ///< planar solver
  std::vector<double> reflectance;  ///< per run wavelength, fraction
  std::vector<double> reflectance_sigma;
  std::vector<double> transmittance;  ///< transmitted_rear
  std::vector<double> transmittance_sigma;
};

ModelCurve model_curve(const Scene& scene, CompareQuantity compare);

}  // namespace lumtrap
