#pragma once
// Where the photons of one wavelength ended: plain integer counters that add.
// A run split over threads, processes or cluster jobs merges to the same
// numbers (integer addition is exact and order independent).
#include <array>
#include <cstdint>
#include <string_view>
#include <vector>

#include "io/end_states.hpp"
#include "io/scene.hpp"

namespace lumtrap {

/// Fixed shapes of the tallies, set once per scene.
struct TallyLayout {
  EndBinLayout bins;                   ///< the end-state bins (io/end_states.hpp)
  std::vector<double> depth_edges_um;  ///< depth bins below the front surface, increasing, from 0
  int polar_bins = 90;                 ///< 1° bins of the polar angle
  int azimuth_bins = 36;               ///< 10° bins of the azimuth
  int pass_bins = 64;                  ///< passes 0..62, last bin = 63 or more
  int hit_bins = 8;                    ///< surface hits 0..6, last bin = 7 or more
  /// Paired groups: photon i of every wavelength counts in group i mod
  /// photon_groups as well. Runs with the same seed draw the same random
  /// numbers for the same photon index (common random numbers), so group g
  /// of two variants is a paired sample and the spread of the groups'
  /// differences gives the standard error of a difference (batch means).
  int photon_groups = 32;
};

/// The end-state bins of the scene and log-spaced depth bins (20 per decade
/// from 1 nm, plus [0, 1 nm)) down to `max_depth_um`.
TallyLayout make_tally_layout(const Scene& scene, double max_depth_um);

struct WavelengthTally {
  std::vector<std::uint64_t> ended;  ///< photons per end-state bin: every photon ends in exactly one
  // statistics
  std::uint64_t photons = 0;        ///< launched
  std::uint64_t interactions = 0;   ///< surface hits processed
  std::uint64_t bulk_passes = 0;    ///< crossings of the bulk between the textured zones
  // histograms
  std::vector<std::uint64_t> depth;            ///< absorbed_silicon by depth bin (TallyLayout::depth_edges_um)
  std::vector<std::uint64_t> escape_angle;     ///< escaped_front by [polar][azimuth]
  std::vector<std::uint64_t> rear_angle;       ///< arrivals at the rear zone by [polar][azimuth]
  std::vector<std::uint64_t> passes_absorbed;  ///< absorbed_silicon by number of bulk passes
  std::vector<std::uint64_t> front_hits;       ///< reflected_front by number of front hits
  /// Paired groups (TallyLayout::photon_groups): photons by [group][end-state
  /// bin]; a group's photons are its row's sum (every photon ends once).
  std::vector<std::uint64_t> ended_by_group;

  explicit WavelengthTally(const TallyLayout& layout = {});
  WavelengthTally& operator+=(const WavelengthTally& other);
  bool operator==(const WavelengthTally& other) const = default;
  /// Sum of the end bins (equals photons when every photon was accounted for).
  std::uint64_t ended_total() const;
};

/// Photons of a tally that ended in a state: in instance k, or (k < 0) in
/// all instances of it together.
std::uint64_t ended_in(const TallyLayout& layout, const WavelengthTally& t, EndState s, int k = -1);

/// The counters and histograms by name, for the checkpoint format and for
/// adding tallies: one list, so a new histogram is one member and one entry.
inline constexpr std::array<std::pair<std::string_view, std::uint64_t WavelengthTally::*>, 3> kTallyCounters = {{
    {"photons", &WavelengthTally::photons},
    {"interactions", &WavelengthTally::interactions},
    {"bulk_passes", &WavelengthTally::bulk_passes},
}};
inline constexpr std::array<std::pair<std::string_view, std::vector<std::uint64_t> WavelengthTally::*>, 7>
    kTallyVectors = {{
        {"ended", &WavelengthTally::ended},
        {"depth", &WavelengthTally::depth},
        {"escape_angle", &WavelengthTally::escape_angle},
        {"rear_angle", &WavelengthTally::rear_angle},
        {"passes_absorbed", &WavelengthTally::passes_absorbed},
        {"front_hits", &WavelengthTally::front_hits},
        {"ended_by_group", &WavelengthTally::ended_by_group},
    }};

}  // namespace lumtrap
