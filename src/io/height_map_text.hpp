#pragma once
// Height maps as text files, read into a geometry::HeightGrid (heights in
// the file's own unit; the scene states which).
//
// Both formats: lines starting with '#' are comments; blank lines are
// skipped; values are separated by ';' if the line has one, else by ',' if
// it has one, else by blanks (spaces or tabs); a trailing separator is
// allowed; numbers use a decimal point ("1.5e-3"); "nan", "inf" and empty
// fields are errors (fill missing pixels before exporting). The first line
// that is not a comment may be a header of words (no field a number) and is
// then skipped.
//
//  - CSV grid ("csv_grid"): one line per row of samples, the first line
//    y = 0, the next y = pitch, …; one value per column, x = 0, pitch, …;
//    every row has as many values as the first. States no pixel size.
//  - x y z ("xyz"): three values per line, the position and the height of
//    one sample, in any order, as scanning-probe and confocal instruments
//    export (common practice). The samples must fill a regular square-pixel
//    grid: every (x, y) node once, the distinct x (and y) values equally
//    spaced within 1 % of the spacing, the x and y spacings equal within
//    0.1 %. Columns run along increasing x, rows along increasing y; the
//    pixel size is the spacing times `xy_unit_um`. While reading, a point
//    takes 24 bytes.
//
// Errors are HeightMapFileError: "FILE:LINE: what is wrong; allowed: ...".
#include <filesystem>
#include <stdexcept>

#include "geometry/height_map_grid.hpp"

namespace lumtrap {

struct HeightMapFileError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

geometry::HeightGrid read_height_csv_grid(const std::filesystem::path& file);

geometry::HeightGrid read_height_xyz(const std::filesystem::path& file, double xy_unit_um);

}  // namespace lumtrap
