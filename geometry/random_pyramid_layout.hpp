#pragma once
// Where the random pyramids of a RandomPyramidsSpec stand: centres drawn
// uniformly in the tile, base sizes from the spec's distribution, pyramids
// added one by one until the flat (uncovered) projected fraction of the tile
// is at most spec.flat_fraction. The flat region is tracked exactly as a set
// of axis-aligned rectangles (tile minus the union of the base squares,
// periodic images included).
#include <cmath>
#include <cstddef>
#include <vector>

#include "geometry/textures.hpp"

namespace lumtrap::geometry {

struct PlacedPyramid {
  double cx = 0;    ///< centre x in [0, period), µm
  double cy = 0;    ///< centre y in [0, period), µm
  double base = 0;  ///< side of the square base, µm
};

struct FlatRect {
  double x0 = 0, y0 = 0, x1 = 0, y1 = 0;  ///< µm, x0 < x1, y0 < y1
};

struct RandomPyramidLayout {
  double period = 0;                    ///< tile side, µm
  std::vector<PlacedPyramid> pyramids;  ///< in the order drawn (all of them, hidden ones too)
  std::vector<FlatRect> flat_regions;   ///< disjoint rectangles covering the flat part exactly
  double flat_fraction = 0;             ///< area of flat_regions / period²
};

/// Draws the layout of `spec` (reproducible for a given seed on every
/// platform: std::mt19937_64 with hand-written variates). Throws
/// std::invalid_argument for a bad spec and std::runtime_error if the safety
/// cap on the number of pyramids is reached with the flat fraction still more
/// than 1e-6 above the target.
RandomPyramidLayout random_pyramids_layout(const RandomPyramidsSpec& spec);

/// A layout from given pyramids (centres in [0, period)², any sizes): the
/// flat region is computed exactly as in random_pyramids_layout.
RandomPyramidLayout layout_from_pyramids(double period_um, std::vector<PlacedPyramid> pyramids);

/// One periodic image of a pyramid: centre shifted by (mx, my)·period.
struct PyramidImage {
  double cx = 0, cy = 0, half = 0;  ///< µm
  int mx = 0, my = 0;
  double x0 = 0, x1 = 0, y0 = 0, y1 = 0;  ///< base square, µm
};

/// Calls f(PyramidImage) for every image of `p` whose base square overlaps
/// the open tile (0, period)². The square bounds are computed here and only
/// here, so every user sees the same numbers.
template <class F>
void for_each_image(const PlacedPyramid& p, double period, F&& f) {
  const double half = 0.5 * p.base;
  const int m_lo = static_cast<int>(std::floor((-half - p.cx) / period)) - 1;
  const int m_hi = static_cast<int>(std::ceil((period + half - p.cx) / period)) + 1;
  const int n_lo = static_cast<int>(std::floor((-half - p.cy) / period)) - 1;
  const int n_hi = static_cast<int>(std::ceil((period + half - p.cy) / period)) + 1;
  for (int mx = m_lo; mx <= m_hi; ++mx) {
    const double cx = mx == 0 ? p.cx : p.cx + mx * period;
    const double x0 = cx - half, x1 = cx + half;
    if (!(x0 < period && x1 > 0)) continue;
    for (int my = n_lo; my <= n_hi; ++my) {
      const double cy = my == 0 ? p.cy : p.cy + my * period;
      const double y0 = cy - half, y1 = cy + half;
      if (!(y0 < period && y1 > 0)) continue;
      f(PyramidImage{cx, cy, half, mx, my, x0, x1, y0, y1});
    }
  }
}

}  // namespace lumtrap::geometry
