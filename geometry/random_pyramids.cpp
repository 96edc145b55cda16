// Random upright pyramids: the layout (random_pyramid_layout) meshed as the
// exact upper envelope of its pyramids (pyramid_envelope) when they are
// sharp and share one facet angle, else as the rounded envelope of pyramids
// with their own facet angles (rounded_envelope); and the texture descriptor
// of texture = "random_pyramids" (keys in [….random_pyramids]), whose keys
// random inverted pyramids share (random_pyramid_keys.hpp).
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <numbers>

#include "geometry/etch_shape_keys.hpp"
#include "geometry/pyramid_envelope.hpp"
#include "geometry/random_pyramid_count.hpp"
#include "geometry/random_pyramid_keys.hpp"
#include "geometry/random_pyramid_layout.hpp"
#include "geometry/texture_descriptor.hpp"
#include "geometry/textures.hpp"

namespace lumtrap::geometry {

bool is_sharp_single_angle(const RandomPyramidsSpec& spec) {
  return spec.shape.tip_radius_um == 0 && spec.shape.valley_radius_um == 0 &&
         spec.facet_spread.distribution == AngleDistribution::fixed;
}

TileMesh random_pyramids_tile(const RandomPyramidsSpec& spec, RandomPyramidsReport* report) {
  const RandomPyramidLayout layout = random_pyramids_layout(spec);
  if (report) {
    report->pyramids_placed = layout.pyramids.size();
    report->flat_fraction = layout.flat_fraction;
  }
  if (is_sharp_single_angle(spec)) {
    EnvelopeStats stats;
    TileMesh mesh = pyramid_envelope_mesh(layout, spec.facet_deg, &stats);
    if (report) report->pyramids_visible = stats.visible_pyramids;
    return mesh;
  }
  const std::vector<double> angles = draw_facet_angles(spec.facet_spread, layout.pyramids.size(), spec.seed);
  std::vector<ShapedPyramid> shaped(layout.pyramids.size());
  for (std::size_t i = 0; i < shaped.size(); ++i)
    shaped[i] = {layout.pyramids[i].cx, layout.pyramids[i].cy, layout.pyramids[i].base, angles[i]};
  return rounded_envelope_mesh(layout.period, shaped, spec.shape);
}

TileMesh random_inverted_pyramids_tile(const RandomPyramidsSpec& spec, RandomPyramidsReport* report) {
  // Pits are upright pyramids mirrored in height: the rims between pits are
  // the upright texture's valleys, the pit bottoms its tips.
  RandomPyramidsSpec upright = spec;
  std::swap(upright.shape.tip_radius_um, upright.shape.valley_radius_um);
  TileMesh mesh = random_pyramids_tile(upright, report);
  mirror_to_pits(mesh);
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

}  // namespace

std::optional<ParamProblem> check_random_pyramids(const TextureParams& p) {
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
  const FacetAngleSpread& f = s.facet_spread;
  if (f.distribution == AngleDistribution::uniform && !(f.a_deg < f.b_deg))
    return ParamProblem{{"facet_angle_max", "facet_angle_min"},
                        fmt::format("facet_angle_min {} deg is not below facet_angle_max {} deg; allowed: min < max",
                                    f.a_deg, f.b_deg)};
  if (f.distribution == AngleDistribution::normal && !(f.a_deg - 3 * f.b_deg > 0 && f.a_deg + 3 * f.b_deg < 90))
    return ParamProblem{{"facet_angle_sd", "facet_angle"},
                        fmt::format("facet_angle {} deg ± 3 × facet_angle_sd {} deg reaches outside (0, 90) deg "
                                    "(draws are truncated at ± 3 sd); allowed: facet_angle_sd below {:.4g} deg",
                                    f.a_deg, f.b_deg, std::min(f.a_deg, 90 - f.a_deg) / 3)};
  if (is_sharp_single_angle(s)) return std::nullopt;
  return check_mesh_size(s.tile_um, mean_size, random_pyramids_feature(p), steepest_facet_angle(f), s.shape);
}

double random_pyramids_triangles(const TextureParams& p) {
  return estimate_random_pyramids(random_pyramids_spec(p)).triangles;
}

double random_pyramids_feature(const TextureParams& p) {
  const RandomPyramidsSpec s = random_pyramids_spec(p);
  switch (s.distribution) {
    case SizeDistribution::fixed:
    case SizeDistribution::uniform: return s.size_a_um;
    case SizeDistribution::normal:
    case SizeDistribution::lognormal: return std::max(s.min_size_um, s.size_a_um - 2 * s.size_b_um);
  }
  return s.size_a_um;
}

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
  const std::string& spread = p.word("facet_angle_distribution");
  if (spread == "uniform") {
    s.facet_spread = {AngleDistribution::uniform, p.number("facet_angle_min"), p.number("facet_angle_max")};
    s.facet_deg = 0.5 * (s.facet_spread.a_deg + s.facet_spread.b_deg);
  } else if (spread == "normal") {
    s.facet_spread = {AngleDistribution::normal, p.number("facet_angle"), p.number("facet_angle_sd")};
    s.facet_deg = s.facet_spread.a_deg;
  } else {
    s.facet_spread = {AngleDistribution::fixed, p.number("facet_angle"), 0.0};
    s.facet_deg = s.facet_spread.a_deg;
  }
  s.shape = etch_shape(p);
  s.flat_fraction = p.number("flat_fraction");
  s.tile_um = p.number("tile");
  s.seed = static_cast<std::uint64_t>(p.number("seed"));
  return s;
}

std::vector<ParamSpec> random_pyramid_params() {
  return {
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
      {.key = "facet_angle_distribution", .kind = ParamKind::word,
       .doc = "distribution of the facet angle over the pyramids (one angle per pyramid)",
       .fallback_word = "fixed", .words = {"fixed", "uniform", "normal"}},
      {.key = "facet_angle", .kind = ParamKind::angle_deg,
       .doc = "facet angle to the wafer plane (normal: the mean); default atan(sqrt 2) (common practice)",
       .fallback = kFacet111Deg, .lo = 0, .hi = 90, .lo_open = true, .hi_open = true,
       .when_key = "facet_angle_distribution", .when_words = {"fixed", "normal"}, .example = "54.74 deg"},
      {.key = "facet_angle_sd", .kind = ParamKind::angle_deg,
       .doc = "standard deviation of the facet angle (draws truncated at ± 3 sd, inside (0, 90) deg)", .lo = 0,
       .when_key = "facet_angle_distribution", .when_words = {"normal"}, .required = true,
       .example = "2 deg"},
      {.key = "facet_angle_min", .kind = ParamKind::angle_deg, .doc = "lowest facet angle", .lo = 0, .hi = 90,
       .lo_open = true, .hi_open = true, .when_key = "facet_angle_distribution", .when_words = {"uniform"},
       .required = true, .example = "50 deg"},
      {.key = "facet_angle_max", .kind = ParamKind::angle_deg, .doc = "highest facet angle (min < max)",
       .lo = 0, .hi = 90, .lo_open = true, .hi_open = true, .when_key = "facet_angle_distribution",
       .when_words = {"uniform"}, .required = true, .example = "56 deg"},
      {.key = "flat_fraction", .kind = ParamKind::number,
       .doc = "projected area left flat: pyramids are added until at most this fraction is flat",
       .fallback = 0.0, .lo = 0, .hi = 1, .hi_open = true, .example = "0.05"},
      {.key = "tile", .kind = ParamKind::length_um,
       .doc = "tile side, at least 4 × the mean base size (so that one tile samples the distribution)",
       .fallback = 50.0, .lo = 0, .lo_open = true, .example = "50 um"},
      {.key = "seed", .kind = ParamKind::integer, .doc = "the same seed gives the same tile", .fallback = 1,
       .lo = 0, .hi = 9007199254740992.0, .example = "1"},
      tip_radius_param(),
      valley_radius_param(),
      angular_error_param(),
  };
}

extern const TextureDescriptor kRandomPyramidsTexture;
const TextureDescriptor kRandomPyramidsTexture{
    .kind = "random_pyramids",
    .table = "random_pyramids",
    .summary = "random upright pyramids of random base size, placed at random in a periodic square tile",
    .params = random_pyramid_params(),
    .regular = false,
    .check = check_random_pyramids,
    .smallest_feature_um = random_pyramids_feature,
    .build = [](const TextureParams& p) { return random_pyramids_tile(random_pyramids_spec(p)); },
    .estimate_triangles = random_pyramids_triangles,
    .size_key = "tile",
    .size_advice = kRandomPyramidsSizeAdvice,
};

}  // namespace lumtrap::geometry
