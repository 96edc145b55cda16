// lumtrap exr-channels FILE.exr (hidden): prints every channel of an OpenEXR
// image as CSV, for the plotting package (Debian 12 has no Python binding of
// OpenEXR). Output: `# width W height H`, then `y,x,<channel>...` (channels
// in the file's order, which OpenEXR keeps sorted by name) and one row per
// pixel, y counted from the top row of the data window, x from its left
// column; values converted to 32-bit float (OpenEXR converts half and uint
// channels), written in their shortest exact text.
#include <OpenEXR/ImfChannelList.h>
#include <OpenEXR/ImfFrameBuffer.h>
#include <OpenEXR/ImfHeader.h>
#include <OpenEXR/ImfInputFile.h>
#include <fmt/format.h>

#include <exception>
#include <iostream>
#include <string>
#include <vector>

#include "cli/commands.hpp"

namespace lumtrap::cli {

void add_exr_channels_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("exr-channels", "print the channels of an OpenEXR image as CSV (for lumtrap plot)");
  cmd->group("");  // hidden from --help: a helper of lumtrap plot
  auto file = std::make_shared<std::string>();
  cmd->add_option("file", *file, "OpenEXR image")->required();
  cmd->callback([file] {
    std::vector<std::string> names;
    std::vector<std::vector<float>> planes;
    int width = 0;
    int height = 0;
    try {
      Imf::InputFile in(file->c_str());
      const Imath::Box2i dw = in.header().dataWindow();
      width = dw.max.x - dw.min.x + 1;
      height = dw.max.y - dw.min.y + 1;
      Imf::FrameBuffer fb;
      for (auto it = in.header().channels().begin(); it != in.header().channels().end(); ++it)
        names.emplace_back(it.name());
      planes.resize(names.size(), std::vector<float>(std::size_t(width) * std::size_t(height)));
      for (std::size_t c = 0; c < names.size(); ++c) {
        // the slice's base is offset so that pixel (dw.min.x, dw.min.y) lands at index 0
        char* base = reinterpret_cast<char*>(planes[c].data()) -
                     (std::ptrdiff_t(dw.min.x) + std::ptrdiff_t(dw.min.y) * width) * std::ptrdiff_t(sizeof(float));
        fb.insert(names[c], Imf::Slice(Imf::FLOAT, base, sizeof(float), sizeof(float) * std::size_t(width)));
      }
      in.setFrameBuffer(fb);
      in.readPixels(dw.min.y, dw.max.y);
    } catch (const std::exception& e) {
      std::cerr << "lumtrap exr-channels: error: " << *file << ": cannot read it as an OpenEXR image ("
                << e.what() << ")\n";
      throw ExitCode{1};
    }
    std::string out = fmt::format("# width {} height {}\ny,x", width, height);
    for (const auto& n : names) out += "," + n;
    out += "\n";
    for (int y = 0; y < height; ++y)
      for (int x = 0; x < width; ++x) {
        out += fmt::format("{},{}", y, x);
        for (const auto& p : planes) out += fmt::format(",{}", p[std::size_t(y) * std::size_t(width) + std::size_t(x)]);
        out += "\n";
      }
    std::cout << out;
  });
}

}  // namespace lumtrap::cli
