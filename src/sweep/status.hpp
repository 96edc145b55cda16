#pragma once
// The state of every variant of a sweep folder, from its files and, when
// SLURM answers, from SLURM's view of the jobs:
//
//   done     the result folder exists (or, when split, every part's tallies)
//   running  a live process traces it, or its array task runs (SLURM RUNNING)
//   queued   its array task waits in the SLURM queue (PENDING)
//   failed   it was started, or its task ran, and it did not finish: killed
//            (SIGKILL, node failure: a start mark is left and its process or
//            job is gone), stopped (time limit, scancel: checkpoint kept), or
//            an error in the task log; the reason names the SLURM state when
//            SLURM still knows the job (sacct, else scontrol for MinJobAge)
//   missing  never started and not queued (never submitted, or cancelled
//            while pending)
//
// Without SLURM (or for a process on another host) a start mark or
// checkpoint younger than `running_seconds` counts as running. Failed and
// missing units need their array task submitted again: `resubmit_tasks`.
#include <cstddef>
#include <filesystem>
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "sweep/plan_folder.hpp"
#include "sweep/slurm_query.hpp"

namespace lumtrap {

enum class VariantState { done, running, queued, failed, missing };
inline constexpr VariantState kVariantStates[] = {VariantState::done, VariantState::running, VariantState::queued,
                                                  VariantState::failed, VariantState::missing};
const char* state_name(VariantState s);

struct VariantStatus {
  VariantState state = VariantState::missing;
  std::size_t task = 0;            ///< array index of the unit that sets the state
  std::filesystem::path log;       ///< that task's log
  std::string reason;              ///< in full: SLURM state, process, log line
  std::string kind;                ///< the reason without ids and paths, for grouping ("never started")
  std::string slurm_job;           ///< the job that ran or runs it ("1234_7"), "" when unknown
  std::string slurm_state;         ///< SLURM's word for that job ("FAILED", "CANCELLED", ...)
};

/// Where status gets SLURM's view; empty functions (or nullopt answers)
/// mean "SLURM unknown". The defaults call squeue and sacct/scontrol.
struct SlurmSource {
  std::function<std::optional<std::vector<SlurmJob>>()> queue;
  std::function<std::map<std::string, SlurmJob>(const std::vector<std::string>& array_jobs)> job_states;
};
SlurmSource slurm_from_commands();

struct SweepStatus {
  std::vector<VariantStatus> variants;          ///< one per variant, in index order
  std::size_t counts[5] = {0, 0, 0, 0, 0};       ///< per VariantState
  std::vector<std::size_t> resubmit_tasks;      ///< array indices with failed or missing units, none queued/running
  bool slurm_answered = false;                  ///< squeue answered
  std::optional<SlurmJob> merge_job;            ///< the merge job while queued or running
  bool all_done() const { return counts[0] == variants.size(); }
};

/// The folder needs its header only (load_sweep_header).
SweepStatus sweep_status(const SweepFolder& f, const SlurmSource& slurm = {}, double running_seconds = 120.0);

/// Consecutive variants with the same state and kind, for lists that stay
/// short however large the sweep ("v0020-v9999 (9980 variants, tasks 20-9999)").
struct StatusGroup {
  VariantState state;
  std::size_t first = 0, last = 0, count = 0;   ///< variant indices, both ends included
  std::size_t first_task = 0, last_task = 0;
  const VariantStatus* example = nullptr;       ///< the first member
};
std::vector<StatusGroup> group_not_done(const SweepFolder& f, const std::vector<VariantStatus>& variants);

/// Text lines of the groups: at most `max_lines`, then "... N more".
std::vector<std::string> status_lines(const SweepFolder& f, const std::vector<StatusGroup>& groups,
                                      std::size_t max_lines = 20);

/// Sorted indices as SLURM array ranges: {3, 17, 40, 41, 42} -> "3,17,40-42".
std::string array_ranges(const std::vector<std::size_t>& sorted_indices);

}  // namespace lumtrap
