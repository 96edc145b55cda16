#include "io/result_writer.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <fstream>
#include <stdexcept>

namespace lumtrap {

namespace fs = std::filesystem;

void write_result_folder(const fs::path& dir, const std::vector<OutputFile>& files, bool overwrite) {
  if (fs::exists(dir) && !overwrite)
    throw std::runtime_error("result folder " + dir.string() +
                             " already exists; choose another --out or pass --overwrite to replace it");
  fs::path parent = dir.parent_path().empty() ? fs::path(".") : dir.parent_path();
  fs::create_directories(parent);
  fs::path tmp = parent / fmt::format(".{}.partial-{}", dir.filename().string(), ::getpid());
  std::error_code ec;
  fs::remove_all(tmp, ec);
  try {
    fs::create_directory(tmp);
    for (const auto& f : files) {
      std::ofstream out(tmp / f.name, std::ios::binary | std::ios::trunc);
      out << f.content;
      out.flush();
      if (!out) throw std::runtime_error("error while writing " + (tmp / f.name).string());
    }
    if (fs::exists(dir)) {
      fs::path old = parent / fmt::format(".{}.old-{}", dir.filename().string(), ::getpid());
      fs::rename(dir, old);
      fs::rename(tmp, dir);
      fs::remove_all(old);
    } else {
      fs::rename(tmp, dir);
    }
  } catch (...) {
    fs::remove_all(tmp, ec);
    throw;
  }
}

}  // namespace lumtrap
