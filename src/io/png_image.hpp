#pragma once
// An 8-bit grey PNG image in memory (stb_image_write, Debian's libstb),
// for pictures such as the shaded relief of a texture tile.
#include <string>
#include <vector>

namespace lumtrap {

/// PNG bytes of a grey image: `values` in [0, 1] (clamped), row by row from
/// the top, stored as round(255·value). Throws on a size mismatch.
std::string png_grey_image(int width, int height, const std::vector<float>& values);

}  // namespace lumtrap
