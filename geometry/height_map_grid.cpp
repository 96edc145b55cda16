// Cropping, binning, scaling and levelling of a height grid. See
// height_map_grid.hpp.
#include "geometry/height_map_grid.hpp"

#include <fmt/format.h>

#include <stdexcept>

namespace lumtrap::geometry {

HeightGrid crop_grid(const HeightGrid& g, const PixelRect& r) {
  if (r.columns == 0 || r.rows == 0 || r.column + r.columns > g.columns || r.row + r.rows > g.rows)
    throw std::invalid_argument(fmt::format(
        "geometry/height_map_grid.cpp: crop of {} × {} samples from column {}, row {} does not fit a {} × {} grid",
        r.columns, r.rows, r.column, r.row, g.columns, g.rows));
  HeightGrid out;
  out.columns = r.columns;
  out.rows = r.rows;
  out.pixel_size_um = g.pixel_size_um;
  out.values.resize(r.columns * r.rows);
  for (std::size_t j = 0; j < r.rows; ++j)
    for (std::size_t i = 0; i < r.columns; ++i) out.at(i, j) = g.at(r.column + i, r.row + j);
  return out;
}

HeightGrid bin_grid(const HeightGrid& g, std::size_t f) {
  if (f == 0 || f > g.columns || f > g.rows)
    throw std::invalid_argument(
        fmt::format("geometry/height_map_grid.cpp: bin factor {} for a {} × {} grid", f, g.columns, g.rows));
  if (f == 1) return g;
  HeightGrid out;
  out.columns = g.columns / f;
  out.rows = g.rows / f;
  out.pixel_size_um = g.pixel_size_um > 0 ? g.pixel_size_um * double(f) : 0.0;
  out.values.assign(out.columns * out.rows, 0.0);
  const double w = 1.0 / double(f * f);
  for (std::size_t j = 0; j < out.rows; ++j)
    for (std::size_t i = 0; i < out.columns; ++i) {
      double sum = 0;
      for (std::size_t b = 0; b < f; ++b)
        for (std::size_t a = 0; a < f; ++a) sum += g.at(i * f + a, j * f + b);
      out.at(i, j) = sum * w;
    }
  return out;
}

void scale_heights(HeightGrid& g, double factor) {
  for (double& v : g.values) v *= factor;
}

PlaneFit level_plane(HeightGrid& g, double pitch) {
  // Least squares on a full regular grid: with centred coordinates
  // u = x - x̄, w = y - ȳ the normal equations decouple (Σu = Σw = Σuw = 0):
  // b = Σ u z / Σ u², c = Σ w z / Σ w², a = z̄ - b x̄ - c ȳ.
  const std::size_t nx = g.columns, ny = g.rows;
  if (nx == 0 || ny == 0) return {};
  const double xc = 0.5 * double(nx - 1), yc = 0.5 * double(ny - 1);
  double sz = 0, suz = 0, swz = 0;
  for (std::size_t j = 0; j < ny; ++j) {
    const double w = double(j) - yc;
    double row_z = 0, row_uz = 0;
    for (std::size_t i = 0; i < nx; ++i) {
      const double z = g.at(i, j);
      row_z += z;
      row_uz += (double(i) - xc) * z;
    }
    sz += row_z;
    suz += row_uz;
    swz += w * row_z;
  }
  // Σ u² over the grid = ny · Σ_i (i - xc)² = ny · nx (nx² - 1) / 12, likewise for w.
  const double n = double(nx) * double(ny);
  const double suu = double(ny) * double(nx) * (double(nx) * double(nx) - 1.0) / 12.0;
  const double sww = double(nx) * double(ny) * (double(ny) * double(ny) - 1.0) / 12.0;
  const double b_index = suu > 0 ? suz / suu : 0.0;  // per sample
  const double c_index = sww > 0 ? swz / sww : 0.0;
  const double mean = sz / n;
  for (std::size_t j = 0; j < ny; ++j)
    for (std::size_t i = 0; i < nx; ++i)
      g.at(i, j) -= mean + b_index * (double(i) - xc) + c_index * (double(j) - yc);
  PlaneFit fit;
  fit.slope_x = b_index / pitch;
  fit.slope_y = c_index / pitch;
  fit.offset_um = mean - b_index * xc - c_index * yc;
  return fit;
}

}  // namespace lumtrap::geometry
