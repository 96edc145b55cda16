// SLURM queries. See slurm_query.hpp.
#include "sweep/slurm_query.hpp"

#include <fcntl.h>
#include <poll.h>
#include <pwd.h>
#include <signal.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <chrono>
#include <cmath>
#include <cstdlib>
#include <stdexcept>

extern char** environ;

namespace lumtrap {

namespace {

std::vector<std::string_view> lines_of(std::string_view text) {
  std::vector<std::string_view> out;
  std::size_t start = 0;
  while (start < text.size()) {
    std::size_t end = text.find('\n', start);
    if (end == std::string_view::npos) end = text.size();
    std::string_view l = text.substr(start, end - start);
    while (!l.empty() && (l.back() == '\r' || l.back() == ' ')) l.remove_suffix(1);
    if (!l.empty()) out.push_back(l);
    start = end + 1;
  }
  return out;
}

std::vector<std::string> split(std::string_view s, char sep) {
  std::vector<std::string> out;
  std::size_t start = 0;
  while (true) {
    const std::size_t p = s.find(sep, start);
    out.emplace_back(s.substr(start, p == std::string_view::npos ? std::string_view::npos : p - start));
    if (p == std::string_view::npos) return out;
    start = p + 1;
  }
}

std::string trim(std::string_view s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  return std::string(s);
}

bool all_digits(std::string_view s) {
  return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) { return c >= '0' && c <= '9'; });
}

/// "1234_7" -> {"1234", 7}; "1240" -> {"", -1}.
void split_job_id(SlurmJob& j) {
  const auto us = j.job.find('_');
  if (us != std::string::npos && all_digits(std::string_view(j.job).substr(us + 1))) {
    j.array_job = j.job.substr(0, us);
    j.array_task = std::atol(j.job.c_str() + us + 1);
  }
}

std::string user_name() {
  if (const passwd* pw = ::getpwuid(::getuid())) return pw->pw_name;
  return std::to_string(::getuid());
}

}  // namespace

CommandOutput run_command(const std::vector<std::string>& argv, double timeout_seconds) {
  CommandOutput r;
  if (argv.empty()) return r;
  int fd[2];
  if (::pipe2(fd, O_CLOEXEC) != 0) return r;
  posix_spawn_file_actions_t fa;
  posix_spawn_file_actions_init(&fa);
  posix_spawn_file_actions_adddup2(&fa, fd[1], 1);
  posix_spawn_file_actions_addopen(&fa, 0, "/dev/null", O_RDONLY, 0);
  posix_spawn_file_actions_addopen(&fa, 2, "/dev/null", O_WRONLY, 0);
  std::vector<char*> args;
  for (const auto& a : argv) args.push_back(const_cast<char*>(a.c_str()));
  args.push_back(nullptr);
  pid_t pid = 0;
  const int rc = ::posix_spawnp(&pid, args[0], &fa, nullptr, args.data(), environ);
  posix_spawn_file_actions_destroy(&fa);
  ::close(fd[1]);
  if (rc != 0) {
    ::close(fd[0]);
    return r;
  }
  const auto deadline = std::chrono::steady_clock::now() + std::chrono::duration<double>(timeout_seconds);
  bool timed_out = false;
  char buf[65536];
  while (true) {
    const auto left = std::chrono::duration_cast<std::chrono::milliseconds>(deadline - std::chrono::steady_clock::now());
    if (left.count() <= 0) {
      timed_out = true;
      break;
    }
    pollfd p{fd[0], POLLIN, 0};
    const int n = ::poll(&p, 1, int(left.count()));
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) {
      timed_out = n == 0;
      if (n == 0) continue;  // re-check the deadline
      break;
    }
    const ssize_t got = ::read(fd[0], buf, sizeof buf);
    if (got < 0 && errno == EINTR) continue;
    if (got <= 0) break;
    r.out.append(buf, std::size_t(got));
  }
  ::close(fd[0]);
  if (timed_out) ::kill(pid, SIGKILL);
  int status = 0;
  while (::waitpid(pid, &status, 0) < 0 && errno == EINTR) {
  }
  if (!timed_out && WIFEXITED(status)) {
    r.exit_code = WEXITSTATUS(status);
    r.ran = r.exit_code == 0;
  }
  return r;
}

// --- limits ----------------------------------------------------------------------

std::optional<std::size_t> parse_max_array_size(std::string_view text) {
  for (std::string_view l : lines_of(text)) {
    const auto eq = l.find('=');
    if (eq == std::string_view::npos || trim(l.substr(0, eq)) != "MaxArraySize") continue;
    const std::string v = trim(l.substr(eq + 1));
    if (all_digits(v)) return std::size_t(std::stoull(v));
  }
  return std::nullopt;
}

std::optional<double> slurm_minutes(std::string_view text_in) {
  std::string text = trim(text_in);
  std::string low = text;
  for (char& c : low) c = char(std::tolower(static_cast<unsigned char>(c)));
  if (low == "infinite" || low == "unlimited") return std::nullopt;
  auto bad = [&]() { return std::invalid_argument(fmt::format("\"{}\" is not a SLURM time", text)); };
  double days = 0;
  std::string rest = text;
  const auto dash = text.find('-');
  if (dash != std::string::npos) {
    if (!all_digits(std::string_view(text).substr(0, dash))) throw bad();
    days = std::stod(text.substr(0, dash));
    rest = text.substr(dash + 1);
  }
  const std::vector<std::string> parts = split(rest, ':');
  if (parts.empty() || parts.size() > 3) throw bad();
  for (const auto& p : parts)
    if (!all_digits(p)) throw bad();
  std::vector<double> v;
  for (const auto& p : parts) v.push_back(std::stod(p));
  double minutes = 0;
  if (dash != std::string::npos) {  // D-HH, D-HH:MM, D-HH:MM:SS
    minutes = v[0] * 60 + (v.size() > 1 ? v[1] : 0) + (v.size() > 2 ? v[2] / 60 : 0);
  } else if (v.size() == 1) {  // MM
    minutes = v[0];
  } else if (v.size() == 2) {  // MM:SS
    minutes = v[0] + v[1] / 60;
  } else {  // HH:MM:SS
    minutes = v[0] * 60 + v[1] + v[2] / 60;
  }
  return days * 24 * 60 + minutes;
}

double slurm_megabytes(std::string_view text_in) {
  const std::string text = trim(text_in);
  std::string digits = text;
  double unit = 1;  // MB
  if (!text.empty() && !std::isdigit(static_cast<unsigned char>(text.back()))) {
    switch (std::toupper(static_cast<unsigned char>(text.back()))) {
      case 'K': unit = 1.0 / 1024; break;
      case 'M': unit = 1; break;
      case 'G': unit = 1024; break;
      case 'T': unit = 1024.0 * 1024; break;
      default: throw std::invalid_argument(fmt::format("\"{}\" is not a SLURM memory size", text));
    }
    digits.pop_back();
  }
  if (!all_digits(digits)) throw std::invalid_argument(fmt::format("\"{}\" is not a SLURM memory size", text));
  return std::stod(digits) * unit;
}

std::vector<PartitionLimits> parse_sinfo_nodes(std::string_view text) {
  std::vector<PartitionLimits> out;
  for (std::string_view l : lines_of(text)) {
    const std::vector<std::string> c = split(l, '|');
    if (c.size() < 4) continue;
    PartitionLimits p;
    p.name = trim(c[0]);
    if (!p.name.empty() && p.name.back() == '*') {
      p.is_default = true;
      p.name.pop_back();
    }
    std::string mem = trim(c[1]), cpus = trim(c[2]);
    if (!mem.empty() && mem.back() == '+') mem.pop_back();
    if (!cpus.empty() && cpus.back() == '+') cpus.pop_back();
    if (!all_digits(mem) || !all_digits(cpus) || p.name.empty()) continue;
    p.max_node_memory_MB = std::stod(mem);
    p.max_node_cpus = std::atoi(cpus.c_str());
    try {
      p.max_minutes = slurm_minutes(c[3]);
    } catch (const std::invalid_argument&) {
      p.max_minutes = std::nullopt;  // unreadable limit: do not check it
    }
    auto it = std::find_if(out.begin(), out.end(), [&](const PartitionLimits& q) { return q.name == p.name; });
    if (it == out.end()) {
      out.push_back(p);
    } else {
      it->is_default = it->is_default || p.is_default;
      it->max_node_memory_MB = std::max(it->max_node_memory_MB, p.max_node_memory_MB);
      it->max_node_cpus = std::max(it->max_node_cpus, p.max_node_cpus);
    }
  }
  return out;
}

ClusterLimits query_cluster_limits() {
  ClusterLimits c;
  const CommandOutput config = run_command({"scontrol", "show", "config"}, 10);
  if (config.ran) c.max_array_size = parse_max_array_size(config.out);
  const CommandOutput sinfo = run_command({"sinfo", "-h", "-N", "-o", "%P|%m|%c|%l"}, 10);
  if (sinfo.ran) c.partitions = parse_sinfo_nodes(sinfo.out);
  return c;
}

// --- jobs ----------------------------------------------------------------------------

std::vector<SlurmJob> parse_squeue(std::string_view text) {
  std::vector<SlurmJob> out;
  for (std::string_view l : lines_of(text)) {
    const std::vector<std::string> c = split(l, '|');
    if (c.size() < 6) continue;
    SlurmJob j;
    const std::string id = trim(c[0]), array_job = trim(c[1]), task = trim(c[2]);
    if (!all_digits(id)) continue;
    if (all_digits(task) && all_digits(array_job)) {
      j.array_job = array_job;
      j.array_task = std::atol(task.c_str());
      j.job = array_job + "_" + task;
    } else {
      j.job = id;
    }
    j.state = trim(c[3]);
    j.reason = trim(c[4]);
    if (j.reason == "None") j.reason.clear();
    j.command = trim(c[5]);
    if (c.size() > 6 && !j.command.empty() && j.command.front() != '/' && !trim(c[6]).empty())
      j.command = trim(c[6]) + "/" + j.command;
    out.push_back(std::move(j));
  }
  return out;
}

std::vector<SlurmJob> parse_sacct(std::string_view text) {
  std::vector<SlurmJob> out;
  for (std::string_view l : lines_of(text)) {
    const std::vector<std::string> c = split(l, '|');
    if (c.size() < 3) continue;
    SlurmJob j;
    j.job = trim(c[0]);
    if (j.job.empty() || j.job.find('.') != std::string::npos) continue;  // job steps
    split_job_id(j);
    const std::string state = trim(c[1]);
    j.state = state.substr(0, state.find(' '));  // "CANCELLED by 0"
    j.exit_code = trim(c[2]);
    out.push_back(std::move(j));
  }
  return out;
}

std::vector<SlurmJob> parse_scontrol_jobs(std::string_view text) {
  std::vector<SlurmJob> out;
  for (std::string_view l : lines_of(text)) {
    std::map<std::string, std::string> kv;
    for (const std::string& w : split(l, ' ')) {
      const auto eq = w.find('=');
      if (eq != std::string::npos && !kv.count(w.substr(0, eq))) kv[w.substr(0, eq)] = w.substr(eq + 1);
    }
    if (!kv.count("JobId") || !kv.count("JobState")) continue;
    SlurmJob j;
    const std::string array_job = kv.count("ArrayJobId") ? kv["ArrayJobId"] : "";
    const std::string task = kv.count("ArrayTaskId") ? kv["ArrayTaskId"] : "";
    if (!array_job.empty() && all_digits(task)) {
      j.array_job = array_job;
      j.array_task = std::atol(task.c_str());
      j.job = array_job + "_" + task;
    } else if (!array_job.empty() && !task.empty()) {
      continue;  // a pending range "3-4": squeue lists those
    } else {
      j.job = kv["JobId"];
    }
    j.state = kv["JobState"];
    j.reason = kv.count("Reason") && kv["Reason"] != "None" ? kv["Reason"] : "";
    j.exit_code = kv.count("ExitCode") ? kv["ExitCode"] : "";
    out.push_back(std::move(j));
  }
  return out;
}

std::optional<std::vector<SlurmJob>> query_queue() {
  const CommandOutput q = run_command({"squeue", "-r", "-h", "-u", user_name(), "-o", "%A|%F|%K|%T|%r|%o|%Z"}, 15);
  if (!q.ran) return std::nullopt;
  return parse_squeue(q.out);
}

std::map<std::string, SlurmJob> query_job_states(const std::vector<std::string>& array_jobs) {
  std::map<std::string, SlurmJob> out;
  if (array_jobs.empty()) return out;
  std::string ids;
  for (const auto& a : array_jobs) ids += (ids.empty() ? "" : ",") + a;
  const CommandOutput s = run_command({"sacct", "-n", "-P", "-X", "-j", ids, "-o", "JobID,State,ExitCode"}, 15);
  if (s.ran)
    for (auto& j : parse_sacct(s.out)) out[j.job] = j;
  if (!out.empty()) return out;
  for (const auto& a : array_jobs) {  // accounting off: what the controller still holds
    const CommandOutput c = run_command({"scontrol", "show", "job", "-o", a}, 15);
    if (c.ran)
      for (auto& j : parse_scontrol_jobs(c.out)) out[j.job] = j;
  }
  return out;
}

std::string describe_job_end(const SlurmJob& j) {
  std::string s = j.state;
  const auto colon = j.exit_code.find(':');
  if (colon != std::string::npos) {
    const int code = std::atoi(j.exit_code.substr(0, colon).c_str());
    const int signal = std::atoi(j.exit_code.substr(colon + 1).c_str());
    if (signal) s += fmt::format(" (killed by signal {})", signal);
    else if (code) s += fmt::format(" (exit code {})", code);
  }
  return s;
}

}  // namespace lumtrap
