#pragma once
// A fresh temporary folder per GoogleTest test, removed afterwards; shared
// by the tests that write files (scenes, material tables, spectra).
#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <string>

namespace lumtrap::test {

class TempDir {
 public:
  TempDir() {
    const auto* info = ::testing::UnitTest::GetInstance()->current_test_info();
    path_ = std::filesystem::temp_directory_path() /
            ("lumtrap_" + std::to_string(::getpid()) + "_" + info->test_suite_name() + "_" + info->name());
    std::filesystem::remove_all(path_);
    std::filesystem::create_directories(path_);
  }
  ~TempDir() {
    std::error_code ec;
    std::filesystem::remove_all(path_, ec);
  }
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;

  /// Writes `text` to the file `name` in the folder and returns its path.
  std::filesystem::path write(const std::string& name, const std::string& text) const {
    const std::filesystem::path p = path_ / name;
    std::ofstream(p, std::ios::binary) << text;
    return p;
  }
  const std::filesystem::path& path() const { return path_; }

 private:
  std::filesystem::path path_;
};

}  // namespace lumtrap::test
