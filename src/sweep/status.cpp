// Variant states of a sweep folder. See status.hpp.
#include "sweep/status.hpp"

#include <fmt/format.h>

#include <cctype>
#include <chrono>
#include <fstream>
#include <vector>

namespace lumtrap {

namespace fs = std::filesystem;

namespace {

/// The last line of a task log that reports an error, or "".
std::string log_error_line(const fs::path& log) {
  std::ifstream in(log);
  std::string line, found;
  while (std::getline(in, line)) {
    std::string low = line;
    for (char& c : low) c = char(std::tolower(static_cast<unsigned char>(c)));
    if (low.find("error") != std::string::npos || low.find("cancelled") != std::string::npos ||
        low.find("killed") != std::string::npos || low.find("oom") != std::string::npos)
      found = line;
  }
  return found;
}

bool fresh(const fs::path& p, double seconds) {
  std::error_code ec;
  const auto t = fs::last_write_time(p, ec);
  if (ec) return false;
  return std::chrono::duration<double>(fs::file_time_type::clock::now() - t).count() < seconds;
}

}  // namespace

const char* state_name(VariantState s) {
  switch (s) {
    case VariantState::done: return "done";
    case VariantState::running: return "running";
    case VariantState::failed: return "failed";
    case VariantState::missing: return "missing";
  }
  return "?";
}

VariantStatus variant_status(const SweepFolder& f, std::size_t v, double running_seconds) {
  VariantStatus st;
  if (result_complete(f, v)) {
    st.state = VariantState::done;
    return st;
  }
  std::vector<std::size_t> open;  // unfinished units of the variant
  for (std::uint32_t k = 0; k < f.split_photons; ++k)
    if (f.split_photons == 1 || !fs::exists(part_tallies(f, v, k))) open.push_back(v * f.split_photons + k);
  if (f.split_photons > 1) {
    if (open.empty()) {
      st.state = VariantState::done;
      st.detail = "all parts done (merge writes the result folder)";
      return st;
    }
    st.detail = fmt::format("{} of {} parts done", f.split_photons - open.size(), f.split_photons);
  }
  st.log = task_log(f, task_of_unit(f, open.front()));
  for (std::size_t unit : open) {
    const WorkUnit u = unit_at(f, unit);
    if (fresh(unit_checkpoint(f, u), running_seconds) || fresh(unit_started(f, u), running_seconds)) {
      st.state = VariantState::running;
      st.log = task_log(f, task_of_unit(f, unit));
      return st;
    }
  }
  for (std::size_t unit : open) {
    const fs::path log = task_log(f, task_of_unit(f, unit));
    const std::string line = log_error_line(log);
    if (!line.empty()) {
      st.state = VariantState::failed;
      st.log = log;
      st.detail = st.detail.empty() ? line : st.detail + "; " + line;
      return st;
    }
  }
  st.state = VariantState::missing;
  return st;
}

}  // namespace lumtrap
