#pragma once
// Where the photons of one wavelength ended: plain integer counters that add.
// A run split over threads, processes or cluster jobs merges to the same
// numbers (integer addition is exact and order independent).
#include <cstdint>
#include <vector>

namespace lumtrap {

/// Fixed shapes of the histograms, set once per scene.
struct TallyLayout {
  int front_films = 0;
  int rear_films = 0;
  std::vector<double> depth_edges_um;  ///< depth bins below the front surface, increasing, from 0
  int polar_bins = 90;                 ///< 1° bins of the polar angle
  int azimuth_bins = 36;               ///< 10° bins of the azimuth
  int pass_bins = 64;                  ///< passes 0..62, last bin = 63 or more
  int hit_bins = 8;                    ///< surface hits 0..6, last bin = 7 or more
};

TallyLayout make_tally_layout(int front_films, int rear_films, double max_depth_um);

struct WavelengthTally {
  // every photon ends in exactly one of these bins
  std::uint64_t R_front = 0;        ///< reflected without ever entering the silicon
  std::uint64_t R_escape = 0;       ///< entered the silicon, then left through the front
  std::uint64_t A_si = 0;           ///< absorbed in the silicon bulk
  std::vector<std::uint64_t> A_front;  ///< absorbed in front film i (ambient → silicon order)
  std::vector<std::uint64_t> A_rear;   ///< absorbed in rear film i (silicon → outside order)
  std::uint64_t A_rear_medium = 0;  ///< entered an absorbing rear medium (metal)
  std::uint64_t T = 0;              ///< left through the rear into a non-absorbing medium
  std::uint64_t unresolved = 0;     ///< stopped at the interaction limit
  std::uint64_t lost = 0;           ///< slipped through the mesh by numerical error
  // statistics
  std::uint64_t photons = 0;        ///< launched
  std::uint64_t interactions = 0;   ///< surface hits processed
  std::uint64_t bulk_passes = 0;    ///< crossings of the bulk between the textured zones
  std::vector<std::uint64_t> depth;          ///< A_si by depth bin (TallyLayout::depth_edges_um)
  std::vector<std::uint64_t> escape_angle;   ///< escapes (R_escape) by [polar][azimuth]
  std::vector<std::uint64_t> rear_angle;     ///< arrivals at the rear zone by [polar][azimuth]
  std::vector<std::uint64_t> passes_absorbed;  ///< A_si photons by number of bulk passes
  std::vector<std::uint64_t> R_front_hits;     ///< R_front photons by number of front hits

  explicit WavelengthTally(const TallyLayout& layout = {});
  WavelengthTally& operator+=(const WavelengthTally& other);
  bool operator==(const WavelengthTally& other) const = default;
  /// Sum of the end bins (equals photons when every photon was accounted for).
  std::uint64_t ended() const;
};

}  // namespace lumtrap
