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
  // A rear pattern finer than a texture tile: the model treats the pattern
  // and the texture as independent, which holds only when the pattern's
  // features span many tiles (docs/scene-format.md, [rear.pattern]).
  if (s.rear_pattern) {
    const RearPatternGeometry& g = s.rear_pattern->geometry;
    const double finest = std::min(g.size_um > 0 ? g.size_um : g.pitch_um, g.pitch_um - g.size_um > 0 ? g.pitch_um - g.size_um : g.pitch_um);
    for (const auto& [name, surface] : {std::pair{"front", &s.front}, std::pair{"rear", &s.rear}}) {
      const geometry::TextureDescriptor& d = geometry::texture_of(surface->texture);
      std::string key(d.size_key);
      if (key.empty() || !surface->texture.numbers.count(key)) key = "period";
      if (!surface->texture.numbers.count(key)) continue;
      const double tile = surface->texture.number(key);
      if (tile > 0 && finest < tile)
        w.push_back(fmt::format(
            "{}: the rear pattern has features of {:g} um, finer than the {} texture tile ({}.{} = {:g} um): the "
            "model takes pattern and texture as independent, which needs pattern features much larger than the "
            "tile",
            s.where("rear.pattern"), finest, name, name, key, tile));
    }
  }
  // Weakly absorbed light in a light-trapping wafer crosses the bulk about
  // 4 n² ≈ 50 times on average (n ≈ 3.5 for silicon near 1100 nm, from
  // memory; E. Yablonovitch, "Statistical ray optics", J. Opt. Soc. Am. 72,
  // 899 (1982)), each crossing ending in a surface interaction: a smaller
  // limit leaves such photons unresolved.
  constexpr int kTrappedInteractions = 100;
  if (s.run.max_bounces < kTrappedInteractions)
    w.push_back(fmt::format(
        "{}: run.max_bounces = {} is below the ~{} surface interactions that light trapped in a wafer makes on "
        "average (4 n^2 passes, Yablonovitch 1982): photons still travelling then end as unresolved and J_G is "
        "underestimated; the default is 10000",
        s.where("run.max_bounces"), s.run.max_bounces, kTrappedInteractions));
  return w;
}

}  // namespace lumtrap
