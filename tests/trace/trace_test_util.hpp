#pragma once
// Helpers shared by the transport tests: scenes written from TOML text into
// a temporary folder, and whole-wavelength traces.
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "io/scene_reader.hpp"
#include "io/scene_writer.hpp"
#include "trace/run.hpp"

namespace lumtrap::test {

inline std::filesystem::path temp_dir() {
  auto d = std::filesystem::temp_directory_path() /
           ("lumtrap-test-" + std::string(::testing::UnitTest::GetInstance()->current_test_info()->name()));
  std::filesystem::create_directories(d);
  return d;
}

inline Scene scene_from_text(const std::string& toml_text, const std::string& name = "scene") {
  auto path = temp_dir() / (name + ".toml");
  std::ofstream(path) << toml_text;
  return parse_scene_file(path);
}

inline std::vector<WavelengthTally> trace_all(const PreparedRun& run, std::uint64_t photons) {
  std::vector<WavelengthTally> out;
  for (std::size_t i = 0; i < run.scene.illumination.wavelengths_nm.size(); ++i)
    out.push_back(trace_wavelength(run, wavelength_optics(run, i), i, 0, photons));
  return out;
}

/// Binomial standard error of a count among n.
inline double sigma_of(std::uint64_t count, std::uint64_t n) {
  const double p = double(count) / double(n);
  return std::sqrt(std::max(p * (1 - p), 1.0 / double(n)) / double(n));
}

}  // namespace lumtrap::test
