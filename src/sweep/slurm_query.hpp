#pragma once
// Asking SLURM about the cluster and its jobs, through its own commands
// (scontrol, sinfo, squeue, sacct) when they are on the PATH. Every query
// has a time limit and every failure (no command, no controller, accounting
// disabled) gives "unknown", never an error: planning and status work
// without SLURM too. The parse_* functions read the commands' text output
// (formats of slurm-wlm 22.05, scontrol(1), sinfo(1), squeue(1), sacct(1),
// SchedMD) and are tested on captured output.
#include <cstddef>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace lumtrap {

/// The standard output of a program run with a time limit.
struct CommandOutput {
  bool ran = false;       ///< started, ended by itself within the limit, exit code 0
  int exit_code = -1;
  std::string out;        ///< stdout (stderr is discarded)
};
/// Runs argv[0] (looked up on PATH) with the arguments; kills it after
/// `timeout_seconds`.
CommandOutput run_command(const std::vector<std::string>& argv, double timeout_seconds = 10.0);

// --- the cluster's limits ---------------------------------------------------------

/// SLURM's default MaxArraySize (slurm.conf(5), SchedMD; from memory):
/// array indices 0 .. MaxArraySize - 1.
inline constexpr std::size_t kDefaultMaxArraySize = 1001;

/// MaxArraySize from `scontrol show config` text ("MaxArraySize = 1001"); nullopt when absent.
std::optional<std::size_t> parse_max_array_size(std::string_view config_text);

/// What one partition offers, from `sinfo -h -N -o %P|%m|%c|%l` (one line
/// per node and partition; the default partition's name ends in '*').
struct PartitionLimits {
  std::string name;
  bool is_default = false;
  double max_node_memory_MB = 0;       ///< the largest node's memory
  int max_node_cpus = 0;               ///< the largest node's CPUs
  std::optional<double> max_minutes;   ///< time limit; nullopt = infinite
};
std::vector<PartitionLimits> parse_sinfo_nodes(std::string_view text);

/// A SLURM time ("MM", "MM:SS", "HH:MM:SS", "D-HH", "D-HH:MM", "D-HH:MM:SS";
/// "infinite"/"UNLIMITED" -> nullopt) in minutes; std::invalid_argument when malformed.
std::optional<double> slurm_minutes(std::string_view text);
/// A SLURM memory size ("500M", "2G", "1024" = MB) in MB; std::invalid_argument when malformed.
double slurm_megabytes(std::string_view text);

/// What the cluster says, queried once: MaxArraySize (nullopt when
/// scontrol gives no answer) and the partitions (empty without sinfo).
struct ClusterLimits {
  std::optional<std::size_t> max_array_size;
  std::vector<PartitionLimits> partitions;
};
ClusterLimits query_cluster_limits();

// --- jobs ---------------------------------------------------------------------------

/// One job or array element as SLURM reports it.
struct SlurmJob {
  std::string job;         ///< "1234_7" for an array element, else "1240"
  std::string array_job;   ///< "1234" ("" for a plain job)
  long array_task = -1;    ///< 7 (-1 for a plain job)
  std::string state;       ///< PENDING, RUNNING, COMPLETED, FAILED, CANCELLED, TIMEOUT, OUT_OF_MEMORY, NODE_FAIL, ...
  std::string reason;      ///< squeue's reason (pending jobs), else ""
  std::string exit_code;   ///< "0:9" = exit code 0, signal 9 ("" when unknown)
  std::string command;     ///< the batch script (squeue only)
};

/// `squeue -r -h -o %A|%F|%K|%T|%r|%o|%Z` lines (job id, array job id,
/// array index or N/A, state, reason, command, working directory). A
/// relative command is made absolute with the working directory.
std::vector<SlurmJob> parse_squeue(std::string_view text);
/// `sacct -n -P -X -o JobID,State,ExitCode` lines ("1234_7|CANCELLED by 0|0:0").
std::vector<SlurmJob> parse_sacct(std::string_view text);
/// `scontrol show job -o` lines (JobId=.. ArrayJobId=.. ArrayTaskId=.. JobState=.. ExitCode=..).
std::vector<SlurmJob> parse_scontrol_jobs(std::string_view text);

/// The jobs of this user in the queue (pending or running), one line per array element.
std::optional<std::vector<SlurmJob>> query_queue();
/// Final states of the given array jobs (all their elements), from sacct or,
/// when accounting is off, `scontrol show job` (which keeps finished jobs
/// for MinJobAge, 300 s by default). Keyed by SlurmJob::job.
std::map<std::string, SlurmJob> query_job_states(const std::vector<std::string>& array_jobs);

/// A job's end in words: "FAILED (killed by signal 9)", "TIMEOUT", "CANCELLED".
std::string describe_job_end(const SlurmJob& j);

}  // namespace lumtrap
