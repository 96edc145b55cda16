// The EXR maps read back with OpenEXR's own reader (the OpenEXR file format,
// Industrial Light & Magic / Academy Software Foundation; the library is the
// reference implementation) give the values written.
#include <gtest/gtest.h>

#include <OpenEXR/ImfFrameBuffer.h>
#include <OpenEXR/ImfHeader.h>
#include <OpenEXR/ImfInputFile.h>

#include <filesystem>
#include <fstream>

#include "io/exr_image.hpp"

namespace lumtrap {
namespace {

TEST(ExrImage, RoundTripThroughOpenExrReader) {
  const int w = 36, h = 90;
  std::vector<float> v(std::size_t(w) * h);
  for (std::size_t i = 0; i < v.size(); ++i) v[i] = float(i) * 0.25f - 3.0f;
  const std::string bytes = exr_image(w, h, v);
  const auto path = std::filesystem::temp_directory_path() / "lumtrap-test-map.exr";
  std::ofstream(path, std::ios::binary) << bytes;

  Imf::InputFile in(path.c_str());
  const auto dw = in.header().dataWindow();
  ASSERT_EQ(dw.max.x - dw.min.x + 1, w);
  ASSERT_EQ(dw.max.y - dw.min.y + 1, h);
  std::vector<float> back(v.size(), 0.0f);
  Imf::FrameBuffer fb;
  fb.insert("Y", Imf::Slice(Imf::FLOAT, reinterpret_cast<char*>(back.data()), sizeof(float), sizeof(float) * w));
  in.setFrameBuffer(fb);
  in.readPixels(dw.min.y, dw.max.y);
  EXPECT_EQ(back, v);
  std::filesystem::remove(path);
}

TEST(ExrImage, RejectsSizeMismatch) { EXPECT_THROW(exr_image(3, 2, std::vector<float>(5)), std::invalid_argument); }

}  // namespace
}  // namespace lumtrap
