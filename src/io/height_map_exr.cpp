// Single-channel OpenEXR height maps. See height_map_exr.hpp.
#include "io/height_map_exr.hpp"

#include <OpenEXR/ImfChannelList.h>
#include <OpenEXR/ImfDoubleAttribute.h>
#include <OpenEXR/ImfFloatAttribute.h>
#include <OpenEXR/ImfFrameBuffer.h>
#include <OpenEXR/ImfHeader.h>
#include <OpenEXR/ImfInputFile.h>
#include <OpenEXR/ImfOutputFile.h>
#include <OpenEXR/ImfStdIO.h>
#include <OpenEXR/ImfStringAttribute.h>
#include <fmt/format.h>
#include <fmt/ranges.h>

#include <cmath>
#include <stdexcept>

#include "io/height_map_text.hpp"

namespace lumtrap {

namespace fs = std::filesystem;

geometry::HeightGrid read_height_exr(const fs::path& file) {
  geometry::HeightGrid g;
  try {
    Imf::InputFile in(file.string().c_str());
    const Imf::Header& h = in.header();
    if (h.hasTileDescription())
      throw HeightMapFileError(fmt::format("{}: a tiled OpenEXR image; allowed: a scanline image", file.string()));
    std::vector<std::string> names;
    for (auto it = h.channels().begin(); it != h.channels().end(); ++it) names.push_back(it.name());
    if (names.size() != 1)
      throw HeightMapFileError(fmt::format("{}: {} channels ({}); allowed: exactly one channel of heights",
                                           file.string(), names.size(), fmt::format("{}", fmt::join(names, ", "))));
    const Imath::Box2i dw = h.dataWindow();
    const long width = long(dw.max.x) - dw.min.x + 1, height = long(dw.max.y) - dw.min.y + 1;
    if (width < 2 || height < 2)
      throw HeightMapFileError(
          fmt::format("{}: {} × {} pixels; allowed: at least 2 × 2", file.string(), width, height));
    std::vector<float> buf(std::size_t(width) * std::size_t(height));
    Imf::FrameBuffer fb;
    // The slice's base points at pixel (0, 0) of the data window's frame.
    char* base = reinterpret_cast<char*>(buf.data()) -
                 (std::ptrdiff_t(dw.min.x) + std::ptrdiff_t(dw.min.y) * width) * std::ptrdiff_t(sizeof(float));
    fb.insert(names[0], Imf::Slice(Imf::FLOAT, base, sizeof(float), sizeof(float) * std::size_t(width)));
    in.setFrameBuffer(fb);
    in.readPixels(dw.min.y, dw.max.y);
    if (const auto* a = h.findTypedAttribute<Imf::DoubleAttribute>("pixel_size_um")) g.pixel_size_um = a->value();
    else if (const auto* f = h.findTypedAttribute<Imf::FloatAttribute>("pixel_size_um")) g.pixel_size_um = f->value();
    if (g.pixel_size_um != 0 && !(g.pixel_size_um > 0 && std::isfinite(g.pixel_size_um)))
      throw HeightMapFileError(fmt::format("{}: attribute pixel_size_um = {}; allowed: a pixel size > 0 (µm)",
                                           file.string(), g.pixel_size_um));
    g.columns = std::size_t(width);
    g.rows = std::size_t(height);
    g.values.resize(buf.size());
    for (std::size_t k = 0; k < buf.size(); ++k) {
      if (!std::isfinite(buf[k]))
        throw HeightMapFileError(fmt::format(
            "{}: pixel (column {}, row {}) is {}; allowed: finite heights (fill missing pixels before exporting)",
            file.string(), k % g.columns, k / g.columns, buf[k]));
      g.values[k] = buf[k];
    }
  } catch (const HeightMapFileError&) {
    throw;
  } catch (const std::exception& e) {
    throw HeightMapFileError(fmt::format("{}: cannot read it as an OpenEXR image ({}); allowed: a single-channel "
                                         "scanline OpenEXR image",
                                         file.string(), e.what()));
  }
  return g;
}

std::string height_exr(int width, int height, const std::vector<float>& z, double pixel_size_um) {
  if (width <= 0 || height <= 0 || z.size() != std::size_t(width) * std::size_t(height))
    throw std::invalid_argument("height_exr: values do not match width × height");
  Imf::StdOSStream stream;
  {
    Imf::Header header(width, height);
    header.compression() = Imf::ZIP_COMPRESSION;
    header.channels().insert("Z", Imf::Channel(Imf::FLOAT));
    header.insert("pixel_size_um", Imf::DoubleAttribute(pixel_size_um));
    header.insert("height_unit", Imf::StringAttribute("um"));
    Imf::OutputFile file(stream, header);
    Imf::FrameBuffer fb;
    fb.insert("Z", Imf::Slice(Imf::FLOAT, const_cast<char*>(reinterpret_cast<const char*>(z.data())), sizeof(float),
                              sizeof(float) * std::size_t(width)));
    file.setFrameBuffer(fb);
    file.writePixels(height);
  }
  return stream.str();
}

}  // namespace lumtrap
