#pragma once
// Where a photon ends: the one table of end states. It drives the tallies
// of the transport, the checkpoint format, the result files (column names of
// spectral.csv, entries of summary.json and merged.csv), the planar solver's
// results and the README's table (`lumtrap end-states` prints it).
//
// Every photon launched ends in exactly one state, so the fractions of all
// states add up to 1 at every wavelength and J_G + every loss = J_max.
//
// A state either has one bin per scene, or one bin per instance: one per
// front film, one per rear film; a state that only a scene feature can
// reach (the measured rear reflector) has no bin in scenes without it, so
// their result files keep their columns. Adding a state means adding an enumerator
// and its row in end_states.cpp, and the line of the transport (or solver)
// that ends photons in it.
#include <array>
#include <cstddef>
#include <cstdint>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "io/scene.hpp"

namespace lumtrap {

enum class EndState : std::uint8_t {
  absorbed_silicon,      ///< absorbed in the silicon bulk: J_G
  reflected_front,       ///< reflected by the front without ever entering the silicon
  escaped_front,         ///< entered the silicon, then left through the front
  absorbed_front_film,   ///< absorbed in a front film (one bin per film)
  absorbed_rear_film,    ///< absorbed in a rear film (one bin per film)
  absorbed_rear_medium,  ///< absorbed in an absorbing rear medium (a metal)
  absorbed_rear_reflector,  ///< absorbed by a rear given by its measured reflectance (no bin otherwise)
  absorbed_rear_opening_film,       ///< absorbed in a film of the rear openings (one bin per film; patterned rears only)
  absorbed_rear_opening_medium,     ///< absorbed in the medium of the rear openings (patterned rears only)
  absorbed_rear_opening_reflector,  ///< absorbed by a measured reflector in the rear openings (patterned rears only)
  absorbed_grid,         ///< light from the ambient absorbed in the front grid (grid scenes only)
  reflected_grid,        ///< light from the ambient reflected away by the front grid (grid scenes only)
  absorbed_front_contact,  ///< light from the silicon absorbed where the grid contacts it (grid scenes only)
  transmitted_rear,      ///< left through the rear into a non-absorbing medium
  unresolved,            ///< stopped at run.max_bounces interactions
  lost,                  ///< slipped through the mesh by numerical error
};
inline constexpr std::size_t kEndStateCount = 16;

/// How the states are grouped in tables and plots.
enum class EndGroup {
  generation,    ///< becomes current (J_G)
  reflection,    ///< never entered the silicon
  escape,        ///< left through the front after entering
  parasitic,     ///< absorbed somewhere other than the silicon bulk
  transmission,  ///< left through the rear
  numerical,     ///< not resolved by the model (reported, expected ~0)
};
std::string_view group_name(EndGroup g);

/// One bin of one scene: a state, or one instance of it.
struct EndBin {
  EndState state;
  int instance = 0;       ///< film index (0-based) for per-film states
  std::string name;       ///< column name, e.g. "absorbed_front_film1_sinx_pecvd_n209"
  std::string meaning;    ///< one line, e.g. "absorbed in front film 1 (sinx_pecvd_n209, 75 nm)"
  EndGroup group;
};

struct EndStateInfo {
  EndState state;
  std::string_view name;     ///< bin name; for per-instance states the prefix of the bin names
  std::string_view meaning;  ///< one line for the docs
  EndGroup group;
  /// The bins of this state in a scene (one for plain states).
  std::vector<EndBin> (*bins)(const EndStateInfo&, const Scene&);
};

/// Every state, in the order of the enum.
std::span<const EndStateInfo> end_state_table();
const EndStateInfo& end_state_info(EndState s);

/// The bins of one scene, state by state in table order, and where each
/// state's bins start: the layout of tallies and result columns.
struct EndBinLayout {
  std::vector<EndBin> bins;
  std::array<std::uint32_t, kEndStateCount> first{};  ///< index of the first bin of each state
  std::array<std::uint32_t, kEndStateCount> count{};  ///< bins of each state

  /// Index of instance k of state s.
  std::size_t slot(EndState s, int k = 0) const { return first[std::size_t(s)] + std::size_t(k); }
  std::size_t size() const { return bins.size(); }
};
EndBinLayout end_bin_layout(const Scene& scene);

/// The README's table of end states (Markdown), generated from the table.
std::string end_state_markdown();

}  // namespace lumtrap
