#pragma once
// The exact planar-wafer solver (optics/planar_wafer.hpp) applied to a
// scene: every run wavelength, the scene's illumination angle and
// polarization, results in the same form as the ray tracer's.
#include "io/results.hpp"
#include "io/scene.hpp"

namespace lumtrap {

/// Throws std::invalid_argument when the scene is not a planar, specular
/// wafer under collimated light (the solver's domain).
Results planar_results(const Scene& scene);

}  // namespace lumtrap
