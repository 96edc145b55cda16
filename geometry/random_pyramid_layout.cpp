#include "geometry/random_pyramid_layout.hpp"

#include <cmath>
#include <random>
#include <stdexcept>
#include <string>

#include "geometry/pyramid_sizes.hpp"
#include "geometry/random_draws.hpp"
#include "geometry/tile_grid.hpp"

namespace lumtrap::geometry {

namespace {

void check(bool ok, const std::string& what) {
  if (!ok) throw std::invalid_argument("geometry/random_pyramid_layout.cpp: random pyramids: " + what);
}

// Removes the square s from rectangle r, appending the remaining pieces to
// `out`: full-height strips left and right of s, then the parts below and
// above s between them. Returns the area removed.
double subtract_square(const FlatRect& r, const PyramidImage& s, std::vector<FlatRect>& out) {
  if (s.x0 >= r.x1 || s.x1 <= r.x0 || s.y0 >= r.y1 || s.y1 <= r.y0) {
    out.push_back(r);
    return 0.0;
  }
  if (s.x0 > r.x0) out.push_back({r.x0, r.y0, s.x0, r.y1});
  if (s.x1 < r.x1) out.push_back({s.x1, r.y0, r.x1, r.y1});
  const double mx0 = std::max(r.x0, s.x0), mx1 = std::min(r.x1, s.x1);
  if (s.y0 > r.y0) out.push_back({mx0, r.y0, mx1, s.y0});
  if (s.y1 < r.y1) out.push_back({mx0, s.y1, mx1, r.y1});
  const double my0 = std::max(r.y0, s.y0), my1 = std::min(r.y1, s.y1);
  return (mx1 - mx0) * (my1 - my0);
}

// The flat part of the tile (tile minus the union of base squares, periodic
// images included) as disjoint rectangles, kept per bin of a grid.
class FlatRegion {
 public:
  FlatRegion(double period, double bin_um) : period_(period), grid_(period, bin_um, 1024) {
    bins_.resize(static_cast<std::size_t>(grid_.n) * grid_.n);
    for (int j = 0; j < grid_.n; ++j)
      for (int i = 0; i < grid_.n; ++i)
        bins_[index(i, j)].push_back({grid_.edges[i], grid_.edges[j], grid_.edges[i + 1], grid_.edges[j + 1]});
    count_ = bins_.size();
    area_ = period * period;
  }

  void remove(const PlacedPyramid& p) {
    for_each_image(p, period_, [&](const PyramidImage& s) {
      const int i0 = grid_.first(s.x0), i1 = grid_.last(s.x1);
      const int j0 = grid_.first(s.y0), j1 = grid_.last(s.y1);
      for (int j = j0; j <= j1; ++j)
        for (int i = i0; i <= i1; ++i) {
          std::vector<FlatRect>& rects = bins_[index(i, j)];
          if (rects.empty()) continue;
          scratch_.clear();
          for (const FlatRect& r : rects) area_ -= subtract_square(r, s, scratch_);
          count_ += scratch_.size();
          count_ -= rects.size();
          rects.swap(scratch_);
        }
    });
  }

  /// Running flat area (µm², accumulates rounding; exact_area() for the final value).
  double area() const { return area_; }
  std::size_t rect_count() const { return count_; }

  /// All rectangles, and their exact total area.
  std::vector<FlatRect> collect(double& exact_area) const {
    std::vector<FlatRect> all;
    all.reserve(count_);
    exact_area = 0.0;
    for (const auto& rects : bins_)
      for (const FlatRect& r : rects) {
        all.push_back(r);
        exact_area += (r.x1 - r.x0) * (r.y1 - r.y0);
      }
    return all;
  }

 private:
  std::size_t index(int i, int j) const { return static_cast<std::size_t>(j) * grid_.n + i; }

  double period_;
  TileGrid grid_;
  std::vector<std::vector<FlatRect>> bins_;
  std::vector<FlatRect> scratch_;
  std::size_t count_ = 0;
  double area_ = 0;
};

}  // namespace

RandomPyramidLayout random_pyramids_layout(const RandomPyramidsSpec& spec) {
  check(std::isfinite(spec.tile_um) && spec.tile_um > 0,
        "tile_um = " + std::to_string(spec.tile_um) + " (allowed: > 0)");
  check(spec.facet_deg > 0 && spec.facet_deg < 90,
        "facet_deg = " + std::to_string(spec.facet_deg) + " (allowed: 0 < facet_deg < 90)");
  check(spec.flat_fraction >= 0 && spec.flat_fraction <= 1,
        "flat_fraction = " + std::to_string(spec.flat_fraction) + " (allowed: 0 to 1)");
  const PyramidSizeSampler sizes(spec);
  const double P = spec.tile_um;
  FlatRegion flat(P, sizes.mean());
  const double target_area = spec.flat_fraction * P * P;

  // Safety cap: full coverage of a tile that holds N mean pyramid bases
  // needs about N·ln(N) random draws (coupon collector); allow far more.
  const double n_tile = P * P / sizes.mean_square() + 1.0;
  const double cap = std::min(2e8, 20.0 * n_tile * (std::log(n_tile) + 10.0));

  RandomPyramidLayout layout;
  layout.period = P;
  std::mt19937_64 rng(spec.seed);
  // flat_fraction = 0 asks for full coverage: no flat rectangle left at all.
  auto done = [&] { return spec.flat_fraction > 0 ? flat.area() <= target_area : flat.rect_count() == 0; };
  while (!done() && static_cast<double>(layout.pyramids.size()) < cap) {
    PlacedPyramid p;
    p.cx = P * uniform01(rng);
    p.cy = P * uniform01(rng);
    p.base = sizes.draw(rng);
    layout.pyramids.push_back(p);
    flat.remove(p);
  }

  double exact = 0.0;
  layout.flat_regions = flat.collect(exact);
  layout.flat_fraction = exact / (P * P);
  if (layout.flat_fraction > spec.flat_fraction + 1e-6)
    throw std::runtime_error(
        "geometry/random_pyramid_layout.cpp: random pyramids: flat_fraction = " +
        std::to_string(spec.flat_fraction) + " not reached after " + std::to_string(layout.pyramids.size()) +
        " pyramids (flat fraction left " + std::to_string(layout.flat_fraction) +
        "); the pyramids are too small for tile_um = " + std::to_string(P));
  return layout;
}

RandomPyramidLayout layout_from_pyramids(double period_um, std::vector<PlacedPyramid> pyramids) {
  check(std::isfinite(period_um) && period_um > 0, "period = " + std::to_string(period_um) + " (allowed: > 0)");
  double mean = 0.0;
  for (const PlacedPyramid& p : pyramids) {
    check(p.cx >= 0 && p.cx < period_um && p.cy >= 0 && p.cy < period_um,
          "pyramid centre (" + std::to_string(p.cx) + ", " + std::to_string(p.cy) +
              ") (allowed: inside [0, period)²)");
    check(p.base > 0, "pyramid base = " + std::to_string(p.base) + " (allowed: > 0)");
    mean += p.base / pyramids.size();
  }
  FlatRegion flat(period_um, pyramids.empty() ? period_um : mean);
  for (const PlacedPyramid& p : pyramids) flat.remove(p);
  RandomPyramidLayout layout;
  layout.period = period_um;
  layout.pyramids = std::move(pyramids);
  double exact = 0.0;
  layout.flat_regions = flat.collect(exact);
  layout.flat_fraction = exact / (period_um * period_um);
  return layout;
}

}  // namespace lumtrap::geometry
