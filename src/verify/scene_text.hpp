#pragma once
// Scenes of the self-checks, written as TOML text here (no files), and
// their traced results.
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "io/results.hpp"
#include "trace/run.hpp"

namespace lumtrap::verify {

/// The scene of a TOML text; `name` stands for the file in messages.
Scene scene_of_text(const std::string& name, const std::string& toml_text);

/// A scene traced with a fixed number of photons per wavelength.
struct TracedScene {
  std::unique_ptr<PreparedRun> run;
  std::vector<WavelengthTally> tallies;
  Results results;
  std::uint64_t photons = 0;
  /// Fraction of the photons of wavelength `i` that ended in bin `name` (all instances).
  double fraction(const std::string& name, std::size_t i = 0) const;
};

/// Traces every wavelength of the scene with `photons` photons each.
TracedScene trace_scene(const std::string& name, const std::string& toml_text, std::uint64_t photons);

/// The tallies of every wavelength of `run`.
std::vector<WavelengthTally> trace_all(const PreparedRun& run, std::uint64_t photons);

}  // namespace lumtrap::verify
