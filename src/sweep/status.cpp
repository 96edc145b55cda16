// Variant states of a sweep folder. See status.hpp.
#include "sweep/status.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <chrono>
#include <fstream>
#include <set>

#include "sweep/run_mark.hpp"

namespace lumtrap {

namespace fs = std::filesystem;

namespace {

/// The end of a log: its last error line (error, cancelled, killed, oom) or
/// else its last line; "" when the log is absent or empty.
struct LogTail {
  std::string error_line, last_line;
};

LogTail read_log_tail(const fs::path& log) {
  LogTail t;
  std::ifstream in(log, std::ios::binary);
  if (!in) return t;
  in.seekg(0, std::ios::end);
  const std::streamoff size = in.tellg();
  in.seekg(std::max<std::streamoff>(0, size - 65536));
  std::string line;
  while (std::getline(in, line)) {
    while (!line.empty() && (line.back() == '\r' || line.back() == ' ')) line.pop_back();
    if (line.empty()) continue;
    t.last_line = line;
    std::string low = line;
    for (char& c : low) c = char(std::tolower(static_cast<unsigned char>(c)));
    if (low.find("error") != std::string::npos || low.find("cancelled") != std::string::npos ||
        low.find("killed") != std::string::npos || low.find("oom") != std::string::npos ||
        low.find("time limit") != std::string::npos)
      t.error_line = line;
  }
  return t;
}

bool fresh(const fs::path& p, double seconds) {
  std::error_code ec;
  const auto t = fs::last_write_time(p, ec);
  if (ec) return false;
  return std::chrono::duration<double>(fs::file_time_type::clock::now() - t).count() < seconds;
}

bool file_exists(const fs::path& p) {
  std::error_code ec;
  return fs::exists(p, ec);
}

/// Per-task facts, read once.
struct TaskFacts {
  bool read = false;
  std::optional<RunMark> record;
  LogTail log;
  bool log_read = false;
};

struct Classifier {
  Classifier(const SweepFolder& folder, double seconds) : f(folder), running_seconds(seconds) {}
  const SweepFolder& f;
  double running_seconds;
  bool slurm_answered = false;
  std::map<std::size_t, SlurmJob> queued_by_task;   // this folder's submit.sbatch elements
  std::map<std::string, SlurmJob> queued_by_job;    // every queued job of the user
  std::map<std::string, SlurmJob> ended;            // final states by job
  std::vector<std::string> array_jobs;              // array jobs that ran tasks of this folder
  std::map<std::size_t, TaskFacts> tasks;

  TaskFacts& task(std::size_t t) {
    TaskFacts& tf = tasks[t];
    if (!tf.read) {
      tf.read = true;
      tf.record = read_run_mark(task_record(f, t));
    }
    return tf;
  }
  const LogTail& log(std::size_t t) {
    TaskFacts& tf = task(t);
    if (!tf.log_read) {
      tf.log_read = true;
      tf.log = read_log_tail(task_log(f, t));
    }
    return tf.log;
  }

  std::string log_note(std::size_t t) {
    const LogTail& l = log(t);
    if (!l.error_line.empty()) return fmt::format("; log: \"{}\"", l.error_line);
    if (!l.last_line.empty()) return fmt::format("; log ends: \"{}\"", l.last_line);
    return "";
  }

  /// SLURM's end of a job, "" when unknown.
  std::string ended_text(const std::string& job, VariantStatus& st) {
    auto it = ended.find(job);
    if (it == ended.end()) return "";
    st.slurm_state = it->second.state;
    return describe_job_end(it->second);
  }

  void from_queue(const SlurmJob& j, VariantStatus& st, const std::string& what) {
    st.slurm_job = j.job;
    st.slurm_state = j.state;
    if (j.state == "PENDING") {
      st.state = VariantState::queued;
      st.kind = "waiting in the SLURM queue";
      st.reason = fmt::format("SLURM job {} PENDING{}", j.job, j.reason.empty() ? "" : " (" + j.reason + ")");
    } else {
      st.state = VariantState::running;
      st.kind = what;
      st.reason = fmt::format("SLURM job {} {}: {}", j.job, j.state, what);
    }
  }

  VariantStatus unit(std::size_t unit) {
    const WorkUnit u = unit_at(f, unit);
    VariantStatus st;
    st.task = task_of_unit(f, unit);
    st.log = task_log(f, st.task);
    const std::optional<RunMark> mark = read_run_mark(unit_started(f, u));
    const bool checkpoint = file_exists(unit_checkpoint(f, u));

    // 1. SLURM runs (or queues) its task, or the job in its start mark.
    if (mark && !mark->slurm_job.empty() && queued_by_job.count(mark->slurm_job)) {
      from_queue(queued_by_job[mark->slurm_job], st, "tracing");
      return st;
    }
    if (auto it = queued_by_task.find(st.task); it != queued_by_task.end()) {
      from_queue(it->second, st, mark ? "tracing" : "waiting for its turn in its array task");
      return st;
    }
    // 2. Started and not ended cleanly: a start mark is left.
    if (mark) {
      st.slurm_job = mark->slurm_job;
      const Liveness live = process_liveness(*mark);
      const std::string who = fmt::format("process {} on {}{}", mark->pid, mark->host,
                                          mark->slurm_job.empty() ? "" : " (SLURM job " + mark->slurm_job + ")");
      if (live == Liveness::alive) {
        st.state = VariantState::running;
        st.kind = "tracing";
        st.reason = who + ": tracing";
        return st;
      }
      const bool job_gone = !mark->slurm_job.empty() && slurm_answered;  // not in the queue (checked above)
      if (live == Liveness::dead || job_gone) {
        const std::string end = mark->slurm_job.empty() ? "" : ended_text(mark->slurm_job, st);
        st.state = VariantState::failed;
        st.kind = end.empty() ? "killed while tracing" : fmt::format("killed while tracing: SLURM {}", end);
        st.reason = fmt::format("{} ended while tracing it{}{}{}", who, end.empty() ? "" : ": SLURM " + end,
                                checkpoint ? " (checkpoint kept)" : "", log_note(st.task));
        return st;
      }
      if (fresh(unit_started(f, u), running_seconds) || fresh(unit_checkpoint(f, u), running_seconds)) {
        st.state = VariantState::running;
        st.kind = "tracing";
        st.reason = who + ": tracing (start mark or checkpoint is recent)";
        return st;
      }
      st.state = VariantState::failed;
      st.kind = "no sign of life";
      st.reason = fmt::format("{} started it; no checkpoint for {:.0f} s (killed?){}", who, running_seconds,
                              log_note(st.task));
      return st;
    }
    // 3. Not started by a live process now: what its task's last run says.
    TaskFacts& tf = task(st.task);
    if (tf.record && tf.record->ended.empty()) {
      const RunMark& r = *tf.record;
      if (!r.slurm_job.empty() && queued_by_job.count(r.slurm_job)) {
        from_queue(queued_by_job[r.slurm_job], st, "waiting for its turn in its array task");
        return st;
      }
      if (process_liveness(r) == Liveness::alive) {
        st.state = VariantState::running;
        st.kind = "waiting for its turn in its array task";
        st.reason = fmt::format("task {} runs as process {} on {}: waiting for its turn", st.task, r.pid, r.host);
        return st;
      }
      if (process_liveness(r) == Liveness::unknown && !(slurm_answered && !r.slurm_job.empty()) &&
          fresh(task_record(f, st.task), running_seconds)) {
        st.state = VariantState::running;
        st.kind = "waiting for its turn in its array task";
        st.reason = fmt::format("task {} started on {} (recent): waiting for its turn", st.task, r.host);
        return st;
      }
    }
    if (tf.record) {
      const RunMark& r = *tf.record;
      st.slurm_job = r.slurm_job;
      const std::string end = r.slurm_job.empty() ? "" : ended_text(r.slurm_job, st);
      st.state = VariantState::failed;
      if (checkpoint) {
        st.kind = end.empty() ? "stopped, checkpoint kept" : fmt::format("stopped: SLURM {}, checkpoint kept", end);
      } else if (!r.ended.empty()) {
        st.kind = fmt::format("its task ended without it ({})", r.outcome);
      } else {
        st.kind = end.empty() ? "its task was killed before it" : fmt::format("its task ended: SLURM {}", end);
      }
      st.reason = fmt::format("last run of task {}{} {}{}: {}{}", st.task,
                              r.slurm_job.empty() ? "" : " (SLURM job " + r.slurm_job + ")",
                              r.ended.empty() ? "started " + r.started : "ended " + r.ended,
                              end.empty() ? "" : ", SLURM " + end, st.kind, log_note(st.task));
      return st;
    }
    if (checkpoint) {
      st.state = VariantState::failed;
      st.kind = "stopped, checkpoint kept";
      st.reason = "stopped before it finished (checkpoint kept)" + log_note(st.task);
      return st;
    }
    // 4. Never started.
    for (const auto& a : array_jobs) {
      const std::string job = fmt::format("{}_{}", a, st.task);
      if (auto it = ended.find(job); it != ended.end()) {
        st.state = VariantState::failed;
        st.slurm_job = job;
        st.slurm_state = it->second.state;
        st.kind = fmt::format("never started: SLURM {}", describe_job_end(it->second));
        st.reason = fmt::format("SLURM job {} {} before it started{}", job, describe_job_end(it->second),
                                log_note(st.task));
        return st;
      }
    }
    const LogTail& l = log(st.task);
    if (!l.error_line.empty()) {
      st.state = VariantState::failed;
      st.kind = "error in the task log";
      st.reason = fmt::format("log: \"{}\"", l.error_line);
      return st;
    }
    st.state = VariantState::missing;
    st.kind = slurm_answered ? "never started, not in the SLURM queue" : "never started";
    st.reason = st.kind;
    return st;
  }
};

int severity(VariantState s) {  // which unit's state a split variant shows
  switch (s) {
    case VariantState::failed: return 4;
    case VariantState::missing: return 3;
    case VariantState::running: return 2;
    case VariantState::queued: return 1;
    case VariantState::done: return 0;
  }
  return 0;
}

}  // namespace

const char* state_name(VariantState s) {
  switch (s) {
    case VariantState::done: return "done";
    case VariantState::running: return "running";
    case VariantState::queued: return "queued";
    case VariantState::failed: return "failed";
    case VariantState::missing: return "missing";
  }
  return "?";
}

SlurmSource slurm_from_commands() { return SlurmSource{query_queue, query_job_states}; }

SweepStatus sweep_status(const SweepFolder& f, const SlurmSource& slurm, double running_seconds) {
  SweepStatus out;
  Classifier c(f, running_seconds);
  // Units still open, per variant.
  std::vector<std::vector<std::size_t>> open(f.variant_count);
  std::vector<char> done(f.variant_count, 0);
  std::set<std::size_t> open_tasks;
  for (std::size_t v = 0; v < f.variant_count; ++v) {
    if (result_complete(f, v)) {
      done[v] = 1;
      continue;
    }
    for (std::uint32_t k = 0; k < f.split_photons; ++k)
      if (f.split_photons == 1 || !file_exists(part_tallies(f, v, k))) open[v].push_back(v * f.split_photons + k);
    if (open[v].empty()) done[v] = 2;  // every part done: merge writes the result
    for (std::size_t unit : open[v]) open_tasks.insert(task_of_unit(f, unit));
  }
  // SLURM's view (only when something is open).
  if (!open_tasks.empty()) {
    std::optional<std::vector<SlurmJob>> queue;
    if (slurm.queue) queue = slurm.queue();
    if (queue) {
      c.slurm_answered = out.slurm_answered = true;
      const std::string submit = (f.dir / "submit.sbatch").string(), merge = (f.dir / "merge.sbatch").string();
      for (const SlurmJob& j : *queue) {
        c.queued_by_job[j.job] = j;
        if (j.command == submit && j.array_task >= 0) c.queued_by_task[std::size_t(j.array_task)] = j;
        if (j.command == merge) out.merge_job = j;
      }
    }
    std::set<std::string> arrays;
    for (std::size_t t : open_tasks) {
      const TaskFacts& tf = c.task(t);
      if (tf.record && !tf.record->slurm_array_job.empty()) arrays.insert(tf.record->slurm_array_job);
    }
    for (const auto& [t, j] : c.queued_by_task)
      if (!j.array_job.empty()) arrays.insert(j.array_job);
    c.array_jobs.assign(arrays.begin(), arrays.end());
    // Newest array job first: its element states are the ones that count.
    std::sort(c.array_jobs.begin(), c.array_jobs.end(), [](const std::string& a, const std::string& b) {
      return a.size() != b.size() ? a.size() > b.size() : a > b;
    });
    if (slurm.job_states && !c.array_jobs.empty()) c.ended = slurm.job_states(c.array_jobs);
    for (auto it = c.ended.begin(); it != c.ended.end();) {  // keep final states only
      const std::string& s = it->second.state;
      if (s == "PENDING" || s == "RUNNING" || s == "COMPLETING" || s == "CONFIGURING" || s == "SUSPENDED")
        it = c.ended.erase(it);
      else
        ++it;
    }
  }

  std::set<std::size_t> resubmit, busy;
  out.variants.resize(f.variant_count);
  for (std::size_t v = 0; v < f.variant_count; ++v) {
    VariantStatus& st = out.variants[v];
    if (done[v]) {
      st.state = VariantState::done;
      if (done[v] == 2) st.reason = st.kind = "all parts done (merge writes the result folder)";
      ++out.counts[0];
      continue;
    }
    std::size_t parts_done = f.split_photons - open[v].size();
    bool first = true;
    for (std::size_t unit : open[v]) {
      VariantStatus us = c.unit(unit);
      if (us.state == VariantState::failed || us.state == VariantState::missing) resubmit.insert(us.task);
      else busy.insert(us.task);
      if (first || severity(us.state) > severity(st.state)) st = us;
      first = false;
    }
    if (f.split_photons > 1) st.reason = fmt::format("{} of {} parts done; {}", parts_done, f.split_photons, st.reason);
    ++out.counts[std::size_t(st.state)];
  }
  for (std::size_t t : resubmit)
    if (!busy.count(t)) out.resubmit_tasks.push_back(t);
  return out;
}

std::vector<StatusGroup> group_not_done(const SweepFolder& f, const std::vector<VariantStatus>& variants) {
  (void)f;
  std::vector<StatusGroup> groups;
  for (std::size_t v = 0; v < variants.size(); ++v) {
    const VariantStatus& st = variants[v];
    if (st.state == VariantState::done) continue;
    if (!groups.empty()) {
      StatusGroup& g = groups.back();
      if (g.last + 1 == v && g.state == st.state && g.example->kind == st.kind) {
        g.last = v;
        ++g.count;
        g.first_task = std::min(g.first_task, st.task);
        g.last_task = std::max(g.last_task, st.task);
        continue;
      }
    }
    groups.push_back(StatusGroup{st.state, v, v, 1, st.task, st.task, &st});
  }
  return groups;
}

std::vector<std::string> status_lines(const SweepFolder& f, const std::vector<StatusGroup>& groups,
                                      std::size_t max_lines) {
  std::vector<std::string> out;
  for (std::size_t i = 0; i < groups.size(); ++i) {
    if (out.size() + 1 == max_lines && groups.size() > max_lines) {
      std::size_t rest = 0;
      for (std::size_t k = i; k < groups.size(); ++k) rest += groups[k].count;
      out.push_back(fmt::format("... and {} more variant{} in {} more groups (--json lists every variant)", rest,
                                rest == 1 ? "" : "s", groups.size() - i));
      break;
    }
    const StatusGroup& g = groups[i];
    if (g.count == 1) {
      out.push_back(fmt::format("{} (array index {}) {}: {}", variant_id(f, g.first), g.first_task,
                                state_name(g.state), g.example->reason));
    } else {
      const std::string tasks = g.first_task == g.last_task ? fmt::format("array index {}", g.first_task)
                                                            : fmt::format("array indices {}-{}", g.first_task,
                                                                          g.last_task);
      out.push_back(fmt::format("{}-{} ({} variants, {}) {}: {}", variant_id(f, g.first), variant_id(f, g.last),
                                g.count, tasks, state_name(g.state), g.example->kind));
    }
  }
  return out;
}

std::string array_ranges(const std::vector<std::size_t>& idx) {
  std::string out;
  for (std::size_t i = 0; i < idx.size();) {
    std::size_t j = i;
    while (j + 1 < idx.size() && idx[j + 1] == idx[j] + 1) ++j;
    if (!out.empty()) out += ',';
    out += j == i ? std::to_string(idx[i]) : fmt::format("{}-{}", idx[i], idx[j]);
    i = j + 1;
  }
  return out;
}

}  // namespace lumtrap
