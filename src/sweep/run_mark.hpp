#pragma once
// Who runs a piece of a sweep: the marks a running process leaves in the
// sweep folder, so that `sweep status` can tell a live run from a dead one.
//
//   variants/<id>/started      (unit start mark) while a process traces the unit;
//                              removed on every way out but a kill
//   logs/PLAN/task_<t>.json    (task record) the last run of array task t:
//                              written at its start, completed at its end
//
// Both hold a RunMark as JSON: host, pid and, inside a SLURM job, the job
// ("<array job>_<index>" for an array task, from SLURM_ARRAY_JOB_ID and
// SLURM_ARRAY_TASK_ID, else SLURM_JOB_ID) and the start time (UTC,
// ISO 8601). A task record adds its end time and outcome.
#include <filesystem>
#include <optional>
#include <string>

#include <nlohmann/json.hpp>

namespace lumtrap {

struct RunMark {
  std::string host;
  long pid = 0;
  std::string slurm_job;        ///< "" outside SLURM; "1234_7" for an array task; "1240" for a plain job
  std::string slurm_array_job;  ///< "1234" for an array task, else ""
  std::string started;          ///< UTC, "2026-03-04T03:12:55Z"
  std::string ended;            ///< task records: when the task ended ("" while running or when killed)
  std::string outcome;          ///< task records: e.g. "3 finished, 0 already done, 0 failed" ("" while running)
};

/// This process, now.
RunMark this_run_mark();

nlohmann::json run_mark_json(const RunMark& m);
/// Reads a mark; nullopt when the file is absent or unreadable (a mark is
/// informative only: a damaged one never stops a sweep).
std::optional<RunMark> read_run_mark(const std::filesystem::path& file);
void write_run_mark(const std::filesystem::path& file, const RunMark& m);

/// Whether the process of a mark still lives, as far as this machine can
/// tell: yes/no for a mark of this host (the pid exists and is no zombie),
/// unknown for another host.
enum class Liveness { alive, dead, unknown };
Liveness process_liveness(const RunMark& m);

/// Current UTC time as "YYYY-MM-DDTHH:MM:SSZ".
std::string utc_now_text();

}  // namespace lumtrap
