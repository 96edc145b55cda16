#pragma once
// One table of a sweep: merged.csv and merged.json, a row per finished
// variant with its parameters, J_G and every loss with σ in mA/cm², J_G
// against a reference variant with the error of the difference, J_max and
// photons, read from the variants' summary.json files (io/summary.hpp).
#include <cstddef>
#include <functional>
#include <string>
#include <utility>
#include <vector>

#include "sweep/plan_folder.hpp"
#include "sweep/status.hpp"

namespace lumtrap {

struct MergeReport {
  std::size_t merged = 0;
  std::vector<std::pair<std::size_t, VariantStatus>> missing;  ///< variant index and its state
};

/// Called for a split variant whose result folder is missing, before it is
/// counted as missing: adds its finished parts into a result folder when it
/// can (run_unit.hpp, assemble_variant). May be empty.
using AssembleVariant = std::function<void(const SweepFolder&, std::size_t variant)>;

/// Writes DIR/merged.csv and DIR/merged.json from every finished variant
/// (the folder must be read whole: load_sweep_folder).
/// Throws std::runtime_error, writing nothing, when a result belongs to
/// another sweep or tool version (hash check); missing variants are
/// reported. merged.csv holds every number in its shortest exact text, so
/// equal tallies give equal bytes.
/// Every row also holds J_G minus J_G of a reference variant (`reference`:
/// its id; empty = the first finished variant) with the error of that
/// difference from the variants' paired photon groups (io/paired_difference.hpp):
/// with common random streams ([sweep] random_streams, the default) it is
/// much smaller than the two errors combined. std::invalid_argument, writing
/// nothing, when `reference` names no finished variant.
MergeReport merge_sweep(const SweepFolder& f, const AssembleVariant& assemble = {}, const std::string& reference = {});

}  // namespace lumtrap
