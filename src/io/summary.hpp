#pragma once
// summary.json: the facts of one result folder as one typed struct. `lumtrap
// run`, `lumtrap planar` and sweep variants write the same keys from it, and
// merge and the plots read result folders back through it. A new fact is a
// member here and a line in visit_summary.
//
// Keys that do not apply to a result keep their empty value: a planar
// (exact) result has photons = 0, a run outside a sweep has sweep_hash = "".
#include <array>
#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

namespace lumtrap {

/// The format of result folders; folders of another format are refused.
inline constexpr const char* kResultFormat = "lumtrap result 3";

/// The current of one end state.
struct StateCurrent {
  std::string name;       ///< bin name, e.g. "reflected_front"
  double mA_cm2 = 0;
  double sigma_mA_cm2 = 0;
  std::string group;      ///< io/end_states.hpp EndGroup name
  std::string meaning;
};

/// Facts of cell features ([front.grid], [rear.pattern]): written only when
/// the scene has them (an object of named numbers), so summary.json of other
/// scenes keeps its keys; read when present.
struct CellFacts {
  nlohmann::ordered_json facts = nlohmann::ordered_json::object();
};

struct Summary {
  std::string format = kResultFormat;
  std::string tool_version;
  std::string scene_name;
  std::string scene_hash;            ///< scene identity (io/scene_identity.hpp)
  std::string method;                ///< "ray tracing" or "planar (exact)"
  std::string spectrum;
  std::array<double, 2> wavelength_range_nm{};
  std::size_t wavelengths = 0;
  // currents, mA/cm² (model estimates)
  double J_max_mA_cm2 = 0;
  double J_G_mA_cm2 = 0;
  double J_G_sigma_mA_cm2 = 0;
  std::vector<StateCurrent> losses;  ///< every end state but absorbed_silicon, in table order
  double closure_mA_cm2 = 0;         ///< J_G + losses - J_max (round-off)
  /// J_G of each paired photon group (trace/tallies.hpp TallyLayout::photon_groups;
  /// empty for exact results or when a group has no photon at some wavelength).
  /// Two results of the same seed and random streams pair group by group:
  /// the spread of the groups' differences is the error of the difference.
  std::vector<double> J_G_groups_mA_cm2;
  /// Batch-means cross-check of J_G_sigma: the spread of J_G_groups / sqrt(groups).
  double J_G_sigma_groups_mA_cm2 = 0;
  /// "common" (variants of a sweep share random streams; runs with the same
  /// seed do too) or "independent" (each sweep variant its own streams).
  std::string random_streams = "common";
  // the run
  std::uint64_t photons = 0;         ///< launched, all wavelengths (0 for exact results)
  std::uint64_t photons_per_wavelength_min = 0;
  std::uint64_t photons_per_wavelength_max = 0;
  std::uint64_t interactions = 0;
  std::uint64_t bulk_passes = 0;
  std::uint64_t seed = 0;
  bool randomize_lateral = false;
  std::string thickness_convention;
  double thickness_um = 0;
  std::uint64_t front_triangles = 0;
  std::uint64_t rear_triangles = 0;
  double target_J_G_sigma_mA_cm2 = 0;  ///< 0: fixed photon count
  bool target_J_G_sigma_met = false;
  int threads = 0;
  std::string host;
  double setup_seconds = 0;
  double trace_seconds = 0;
  double photons_per_second = 0;
  double interactions_per_second = 0;
  double peak_memory_MB = 0;
  std::vector<std::string> warnings;
  /// Geometric facts of the grid and rear pattern (grid_coverage,
  /// grid_contact_fraction, rear_opening_fraction); empty without them.
  CellFacts cell;
  // sweep variants
  std::string sweep_hash;
  std::string variant;
  std::size_t variant_index = 0;
  nlohmann::ordered_json parameters = nlohmann::ordered_json::object();  ///< swept key -> value
  std::uint32_t split_photons = 1;
  bool resumed_from_checkpoint = false;
};

/// Every key of summary.json, in file order.
template <class S, class Visit>
void visit_summary(S& s, Visit&& v) {
  v("format", s.format);
  v("tool_version", s.tool_version);
  v("scene_name", s.scene_name);
  v("scene_hash", s.scene_hash);
  v("method", s.method);
  v("spectrum", s.spectrum);
  v("wavelength_range_nm", s.wavelength_range_nm);
  v("wavelengths", s.wavelengths);
  v("J_max_mA_cm2", s.J_max_mA_cm2);
  v("J_G_mA_cm2", s.J_G_mA_cm2);
  v("J_G_sigma_mA_cm2", s.J_G_sigma_mA_cm2);
  v("losses", s.losses);
  v("closure_mA_cm2", s.closure_mA_cm2);
  v("J_G_groups_mA_cm2", s.J_G_groups_mA_cm2);
  v("J_G_sigma_groups_mA_cm2", s.J_G_sigma_groups_mA_cm2);
  v("random_streams", s.random_streams);
  v("photons", s.photons);
  v("photons_per_wavelength_min", s.photons_per_wavelength_min);
  v("photons_per_wavelength_max", s.photons_per_wavelength_max);
  v("interactions", s.interactions);
  v("bulk_passes", s.bulk_passes);
  v("seed", s.seed);
  v("randomize_lateral", s.randomize_lateral);
  v("thickness_convention", s.thickness_convention);
  v("thickness_um", s.thickness_um);
  v("front_triangles", s.front_triangles);
  v("rear_triangles", s.rear_triangles);
  v("target_J_G_sigma_mA_cm2", s.target_J_G_sigma_mA_cm2);
  v("target_J_G_sigma_met", s.target_J_G_sigma_met);
  v("threads", s.threads);
  v("host", s.host);
  v("setup_seconds", s.setup_seconds);
  v("trace_seconds", s.trace_seconds);
  v("photons_per_second", s.photons_per_second);
  v("interactions_per_second", s.interactions_per_second);
  v("peak_memory_MB", s.peak_memory_MB);
  v("warnings", s.warnings);
  v("cell_geometry", s.cell);
  v("sweep_hash", s.sweep_hash);
  v("variant", s.variant);
  v("variant_index", s.variant_index);
  v("parameters", s.parameters);
  v("split_photons", s.split_photons);
  v("resumed_from_checkpoint", s.resumed_from_checkpoint);
}

/// summary.json text (two-space indent, keys in visit_summary order).
std::string summary_json(const Summary& s);

/// Reads summary.json text; std::runtime_error naming `file` when it is not
/// JSON, lacks a key, or has another format (e.g. a folder written by an
/// older lumtrap: the message names both formats).
Summary summary_from_json(const std::string& text, const std::string& file);
Summary read_summary(const std::filesystem::path& file);

/// The loss of a given name, or nullptr.
const StateCurrent* find_loss(const Summary& s, const std::string& name);

}  // namespace lumtrap
