#pragma once
// The state of every variant of a sweep folder, read from its files alone:
// done (result folder, or every part's tallies), running (a fresh start mark
// or checkpoint), failed (the task log holds an error line) or missing.
#include <cstddef>
#include <filesystem>
#include <string>

#include "sweep/plan_folder.hpp"

namespace lumtrap {

enum class VariantState { done, running, failed, missing };
const char* state_name(VariantState s);

struct VariantStatus {
  VariantState state = VariantState::missing;
  std::filesystem::path log;   ///< the task log of its (first unfinished) unit
  std::string detail;          ///< e.g. the log's error line, "3 of 4 parts done"
};

/// done: the result folder exists (or, when split, every part's tallies);
/// running: a checkpoint or start mark newer than `running_seconds`;
/// failed: otherwise, and the task log holds an error line;
/// missing: otherwise.
VariantStatus variant_status(const SweepFolder& f, std::size_t variant, double running_seconds = 120.0);

}  // namespace lumtrap
