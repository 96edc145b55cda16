#pragma once
// A uniform n x n grid of bins over the tile [0, period)², used to find the
// pyramids or flat pieces near a point or a box. Bin edges are computed once
// (edge j = period·j/n) so that neighbouring bins share them exactly.
#include <algorithm>
#include <cmath>
#include <vector>

namespace lumtrap::geometry {

struct TileGrid {
  int n = 1;
  double period = 0;
  std::vector<double> edges;  ///< n + 1 values, edges[0] = 0, edges[n] = period

  TileGrid() = default;
  /// Bins of about `bin_um` (at least 1, at most max_bins per side).
  TileGrid(double period_um, double bin_um, int max_bins) : period(period_um) {
    const double want = bin_um > 0 ? std::floor(period_um / bin_um) : 1.0;
    n = static_cast<int>(std::clamp(want, 1.0, static_cast<double>(max_bins)));
    edges.resize(n + 1);
    for (int j = 0; j <= n; ++j) edges[j] = period_um * j / n;
    edges[n] = period_um;
  }

  /// First bin whose closed extent [edges[j], edges[j+1]] holds x: the
  /// smallest j with x <= edges[j+1] (clamped to the grid). Non-decreasing in x.
  int first(double x) const {
    int j = guess(x);
    while (j > 0 && x <= edges[j]) --j;
    while (j < n - 1 && x > edges[j + 1]) ++j;
    return j;
  }
  /// Last bin whose closed extent holds x: the largest j with x >= edges[j]
  /// (clamped). Non-decreasing in x, and first(x) <= last(x).
  int last(double x) const {
    int j = guess(x);
    while (j < n - 1 && x >= edges[j + 1]) ++j;
    while (j > 0 && x < edges[j]) --j;
    return j;
  }

 private:
  int guess(double x) const {
    const double g = std::floor(x / period * n);
    return static_cast<int>(std::clamp(std::isfinite(g) ? g : 0.0, 0.0, n - 1.0));
  }
};

}  // namespace lumtrap::geometry
