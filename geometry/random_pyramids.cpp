// Random upright pyramids: the layout (random_pyramid_layout) meshed as the
// exact upper envelope of its pyramids (pyramid_envelope), and the texture
// descriptor of texture = "random_pyramids" (keys in [….random_pyramids]).
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <numbers>

#include "geometry/pyramid_envelope.hpp"
#include "geometry/random_pyramid_layout.hpp"
#include "geometry/texture_descriptor.hpp"
#include "geometry/textures.hpp"

namespace lumtrap::geometry {

TileMesh random_pyramids_tile(const RandomPyramidsSpec& spec, RandomPyramidsReport* report) {
  const RandomPyramidLayout layout = random_pyramids_layout(spec);
  EnvelopeStats stats;
  TileMesh mesh = pyramid_envelope_mesh(layout, spec.facet_deg, &stats);
  if (report) {
    report->pyramids_placed = layout.pyramids.size();
    report->pyramids_visible = stats.visible_pyramids;
    report->flat_fraction = layout.flat_fraction;
  }
  return mesh;
}

TileMesh random_pyramids_tile(const RandomPyramidsSpec& spec) { return random_pyramids_tile(spec, nullptr); }

namespace {

/// A random-pyramid tile must be at least this many mean pyramid sizes wide,
/// so that a tile holds enough pyramids to sample the size distribution.
constexpr double kMinTileOverMeanSize = 4.0;

const std::vector<std::string_view> kDistributions = {"fixed", "uniform", "normal", "lognormal"};

SizeDistribution distribution_of(const std::string& word) {
  if (word == "fixed") return SizeDistribution::fixed;
  if (word == "uniform") return SizeDistribution::uniform;
  if (word == "normal") return SizeDistribution::normal;
  return SizeDistribution::lognormal;
}

std::string um(double x) { return fmt::format("{} um", x); }

std::optional<ParamProblem> check_random(const TextureParams& p) {
  const RandomPyramidsSpec s = random_pyramids_spec(p);
  const bool fixed = s.distribution == SizeDistribution::fixed;
  const bool uniform = s.distribution == SizeDistribution::uniform;
  if (uniform && !(s.size_a_um < s.size_b_um))
    return ParamProblem{{"max", "min"},
                        fmt::format("min {} is not below max {}; allowed: min < max", um(s.size_a_um), um(s.size_b_um))};
  // Sizes below min_size are redrawn: the distribution must reach above it
  // (the same conditions as pyramid_sizes.cpp, reported with the key).
  const std::string size_key = fixed ? "size" : uniform ? "max" : "mean";
  const bool single_size = fixed || (!uniform && s.size_b_um == 0);  // every draw is size_a
  bool ok = true;
  double reach = s.size_a_um;
  if (single_size) {
    ok = s.size_a_um >= s.min_size_um;
  } else if (uniform) {
    reach = s.size_b_um;
    ok = s.size_b_um > s.min_size_um;
  }  // normal / lognormal with sd > 0 reach any size
  if (!ok)
    return ParamProblem{{"min_size", size_key},
                        fmt::format("min_size {} is above {} = {}, and sizes below min_size are redrawn; allowed: "
                                    "min_size below {}",
                                    um(s.min_size_um), size_key, um(reach), size_key)};
  double mean_size = uniform ? 0.5 * (s.size_a_um + s.size_b_um) : s.size_a_um;
  std::string how;
  if (s.distribution == SizeDistribution::normal && s.size_b_um > 0) {
    // Sizes below min_size are redrawn: the sizes follow the normal
    // distribution truncated at min_size, whose mean is
    //   mu + sd phi(a) / (1 - Phi(a)),  a = (min_size - mu) / sd
    // (N. L. Johnson, S. Kotz, N. Balakrishnan, Continuous Univariate
    // Distributions, vol. 1, 2nd ed., Wiley 1994, truncated normal
    // distributions). With sd >> mean this is far above `mean`.
    const double a = (s.min_size_um - s.size_a_um) / s.size_b_um;
    const double phi = std::exp(-0.5 * a * a) / std::sqrt(2 * std::numbers::pi);
    const double upper_tail = 0.5 * std::erfc(a / std::numbers::sqrt2);
    if (upper_tail > 0) mean_size = s.size_a_um + s.size_b_um * phi / upper_tail;
    if (mean_size > 1.01 * s.size_a_um)
      how = fmt::format(" (the sizes drawn: mean {} and sd {} with sizes below min_size {} drawn again)",
                        um(s.size_a_um), um(s.size_b_um), um(s.min_size_um));
  }
  if (s.tile_um < kMinTileOverMeanSize * mean_size)
    return ParamProblem{{"tile"},
                        fmt::format("tile {} is smaller than {} × the mean pyramid size {}{}; allowed: tile >= {}",
                                    um(s.tile_um), kMinTileOverMeanSize, um(mean_size), how,
                                    um(kMinTileOverMeanSize * mean_size))};
  return std::nullopt;
}

double random_feature(const TextureParams& p) {
  const RandomPyramidsSpec s = random_pyramids_spec(p);
  switch (s.distribution) {
    case SizeDistribution::fixed:
    case SizeDistribution::uniform: return s.size_a_um;
    case SizeDistribution::normal:
    case SizeDistribution::lognormal: return std::max(s.min_size_um, s.size_a_um - 2 * s.size_b_um);
  }
  return s.size_a_um;
}

}  // namespace

RandomPyramidsSpec random_pyramids_spec(const TextureParams& p) {
  RandomPyramidsSpec s;
  s.distribution = distribution_of(p.word("distribution"));
  switch (s.distribution) {
    case SizeDistribution::fixed: s.size_a_um = p.number("size"); break;
    case SizeDistribution::uniform:
      s.size_a_um = p.number("min");
      s.size_b_um = p.number("max");
      break;
    case SizeDistribution::normal:
    case SizeDistribution::lognormal:
      s.size_a_um = p.number("mean");
      s.size_b_um = p.number("sd");
      break;
  }
  s.min_size_um = p.number("min_size");
  s.facet_deg = p.number("facet_angle");
  s.flat_fraction = p.number("flat_fraction");
  s.tile_um = p.number("tile");
  s.seed = static_cast<std::uint64_t>(p.number("seed"));
  return s;
}

extern const TextureDescriptor kRandomPyramidsTexture;
const TextureDescriptor kRandomPyramidsTexture{
    .kind = "random_pyramids",
    .table = "random_pyramids",
    .summary = "random upright pyramids of random base size, placed at random in a periodic square tile",
    .params =
        {
            {.key = "distribution", .kind = ParamKind::word, .doc = "distribution of the base size",
             .fallback_word = "uniform", .words = kDistributions},
            {.key = "size", .kind = ParamKind::length_um, .doc = "base size", .lo = 0, .lo_open = true,
             .when_key = "distribution", .when_words = {"fixed"}, .required = true, .example = "3 um"},
            {.key = "min", .kind = ParamKind::length_um, .doc = "smallest base size", .fallback = 1.0, .lo = 0,
             .lo_open = true, .when_key = "distribution", .when_words = {"uniform"}, .example = "1 um"},
            {.key = "max", .kind = ParamKind::length_um, .doc = "largest base size (min < max)", .fallback = 5.0,
             .lo = 0, .lo_open = true, .when_key = "distribution", .when_words = {"uniform"}, .example = "5 um"},
            {.key = "mean", .kind = ParamKind::length_um, .doc = "mean base size", .lo = 0, .lo_open = true,
             .when_key = "distribution", .when_words = {"normal", "lognormal"}, .required = true,
             .example = "3 um"},
            {.key = "sd", .kind = ParamKind::length_um, .doc = "standard deviation of the base size", .lo = 0,
             .when_key = "distribution", .when_words = {"normal", "lognormal"}, .required = true,
             .example = "1 um"},
            {.key = "min_size", .kind = ParamKind::length_um,
             .doc = "sizes drawn below it are drawn again (normal tails); must lie below the largest size the "
                    "distribution gives",
             .fallback = 0.2, .lo = 0, .lo_open = true, .example = "0.2 um"},
            {.key = "facet_angle", .kind = ParamKind::angle_deg, .doc = "facet angle to the wafer plane",
             .fallback = kFacet111Deg, .lo = 0, .hi = 90, .lo_open = true, .hi_open = true,
             .example = "54.74 deg"},
            {.key = "flat_fraction", .kind = ParamKind::number,
             .doc = "projected area left flat: pyramids are added until at most this fraction is flat",
             .fallback = 0.0, .lo = 0, .hi = 1, .hi_open = true, .example = "0.05"},
            {.key = "tile", .kind = ParamKind::length_um,
             .doc = "tile side, at least 4 × the mean base size (so that one tile samples the distribution)",
             .fallback = 50.0, .lo = 0, .lo_open = true, .example = "50 um"},
            {.key = "seed", .kind = ParamKind::integer, .doc = "the same seed gives the same tile", .fallback = 1,
             .lo = 0, .hi = 9007199254740992.0, .example = "1"},
        },
    .regular = false,
    .check = check_random,
    .smallest_feature_um = random_feature,
    .build = [](const TextureParams& p) { return random_pyramids_tile(random_pyramids_spec(p)); },
};

}  // namespace lumtrap::geometry
