// texture = "height_map": spec, plan, builder and descriptor. See
// height_map.hpp.
#include "geometry/height_map.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <atomic>
#include <cmath>
#include <stdexcept>

#include "geometry/height_map_mesh.hpp"

namespace lumtrap::geometry {

namespace {

std::atomic<HeightGridLoader> g_loader{nullptr};

double unit_um(const std::string& word) {
  if (word == "nm") return 1e-3;
  if (word == "um") return 1.0;
  if (word == "mm") return 1e3;
  if (word == "m") return 1e6;
  throw std::invalid_argument("geometry/height_map.cpp: unknown unit \"" + word + "\"");
}

std::string um(double x) { return fmt::format("{:g} um", x); }

/// Samples i with from <= i·pitch < from + width: the first and one past the last.
std::pair<std::size_t, std::size_t> samples_in(double from, double width, double pitch) {
  const double rel = 1e-9;  // positions on a sample count as inside
  const double first = std::ceil(from / pitch - rel);
  const double end = std::ceil((from + width) / pitch - rel);
  return {static_cast<std::size_t>(std::max(first, 0.0)), static_cast<std::size_t>(std::max(end, 0.0))};
}

const char* format_text(const std::string& format) {
  if (format == "csv_grid") return "a CSV grid";
  if (format == "xyz") return "an x y z file";
  return "an OpenEXR image";
}

}  // namespace

void set_height_grid_loader(HeightGridLoader loader) { g_loader.store(loader); }

std::shared_ptr<const HeightGrid> load_height_grid(const HeightMapSource& source) {
  const HeightGridLoader loader = g_loader.load();
  if (!loader)
    throw std::logic_error("geometry/height_map.cpp: no height-map file reader installed (src/io "
                           "install_height_map_reader())");
  return loader(source);
}

HeightMapSpec height_map_spec(const TextureParams& p) {
  HeightMapSpec s;
  s.source.path = p.word("file");
  s.source.format = p.word("format");
  if (s.source.format == "xyz") s.source.xy_unit_um = unit_um(p.word("xy_unit"));
  s.height_unit_um = unit_um(p.word("height_unit"));
  s.pixel_size_um = p.number("pixel_size");
  s.level = p.word("level") == "plane";
  const std::string& crop = p.word("crop");
  if (crop == "pixels") {
    s.crop = CropMode::pixels;
    s.crop_pixels = {static_cast<std::size_t>(p.number("crop_column")), static_cast<std::size_t>(p.number("crop_row")),
                     static_cast<std::size_t>(p.number("crop_columns")),
                     static_cast<std::size_t>(p.number("crop_rows"))};
  } else if (crop == "length") {
    s.crop = CropMode::length;
    s.crop_x_um = p.number("crop_x");
    s.crop_y_um = p.number("crop_y");
    s.crop_width_um = p.number("crop_width");
    s.crop_height_um = p.number("crop_height");
  }
  s.bin = static_cast<std::size_t>(p.number("bin"));
  const std::string& tiling = p.word("tiling");
  s.tiling = tiling == "wrap" ? TilingMethod::wrap : tiling == "blend" ? TilingMethod::blend : TilingMethod::mirror;
  if (s.tiling == TilingMethod::blend) s.seam_width_um = p.number("seam_width");
  s.max_triangles = p.number("max_triangles");
  return s;
}

std::optional<ParamProblem> plan_height_map(const HeightGrid& g, const HeightMapSpec& s, HeightMapPlan& plan) {
  plan = {};
  // The pitch: the scene's, the file's, and they must not contradict.
  if (s.pixel_size_um > 0) {
    if (g.pixel_size_um > 0 && std::abs(s.pixel_size_um - g.pixel_size_um) > 1e-3 * g.pixel_size_um)
      return ParamProblem{{"pixel_size"},
                          fmt::format("{}, but the file states {} between samples; allowed: the file's value, or "
                                      "no pixel_size (0 um: take it from the file)",
                                      um(s.pixel_size_um), um(g.pixel_size_um))};
    plan.file_pixel_um = s.pixel_size_um;
  } else if (g.pixel_size_um > 0) {
    plan.file_pixel_um = g.pixel_size_um;
    plan.pixel_from_file = true;
  } else {
    return ParamProblem{{"pixel_size"},
                        fmt::format("0 um (take it from the file), but {} states no pixel size; allowed: the "
                                    "distance between neighbouring samples, e.g. \"0.1 um\"",
                                    format_text(s.source.format))};
  }
  const double p = plan.file_pixel_um;

  // The rectangle of samples used.
  PixelRect r{0, 0, g.columns, g.rows};
  if (s.crop == CropMode::pixels) {
    r = s.crop_pixels;
    if (r.column + r.columns > g.columns)
      return ParamProblem{{"crop_columns", "crop_column"},
                          fmt::format("crop_column {} + crop_columns {} reaches beyond the map's {} columns; allowed: "
                                      "crop_column + crop_columns <= {}",
                                      r.column, r.columns, g.columns, g.columns)};
    if (r.row + r.rows > g.rows)
      return ParamProblem{{"crop_rows", "crop_row"},
                          fmt::format("crop_row {} + crop_rows {} reaches beyond the map's {} rows; allowed: crop_row "
                                      "+ crop_rows <= {}",
                                      r.row, r.rows, g.rows, g.rows)};
  } else if (s.crop == CropMode::length) {
    const auto [i0, i1] = samples_in(s.crop_x_um, s.crop_width_um, p);
    const auto [j0, j1] = samples_in(s.crop_y_um, s.crop_height_um, p);
    if (i1 > g.columns || i1 <= i0)
      return ParamProblem{{"crop_width", "crop_x"},
                          fmt::format("crop_x {} + crop_width {} does not lie within the map's x extent 0 to {} "
                                      "({} samples, {} apart); allowed: a crop inside the map holding samples",
                                      um(s.crop_x_um), um(s.crop_width_um), um(double(g.columns) * p), g.columns,
                                      um(p))};
    if (j1 > g.rows || j1 <= j0)
      return ParamProblem{{"crop_height", "crop_y"},
                          fmt::format("crop_y {} + crop_height {} does not lie within the map's y extent 0 to {} "
                                      "({} samples, {} apart); allowed: a crop inside the map holding samples",
                                      um(s.crop_y_um), um(s.crop_height_um), um(double(g.rows) * p), g.rows, um(p))};
    r = {i0, j0, i1 - i0, j1 - j0};
  }
  plan.rect = r;

  if (s.bin < 1 || r.columns / s.bin < 2 || r.rows / s.bin < 2)
    return ParamProblem{{"bin"}, fmt::format("{} for {} × {} samples leaves fewer than 2 × 2; allowed: bin <= {}",
                                             s.bin, r.columns, r.rows, std::min(r.columns, r.rows) / 2)};
  const std::size_t nx = r.columns / s.bin, ny = r.rows / s.bin;
  if (nx != ny) {
    const std::string where = s.crop == CropMode::none ? "file" : s.crop == CropMode::pixels ? "crop_columns" : "crop_width";
    return ParamProblem{{where},
                        fmt::format("the map used is {} × {} samples (columns × rows{}), not square; allowed: a square "
                                    "map, as the tile is square: crop it, e.g. crop = \"pixels\", crop_columns = {}, "
                                    "crop_rows = {}",
                                    nx, ny, s.bin > 1 ? ", after binning" : "", std::min(r.columns, r.rows),
                                    std::min(r.columns, r.rows))};
  }
  plan.map_samples = nx;
  plan.pitch_um = p * double(s.bin);
  if (s.tiling == TilingMethod::blend) {
    const double w = std::round(s.seam_width_um / plan.pitch_um);
    if (w < 1 || double(nx) < 2 * w + 2)
      return ParamProblem{{"seam_width"},
                          fmt::format("{} is {} samples of {} in a map of {} samples; allowed: at least one sample "
                                      "and at most (map - 2)/2 samples, i.e. {} to {}",
                                      um(s.seam_width_um), w, um(plan.pitch_um), nx, um(plan.pitch_um),
                                      um(std::floor((double(nx) - 2) / 2) * plan.pitch_um))};
    plan.blend_samples = static_cast<std::size_t>(w);
  }
  plan.period_samples = period_samples(nx, s.tiling, plan.blend_samples);
  plan.period_um = double(plan.period_samples) * plan.pitch_um;
  plan.triangles = 2.0 * double(plan.period_samples) * double(plan.period_samples);
  if (plan.triangles > s.max_triangles)
    return ParamProblem{
        {"max_triangles"},
        fmt::format("{:.0f}, but the map gives {:.3g} triangles ({} × {} samples per tile{}), about {:.1f} GB while "
                    "tracing; allowed: at most max_triangles: crop or bin the map, or raise max_triangles if the "
                    "machine has the memory",
                    s.max_triangles, plan.triangles, plan.period_samples, plan.period_samples,
                    s.tiling == TilingMethod::mirror ? ", the map mirrored to twice its side" : "",
                    plan.triangles * kHeightMapBytesPerTriangle / 1e9)};
  return std::nullopt;
}

TileMesh height_map_tile(const HeightGrid& file_grid, const HeightMapSpec& s, HeightMapReport* report) {
  HeightMapPlan plan;
  if (auto problem = plan_height_map(file_grid, s, plan))
    throw std::invalid_argument("height map " + s.source.path + ": key '" + problem->keys.front() +
                                "': " + problem->message);
  const bool whole = plan.rect.columns == file_grid.columns && plan.rect.rows == file_grid.rows;
  HeightGrid g = whole ? file_grid : crop_grid(file_grid, plan.rect);
  g = bin_grid(g, s.bin);
  scale_heights(g, s.height_unit_um);
  HeightMapReport r;
  r.file_columns = file_grid.columns;
  r.file_rows = file_grid.rows;
  if (s.level) r.removed_plane = level_plane(g, plan.pitch_um);
  const PeriodicGrid periodic = make_periodic(std::move(g), s.tiling, plan.blend_samples, &r.tiling);
  TileMesh mesh = periodic_grid_mesh(periodic, plan.pitch_um);
  r.plan = plan;
  r.height_range_um = mesh.max_z();
  if (report) *report = r;
  return mesh;
}

TileMesh height_map_tile(const TextureParams& params, HeightMapReport* report) {
  const HeightMapSpec s = height_map_spec(params);
  const auto grid = load_height_grid(s.source);
  return height_map_tile(*grid, s, report);
}

namespace {

std::optional<ParamProblem> check_height_map(const TextureParams& p) {
  const HeightMapSpec s = height_map_spec(p);
  std::shared_ptr<const HeightGrid> grid;
  try {
    grid = load_height_grid(s.source);
  } catch (const std::exception& e) {
    return ParamProblem{{"file"}, e.what()};
  }
  HeightMapPlan plan;
  return plan_height_map(*grid, s, plan);
}

double estimate_height_map(const TextureParams& p) {
  const HeightMapSpec s = height_map_spec(p);
  HeightMapPlan plan;
  return plan_height_map(*load_height_grid(s.source), s, plan) ? 0.0 : plan.triangles;
}

// The mean width of the profile elements along rows and columns (the
// distance between successive upward crossings of the mean line, with a
// hysteresis of a tenth of the RMS height so that noise does not count;
// ISO 4287:1997 "RSm", from memory): the smaller of the two, in µm. 0 for a
// flat map.
double height_map_feature(const TextureParams& p) {
  const HeightMapSpec s = height_map_spec(p);
  const auto file_grid = load_height_grid(s.source);
  HeightMapPlan plan;
  if (plan_height_map(*file_grid, s, plan)) return 0.0;
  HeightGrid g = bin_grid(crop_grid(*file_grid, plan.rect), s.bin);
  scale_heights(g, s.height_unit_um);
  if (s.level) level_plane(g, plan.pitch_um);
  double mean = 0, sq = 0;
  for (double z : g.values) mean += z;
  mean /= double(g.values.size());
  for (double z : g.values) sq += (z - mean) * (z - mean);
  const double delta = 0.1 * std::sqrt(sq / double(g.values.size()));
  if (!(delta > 1e-9)) return 0.0;
  const std::size_t n = g.columns;
  double best = 0;
  for (int axis = 0; axis < 2; ++axis) {
    std::size_t crossings = 0;
    for (std::size_t l = 0; l < n; ++l) {
      int state = 0;  // -1 below -delta, +1 above +delta
      for (std::size_t k = 0; k < n; ++k) {
        const double z = (axis == 0 ? g.at(k, l) : g.at(l, k)) - mean;
        if (z < -delta) state = -1;
        else if (z > delta) {
          if (state == -1) ++crossings;
          state = 1;
        }
      }
    }
    if (crossings == 0) continue;
    const double width = double(n) * double(n - 1) * plan.pitch_um / double(crossings);
    best = best == 0 ? width : std::min(best, width);
  }
  return best > 0 ? best : double(n - 1) * plan.pitch_um;
}

const std::vector<std::string_view> kUnits = {"nm", "um", "mm", "m"};

}  // namespace

extern const TextureDescriptor kHeightMapTexture;
const TextureDescriptor kHeightMapTexture{
    .kind = "height_map",
    .table = "height_map",
    .summary = "a surface measured (or computed) as a grid of heights, read from a file and made periodic",
    .params =
        {
            {.key = "file", .kind = ParamKind::file_path,
             .doc = "the height-map file, relative to the scene file's folder or absolute", .required = true,
             .example = "maps/k7_recipe_b_afm.csv"},
            {.key = "format", .kind = ParamKind::word,
             .doc = "csv_grid: a grid of heights, one line per row (y), one value per column (x); xyz: three "
                    "columns x y z on a regular grid; exr: a single-channel OpenEXR image",
             .words = {"csv_grid", "xyz", "exr"}, .required = true, .example = "csv_grid"},
            {.key = "xy_unit", .kind = ParamKind::word, .doc = "unit of the x and y columns of an xyz file",
             .words = kUnits, .when_key = "format", .when_words = {"xyz"}, .required = true, .example = "um"},
            {.key = "height_unit", .kind = ParamKind::word, .doc = "unit of the heights in the file",
             .words = kUnits, .required = true, .example = "nm"},
            {.key = "pixel_size", .kind = ParamKind::length_um,
             .doc = "distance between neighbouring samples (square pixels); 0: the file's own (xyz files and "
                    "OpenEXR images written by lumtrap texture state it)",
             .fallback = 0.0, .lo = 0, .example = "0.1 um"},
            {.key = "level", .kind = ParamKind::word,
             .doc = "plane: remove the least-squares plane (sample tilt); none: heights as given",
             .fallback_word = "plane", .words = {"plane", "none"}},
            {.key = "crop", .kind = ParamKind::word,
             .doc = "none: the whole map; pixels: a rectangle of samples; length: a rectangle in um",
             .fallback_word = "none", .words = {"none", "pixels", "length"}},
            {.key = "crop_column", .kind = ParamKind::integer, .doc = "first column used (0 = the file's first)",
             .fallback = 0, .lo = 0, .hi = 4e9, .when_key = "crop", .when_words = {"pixels"}, .example = "0"},
            {.key = "crop_row", .kind = ParamKind::integer, .doc = "first row used (0 = the file's first)",
             .fallback = 0, .lo = 0, .hi = 4e9, .when_key = "crop", .when_words = {"pixels"}, .example = "0"},
            {.key = "crop_columns", .kind = ParamKind::integer, .doc = "number of columns used", .lo = 1, .hi = 4e9,
             .when_key = "crop", .when_words = {"pixels"}, .required = true, .example = "512"},
            {.key = "crop_rows", .kind = ParamKind::integer, .doc = "number of rows used", .lo = 1, .hi = 4e9,
             .when_key = "crop", .when_words = {"pixels"}, .required = true, .example = "512"},
            {.key = "crop_x", .kind = ParamKind::length_um,
             .doc = "x where the crop starts (the file's first column is x = 0)", .fallback = 0, .lo = 0,
             .when_key = "crop", .when_words = {"length"}, .example = "5 um"},
            {.key = "crop_y", .kind = ParamKind::length_um,
             .doc = "y where the crop starts (the file's first row is y = 0)", .fallback = 0, .lo = 0,
             .when_key = "crop", .when_words = {"length"}, .example = "5 um"},
            {.key = "crop_width", .kind = ParamKind::length_um,
             .doc = "width of the crop: the samples with crop_x <= x < crop_x + crop_width are used", .lo = 0,
             .lo_open = true, .when_key = "crop", .when_words = {"length"}, .required = true, .example = "20 um"},
            {.key = "crop_height", .kind = ParamKind::length_um,
             .doc = "height of the crop (along y), likewise", .lo = 0, .lo_open = true, .when_key = "crop",
             .when_words = {"length"}, .required = true, .example = "20 um"},
            {.key = "bin", .kind = ParamKind::integer,
             .doc = "each bin × bin block of samples replaced by its mean (a coarser mesh: bin² times fewer "
                    "triangles)",
             .fallback = 1, .lo = 1, .hi = 1e6, .example = "2"},
            {.key = "tiling", .kind = ParamKind::word,
             .doc = "how the map is made periodic: mirror (seamless, the tile side doubles), wrap (the map is "
                    "one period as it is), blend (the edges cross-faded over seam_width)",
             .fallback_word = "mirror", .words = {"mirror", "wrap", "blend"}},
            {.key = "seam_width", .kind = ParamKind::length_um,
             .doc = "width of the band over which the opposite edges are cross-faded", .lo = 0, .lo_open = true,
             .when_key = "tiling", .when_words = {"blend"}, .required = true, .example = "2 um"},
            {.key = "max_triangles", .kind = ParamKind::integer,
             .doc = "refuse a map whose tile would have more triangles (a memory bound checked before any "
                    "work, about 125 bytes per triangle while tracing: the default is about 2 GB; it does not change "
                    "results)",
             .fallback = 1.6e7, .lo = 2, .hi = 4e9, .example = "16000000"},
        },
    .regular = false,
    .check = check_height_map,
    .smallest_feature_um = height_map_feature,
    .build = [](const TextureParams& p) { return height_map_tile(p, nullptr); },
    .estimate_triangles = estimate_height_map,
    .size_key = "bin",
    .size_advice = "a larger bin (bin = 2 makes four times fewer triangles) or a smaller crop of the map",
};

}  // namespace lumtrap::geometry
