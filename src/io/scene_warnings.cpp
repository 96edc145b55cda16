#include "io/scene_warnings.hpp"

#include <algorithm>
#include <fmt/format.h>

namespace lumtrap {

namespace {

// The smallest typical facet size of a texture, µm (0 for planar).
double smallest_feature_um(const Texture& t) {
  using geometry::SizeDistribution;
  switch (t.kind) {
    case TextureKind::planar: return 0;
    case TextureKind::upright_pyramids:
    case TextureKind::inverted_pyramids: return t.base_um;
    case TextureKind::random_pyramids:
      switch (t.random.distribution) {
        case SizeDistribution::fixed: return t.random.size_a_um;
        case SizeDistribution::uniform: return t.random.size_a_um;
        case SizeDistribution::normal:
        case SizeDistribution::lognormal:
          return std::max(t.random.min_size_um, t.random.size_a_um - 2 * t.random.size_b_um);
      }
  }
  return 0;
}

}  // namespace

std::vector<std::string> scene_warnings(const Scene& s) {
  std::vector<std::string> w;
  const double longest_um = s.illumination.wavelengths_nm.back() * 1e-3;
  const double limit_um = std::max(2.0, 2.0 * longest_um);
  for (const auto& [name, surface] : {std::pair{"front", &s.front}, std::pair{"rear", &s.rear}}) {
    const double f = smallest_feature_um(surface->texture);
    if (f > 0 && f < limit_um)
      w.push_back(fmt::format(
          "{} texture has features down to about {:g} um, close to the wavelength ({:g} um): ray optics is "
          "an approximation there (diffraction is not modelled)",
          name, f, longest_um));
    const bool regular = surface->texture.kind == TextureKind::upright_pyramids ||
                         surface->texture.kind == TextureKind::inverted_pyramids;
    if (regular && !s.run.randomize_lateral)
      w.push_back(fmt::format(
          "{} texture is perfectly regular and run.randomize_lateral = false: weakly absorbed light follows "
          "deterministic paths and its absorptance depends on thickness / period",
          name));
  }
  return w;
}

}  // namespace lumtrap
