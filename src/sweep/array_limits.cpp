// Array size and resources against the cluster's limits. See array_limits.hpp.
#include "sweep/array_limits.hpp"

#include <fmt/format.h>

#include <stdexcept>

namespace lumtrap {

ArrayFit fit_array(std::size_t units, std::size_t per_task, std::optional<std::size_t> max_array_size) {
  ArrayFit fit;
  fit.from_cluster = max_array_size.has_value();
  fit.max_array_size = max_array_size.value_or(kDefaultMaxArraySize);
  const std::size_t m = std::max<std::size_t>(1, fit.max_array_size);
  const std::size_t needed = (units + m - 1) / m;  // smallest per-task with ceil(units / per_task) <= m
  const std::string whose = fit.from_cluster ? "this cluster's MaxArraySize (scontrol show config)"
                                             : "SLURM's default MaxArraySize (scontrol gave no answer here)";
  if (per_task == 0) {
    fit.per_task = std::max<std::size_t>(1, needed);
  } else {
    fit.per_task = per_task;
    const std::size_t tasks = (units + per_task - 1) / per_task;
    if (tasks > m)
      throw std::runtime_error(fmt::format(
          "--per-task {}: {} work units make {} array tasks (indices 0-{}), but {} is {} (indices 0-{}); allowed: "
          "--per-task {} or more (then {} tasks), or leave --per-task out to have it chosen",
          per_task, units, tasks, tasks - 1, whose, m, m - 1, needed, (units + needed - 1) / needed));
  }
  fit.tasks = (units + fit.per_task - 1) / fit.per_task;
  return fit;
}

void check_requests(const SlurmRequests& r, const std::vector<PartitionLimits>& partitions) {
  if (partitions.empty()) return;
  const PartitionLimits* p = nullptr;
  std::string names;
  for (const auto& q : partitions) {
    names += (names.empty() ? "" : ", ") + q.name + (q.is_default ? " (default)" : "");
    if (r.partition.empty() ? q.is_default : q.name == r.partition) p = &q;
  }
  if (!p) {
    if (r.partition.empty()) return;
    throw std::runtime_error(
        fmt::format("--partition {}: sinfo lists no such partition; allowed: {}", r.partition, names));
  }
  const std::string which = fmt::format("partition {}{}", p->name, r.partition.empty() ? " (the default)" : "");
  const double mem = slurm_megabytes(r.mem);
  if (mem > p->max_node_memory_MB)
    throw std::runtime_error(fmt::format(
        "--mem {}: {:.0f} MB per task, but the largest node of {} has {:.0f} MB (sinfo); allowed: --mem {}M or less "
        "(lumtrap measured 60-70 MB per 1-thread task, docs/cluster.md), or another --partition",
        r.mem, mem, which, p->max_node_memory_MB, static_cast<long long>(p->max_node_memory_MB)));
  if (r.cpus_per_task > p->max_node_cpus)
    throw std::runtime_error(fmt::format("--cpus-per-task {}: the largest node of {} has {} CPUs (sinfo); allowed: "
                                         "--cpus-per-task {} or less",
                                         r.cpus_per_task, which, p->max_node_cpus, p->max_node_cpus));
  if (p->max_minutes) {
    const std::optional<double> t = slurm_minutes(r.time);
    if (t && *t > *p->max_minutes + 1e-9)
      throw std::runtime_error(fmt::format("--time {}: {:.0f} minutes, but {} allows at most {:.0f} minutes (sinfo); "
                                           "allowed: a shorter --time (a task stopped by its limit resumes from its "
                                           "checkpoint when submitted again), or another --partition",
                                           r.time, *t, which, *p->max_minutes));
  }
}

}  // namespace lumtrap
