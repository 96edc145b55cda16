#pragma once
// The readers under fuzzing take file paths, as lumtrap's commands give
// them: each fuzz input is written to a fresh file in a private folder
// (a new name every time, so the readers' caches keyed by path, size and
// modification time never hand back an earlier input) and removed after.
#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <string>
#include <unistd.h>

namespace lumtrap::fuzz {

/// A file holding one fuzz input; removed when it goes out of scope.
class InputFile {
 public:
  InputFile(const uint8_t* data, size_t size, const std::string& extension) {
    static const std::filesystem::path dir = [] {
      auto d = std::filesystem::temp_directory_path() / ("lumtrap-fuzz-" + std::to_string(::getpid()));
      std::filesystem::create_directories(d);
      return d;
    }();
    static unsigned long counter = 0;
    path_ = dir / ("input" + std::to_string(counter++) + extension);
    std::ofstream(path_, std::ios::binary).write(reinterpret_cast<const char*>(data), static_cast<std::streamsize>(size));
  }
  ~InputFile() {
    std::error_code ec;
    std::filesystem::remove(path_, ec);
  }
  InputFile(const InputFile&) = delete;
  InputFile& operator=(const InputFile&) = delete;
  const std::filesystem::path& path() const { return path_; }

 private:
  std::filesystem::path path_;
};

}  // namespace lumtrap::fuzz
