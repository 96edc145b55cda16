#include "io/exr_image.hpp"

#include <OpenEXR/ImfChannelList.h>
#include <OpenEXR/ImfFrameBuffer.h>
#include <OpenEXR/ImfHeader.h>
#include <OpenEXR/ImfOutputFile.h>
#include <OpenEXR/ImfStdIO.h>

#include <stdexcept>

namespace lumtrap {

std::string exr_image(int width, int height, const std::vector<float>& values) {
  if (width <= 0 || height <= 0 || values.size() != std::size_t(width) * std::size_t(height))
    throw std::invalid_argument("exr_image: values do not match width × height");
  Imf::StdOSStream stream;
  {
    Imf::Header header(width, height);
    header.compression() = Imf::NO_COMPRESSION;
    header.channels().insert("Y", Imf::Channel(Imf::FLOAT));
    Imf::OutputFile file(stream, header);
    Imf::FrameBuffer fb;
    fb.insert("Y", Imf::Slice(Imf::FLOAT, const_cast<char*>(reinterpret_cast<const char*>(values.data())),
                              sizeof(float), sizeof(float) * std::size_t(width)));
    file.setFrameBuffer(fb);
    file.writePixels(height);
  }  // the file is complete when OutputFile is destroyed
  return stream.str();
}

}  // namespace lumtrap
