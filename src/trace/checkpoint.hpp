#pragma once
// Tallies on disk: a run's (or a sweep variant's) progress, written
// atomically after every batch of photons, so an interrupted run resumes
// where it stopped and finishes with the same numbers. Also the exchange
// format of tallies between cluster jobs (they add).
#include <cstdint>
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "trace/tallies.hpp"

namespace lumtrap {

struct TallySet {
  std::string scene_hash;                ///< the resolved scene's hash: refuses to mix runs
  std::string tool_version;
  std::vector<WavelengthTally> tallies;  ///< one per run wavelength
  /// Precision mode: the photons per wavelength the current allocation round
  /// aims at (empty otherwise). A run resumed in the middle of a round first
  /// finishes that round, so it makes the same allocation decisions as an
  /// uninterrupted run and ends with bit-identical tallies.
  std::vector<std::uint64_t> round_goals;
  int round = 0;  ///< precision mode: index of that round (0 = the pilot)
};

/// JSON text of the tallies, with the layout's end-state names (checked on reading).
std::string tally_set_json(const TallySet& set, const TallyLayout& layout);
/// Throws std::runtime_error naming the file on malformed content, another
/// format version (e.g. from an older lumtrap) or a layout mismatch.
TallySet tally_set_from_json(const std::string& text, const TallyLayout& layout, const std::string& file);

void save_tally_set(const std::filesystem::path& file, const TallySet& set, const TallyLayout& layout);
/// Empty when the file does not exist.
std::optional<TallySet> load_tally_set(const std::filesystem::path& file, const TallyLayout& layout);

}  // namespace lumtrap
