// Run marks of a sweep folder. See run_mark.hpp.
#include "sweep/run_mark.hpp"

#include <signal.h>
#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <ctime>
#include <fstream>
#include <sstream>

#include "io/run_facts.hpp"
#include "io/text_file.hpp"

namespace lumtrap {

namespace fs = std::filesystem;

namespace {
std::string env(const char* name) {
  const char* v = std::getenv(name);
  return v ? std::string(v) : std::string();
}
}  // namespace

std::string utc_now_text() {
  const std::time_t t = std::time(nullptr);
  std::tm tm{};
  ::gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

RunMark this_run_mark() {
  RunMark m;
  m.host = host_name();
  m.pid = long(::getpid());
  const std::string array_job = env("SLURM_ARRAY_JOB_ID"), array_task = env("SLURM_ARRAY_TASK_ID");
  if (!array_job.empty() && !array_task.empty()) {
    m.slurm_array_job = array_job;
    m.slurm_job = array_job + "_" + array_task;
  } else {
    m.slurm_job = env("SLURM_JOB_ID");
  }
  m.started = utc_now_text();
  return m;
}

nlohmann::json run_mark_json(const RunMark& m) {
  return {{"host", m.host},
          {"pid", m.pid},
          {"slurm_job", m.slurm_job},
          {"slurm_array_job", m.slurm_array_job},
          {"started", m.started},
          {"ended", m.ended},
          {"outcome", m.outcome}};
}

std::optional<RunMark> read_run_mark(const fs::path& file) {
  std::error_code ec;
  if (!fs::exists(file, ec)) return std::nullopt;
  try {
    const auto j = nlohmann::json::parse(read_text_file(file));
    RunMark m;
    m.host = j.value("host", std::string());
    m.pid = j.value("pid", 0L);
    m.slurm_job = j.value("slurm_job", std::string());
    m.slurm_array_job = j.value("slurm_array_job", std::string());
    m.started = j.value("started", std::string());
    m.ended = j.value("ended", std::string());
    m.outcome = j.value("outcome", std::string());
    return m;
  } catch (const std::exception&) {
    return std::nullopt;
  }
}

void write_run_mark(const fs::path& file, const RunMark& m) {
  write_file_atomically(file, run_mark_json(m).dump(2) + "\n");
}

Liveness process_liveness(const RunMark& m) {
  if (m.host.empty() || m.host != host_name() || m.pid <= 0) return Liveness::unknown;
  if (::kill(pid_t(m.pid), 0) != 0 && errno != EPERM) return Liveness::dead;
  // A killed process stays a zombie until its parent reaps it: not alive.
  std::ifstream stat("/proc/" + std::to_string(m.pid) + "/stat");
  std::string line;
  if (std::getline(stat, line)) {
    const auto close = line.rfind(')');
    if (close != std::string::npos && close + 2 < line.size() && line[close + 2] == 'Z') return Liveness::dead;
  }
  return Liveness::alive;
}

}  // namespace lumtrap
