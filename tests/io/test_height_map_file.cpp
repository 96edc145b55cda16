// Height-map files (CSV grid, x y z, OpenEXR), the PNG writer, and
// texture = "height_map" in scene files: values read back as written,
// every malformed file reported with file, line and what is allowed, paths
// relative to the scene's folder, the scene identity following the file's
// content, and the resolved scene reading back equal.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <OpenEXR/ImfChannelList.h>
#include <OpenEXR/ImfFrameBuffer.h>
#include <OpenEXR/ImfHeader.h>
#include <OpenEXR/ImfOutputFile.h>
#include <fmt/format.h>
#include <stb/stb_image.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <random>
#include <string>

#include "geometry/height_map.hpp"
#include "io/height_map_exr.hpp"
#include "io/height_map_file.hpp"
#include "io/height_map_text.hpp"
#include "io/png_image.hpp"
#include "io/scene_identity.hpp"
#include "io/scene_reader.hpp"
#include "io/scene_writer.hpp"

using namespace lumtrap;
using ::testing::HasSubstr;
namespace fs = std::filesystem;

namespace {

fs::path scratch() {
  const fs::path d = fs::path(::testing::TempDir()) / "lumtrap_height_map_file_test";
  fs::create_directories(d);
  return d;
}

fs::path write(const std::string& name, const std::string& text) {
  const fs::path p = scratch() / name;
  fs::create_directories(p.parent_path());
  std::ofstream(p, std::ios::binary) << text;
  return p;
}

template <class F>
std::string error_of(F&& f) {
  try {
    f();
  } catch (const std::exception& e) {
    return e.what();
  }
  return "";
}

TEST(HeightMapFile, CsvGridWithCommentsHeaderAndSeparators) {
  // '#' comments, a header of words, commas with a trailing one, semicolons,
  // tabs and spaces: rows are y, columns x, in file order.
  const fs::path f = write("grid.csv",
                           "# exported by the K7 line's profiler (demo data)\n"
                           "col_a,col_b,col_c\n"
                           "1,2,3,\n"
                           "\n"
                           "4;5;+6e0\n"
                           "7\t8   -9.5\r\n");
  const geometry::HeightGrid g = read_height_csv_grid(f);
  EXPECT_EQ(g.columns, 3u);
  EXPECT_EQ(g.rows, 3u);
  EXPECT_EQ(g.pixel_size_um, 0.0);
  EXPECT_EQ(g.values, (std::vector<double>{1, 2, 3, 4, 5, 6, 7, 8, -9.5}));
}

TEST(HeightMapFile, CsvGridErrorsNameFileLineAndWhatIsAllowed) {
  const fs::path ragged = write("ragged.csv", "1,2,3\n4,5,6\n7,8\n");
  std::string e = error_of([&] { read_height_csv_grid(ragged); });
  EXPECT_THAT(e, HasSubstr(ragged.string() + ":3: row 3 has 2 values, but the first row (line 1) has 3"));
  EXPECT_THAT(e, HasSubstr("allowed:"));
  const fs::path nan = write("nan.csv", "1,2\n3,nan\n");
  e = error_of([&] { read_height_csv_grid(nan); });
  EXPECT_THAT(e, HasSubstr(nan.string() + ":2: field 2 \"nan\" is not a finite number"));
  const fs::path empty_field = write("empty.csv", "1,,2\n3,4,5\n");
  EXPECT_THAT(error_of([&] { read_height_csv_grid(empty_field); }), HasSubstr(":1: field 2 \"\""));
  const fs::path one_row = write("row.csv", "1,2,3\n");
  EXPECT_THAT(error_of([&] { read_height_csv_grid(one_row); }), HasSubstr("at least 2 × 2"));
}

TEST(HeightMapFile, XyzInAnyOrderGivesTheGridAndThePixelSize) {
  // A 4 × 3 grid 2e-7 m apart written in shuffled order, heights 100·i + j.
  std::vector<std::string> lines;
  for (int j = 0; j < 3; ++j)
    for (int i = 0; i < 4; ++i) lines.push_back(fmt::format("{:.6e} {:.6e} {}\n", 5e-6 + 2e-7 * i, -1e-6 + 2e-7 * j, 100 * i + j));
  std::shuffle(lines.begin(), lines.end(), std::mt19937(4));
  std::string text = "x y z\n";
  for (const auto& l : lines) text += l;
  const geometry::HeightGrid g = read_height_xyz(write("scan.xyz", text), 1e6);
  EXPECT_EQ(g.columns, 4u);
  EXPECT_EQ(g.rows, 3u);
  EXPECT_NEAR(g.pixel_size_um, 0.2, 1e-9);
  for (int j = 0; j < 3; ++j)
    for (int i = 0; i < 4; ++i) EXPECT_EQ(g.at(i, j), 100 * i + j);
}

TEST(HeightMapFile, XyzErrors) {
  const fs::path missing = write("missing.xyz", "0 0 1\n1 0 1\n0 1 1\n2 0 1\n2 1 1\n");
  EXPECT_THAT(error_of([&] { read_height_xyz(missing, 1); }), HasSubstr("5 samples, but the distinct x and y values make a 3 × 2 grid"));
  // distinct x 0, 1, 3: not equally spaced (1.5 apart, x = 1 lies 0.33 pixel off node 1)
  const fs::path off = write("off.xyz", "0 0 1\n1 0 1\n3 0 1\n0 1.5 1\n1 1.5 1\n3 1.5 1\n");
  EXPECT_THAT(error_of([&] { read_height_xyz(off, 1); }),
              HasSubstr(off.string() + ":2: the sample at x = 1, y = 0 lies 0.33 pixels off the nearest grid node"));
  const fs::path rect = write("rect.xyz", "0 0 1\n1 0 1\n0 2 1\n1 2 1\n");
  EXPECT_THAT(error_of([&] { read_height_xyz(rect, 1); }), HasSubstr("square pixels"));
  const fs::path four = write("four.xyz", "0 0 1 7\n");
  EXPECT_THAT(error_of([&] { read_height_xyz(four, 1); }), HasSubstr(four.string() + ":1: 4 values; allowed: three values"));
  const fs::path twice = write("twice.xyz", "0 0 1\n1 0 1\n0 0 2\n1 1 1\n");
  EXPECT_THAT(error_of([&] { read_height_xyz(twice, 1); }), HasSubstr(":3: the sample at x = 0, y = 0 repeats line 1"));
}

TEST(HeightMapFile, ExrRoundTripKeepsHeightsAndPixelSize) {
  std::vector<float> z(5 * 3);
  for (std::size_t k = 0; k < z.size(); ++k) z[k] = 0.125f * float(k) - 1.0f;
  const fs::path f = write("h.exr", height_exr(5, 3, z, 0.07));
  const geometry::HeightGrid g = read_height_exr(f);
  EXPECT_EQ(g.columns, 5u);
  EXPECT_EQ(g.rows, 3u);
  EXPECT_EQ(g.pixel_size_um, 0.07);
  for (std::size_t k = 0; k < z.size(); ++k) EXPECT_EQ(g.values[k], z[k]);
}

TEST(HeightMapFile, ExrErrors) {
  // two channels
  const fs::path two = scratch() / "two.exr";
  {
    Imf::Header h(2, 2);
    h.channels().insert("R", Imf::Channel(Imf::FLOAT));
    h.channels().insert("G", Imf::Channel(Imf::FLOAT));
    std::vector<float> r(4, 1.0f), gr(4, 2.0f);
    Imf::OutputFile out(two.string().c_str(), h);
    Imf::FrameBuffer fb;
    fb.insert("R", Imf::Slice(Imf::FLOAT, reinterpret_cast<char*>(r.data()), 4, 8));
    fb.insert("G", Imf::Slice(Imf::FLOAT, reinterpret_cast<char*>(gr.data()), 4, 8));
    out.setFrameBuffer(fb);
    out.writePixels(2);
  }
  EXPECT_THAT(error_of([&] { read_height_exr(two); }), HasSubstr("2 channels (G, R); allowed: exactly one channel"));
  const fs::path text = write("not.exr", "1,2\n3,4\n");
  EXPECT_THAT(error_of([&] { read_height_exr(text); }), HasSubstr(text.string() + ": cannot read it as an OpenEXR image"));
  std::vector<float> z = {0, 1, std::numeric_limits<float>::quiet_NaN(), 2};
  const fs::path hole = write("hole.exr", height_exr(2, 2, z, 0.1));
  EXPECT_THAT(error_of([&] { read_height_exr(hole); }), HasSubstr("pixel (column 0, row 1) is nan"));
}

TEST(HeightMapFile, CacheReadsAFileOnceAndAgainWhenItChanges) {
  const fs::path f = write("cached.csv", "1,2\n3,4\n");
  const geometry::HeightMapSource src{f.string(), "csv_grid", 1.0};
  const auto a = cached_height_map(src), b = cached_height_map(src);
  EXPECT_EQ(a.get(), b.get());
  std::ofstream(f) << "1,2,3\n4,5,6\n";  // another size: read again
  const auto c = cached_height_map(src);
  EXPECT_NE(c.get(), a.get());
  EXPECT_EQ(c->columns, 3u);
}

TEST(PngImage, DecodesToTheSameGreyLevels) {
  // Decoded with stb_image (an independent PNG decoder in the same package).
  const int w = 7, h = 4;
  std::vector<float> v(w * h);
  for (int k = 0; k < w * h; ++k) v[k] = float(k) / float(w * h - 1);
  v[3] = 2.0f;  // clamped to white
  const std::string png = png_grey_image(w, h, v);
  ASSERT_EQ(png.substr(1, 3), "PNG");
  int dw = 0, dh = 0, channels = 0;
  unsigned char* pixels = stbi_load_from_memory(reinterpret_cast<const unsigned char*>(png.data()), int(png.size()), &dw,
                                                &dh, &channels, 1);
  ASSERT_NE(pixels, nullptr);
  EXPECT_EQ(dw, w);
  EXPECT_EQ(dh, h);
  EXPECT_EQ(channels, 1);
  for (int k = 0; k < w * h; ++k)
    EXPECT_EQ(int(pixels[k]), k == 3 ? 255 : int(std::lround(255.0f * v[k]))) << k;
  stbi_image_free(pixels);
}

// --- texture = "height_map" in scene files -----------------------------------

std::string scene_text(const std::string& map_table) {
  return "[front]\ntexture = \"height_map\"\n[front.height_map]\n" + map_table +
         "[illumination]\nwavelengths = \"1000 nm\"\n";
}

TEST(HeightMapScene, RelativePathAndDefaultsAndRoundTrip) {
  write("k7/maps/afm.csv", "0,1,0,1\n1,2,1,2\n0,1,0,1\n1,2,1,2\n");
  const fs::path scene_file = write("k7/scene.toml", scene_text("file = \"maps/afm.csv\"\nformat = \"csv_grid\"\n"
                                                                "height_unit = \"nm\"\npixel_size = \"0.5 um\"\n"));
  const Scene s = parse_scene_file(scene_file);
  const auto& t = s.front.texture;
  EXPECT_EQ(t.word("file"), (scratch() / "k7" / "maps" / "afm.csv").lexically_normal().string());
  EXPECT_EQ(t.word("level"), "plane");
  EXPECT_EQ(t.word("tiling"), "mirror");
  EXPECT_EQ(t.word("crop"), "none");
  EXPECT_EQ(t.number("bin"), 1);
  EXPECT_FALSE(t.has("xy_unit"));
  EXPECT_FALSE(t.has("seam_width"));
  // the resolved scene, read back from another folder, is the same scene
  const std::string resolved = resolved_scene_toml(s);
  EXPECT_THAT(resolved, HasSubstr("file = \"" + t.word("file") + "\""));
  const Scene back = parse_scene_file(write("elsewhere/resolved.toml", resolved));
  EXPECT_EQ(back.front.texture, s.front.texture);
  EXPECT_EQ(scene_identity(back), scene_identity(s));
  // the mesh: 4 × 4 samples mirrored to 6 × 6, 0.5 um apart
  const geometry::TileMesh m = geometry::build_texture(s.front.texture);
  EXPECT_EQ(m.period, 3.0);
  EXPECT_EQ(m.triangles.size(), 72u);
  EXPECT_EQ(geometry::texture_of(s.front.texture).estimate_triangles(s.front.texture), 72.0);
}

TEST(HeightMapScene, IdentityFollowsTheFileContentNotItsPath) {
  const std::string grid = "0,1,0\n1,2,1\n0,1,0\n";
  write("id/a.csv", grid);
  write("id/b.csv", grid);
  const std::string rest = "format = \"csv_grid\"\nheight_unit = \"um\"\npixel_size = \"1 um\"\n";
  const Scene a = parse_scene_file(write("id/a.toml", scene_text("file = \"a.csv\"\n" + rest)));
  const Scene b = parse_scene_file(write("id/b.toml", scene_text("file = \"b.csv\"\n" + rest)));
  EXPECT_EQ(scene_identity(a), scene_identity(b));
  write("id/b.csv", "0,1,0\n1,3,1\n0,1,0\n");
  EXPECT_NE(scene_identity(a), scene_identity(b));
}

TEST(HeightMapScene, ErrorsNameTheKeyTheValueAndTheFileLine) {
  write("err/ragged.csv", "1,2,3\n4,5\n1,2,3\n");
  write("err/ok.csv", "1,2,3\n4,5,6\n7,8,9\n");
  write("err/wide.csv", "1,2,3\n4,5,6\n");
  const auto e = [](const std::string& name, const std::string& table) {
    const fs::path p = write("err/" + name + ".toml", scene_text(table));
    return std::pair{p.string(), error_of([&] { parse_scene_file(p); })};
  };
  auto [f, msg] = e("nofile", "file = \"none.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\n");
  EXPECT_THAT(msg, HasSubstr(f + ":4:8: key 'front.height_map.file': value \"none.csv\": no file "));
  std::tie(f, msg) = e("ragged", "file = \"ragged.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\npixel_size = \"1 um\"\n");
  EXPECT_THAT(msg, HasSubstr(f + ":4:8: key 'front.height_map.file': value \"ragged.csv\": "));
  EXPECT_THAT(msg, HasSubstr("ragged.csv:2: row 2 has 2 values, but the first row (line 1) has 3"));
  std::tie(f, msg) = e("nopitch", "file = \"ok.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\n");
  EXPECT_THAT(msg, HasSubstr(f + ":3:1: key 'front.height_map.pixel_size': default 0 um (take it from the file), but "
                                 "a CSV grid states no pixel size"));
  EXPECT_THAT(msg, HasSubstr("(set 'pixel_size')"));
  std::tie(f, msg) = e("nounit", "file = \"ok.csv\"\nformat = \"csv_grid\"\n");
  EXPECT_THAT(msg, HasSubstr(f + ":3:1: key 'front.height_map.height_unit': missing"));
  std::tie(f, msg) = e("badunit", "file = \"ok.csv\"\nformat = \"csv_grid\"\nheight_unit = \"A\"\n");
  EXPECT_THAT(msg, HasSubstr(f + ":6:15: key 'front.height_map.height_unit': value \"A\": unknown word; allowed: one "
                                 "of \"nm\", \"um\", \"mm\", \"m\""));
  std::tie(f, msg) = e("xyunit", "file = \"ok.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\nxy_unit = \"um\"\n");
  EXPECT_THAT(msg, HasSubstr("key 'front.height_map.xy_unit': value \"um\": 'xy_unit' is allowed only with format = "
                             "\"xyz\""));
  std::tie(f, msg) = e("square", "file = \"wide.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\npixel_size = \"1 um\"\n");
  EXPECT_THAT(msg, HasSubstr("key 'front.height_map.file': value \"wide.csv\": the map used is 3 × 2 samples"));
  std::tie(f, msg) = e("crop", "file = \"ok.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\npixel_size = \"1 um\"\n"
                               "crop = \"pixels\"\ncrop_column = 2\ncrop_columns = 2\ncrop_rows = 2\n");
  EXPECT_THAT(msg, HasSubstr(f + ":10:16: key 'front.height_map.crop_columns': value 2: crop_column 2 + crop_columns 2 "
                                 "reaches beyond the map's 3 columns"));
  std::tie(f, msg) = e("seam", "file = \"ok.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\npixel_size = \"1 um\"\n"
                               "tiling = \"blend\"\n");
  EXPECT_THAT(msg, HasSubstr("key 'front.height_map.seam_width': missing"));
  std::tie(f, msg) = e("big", "file = \"ok.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\npixel_size = \"1 um\"\n"
                              "max_triangles = 10\n");
  EXPECT_THAT(msg, HasSubstr(f + ":8:17: key 'front.height_map.max_triangles': value 10: 10, but the map gives 32 "
                                 "triangles (4 × 4 samples per tile, the map mirrored to twice its side)"));
}

}  // namespace
