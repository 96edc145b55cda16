#include "io/stale_result_folders.hpp"

#include <fmt/format.h>
#include <signal.h>
#include <unistd.h>

#include <cerrno>
#include <charconv>
#include <optional>
#include <string_view>

namespace lumtrap {

namespace fs = std::filesystem;

namespace {

/// The PID of `name` when it reads `prefix` followed by digits only.
std::optional<long> pid_after(std::string_view name, std::string_view prefix) {
  if (name.size() <= prefix.size() || name.substr(0, prefix.size()) != prefix) return std::nullopt;
  const std::string_view digits = name.substr(prefix.size());
  long pid = 0;
  auto [end, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), pid);
  if (ec != std::errc() || end != digits.data() + digits.size() || pid <= 0) return std::nullopt;
  return pid;
}

/// kill(pid, 0) fails with ESRCH only when no such process exists (POSIX.1-2017, kill()).
bool process_exists(long pid) { return ::kill(pid_t(pid), 0) == 0 || errno != ESRCH; }

}  // namespace

std::vector<std::string> tidy_stale_result_folders(const fs::path& dir) {
  std::vector<std::string> notes;
  const fs::path parent = dir.parent_path().empty() ? fs::path(".") : dir.parent_path();
  const std::string name = dir.filename().string();
  const std::string partial = fmt::format(".{}.partial-", name), old = fmt::format(".{}.old-", name),
                    checkpoint_tmp = fmt::format(".{}.checkpoint.json.tmp-", name);
  std::error_code ec;
  std::vector<std::pair<fs::path, long>> olds;
  for (const auto& e : fs::directory_iterator(parent, ec)) {
    const std::string n = e.path().filename().string();
    std::optional<long> pid;
    const bool is_old = (pid = pid_after(n, old)).has_value();
    if (!pid) pid = pid_after(n, partial);
    if (!pid) pid = pid_after(n, checkpoint_tmp);
    if (!pid || *pid == long(::getpid())) continue;
    if (process_exists(*pid)) {
      notes.push_back(fmt::format("{} was left by process {}, which still exists; kept (remove it yourself if that "
                                  "is not a lumtrap run writing {})",
                                  e.path().string(), *pid, dir.string()));
      continue;
    }
    if (is_old) {
      olds.emplace_back(e.path(), *pid);
      continue;
    }
    std::error_code rm;
    fs::remove_all(e.path(), rm);
    notes.push_back(rm ? fmt::format("cannot remove {}, left by an ended run (process {}): {}", e.path().string(),
                                     *pid, rm.message())
                       : fmt::format("removed {}, left by an ended run (process {})", e.path().string(), *pid));
  }
  for (const auto& [path, pid] : olds) {
    std::error_code mv;
    if (!fs::exists(fs::symlink_status(dir, mv))) {
      fs::rename(path, dir, mv);
      if (!mv) {
        notes.push_back(fmt::format("put back {} as {}: a run (process {}) ended while replacing it", path.string(),
                                    dir.string(), pid));
        continue;
      }
    }
    fs::remove_all(path, mv);
    notes.push_back(mv ? fmt::format("cannot remove {}, left by an ended run (process {}): {}", path.string(), pid,
                                     mv.message())
                       : fmt::format("removed {}, the previous result left by an ended run (process {})",
                                     path.string(), pid));
  }
  return notes;
}

}  // namespace lumtrap
