#pragma once
// A planned sweep on disk: its layout, writing the plan and reading it back,
// and how its work is cut into units and array tasks. Layout of a sweep
// folder:
//
//   sweep.json                    format, sweep hash, tool version, variants, tasks
//   variants.csv                  id + parameter values
//   variants/<id>/scene.toml      the variant's resolved scene (its identity is in sweep.json)
//   variants/<id>/result/         result folder, written atomically: spectral.csv,
//                                 summary.json, scene.toml, generation.csv, ...,
//                                 tallies.json (the integer tallies, for exact merging)
//   variants/<id>/checkpoint.json while running (tallies after the last batch)
//   variants/<id>/started         while running (host and process)
//   variants/<id>/parts/pKKofNN.* split runs: each part's tallies, facts and checkpoint
//   logs/task_<t>.log             array task logs (written by SLURM)
//   merged.csv, merged.json       one row per variant (merge.hpp)
//
// Work is cut into units: one unit per variant, or with a split of K, K
// units per variant (photons [k P/K, (k+1) P/K) of every wavelength). Array
// task t runs units [t n, (t+1) n) for n units per task. A variant's tallies
// are bit-identical however its units are spread over tasks, threads, parts
// or interrupted runs (counter-based random numbers keyed by the photon).
#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <string>
#include <utility>
#include <vector>

#include <nlohmann/json.hpp>

#include "sweep/expand.hpp"

namespace lumtrap {

struct SweepPlanOptions {
  std::size_t per_task = 1;         ///< work units per array task (>= 1)
  std::uint32_t split_photons = 1;  ///< parts per variant (>= 1; > 1 needs fixed photon counts)
};

struct SweepFolderVariant {
  std::string id;
  std::size_t index = 0;                ///< position in expansion order
  std::string scene_hash;               ///< scene identity of variants/<id>/scene.toml
  std::uint64_t photons = 0;            ///< run.photons per wavelength
  nlohmann::ordered_json parameters;    ///< swept key -> value
  std::vector<std::string> cells;       ///< the parameter cells of merged.csv / variants.csv
};

struct SweepFolder {
  std::filesystem::path dir;            ///< absolute
  std::string sweep_hash;               ///< text_hash(sweep_identity_text)
  std::string tool_version;             ///< lumtrap version that planned it
  std::string source;                   ///< the sweep file, absolute
  std::vector<std::string> headers;     ///< parameter column headers
  std::vector<SweepFolderVariant> variants;
  std::size_t per_task = 1;
  std::uint32_t split_photons = 1;
  std::size_t tasks = 0;                ///< array tasks: ceil(units / per_task)
  nlohmann::ordered_json requests;      ///< resources asked of the scheduler (as planned)
};

/// Writes a sweep folder (all but the scheduler scripts). Planning the same
/// sweep again into its folder keeps every finished result and checkpoint;
/// a folder of another sweep or tool version, or a non-empty folder that is
/// no sweep folder, is refused (std::runtime_error naming it).
SweepFolder write_sweep_plan(const Sweep& sweep, const std::filesystem::path& dir, const SweepPlanOptions& options,
                             const nlohmann::ordered_json& requests);

/// Reads DIR/sweep.json; std::runtime_error naming the file when absent,
/// malformed or of another format version.
SweepFolder load_sweep_folder(const std::filesystem::path& dir);

/// Throws std::runtime_error when the folder was planned by another lumtrap version.
void require_same_tool_version(const SweepFolder& folder);

// --- work units ---------------------------------------------------------------

struct WorkUnit {
  std::size_t variant = 0;  ///< index into SweepFolder::variants
  std::uint32_t part = 0;   ///< 0 .. split-1
};

std::size_t unit_count(const SweepFolder& f);
WorkUnit unit_at(const SweepFolder& f, std::size_t unit);
/// Units [task per_task, (task+1) per_task) (clipped); out_of_range for a task >= f.tasks.
std::vector<std::size_t> units_of_task(const SweepFolder& f, std::size_t task);
std::size_t task_of_unit(const SweepFolder& f, std::size_t unit);
/// Photons [first, last) of every wavelength in part `part` of a split.
std::pair<std::uint64_t, std::uint64_t> part_range(std::uint64_t photons, std::uint32_t part, std::uint32_t split);

// --- paths ----------------------------------------------------------------------

std::filesystem::path variant_dir(const SweepFolder& f, std::size_t variant);
std::filesystem::path result_dir(const SweepFolder& f, std::size_t variant);
std::filesystem::path task_log(const SweepFolder& f, std::size_t task);
std::filesystem::path parts_dir(const SweepFolder& f, std::size_t variant);
std::filesystem::path part_tallies(const SweepFolder& f, std::size_t variant, std::uint32_t part);
std::filesystem::path part_facts(const SweepFolder& f, std::size_t variant, std::uint32_t part);
std::filesystem::path unit_checkpoint(const SweepFolder& f, const WorkUnit& u);
std::filesystem::path unit_started(const SweepFolder& f, const WorkUnit& u);

/// The variant's result folder is complete (summary.json and tallies.json).
bool result_complete(const SweepFolder& f, std::size_t variant);

/// What a checkpoint or part file of a unit must carry: the scene identity,
/// the variant and the part.
std::string unit_key(const SweepFolder& f, std::size_t variant, std::uint32_t part);

}  // namespace lumtrap
