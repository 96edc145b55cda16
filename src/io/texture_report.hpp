#pragma once
// The files `lumtrap texture` writes for one surface (prefix "front_" or
// "rear_"), from the statistics it is handed (geometry/texture_statistics.hpp):
//
//   <s>_statistics.json      the numbers of one surface: area ratio, flat
//                            fraction, heights (Sq, Sa, Sz), pyramid count and
//                            sizes, and for a height map what was done to it
//   <s>_facet_angles.csv     facet-angle histogram, by surface and by projected area
//   <s>_heights.csv          height distribution (projected area)
//   <s>_pyramids.csv         one row per pyramid found
//   <s>_pyramid_sizes.csv    pyramid size histogram (base from height, visible side)
//
// CSV headers carry units in brackets. Every number describes the model
// surface built from the scene; the files say so.
#include <optional>
#include <string>
#include <vector>

#include "geometry/height_map.hpp"
#include "geometry/texture_statistics.hpp"
#include "io/result_files.hpp"

namespace lumtrap {

struct TextureReportInput {
  std::string surface;   ///< "front" or "rear"
  std::string texture;   ///< the texture kind
  geometry::TextureStatistics statistics;
  std::optional<geometry::HeightMapReport> height_map;
  int image_pixels = 0;  ///< pictures: pixels per tile side
  double image_pixel_um = 0;
};

std::vector<OutputFile> texture_report_files(const TextureReportInput& in);

}  // namespace lumtrap
