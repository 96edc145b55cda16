#pragma once
// Height maps as single-channel OpenEXR images, both ways.
//
// Reading: exactly one channel (any name, any pixel type: half, float or
// unsigned int), converted to double; scanline r of the data window is row
// r (y = r·pitch, the image's top row is y = 0), column c is x = c·pitch.
// The pixel size is taken from the header attribute "pixel_size_um"
// (double or float, µm) when present — lumtrap writes it; otherwise the
// scene must state it. Tiled and deep images are refused. Errors are
// HeightMapFileError (height_map_text.hpp) naming the file.
//
// Writing: channel "Z" (32-bit float, heights in µm), attributes
// "pixel_size_um" (double) and "height_unit" ("um"), ZIP compression, so
// that the image reads back as a height map with height_unit = "um".
#include <filesystem>
#include <string>
#include <vector>

#include "geometry/height_map_grid.hpp"

namespace lumtrap {

geometry::HeightGrid read_height_exr(const std::filesystem::path& file);

/// The bytes of an OpenEXR height image of width × height values (row by row, µm).
std::string height_exr(int width, int height, const std::vector<float>& heights_um, double pixel_size_um);

}  // namespace lumtrap
