#include "cli/memory_limit.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <cctype>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <stdexcept>

#include "trace/build_estimate.hpp"

namespace lumtrap::cli {

void add_max_memory_option(CLI::App& cmd, std::string& value) {
  cmd.add_option("--max-memory", value,
                 fmt::format("refuse textures whose meshes would need more memory than this, e.g. 8G, 500M or 30% "
                             "(default {:g} % of this machine's memory)",
                             100 * kDefaultMemoryFraction));
}

namespace {

// A number read from a cgroup file ("max" and unreadable files: none).
double cgroup_number(const std::filesystem::path& file) {
  std::ifstream in(file);
  std::string text;
  if (!(in >> text) || text.empty() || !std::isdigit(static_cast<unsigned char>(text[0]))) return 0.0;
  return std::strtod(text.c_str(), nullptr);
}

// The smallest memory limit of this process's control group and its
// parents: cgroup v2 (memory.max; "0::PATH" in /proc/self/cgroup) and v1
// (memory.limit_in_bytes; "N:memory:PATH"), wherever the hierarchy is
// mounted under /sys/fs/cgroup. 0 when there is none.
double cgroup_memory_limit() {
  std::ifstream in("/proc/self/cgroup");
  std::string line;
  double limit = 0;
  const auto consider = [&](const std::filesystem::path& root, std::string path, const char* file) {
    for (;;) {
      const double v = cgroup_number(root / std::filesystem::path(path).relative_path() / file);
      if (v > 0 && (limit == 0 || v < limit)) limit = v;
      if (path.empty() || path == "/") break;
      path = std::filesystem::path(path).parent_path().string();
    }
  };
  while (std::getline(in, line)) {
    const auto a = line.find(':'), b = line.find(':', a + 1);
    if (a == std::string::npos || b == std::string::npos) continue;
    const std::string controllers = line.substr(a + 1, b - a - 1), path = line.substr(b + 1);
    if (line.compare(0, a, "0") == 0 && controllers.empty()) {
      consider("/sys/fs/cgroup", path, "memory.max");
      consider("/sys/fs/cgroup/unified", path, "memory.max");
    } else if (controllers == "memory") {
      consider("/sys/fs/cgroup/memory", path, "memory.limit_in_bytes");
    }
  }
  return limit;
}

}  // namespace

double available_memory_bytes(std::string* what) {
  const long pages = ::sysconf(_SC_PHYS_PAGES), page = ::sysconf(_SC_PAGE_SIZE);
  double bytes = pages > 0 && page > 0 ? double(pages) * double(page) : 0.0;
  if (what) *what = "physical memory";
  // A control group's limit, e.g. the memory of a SLURM job.
  const double limit = cgroup_memory_limit();
  if (limit > 0 && (bytes <= 0 || limit < bytes)) {
    bytes = limit;
    if (what) *what = "memory limit of this process's control group";
  }
  if (bytes <= 0) bytes = 4.0 * 1024 * 1024 * 1024;  // unknown: a small machine
  return bytes;
}

MemoryLimit memory_limit(const std::string& option) {
  std::string what;
  const double available = available_memory_bytes(&what);
  if (option.empty())
    return {kDefaultMemoryFraction * available,
            fmt::format("{:g} % of the {} {}; --max-memory changes it", 100 * kDefaultMemoryFraction,
                        format_bytes(available), what)};
  const auto bad = [&] {
    return std::runtime_error(fmt::format(
        "--max-memory: value \"{}\" is not a memory size; allowed: a positive number with K, M, G or T (powers of "
        "1024), e.g. 8G or 500M, or a percentage of this machine's {} ({}), e.g. 30%",
        option, format_bytes(available), what));
  };
  std::size_t used = 0;
  double v = 0;
  try {
    v = std::stod(option, &used);
  } catch (const std::exception&) {
    throw bad();
  }
  std::string unit = option.substr(used);
  while (!unit.empty() && unit.front() == ' ') unit.erase(0, 1);
  if (!std::isfinite(v) || !(v > 0)) throw bad();
  if (unit == "%") {
    if (v > 100) throw bad();
    return {v / 100 * available,
            fmt::format("--max-memory {}: {:g} % of the {} {}", option, v, format_bytes(available), what)};
  }
  for (const char* suffix : {"iB", "B"})
    if (unit.size() > std::string(suffix).size() && unit.ends_with(suffix)) {
      unit.resize(unit.size() - std::string(suffix).size());
      break;
    }
  double scale = 0;
  if (unit.empty()) scale = 1;
  else if (unit == "K" || unit == "k") scale = 1024.0;
  else if (unit == "M") scale = 1024.0 * 1024;
  else if (unit == "G") scale = 1024.0 * 1024 * 1024;
  else if (unit == "T") scale = 1024.0 * 1024 * 1024 * 1024;
  else throw bad();
  return {v * scale, fmt::format("--max-memory {}", option)};
}

}  // namespace lumtrap::cli
