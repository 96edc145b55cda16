#pragma once
// A planned sweep on disk: its layout, writing the plan and reading it back
// (whole, or only one array task's part), and how its work is cut into
// units and array tasks. Layout of a sweep folder (PLAN = the plan id,
// "per-task-4" or "per-task-4-split-3": how units map to array indices):
//
//   sweep.json                    header: format, sweep hash, tool version, keys, counts,
//                                 plan id, resources asked for (small, whatever the size)
//   sweep.toml                    the sweep file as planned (every variant's base scene)
//   variants.jsonl                one line per variant (id, index, scene identity, photons,
//                                 swept values as TOML and JSON, table cells), every line
//                                 padded to the same length: a task seeks to its own lines
//   variants.csv                  id + parameter values
//   submit.sbatch, merge.sbatch   SLURM job scripts (slurm_scripts.hpp)
//   logs/PLAN/task_<t>.log        array task logs (written by SLURM)
//   logs/PLAN/task_<t>.json       the last run of task t: SLURM job, host, pid, times, outcome
//   logs/PLAN/merge.log           the merge job's log
//   variants/<id>/                made when the variant first runs:
//     result/                     result folder, written atomically (summary.json, spectral.csv,
//                                 scene.toml = the variant's resolved scene, ..., tallies.json)
//     checkpoint.json             while unfinished (tallies after the last saved batch)
//     started                     while a process runs it (JSON: host, pid, SLURM job)
//     trace_time.json             trace seconds of earlier, interrupted attempts
//     parts/pKKofNN.*             split runs: each part's tallies, facts, checkpoint, marks
//   merged.csv, merged.json       one row per variant (merge.hpp)
//
// A variant's scene is not stored whole: it is sweep.toml with the
// variant's swept values set (expand.hpp, variant_table), rebuilt and
// checked against the planned scene identity by the task that runs it.
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
  bool lean = false;                ///< result folders without the angle maps (CSV and EXR)
};

struct SweepFolderVariant {
  std::string id;
  std::size_t index = 0;                ///< position in expansion order
  std::string scene_hash;               ///< scene identity of the variant's scene
  std::uint64_t photons = 0;            ///< run.photons per wavelength
  std::vector<std::string> toml;        ///< swept values as TOML text, in SweepFolder::keys order
  std::vector<nlohmann::json> json;     ///< the same values as JSON
  std::vector<std::string> cells;       ///< the parameter cells of merged.csv / variants.csv
};

struct SweepFolder {
  std::filesystem::path dir;            ///< absolute
  std::string sweep_hash;               ///< text_hash(sweep_identity_text)
  std::string tool_version;             ///< lumtrap version that planned it
  std::string source;                   ///< the sweep file, absolute (anchors its relative paths)
  std::string plan_id;                  ///< "per-task-N" or "per-task-N-split-K"
  std::vector<std::string> keys;        ///< swept keys
  std::vector<std::string> headers;     ///< parameter column headers
  std::size_t variant_count = 0;
  std::size_t per_task = 1;
  std::uint32_t split_photons = 1;
  std::size_t tasks = 0;                ///< array tasks: ceil(units / per_task)
  bool lean = false;
  std::string random_streams = "common";  ///< Sweep::random_streams
  nlohmann::ordered_json requests;      ///< resources asked of the scheduler, binary and materials (as planned)
  std::size_t line_bytes = 0;           ///< length of every line of variants.jsonl, '\n' included
  /// The variants read: all of them (load_sweep_folder), one task's
  /// (load_sweep_task) or none (load_sweep_header). variants[k] is variant
  /// first_variant + k.
  std::size_t first_variant = 0;
  std::vector<SweepFolderVariant> variants;
};

/// Writes a sweep folder (all but the scheduler scripts): sweep.json,
/// sweep.toml (`sweep_text`, the sweep file's text), variants.jsonl,
/// variants.csv and logs/PLAN/. Planning the same sweep again into its
/// folder keeps every finished result and checkpoint; a folder of another
/// sweep or tool version, or a non-empty folder that is no sweep folder, is
/// refused (std::runtime_error naming it) before anything is written.
SweepFolder write_sweep_plan(const Sweep& sweep, const std::string& sweep_text, const std::filesystem::path& dir,
                             const SweepPlanOptions& options, const nlohmann::ordered_json& requests);

/// Checks that `dir` may receive a plan of `sweep_hash` (as write_sweep_plan
/// does, without writing): throws std::runtime_error naming the folder.
void check_plan_target(const std::filesystem::path& dir, const std::string& sweep_hash);

/// sweep.json alone (no variants); std::runtime_error naming the file when
/// absent, malformed or of another format version.
SweepFolder load_sweep_header(const std::filesystem::path& dir);
/// The header and every variant.
SweepFolder load_sweep_folder(const std::filesystem::path& dir);
/// The header and the variants of array task `task` only, read by seeking
/// into variants.jsonl: what a task reads does not grow with the sweep.
/// std::out_of_range for a task >= tasks.
SweepFolder load_sweep_task(const std::filesystem::path& dir, std::size_t task);

/// The variant with index v; std::logic_error when it was not read.
const SweepFolderVariant& folder_variant(const SweepFolder& f, std::size_t v);
/// "v0042": computed from the index and the variant count (expand.hpp ids).
std::string variant_id(const SweepFolder& f, std::size_t v);
/// Swept key -> value (JSON) of a variant, for summary.json and merged.json.
nlohmann::ordered_json variant_parameters(const SweepFolder& f, const SweepFolderVariant& v);

/// The plan id of a mapping: "per-task-4", "per-task-4-split-3".
std::string plan_id_of(std::size_t per_task, std::uint32_t split_photons);

/// Throws std::runtime_error when the folder was planned by another lumtrap version.
void require_same_tool_version(const SweepFolder& folder);

// --- work units ---------------------------------------------------------------

struct WorkUnit {
  std::size_t variant = 0;  ///< variant index
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
std::filesystem::path log_dir(const SweepFolder& f);  ///< logs/PLAN
std::filesystem::path task_log(const SweepFolder& f, std::size_t task);
std::filesystem::path task_record(const SweepFolder& f, std::size_t task);
std::filesystem::path merge_log(const SweepFolder& f);
std::filesystem::path parts_dir(const SweepFolder& f, std::size_t variant);
std::filesystem::path part_tallies(const SweepFolder& f, std::size_t variant, std::uint32_t part);
std::filesystem::path part_facts(const SweepFolder& f, std::size_t variant, std::uint32_t part);
std::filesystem::path unit_checkpoint(const SweepFolder& f, const WorkUnit& u);
std::filesystem::path unit_started(const SweepFolder& f, const WorkUnit& u);
std::filesystem::path unit_trace_time(const SweepFolder& f, const WorkUnit& u);

/// The variant's result folder is complete (summary.json and tallies.json).
bool result_complete(const SweepFolder& f, std::size_t variant);

/// What a checkpoint or part file of a unit must carry: the scene identity,
/// the variant and the part.
std::string unit_key(const SweepFolder& f, std::size_t variant, std::uint32_t part);

}  // namespace lumtrap
