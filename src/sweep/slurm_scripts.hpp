#pragma once
// The SLURM job scripts of a planned sweep: an array job (one array task per
// group of work units) and a merge job that runs when every task succeeded.
#include <filesystem>
#include <string>

#include <nlohmann/json.hpp>

#include "sweep/plan_folder.hpp"

namespace lumtrap {

/// Resources asked of the scheduler per array task.
struct SlurmRequests {
  int cpus_per_task = 1;
  std::string time = "04:00:00";  ///< MM, HH:MM:SS or D-HH:MM:SS
  std::string mem = "2G";         ///< a whole number with K, M, G or T
  std::string partition;          ///< empty: the cluster's default
};

/// Throws std::runtime_error naming the option when --time or --mem is not in SLURM's syntax.
void check_slurm_requests(const SlurmRequests& r);

/// The requests as stored in sweep.json, with the binary the jobs run.
nlohmann::ordered_json slurm_requests_json(const SlurmRequests& r, const std::filesystem::path& binary);

/// Paths go into #SBATCH lines, which take no quoting: throws
/// std::runtime_error naming `what` when the path holds a space or a shell
/// metacharacter.
void require_plain_path(const std::filesystem::path& p, const char* what);

/// The shell line that submits the array job and the dependent merge job.
std::string submit_line(const SweepFolder& f);

/// submit.sbatch and merge.sbatch, running `binary`.
std::string submit_script(const SweepFolder& f, const SlurmRequests& r, const std::filesystem::path& binary);
std::string merge_script(const SweepFolder& f, const SlurmRequests& r, const std::filesystem::path& binary);

}  // namespace lumtrap
