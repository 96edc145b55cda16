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
};

std::string tally_set_json(const TallySet& set);
/// Throws std::runtime_error naming the file on malformed content or a layout mismatch.
TallySet tally_set_from_json(const std::string& text, const TallyLayout& layout, const std::string& file);

void save_tally_set(const std::filesystem::path& file, const TallySet& set);
/// Empty when the file does not exist.
std::optional<TallySet> load_tally_set(const std::filesystem::path& file, const TallyLayout& layout);

/// 64-bit FNV-1a of a text, as 16 hex digits (stable across platforms).
std::string text_hash(const std::string& text);

}  // namespace lumtrap
