#pragma once
// A single-channel floating-point image as an OpenEXR file in memory, for
// maps such as the escape current per (polar, azimuth) bin: rows are the
// first index (polar), columns the second (azimuth).
#include <string>
#include <vector>

namespace lumtrap {

/// Bytes of an OpenEXR file (channel "Y", 32-bit float, no compression)
/// holding `values` (row-major, height × width). Throws on a size mismatch.
std::string exr_image(int width, int height, const std::vector<float>& values);

}  // namespace lumtrap
