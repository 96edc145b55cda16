#include "geometry/random_pyramid_count.hpp"

#include <algorithm>
#include <cmath>
#include <vector>

#include "geometry/pyramid_sizes.hpp"

namespace lumtrap::geometry {

namespace {

// λ·E[s²] when no flat spot may be left (flat_fraction = 0): ln(A) + this,
// A = tile²/E[s²]. Fitted to measured layouts (fixed 5 µm, uniform 1-5 µm,
// normal and lognormal 3 ± 1 µm; tiles 50-400 µm): the measured values lie
// within ±3 of it, i.e. the placed count within a factor of about 1.3.
constexpr double kFullCoverageOffset = 5.5;
// Triangles per visible pyramid, and the extra per unit flat fraction
// (fitted to the same tiles: 14.2-15.2 at full coverage).
constexpr double kTrianglesPerVisible = 14.5;
constexpr double kTrianglesPerVisiblePerFlat = 15.0;

struct SizeNode {
  double s = 0, w = 0;  // size (µm) and probability weight
};

// The size distribution after redrawing (sizes below min_size drawn again),
// as quadrature nodes in increasing size with weights summing to 1.
std::vector<SizeNode> size_nodes(const RandomPyramidsSpec& spec) {
  const double a = spec.size_a_um, b = spec.size_b_um, lo_size = spec.min_size_um;
  constexpr int K = 2000;
  std::vector<SizeNode> nodes;
  auto grid = [&](double lo, double hi, auto size_of, auto weight_of) {
    if (!(hi > lo)) hi = lo * (1 + 1e-9) + 1e-12;
    for (int k = 0; k < K; ++k) {
      const double t = lo + (hi - lo) * (k + 0.5) / K;
      nodes.push_back({size_of(t), weight_of(t)});
    }
  };
  const auto same = [](double t) { return t; };
  switch (spec.distribution) {
    case SizeDistribution::fixed: nodes.push_back({a, 1.0}); break;
    case SizeDistribution::uniform:
      grid(std::max(a, lo_size), b, same, [](double) { return 1.0; });
      break;
    case SizeDistribution::normal:
      if (b == 0) {
        nodes.push_back({a, 1.0});
        break;
      }
      grid(std::max(lo_size, a - 8 * b), std::max(a + 8 * b, lo_size + 8 * b), same,
           [&](double s) { return std::exp(-0.5 * ((s - a) / b) * ((s - a) / b)); });
      break;
    case SizeDistribution::lognormal: {
      if (b == 0) {
        nodes.push_back({a, 1.0});
        break;
      }
      // ln(size) ~ N(mu, sigma²) with mean a and standard deviation b (as pyramid_sizes.cpp).
      const double s2 = std::log1p((b / a) * (b / a));
      const double sigma = std::sqrt(s2), mu = std::log(a) - 0.5 * s2;
      grid(std::max(std::log(lo_size), mu - 8 * sigma), std::max(mu + 8 * sigma, std::log(lo_size) + 8 * sigma),
           [](double t) { return std::exp(t); },
           [&](double t) { return std::exp(-0.5 * ((t - mu) / sigma) * ((t - mu) / sigma)); });
      break;
    }
  }
  double total = 0;
  for (const SizeNode& n : nodes) total += n.w;
  if (!(total > 0)) return {{std::max(a, lo_size), 1.0}};
  for (SizeNode& n : nodes) n.w /= total;
  return nodes;
}

}  // namespace

RandomPyramidCount estimate_random_pyramids(const RandomPyramidsSpec& spec) {
  const PyramidSizeSampler sampler(spec);  // validates the sizes
  const std::vector<SizeNode> nodes = size_nodes(spec);
  RandomPyramidCount c;
  for (const SizeNode& n : nodes) c.mean_square_um2 += n.w * n.s * n.s;
  const double area = spec.tile_um * spec.tile_um;
  const double cells = area / c.mean_square_um2;
  // λ·E[s²]: the coverage the layout stops at.
  double coverage = std::log(std::max(cells, 1.0)) + kFullCoverageOffset;
  if (spec.flat_fraction > 0) coverage = std::min(coverage, std::log(1.0 / spec.flat_fraction));
  c.placed = coverage * cells;
  // random_pyramid_layout.cpp stops at its safety cap whatever the coverage.
  const double n_tile = area / sampler.mean_square() + 1.0;
  c.placed = std::min(c.placed, std::min(2e8, 20.0 * n_tile * (std::log(n_tile) + 10.0)));
  const double lambda = c.placed / area;

  // Visible fraction: E_s[exp(-λ·Σ_{s'>s} w'(s' - s)²)], suffix sums over the nodes.
  double s0 = 0, s1 = 0, s2 = 0, visible = 0;
  for (auto it = nodes.rbegin(); it != nodes.rend(); ++it) {
    const double s = it->s;
    const double hide = s2 - 2 * s * s1 + s * s * s0;
    visible += it->w * std::exp(-lambda * std::max(0.0, hide));
    s0 += it->w;
    s1 += it->w * s;
    s2 += it->w * s * s;
  }
  c.visible = c.placed * visible;
  c.triangles = std::max(2.0, (kTrianglesPerVisible + kTrianglesPerVisiblePerFlat * spec.flat_fraction) * c.visible);
  return c;
}

}  // namespace lumtrap::geometry
