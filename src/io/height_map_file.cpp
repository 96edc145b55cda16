// Height-map files: dispatch by format, cache, loader installation. See
// height_map_file.hpp.
#include "io/height_map_file.hpp"

#include <fmt/format.h>

#include <deque>
#include <filesystem>
#include <mutex>
#include <tuple>

#include "io/height_map_exr.hpp"
#include "io/height_map_text.hpp"

namespace lumtrap {

namespace fs = std::filesystem;

geometry::HeightGrid read_height_map_file(const geometry::HeightMapSource& s) {
  const fs::path file(s.path);
  std::error_code ec;
  if (!fs::is_regular_file(file, ec))
    throw HeightMapFileError(fmt::format("{}: no such file; allowed: an existing height-map file", s.path));
  if (s.format == "csv_grid") return read_height_csv_grid(file);
  if (s.format == "xyz") return read_height_xyz(file, s.xy_unit_um);
  if (s.format == "exr") return read_height_exr(file);
  throw HeightMapFileError(fmt::format("{}: unknown format \"{}\"; allowed: csv_grid, xyz, exr", s.path, s.format));
}

namespace {

struct CacheEntry {
  geometry::HeightMapSource source;
  std::uintmax_t size = 0;
  fs::file_time_type modified;
  std::shared_ptr<const geometry::HeightGrid> grid;
};

/// Front and rear maps, and one more (a sweep between two files).
constexpr std::size_t kCacheEntries = 3;

std::mutex g_mutex;
std::deque<CacheEntry> g_cache;

}  // namespace

std::shared_ptr<const geometry::HeightGrid> cached_height_map(const geometry::HeightMapSource& s) {
  std::error_code ec;
  const std::uintmax_t size = fs::file_size(s.path, ec);
  const fs::file_time_type modified = ec ? fs::file_time_type{} : fs::last_write_time(s.path, ec);
  if (ec) return std::make_shared<const geometry::HeightGrid>(read_height_map_file(s));  // reports the problem
  std::lock_guard lock(g_mutex);
  for (auto it = g_cache.begin(); it != g_cache.end(); ++it)
    if (it->source == s && it->size == size && it->modified == modified) {
      CacheEntry e = *it;  // most recent first
      g_cache.erase(it);
      g_cache.push_front(e);
      return e.grid;
    }
  auto grid = std::make_shared<const geometry::HeightGrid>(read_height_map_file(s));
  g_cache.push_front({s, size, modified, grid});
  while (g_cache.size() > kCacheEntries) g_cache.pop_back();
  return grid;
}

void install_height_map_reader() { geometry::set_height_grid_loader(&cached_height_map); }

}  // namespace lumtrap
