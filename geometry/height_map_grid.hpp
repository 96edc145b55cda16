#pragma once
// A rectangular grid of height samples as a height-map file gives it, and
// the steps that prepare it before it is made periodic
// (height_map_periodic.hpp): cropping, binning and levelling.
//
// Conventions:
//  - sample (column i, row j) is the height at x = i·pitch, y = j·pitch:
//    columns run along x, rows along y, in the order the file lists them
//    (the file's first row is y = 0, its first column x = 0);
//  - values are stored row by row: values[j·columns + i];
//  - heights are in the file's unit until the caller scales them (µm after);
//  - pitch is the distance between neighbouring samples, the same along x
//    and y (square pixels), in µm.
//
// Levelling removes the least-squares plane z = a + b·x + c·y over all
// samples (the usual first step of scanning-probe image processing: common
// practice).
#include <cstddef>
#include <vector>

namespace lumtrap::geometry {

struct HeightGrid {
  std::size_t columns = 0;     ///< samples along x
  std::size_t rows = 0;        ///< samples along y
  std::vector<double> values;  ///< rows × columns, row by row
  double pixel_size_um = 0;    ///< sample pitch the file states, µm; 0 when it states none

  double at(std::size_t column, std::size_t row) const { return values[row * columns + column]; }
  double& at(std::size_t column, std::size_t row) { return values[row * columns + column]; }
};

/// A rectangle of samples: the first column and row, and how many of each.
struct PixelRect {
  std::size_t column = 0, row = 0, columns = 0, rows = 0;
};

/// The samples inside `rect`; std::invalid_argument when it reaches outside
/// the grid or is empty.
HeightGrid crop_grid(const HeightGrid& grid, const PixelRect& rect);

/// Each `factor` × `factor` block of samples replaced by its mean (a coarser
/// map with `factor` times the pitch); trailing samples that do not fill a
/// whole block are dropped. factor = 1 returns the grid unchanged.
/// std::invalid_argument when factor is 0 or larger than the grid.
HeightGrid bin_grid(const HeightGrid& grid, std::size_t factor);

/// Multiplies every height by `factor` (e.g. file unit → µm).
void scale_heights(HeightGrid& grid, double factor);

/// The plane a + b·x + c·y (x, y in µm, heights in µm) removed by levelling.
struct PlaneFit {
  double offset_um = 0;  ///< a: height at x = y = 0
  double slope_x = 0;    ///< b = dz/dx (µm per µm)
  double slope_y = 0;    ///< c = dz/dy
};

/// Fits the least-squares plane to all samples (pitch in µm) and subtracts it.
PlaneFit level_plane(HeightGrid& grid, double pitch_um);

}  // namespace lumtrap::geometry
