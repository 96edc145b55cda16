#pragma once
// Physics warnings about a valid scene: things the model can compute but
// that users should not take at face value.
#include <string>
#include <vector>

#include "io/scene.hpp"

namespace lumtrap {

/// - Features near the wavelength: ray optics needs facets much larger than
///   the wavelength; pyramids below about 1-2 µm diffract, and a ray
///   tracer's answer for them is an approximation (common practice).
/// - Regular textures traced without lateral randomization: results depend
///   on thickness / period (deterministic paths).
std::vector<std::string> scene_warnings(const Scene& scene);

}  // namespace lumtrap
