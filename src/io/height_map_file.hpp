#pragma once
// Height-map files for texture = "height_map" (geometry/height_map.hpp):
// the reader of each format (height_map_text.hpp, height_map_exr.hpp)
// behind one function, a cache, and the installation of that function as
// geometry's loader.
//
// The cache keeps the grids of the last few files read (key: absolute
// path, size and modification time of the file, format, xy unit), so that
// validating a scene (which reads the file to report its errors before any
// work starts), estimating its mesh, and building the mesh read a file
// once; a file changed on disk is read again.
#include <memory>

#include "geometry/height_map.hpp"

namespace lumtrap {

/// The file's samples (heights in its own unit); HeightMapFileError naming
/// the file (and line) when it cannot be read or is malformed.
geometry::HeightGrid read_height_map_file(const geometry::HeightMapSource& source);

/// read_height_map_file through the cache.
std::shared_ptr<const geometry::HeightGrid> cached_height_map(const geometry::HeightMapSource& source);

/// Makes cached_height_map geometry's height-map loader (idempotent; the
/// scene reader calls it).
void install_height_map_reader();

}  // namespace lumtrap
