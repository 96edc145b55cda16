#include "io/png_image.hpp"

#include <stb_image_write.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <stdexcept>

namespace lumtrap {

namespace {

void append(void* context, void* data, int size) {
  static_cast<std::string*>(context)->append(static_cast<const char*>(data), std::size_t(size));
}

}  // namespace

std::string png_grey_image(int width, int height, const std::vector<float>& values) {
  if (width <= 0 || height <= 0 || values.size() != std::size_t(width) * std::size_t(height))
    throw std::invalid_argument("png_grey_image: values do not match width × height");
  std::vector<std::uint8_t> grey(values.size());
  for (std::size_t k = 0; k < values.size(); ++k) {
    const float v = std::isfinite(values[k]) ? std::clamp(values[k], 0.0f, 1.0f) : 0.0f;
    grey[k] = static_cast<std::uint8_t>(std::lround(255.0f * v));
  }
  std::string out;
  if (!stbi_write_png_to_func(append, &out, width, height, 1, grey.data(), width))
    throw std::runtime_error("png_grey_image: the PNG encoder failed");
  return out;
}

}  // namespace lumtrap
