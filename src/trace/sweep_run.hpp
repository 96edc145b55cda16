#pragma once
// A planned sweep on disk and the work done in it. Layout of a sweep folder:
//
//   sweep.json                    sweep hash, tool version, variants, tasks
//   variants.csv                  id + parameter values
//   variants/<id>/scene.toml      the variant's resolved scene (its hash is in sweep.json)
//   variants/<id>/result/         result folder, written atomically: spectral.csv,
//                                 summary.json, scene.toml, generation.csv, ...,
//                                 tallies.json (the integer tallies, for exact merging)
//   variants/<id>/checkpoint.json while running (tallies after the last batch)
//   variants/<id>/parts/pKKofNN.* split runs: each part's tallies and checkpoint
//   logs/task_<t>.log             array task logs (written by SLURM)
//   merged.csv, merged.json       one row per variant (merge_sweep)
//
// Work is cut into units: one unit per variant, or with a split of K, K
// units per variant (photons [k P/K, (k+1) P/K) of every wavelength). Array
// task t runs units [t n, (t+1) n) for n units per task. A variant's random
// numbers are keyed by its index (PreparedRun::variant) and by the photon
// index, so its tallies are bit-identical however the units are spread
// over tasks, threads, parts or interrupted runs.
#include <atomic>
#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <functional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "io/sweep.hpp"

namespace lumtrap {

struct SweepPlanOptions {
  std::size_t per_task = 1;         ///< work units per array task (>= 1)
  std::uint32_t split_photons = 1;  ///< parts per variant (>= 1; > 1 needs fixed photon counts)
};

struct SweepFolderVariant {
  std::string id;
  std::size_t index = 0;                ///< keys the variant's random numbers
  std::string scene_hash;               ///< text_hash of variants/<id>/scene.toml
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
  std::uint32_t split = 1;
  std::size_t tasks = 0;                ///< array tasks: ceil(units / per_task)
  nlohmann::ordered_json requests;      ///< resources asked of the scheduler (as planned)
};

/// Writes a sweep folder (all but the scheduler scripts). Planning the same
/// sweep again into its folder keeps every finished result and checkpoint;
/// a folder of another sweep or tool version, or a non-empty folder that is
/// no sweep folder, is refused (std::runtime_error naming it).
SweepFolder write_sweep_plan(const Sweep& sweep, const std::filesystem::path& dir, const SweepPlanOptions& options,
                             const nlohmann::ordered_json& requests);

/// Reads DIR/sweep.json; std::runtime_error naming the file when absent or malformed.
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

std::filesystem::path variant_dir(const SweepFolder& f, std::size_t variant);
std::filesystem::path result_dir(const SweepFolder& f, std::size_t variant);
std::filesystem::path task_log(const SweepFolder& f, std::size_t task);

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

/// Runs one work unit: skips it when its result (or part tallies) exists,
/// resumes from its checkpoint, writes the result atomically and removes
/// the checkpoint. The unit that completes the last part of a split
/// variant also writes the variant's result folder.
UnitReport run_work_unit(const SweepFolder& f, std::size_t unit, const UnitRunOptions& options);

/// For a split variant whose parts are all finished and whose result folder
/// is missing: adds the part tallies and writes the result folder. True
/// when the variant's result exists afterwards.
bool assemble_variant(const SweepFolder& f, std::size_t variant);

// --- status and merge -----------------------------------------------------------

enum class VariantState { done, running, failed, missing };
const char* state_name(VariantState s);

struct VariantStatus {
  VariantState state = VariantState::missing;
  std::filesystem::path log;   ///< the task log of its (first unfinished) unit
  std::string detail;          ///< e.g. the log's error line, "3 of 4 parts done"
};

/// done: the result folder exists (or, when split, every part's tallies);
/// running: a checkpoint or start mark newer than `running_seconds`;
/// failed: otherwise, and the task log holds an error line;
/// missing: otherwise.
VariantStatus variant_status(const SweepFolder& f, std::size_t variant, double running_seconds = 120.0);

struct MergeReport {
  std::size_t merged = 0;
  std::vector<std::pair<std::size_t, VariantStatus>> missing;  ///< variant index and its state
};

/// Writes DIR/merged.csv and DIR/merged.json from every finished variant
/// (assembling finished split variants first): per variant its parameters,
/// J_G and every loss with σ in mA/cm², J_max and photons. Throws
/// std::runtime_error, writing nothing, when a result belongs to another
/// sweep or tool version (hash check); missing variants are reported.
MergeReport merge_sweep(const SweepFolder& f);

}  // namespace lumtrap
