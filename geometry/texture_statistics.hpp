#pragma once
// Statistics of any tile mesh (mesh.hpp) as a surface-metrology analysis of
// the real sample gives them, so that the built surface can be checked
// against AFM, confocal or SEM results:
//
//  - facet-angle histogram: the tilt of each triangle from the wafer plane
//    (angle between its normal and +z), in bins of `angle_bin_deg` from 0 to
//    90°, weighted by true surface area and, separately, by projected area
//    (a scanning-probe slope histogram counts pixels, i.e. projected area);
//  - height distribution: the fraction of the projected area at each height,
//    in `height_bins` equal bins from the lowest to the highest point,
//    integrated exactly over each triangle (a linear function over a
//    triangle has a piecewise quadratic distribution function);
//  - heights as in ISO 25178-2:2012 (from memory): mean height, Sq (RMS
//    deviation from the mean), Sa (mean absolute deviation), Sz (highest -
//    lowest), all over projected area, exact for the mesh;
//  - projected flat fraction: projected area of triangles tilted less than
//    `flat_below_deg` (a threshold chosen here, default 5°, not a standard;
//    exactly flat ground counts whatever the threshold);
//  - surface area ratio: true / projected area (ISO 25178-2 writes Sdr =
//    ratio - 1); 1/cos(facet angle) for pyramids without flat ground;
//  - pyramids: count, density, and a size histogram (texture_peaks.hpp).
//
// Lengths in µm, angles in degrees, fractions of the tile's projected area
// (period²) unless said otherwise. These describe the model surface, not a
// measurement.
#include <cstddef>
#include <vector>

#include "geometry/mesh.hpp"
#include "geometry/texture_peaks.hpp"

namespace lumtrap::geometry {

struct StatisticsOptions {
  double flat_below_deg = 5.0;
  double min_prominence_um = 0.0;  ///< texture_peaks.hpp
  double angle_bin_deg = 1.0;
  std::size_t height_bins = 100;
  double size_bin_um = 0;          ///< width of the pyramid size bins; 0: chosen from the sizes
};

struct AngleBin {
  double from_deg = 0, to_deg = 0;
  double surface_fraction = 0;    ///< of the true surface area
  double projected_fraction = 0;  ///< of the projected area
};

struct HeightBin {
  double from_um = 0, to_um = 0;
  double projected_fraction = 0;
};

struct SizeBin {
  double from_um = 0, to_um = 0;
  std::size_t by_base_from_height = 0;  ///< pyramids whose base_from_height falls in the bin
  std::size_t by_visible_side = 0;
};

struct TextureStatistics {
  double period_um = 0;
  std::size_t triangles = 0;
  double projected_area_um2 = 0, surface_area_um2 = 0;
  double surface_area_ratio = 0;         ///< surface / projected
  double flat_below_deg = 0;
  double flat_fraction = 0;              ///< projected, tilt < flat_below_deg
  double mean_facet_deg = 0;             ///< mean tilt of the tilted part, projected-area weighted
  double min_z_um = 0, max_z_um = 0, mean_z_um = 0;
  double sq_um = 0, sa_um = 0, sz_um = 0;
  std::vector<AngleBin> facet_angles;
  std::vector<HeightBin> heights;
  std::vector<FoundPyramid> pyramids;
  double pyramids_per_mm2 = 0;
  std::vector<SizeBin> pyramid_sizes;
};

TextureStatistics texture_statistics(const TileMesh& mesh, const StatisticsOptions& options = {});

}  // namespace lumtrap::geometry
