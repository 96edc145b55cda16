#pragma once
// The exact planar-wafer solver (optics/planar_wafer.hpp) applied to a
// scene: every run wavelength, the scene's illumination angle and
// polarization, results in the same form as the ray tracer's.
#include <optional>
#include <string>

#include "io/results.hpp"
#include "io/scene.hpp"

namespace lumtrap {

/// Why the solver cannot take the scene (planar, specular, film interfaces,
/// no perfect mirror, collimated light), or nothing when it can.
std::optional<std::string> planar_solver_problem(const Scene& scene);

/// Throws std::invalid_argument with planar_solver_problem's text when the
/// scene lies outside the solver's domain.
Results planar_results(const Scene& scene);

}  // namespace lumtrap
