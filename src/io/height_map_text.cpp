// CSV-grid and x y z height maps. See height_map_text.hpp.
#include "io/height_map_text.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <fstream>
#include <limits>
#include <string>
#include <string_view>
#include <vector>

namespace lumtrap {

namespace fs = std::filesystem;

namespace {

std::string_view trim(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t' || s.front() == '\r')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r')) s.remove_suffix(1);
  return s;
}

/// The fields of a line (see the header for the separator rule).
void split_fields(std::string_view line, std::vector<std::string_view>& out) {
  out.clear();
  char sep = 0;
  if (line.find(';') != std::string_view::npos) sep = ';';
  else if (line.find(',') != std::string_view::npos) sep = ',';
  if (sep) {
    std::size_t at = 0;
    while (true) {
      const std::size_t next = line.find(sep, at);
      out.push_back(trim(line.substr(at, next == std::string_view::npos ? std::string_view::npos : next - at)));
      if (next == std::string_view::npos) break;
      at = next + 1;
    }
    if (out.size() > 1 && out.back().empty()) out.pop_back();  // trailing separator
    return;
  }
  std::size_t at = 0;
  while (at < line.size()) {
    while (at < line.size() && (line[at] == ' ' || line[at] == '\t' || line[at] == '\r')) ++at;
    if (at >= line.size()) break;
    std::size_t end = at;
    while (end < line.size() && line[end] != ' ' && line[end] != '\t' && line[end] != '\r') ++end;
    out.push_back(line.substr(at, end - at));
    at = end;
  }
}

/// A finite number taking the whole field; false otherwise.
bool to_number(std::string_view f, double& v) {
  if (!f.empty() && f.front() == '+') f.remove_prefix(1);
  if (f.empty()) return false;
  const auto r = std::from_chars(f.data(), f.data() + f.size(), v);
  return r.ec == std::errc() && r.ptr == f.data() + f.size() && std::isfinite(v);
}

/// Reads the data lines of a text height map: calls on_fields(fields, line
/// number) for each, after skipping comments, blank lines and a header of words.
template <class OnFields>
void for_each_data_line(const fs::path& file, OnFields&& on_fields) {
  std::ifstream in(file, std::ios::binary);
  if (!in) throw HeightMapFileError(fmt::format("{}: cannot open the height-map file", file.string()));
  std::string line;
  std::vector<std::string_view> fields;
  std::size_t number = 0;
  bool first = true;
  while (std::getline(in, line)) {
    ++number;
    const std::string_view t = trim(line);
    if (t.empty() || t.front() == '#') continue;
    split_fields(t, fields);
    if (first) {
      first = false;
      double v;
      if (std::none_of(fields.begin(), fields.end(), [&](std::string_view f) { return to_number(f, v); })) continue;
    }
    on_fields(fields, number);
  }
  if (in.bad()) throw HeightMapFileError(fmt::format("{}: read error", file.string()));
}

[[noreturn]] void bad_value(const fs::path& file, std::size_t line, std::size_t column, std::string_view field) {
  throw HeightMapFileError(fmt::format(
      "{}:{}: field {} \"{}\" is not a finite number; allowed: numbers with a decimal point such as 1.25e-3 (no "
      "empty fields, no nan or inf: fill missing pixels before exporting)",
      file.string(), line, column + 1, field));
}

}  // namespace

geometry::HeightGrid read_height_csv_grid(const fs::path& file) {
  geometry::HeightGrid g;
  std::size_t first_line = 0;
  for_each_data_line(file, [&](const std::vector<std::string_view>& f, std::size_t line) {
    if (g.rows == 0) {
      g.columns = f.size();
      first_line = line;
    } else if (f.size() != g.columns) {
      throw HeightMapFileError(fmt::format(
          "{}:{}: row {} has {} values, but the first row (line {}) has {}; allowed: the same number of values in "
          "every row (a rectangular grid)",
          file.string(), line, g.rows + 1, f.size(), first_line, g.columns));
    }
    for (std::size_t i = 0; i < f.size(); ++i) {
      double v;
      if (!to_number(f[i], v)) bad_value(file, line, i, f[i]);
      g.values.push_back(v);
    }
    ++g.rows;
  });
  if (g.rows < 2 || g.columns < 2)
    throw HeightMapFileError(fmt::format("{}: {} rows of {} values; allowed: a grid of at least 2 × 2 heights",
                                         file.string(), g.rows, g.columns));
  return g;
}

namespace {

/// Distinct values of one coordinate (sorted; within 1e-6 of the range merged).
struct Axis {
  double lo = 0, step = 0;
  std::size_t count = 0;
};

Axis axis_of(std::vector<double> v, const fs::path& file, const char* name) {
  std::sort(v.begin(), v.end());
  const double range = v.back() - v.front();
  const double merge = 1e-6 * range;
  std::size_t count = 1;
  for (std::size_t i = 1; i < v.size(); ++i)
    if (v[i] - v[i - 1] > merge) ++count;
  if (count < 2)
    throw HeightMapFileError(fmt::format("{}: all samples have the same {} = {}; allowed: a grid at least 2 samples "
                                         "wide in x and in y",
                                         file.string(), name, v.front()));
  return {v.front(), range / double(count - 1), count};
}

}  // namespace

geometry::HeightGrid read_height_xyz(const fs::path& file, double xy_unit_um) {
  std::vector<double> xs, ys, zs;
  std::vector<std::size_t> lines;
  for_each_data_line(file, [&](const std::vector<std::string_view>& f, std::size_t line) {
    if (f.size() != 3)
      throw HeightMapFileError(fmt::format("{}:{}: {} values; allowed: three values per line, x y z", file.string(),
                                           line, f.size()));
    double v[3];
    for (std::size_t i = 0; i < 3; ++i)
      if (!to_number(f[i], v[i])) bad_value(file, line, i, f[i]);
    xs.push_back(v[0]);
    ys.push_back(v[1]);
    zs.push_back(v[2]);
    lines.push_back(line);
  });
  if (xs.size() < 4)
    throw HeightMapFileError(
        fmt::format("{}: {} samples; allowed: a grid of at least 2 × 2 samples", file.string(), xs.size()));
  const Axis ax = axis_of(xs, file, "x"), ay = axis_of(ys, file, "y");
  if (std::abs(ax.step - ay.step) > 1e-3 * ax.step)
    throw HeightMapFileError(fmt::format(
        "{}: the samples are {} apart in x but {} apart in y; allowed: square pixels (equal spacing in x and y)",
        file.string(), ax.step, ay.step));
  geometry::HeightGrid g;
  g.columns = ax.count;
  g.rows = ay.count;
  g.pixel_size_um = ax.step * xy_unit_um;
  if (xs.size() != g.columns * g.rows)
    throw HeightMapFileError(fmt::format(
        "{}: {} samples, but the distinct x and y values make a {} × {} grid ({} nodes); allowed: every node of a "
        "regular grid exactly once (resample scattered data onto a grid first)",
        file.string(), xs.size(), g.columns, g.rows, g.columns * g.rows));
  g.values.assign(g.columns * g.rows, std::numeric_limits<double>::quiet_NaN());
  std::vector<std::size_t> line_of(g.values.size(), 0);
  for (std::size_t k = 0; k < xs.size(); ++k) {
    const double fi = (xs[k] - ax.lo) / ax.step, fj = (ys[k] - ay.lo) / ay.step;
    const double i = std::round(fi), j = std::round(fj);
    if (std::abs(fi - i) > 0.01 || std::abs(fj - j) > 0.01)
      throw HeightMapFileError(fmt::format(
          "{}:{}: the sample at x = {}, y = {} lies {:.2f} pixels off the nearest grid node; allowed: samples on a "
          "regular grid (resample scattered data onto a grid first)",
          file.string(), lines[k], xs[k], ys[k], std::max(std::abs(fi - i), std::abs(fj - j))));
    const std::size_t at = std::size_t(j) * g.columns + std::size_t(i);
    if (line_of[at])
      throw HeightMapFileError(fmt::format("{}:{}: the sample at x = {}, y = {} repeats line {}; allowed: every grid "
                                           "node exactly once",
                                           file.string(), lines[k], xs[k], ys[k], line_of[at]));
    line_of[at] = lines[k];
    g.values[at] = zs[k];
  }
  return g;
}

}  // namespace lumtrap
