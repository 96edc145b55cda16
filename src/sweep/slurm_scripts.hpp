#pragma once
// The SLURM job scripts of a planned sweep: an array job (one array task per
// group of work units) and a merge job that runs when every task succeeded.
// Both run the lumtrap binary that planned the sweep, by absolute path, with
// LUMTRAP_MATERIALS set to the materials folder it used (so a job never
// depends on PATH, modules or the source tree), and write their logs to
// logs/PLAN/ (plan_folder.hpp).
#include <filesystem>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "sweep/plan_folder.hpp"

namespace lumtrap {

/// Resources asked of the scheduler per array task.
struct SlurmRequests {
  int cpus_per_task = 1;
  std::string time = "04:00:00";  ///< MM, HH:MM:SS or D-HH:MM:SS
  std::string mem = "1G";         ///< a whole number with K, M, G or T
  std::string partition;          ///< empty: the cluster's default
  std::size_t throttle = 0;       ///< at most this many array tasks at once ("%N"); 0 = no limit
};

/// What the job scripts run: the binary and the materials folder.
struct JobProgram {
  std::filesystem::path binary;
  std::filesystem::path materials;
};

/// Throws std::runtime_error naming the option when --time or --mem is not in SLURM's syntax.
void check_slurm_requests(const SlurmRequests& r);

/// The requests as stored in sweep.json, with the binary and materials the jobs use.
nlohmann::ordered_json slurm_requests_json(const SlurmRequests& r, const JobProgram& program);
/// The throttle stored in sweep.json's requests (0 when absent).
std::size_t planned_throttle(const nlohmann::ordered_json& requests);

/// Paths go into #SBATCH lines, which take no quoting: throws
/// std::runtime_error naming `what` when the path holds a space or a shell
/// metacharacter.
void require_plain_path(const std::filesystem::path& p, const char* what);

/// The shell line that submits the array job and the dependent merge job.
std::string submit_line(const SweepFolder& f);

/// The same for some array tasks only (`--array=3,17,40-42%T` on the
/// command line overrides the script's #SBATCH --array); T = the planned
/// throttle when there is one.
std::string resubmit_line(const SweepFolder& f, const std::vector<std::size_t>& tasks);

/// "0-239" or "0-239%20".
std::string array_spec(std::size_t tasks, std::size_t throttle);

/// submit.sbatch and merge.sbatch.
std::string submit_script(const SweepFolder& f, const SlurmRequests& r, const JobProgram& program);
std::string merge_script(const SweepFolder& f, const SlurmRequests& r, const JobProgram& program);

}  // namespace lumtrap
