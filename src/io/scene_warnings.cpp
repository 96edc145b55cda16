#include "io/scene_warnings.hpp"

#include <algorithm>
#include <fmt/format.h>

namespace lumtrap {

std::vector<std::string> scene_warnings(const Scene& s) {
  std::vector<std::string> w;
  const double longest_um = s.illumination.wavelengths_nm.back() * 1e-3;
  const double limit_um = std::max(2.0, 2.0 * longest_um);
  for (const auto& [name, surface] : {std::pair{"front", &s.front}, std::pair{"rear", &s.rear}}) {
    const geometry::TextureDescriptor& d = geometry::texture_of(surface->texture);
    const double f = d.smallest_feature_um(surface->texture);
    if (f > 0 && f < limit_um)
      w.push_back(fmt::format(
          "{} texture has features down to about {:g} um, close to the wavelength ({:g} um): ray optics is "
          "an approximation there (diffraction is not modelled)",
          name, f, longest_um));
    if (d.regular && !s.run.randomize_lateral)
      w.push_back(fmt::format(
          "{} texture is perfectly regular and run.randomize_lateral = false: weakly absorbed light follows "
          "deterministic paths and its absorptance depends on thickness / period",
          name));
  }
  return w;
}

}  // namespace lumtrap
