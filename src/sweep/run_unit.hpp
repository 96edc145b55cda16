#pragma once
// Running one work unit of a sweep folder: the only part of the sweeps that
// traces photons. A unit is skipped when its result (or part tallies)
// exists, resumes from its checkpoint, writes its result atomically and
// removes the checkpoint.
#include <atomic>
#include <cstddef>
#include <cstdint>
#include <functional>
#include <string>

#include "sweep/plan_folder.hpp"

namespace lumtrap {

struct UnitRunOptions {
  double checkpoint_seconds = 10.0;          ///< write the checkpoint at most this often
  std::uint64_t batch = 50000;               ///< photons per wavelength per batch
  const std::atomic<bool>* stop = nullptr;   ///< set to stop after the current batch (checkpoint kept)
  std::function<void(double)> progress;      ///< fraction of this unit done
};

struct UnitReport {
  enum Outcome { skipped, finished, interrupted } outcome = skipped;
  std::string line;   ///< one line for the log: what was done, J_G when a variant finished
};

/// Runs one work unit. The unit that completes the last part of a split
/// variant also writes the variant's result folder.
UnitReport run_work_unit(const SweepFolder& f, std::size_t unit, const UnitRunOptions& options);

/// For a split variant whose parts are all finished and whose result folder
/// is missing: adds the part tallies and writes the result folder. True
/// when the variant's result exists afterwards.
bool assemble_variant(const SweepFolder& f, std::size_t variant);

}  // namespace lumtrap
