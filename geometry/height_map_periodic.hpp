#pragma once
// One period of a surface from a square grid of height samples
// (height_map_grid.hpp), by one of three documented methods. The result is
// periodic: sample M (one past the last) is sample 0 again, in x and in y.
//
//  - mirror: the map joined to its mirror images about its last column and
//    last row, i.e. the sequence z0 z1 … z(n-1) z(n-2) … z1 along each axis,
//    repeated. Seamless (the surface is continuous everywhere), mirror
//    symmetric, and the tile side DOUBLES: M = 2(n - 1) samples for an n × n
//    map, so the tile holds the map four times (once as measured, three
//    times mirrored). Default for measured maps.
//  - wrap: the map is taken as one period as it is (M = n): right for maps of
//    periodic structures and for maps written from a periodic model; on a
//    measured map the opposite edges generally do not match, and the step
//    across the seam is reported (RMS, next to the RMS step between
//    neighbouring samples inside the map) so that a cliff can be seen.
//  - blend: the last w samples along each axis are cross-faded linearly into
//    the first w (first along x, then along y): for k < w,
//    z'(k) = s·z(k) + (1 - s)·z(M + k) with s = (k + 1)/(w + 1) and
//    M = n - w; z'(k) = z(k) for w <= k < M. Continuous across the seam, no
//    doubling, but within the blended band (w samples wide, reported) the
//    surface is an average of two unrelated places, which lowers its slopes.
#include <cstddef>
#include <cstdint>
#include <string_view>
#include <vector>

#include "geometry/height_map_grid.hpp"

namespace lumtrap::geometry {

enum class TilingMethod { mirror, wrap, blend };

/// The word of a method ("mirror", "wrap", "blend").
std::string_view tiling_word(TilingMethod m);

/// M × M samples of one period, read through index maps so that a mirrored
/// map costs no copy: z(i, j) = source.at(column_of[i], row_of[j]).
struct PeriodicGrid {
  std::size_t samples = 0;  ///< M: samples per period along x and y
  HeightGrid source;
  std::vector<std::uint32_t> column_of, row_of;  ///< M entries each

  double z(std::size_t i, std::size_t j) const { return source.at(column_of[i], row_of[j]); }
};

/// What the method did.
struct TilingReport {
  TilingMethod method = TilingMethod::mirror;
  std::size_t map_samples = 0;        ///< n: samples per side of the map given
  std::size_t period_samples = 0;     ///< M
  std::size_t blend_samples = 0;      ///< w (blend only)
  double seam_rms_step = 0;           ///< wrap: RMS height step across the seam (map's unit)
  double interior_rms_step = 0;       ///< wrap: RMS step between neighbouring samples inside the map
};

/// The periodic grid of a square grid (columns == rows == n). mirror needs
/// n >= 2; wrap n >= 2; blend 1 <= blend_samples and n >= 2·blend_samples + 2.
/// std::invalid_argument otherwise.
PeriodicGrid make_periodic(HeightGrid grid, TilingMethod method, std::size_t blend_samples,
                           TilingReport* report = nullptr);

/// Samples per period that `make_periodic` gives for an n × n map.
std::size_t period_samples(std::size_t n, TilingMethod method, std::size_t blend_samples);

}  // namespace lumtrap::geometry
