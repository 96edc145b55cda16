#pragma once
// A small sweep planned into a temporary folder, for the sweep unit tests
// (no tracing: results are faked by writing their files).
#include <filesystem>
#include <fstream>
#include <string>
#include <unistd.h>

#include "io/text_file.hpp"
#include "sweep/expand.hpp"
#include "sweep/plan_folder.hpp"

namespace lumtrap::test {

// A planar K7-like scene, three wavelengths; `grid` is the [sweep.grid] body.
inline std::string sweep_text(const std::string& grid) {
  return R"(
[wafer]
thickness = "160 um"

[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"

[rear]
medium = "al_rakic1995"

[illumination]
wavelengths = ["800 nm", "1000 nm", "1100 nm"]

[run]
photons = 100

[sweep.grid]
)" + grid;
}

/// A fresh temporary folder named after the test, removed with the object.
struct TempDir {
  std::filesystem::path path;
  explicit TempDir(const std::string& name) {
    path = std::filesystem::temp_directory_path() / ("lumtrap_test_" + name + "_" + std::to_string(::getpid()));
    std::filesystem::remove_all(path);
    std::filesystem::create_directories(path);
  }
  ~TempDir() {
    std::error_code ec;
    std::filesystem::remove_all(path, ec);
  }
};

struct PlannedSweep {
  Sweep sweep;
  SweepFolder folder;
};

/// Writes `grid`'s sweep file into dir and plans it into dir/plan.
inline PlannedSweep plan_sweep(const std::filesystem::path& dir, const std::string& grid, SweepPlanOptions opt = {},
                               const std::string& file_name = "sweep.toml") {
  const std::filesystem::path file = dir / file_name;
  const std::string text = sweep_text(grid);
  write_file_atomically(file, text);
  PlannedSweep p;
  p.sweep = read_sweep_file(file);
  p.folder = write_sweep_plan(p.sweep, text, dir / "plan", opt, nlohmann::ordered_json::object());
  return p;
}

/// Marks variant v done: result/summary.json and result/tallies.json.
inline void fake_done(const SweepFolder& f, std::size_t v, const std::string& summary = "{}") {
  std::filesystem::create_directories(result_dir(f, v));
  write_file_atomically(result_dir(f, v) / "summary.json", summary);
  write_file_atomically(result_dir(f, v) / "tallies.json", "{}");
}

}  // namespace lumtrap::test
