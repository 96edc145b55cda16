#pragma once
// Fitting a planned sweep into what the cluster accepts, checked before
// anything is written:
//  - the array: indices 0 .. tasks-1 must stay below MaxArraySize (the
//    highest accepted index is MaxArraySize - 1; SLURM rejects a larger one
//    with "Invalid job array specification"). Without --per-task the plan
//    groups units so the array fits; a given --per-task that does not fit is
//    refused with the numbers;
//  - the resources: --mem, --cpus-per-task and --time against the largest
//    node and the time limit of the partition (the requested one, else the
//    default), when sinfo answered.
// Inputs come from slurm_query.hpp (query_cluster_limits); errors are
// std::runtime_error naming the option, the value and what is allowed.
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "sweep/slurm_query.hpp"
#include "sweep/slurm_scripts.hpp"

namespace lumtrap {

struct ArrayFit {
  std::size_t per_task = 1;
  std::size_t tasks = 0;
  std::size_t max_array_size = kDefaultMaxArraySize;
  bool from_cluster = false;   ///< MaxArraySize read from scontrol (else SLURM's default)
};

/// `units` work units; `per_task` 0 = choose the smallest that fits.
ArrayFit fit_array(std::size_t units, std::size_t per_task, std::optional<std::size_t> max_array_size);

/// Throws when no node of the partition can hold one array task. Nothing
/// is checked when `partitions` is empty (no sinfo) or, without
/// --partition, when no partition is marked default.
void check_requests(const SlurmRequests& r, const std::vector<PartitionLimits>& partitions);

}  // namespace lumtrap
