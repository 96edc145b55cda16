// `lumtrap exr-channels` (the OpenEXR reader of lumtrap plot) and the top view
// of absorption in the texture tile that lumtrap plot draws from
// absorption_map*.exr files. The images are written here with OpenEXR's own
// writer (the reference implementation of the OpenEXR format, Industrial
// Light & Magic / Academy Software Foundation): a multi-channel image with a
// data window that does not start at (0, 0), a half-float channel and a
// float channel, read back exactly; then two synthetic absorption maps in a
// planar result folder are drawn and checked (SVG labels and one series per
// non-zero channel, PNG not blank) with tests/cli/chart_checks.py.
#include <gtest/gtest.h>

#include <OpenEXR/ImfChannelList.h>
#include <OpenEXR/ImfFrameBuffer.h>
#include <OpenEXR/ImfHeader.h>
#include <OpenEXR/ImfOutputFile.h>
#include <Imath/half.h>

#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <vector>

namespace {

namespace fs = std::filesystem;

struct Output {
  int code;
  std::string text;
};

Output run(const std::string& command) {
  Output o{0, ""};
  FILE* p = popen(command.c_str(), "r");
  if (p == nullptr) return {-1, ""};
  char buf[4096];
  while (std::size_t n = std::fread(buf, 1, sizeof buf, p)) o.text.append(buf, n);
  const int status = pclose(p);
  o.code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return o;
}

std::string python() { return fs::exists("/usr/bin/python3") ? "/usr/bin/python3" : "python3"; }

/// Writes an image of float channels (row-major, width × height each), the
/// data window starting at (x0, y0); channels listed in `half_channels` are
/// stored as half floats.
void write_exr(const fs::path& file, int width, int height, int x0, int y0,
               const std::map<std::string, std::vector<float>>& channels,
               const std::vector<std::string>& half_channels = {}) {
  Imath::Box2i data(Imath::V2i(x0, y0), Imath::V2i(x0 + width - 1, y0 + height - 1));
  Imf::Header header(data, data);
  header.compression() = Imf::ZIP_COMPRESSION;
  std::map<std::string, std::vector<half>> halves;
  Imf::FrameBuffer fb;
  for (const auto& [name, v] : channels) {
    const bool is_half = std::find(half_channels.begin(), half_channels.end(), name) != half_channels.end();
    header.channels().insert(name, Imf::Channel(is_half ? Imf::HALF : Imf::FLOAT));
    const std::ptrdiff_t shift = std::ptrdiff_t(x0) + std::ptrdiff_t(y0) * width;
    if (is_half) {
      auto& h = halves[name];
      for (float f : v) h.push_back(half(f));
      fb.insert(name, Imf::Slice(Imf::HALF, reinterpret_cast<char*>(h.data() - shift), sizeof(half),
                                 sizeof(half) * std::size_t(width)));
    } else {
      fb.insert(name, Imf::Slice(Imf::FLOAT, reinterpret_cast<char*>(const_cast<float*>(v.data()) - shift),
                                 sizeof(float), sizeof(float) * std::size_t(width)));
    }
  }
  Imf::OutputFile out(file.c_str(), header);
  out.setFrameBuffer(fb);
  out.writePixels(height);
}

fs::path temp_folder(const std::string& name) {
  const fs::path d = fs::temp_directory_path() / ("lumtrap-test-" + name + "-" + std::to_string(::getpid()));
  fs::remove_all(d);
  fs::create_directories(d);
  return d;
}

TEST(ExrChannels, PrintsEveryChannelOfEveryPixelExactly) {
  const fs::path dir = temp_folder("exr-channels");
  const int w = 5, h = 3;
  std::vector<float> a(w * h), b(w * h), c(w * h);
  for (int i = 0; i < w * h; ++i) {
    a[i] = 0.1f * float(i) + 1e-7f;   // not representable in fewer digits
    b[i] = 0.25f * float(i);          // exact in half precision
    c[i] = i % 2 ? 0.0f : 3.0e-5f * float(i);
  }
  write_exr(dir / "m.exr", w, h, 7, -2, {{"absorbed_silicon", a}, {"reflected_front", b}, {"lost", c}},
            {"reflected_front"});
  const Output o = run(std::string(LUMTRAP_BINARY) + " exr-channels " + (dir / "m.exr").string());
  ASSERT_EQ(o.code, 0) << o.text;
  std::istringstream in(o.text);
  std::string line;
  std::getline(in, line);
  EXPECT_EQ(line, "# width 5 height 3");
  std::getline(in, line);
  EXPECT_EQ(line, "y,x,absorbed_silicon,lost,reflected_front");  // OpenEXR keeps channels sorted by name
  int rows = 0;
  while (std::getline(in, line)) {
    int y = 0, x = 0;
    float va = 0, vl = 0, vr = 0;
    ASSERT_EQ(std::sscanf(line.c_str(), "%d,%d,%g,%g,%g", &y, &x, &va, &vl, &vr), 5) << line;
    const int i = y * w + x;
    EXPECT_EQ(va, a[i]) << line;
    EXPECT_EQ(vl, c[i]) << line;
    EXPECT_EQ(vr, b[i]) << line;
    ++rows;
  }
  EXPECT_EQ(rows, w * h);
  fs::remove_all(dir);
}

TEST(ExrChannels, NotAnImageIsOneLineError) {
  const fs::path dir = temp_folder("exr-bad");
  std::ofstream(dir / "bad.exr") << "not an image\n";
  const Output o = run(std::string(LUMTRAP_BINARY) + " exr-channels " + (dir / "bad.exr").string() + " 2>&1");
  EXPECT_EQ(o.code, 1);
  EXPECT_NE(o.text.find("cannot read it as an OpenEXR image"), std::string::npos) << o.text;
  EXPECT_EQ(std::count(o.text.begin(), o.text.end(), '\n'), 1) << o.text;
  fs::remove_all(dir);
}

TEST(AbsorptionMap, PlotDrawsTheTileFromAbove) {
  const fs::path dir = temp_folder("absorption-map");
  std::ofstream(dir / "flat.toml") << "[scene]\nname = \"K7 absorption map test\"\n[wafer]\nthickness = \"160 um\"\n"
                                      "[rear]\nmedium = \"al_rakic1995\"\n[illumination]\n"
                                      "wavelengths = [\"400 nm\", \"500 nm\"]\n";
  const fs::path result = dir / "result";
  Output o = run(std::string(LUMTRAP_BINARY) + " planar " + (dir / "flat.toml").string() + " -o " + result.string() +
                 " 2>&1");
  ASSERT_EQ(o.code, 0) << o.text;
  // a 24 x 16 pixel tile: silicon absorbs in a ring, the rear metal in a corner, nothing is lost
  const int w = 24, h = 16;
  std::vector<float> si(w * h), metal(w * h), lost(w * h, 0.0f);
  for (int y = 0; y < h; ++y)
    for (int x = 0; x < w; ++x) {
      const double r = std::hypot(x - 12.0, y - 8.0);
      si[y * w + x] = float(std::exp(-(r - 5) * (r - 5) / 4) / (w * h));
      metal[y * w + x] = x < 6 && y < 4 ? 1e-3f : 0.0f;
    }
  write_exr(result / "absorption_map_300-500nm.exr", w, h, 0, 0,
            {{"absorbed_silicon", si}, {"absorbed_rear_medium", metal}, {"lost", lost}});
  write_exr(result / "absorption_map.exr", w, h, 0, 0, {{"absorbed_silicon", si}});
  o = run(std::string(LUMTRAP_BINARY) + " plot " + result.string() + " 2>&1");
  ASSERT_EQ(o.code, 0) << o.text;
  for (const char* stem : {"absorption_map_300-500nm", "absorption_map"}) {
    for (const char* ext : {".png", ".svg"}) {
      const fs::path f = result / "plots" / (std::string(stem) + ext);
      EXPECT_TRUE(fs::is_regular_file(f)) << f;
      EXPECT_NE(o.text.find(f.string()), std::string::npos) << "not listed: " << f;
    }
  }
  const std::string check = python() + " " + LUMTRAP_SOURCE_DIR + "/tests/cli/chart_checks.py ";
  // two channels are not zero (silicon, metal): two panels; the all-zero "lost" is left out
  o = run(check + "svg " + (result / "plots/absorption_map_300-500nm.svg").string() +
          " --series 2 --label 'x [tile widths]' --label 'y [tile widths]' --label absorbed_rear_medium"
          " --label 'absorbed fraction per pixel' --label '300–500 nm' 2>&1");
  EXPECT_EQ(o.code, 0) << o.text;
  o = run(check + "svg " + (result / "plots/absorption_map.svg").string() +
          " --series 1 --label 'all wavelengths' 2>&1");
  EXPECT_EQ(o.code, 0) << o.text;
  o = run(check + "png " + (result / "plots/absorption_map_300-500nm.png").string() + " " +
          (result / "plots/absorption_map.png").string() + " 2>&1");
  EXPECT_EQ(o.code, 0) << o.text;
  fs::remove_all(dir);
}

}  // namespace
