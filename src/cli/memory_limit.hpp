#pragma once
// How much memory a command may plan to use when it builds texture meshes
// (src/trace/build_estimate.hpp): --max-memory SIZE, or by default half of
// the memory this process can have (the machine's physical memory, or the
// control group's limit when smaller, e.g. a SLURM job's allocation).
#include <string>

#include <CLI/CLI.hpp>

namespace lumtrap::cli {

/// The default: this fraction of the memory available.
inline constexpr double kDefaultMemoryFraction = 0.5;

struct MemoryLimit {
  double bytes = 0;
  std::string origin;  ///< for messages: where the number comes from and how to change it
};

/// Adds --max-memory to `cmd`, stored as text in `value`.
void add_max_memory_option(CLI::App& cmd, std::string& value);

/// Memory this process can have: physical memory, or the cgroup limit
/// (cgroup v2 memory.max) when that is smaller; `what` says which.
double available_memory_bytes(std::string* what = nullptr);

/// The limit from the option's text ("" = default): "8G", "500M", "2T",
/// "1.5G", "8GiB", "8GB" (K, M, G, T are powers of 1024) or "30%" of the
/// available memory. std::runtime_error naming --max-memory, the value and
/// what is allowed otherwise.
MemoryLimit memory_limit(const std::string& option);

}  // namespace lumtrap::cli
