// One work unit of a sweep folder. See run_unit.hpp.
#include "sweep/run_unit.hpp"

#include <fmt/format.h>
#include <tbb/global_control.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <memory>
#include <stdexcept>
#include <tuple>

#include "io/result_writer.hpp"
#include "io/run_facts.hpp"
#include "io/scene_identity.hpp"
#include "io/scene_reader.hpp"
#include "io/scene_writer.hpp"
#include "sweep/run_mark.hpp"
#include "trace/checkpoint.hpp"
#include "trace/driver.hpp"
#include "trace/run.hpp"

namespace lumtrap {

namespace fs = std::filesystem;
using ojson = nlohmann::ordered_json;

namespace {

using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point t) { return std::chrono::duration<double>(Clock::now() - t).count(); }

int active_threads() {
  return int(tbb::global_control::active_value(tbb::global_control::max_allowed_parallelism));
}

std::string threads_text() {
  const int n = active_threads();
  return fmt::format("{} thread{}", n, n == 1 ? "" : "s");
}

// --- one variant, prepared ---------------------------------------------------

struct LoadedVariant {
  std::unique_ptr<PreparedRun> run;
  std::string scene_text;   ///< the resolved scene (result/scene.toml)
  double setup_seconds = 0;
};

/// The variant's scene: sweep.toml with its swept values, anchored at the
/// sweep file (relative paths), checked against the planned identity.
LoadedVariant load_variant(const SweepFolder& f, std::size_t v) {
  const auto t0 = Clock::now();
  const SweepFolderVariant& var = folder_variant(f, v);
  const fs::path base = f.dir / "sweep.toml";
  std::vector<std::pair<std::string, std::string>> values;
  for (std::size_t k = 0; k < f.keys.size() && k < var.toml.size(); ++k) values.emplace_back(f.keys[k], var.toml[k]);
  const Scene scene = scene_from_table(variant_table(read_scene_table(base), values), f.source, {"sweep"});
  const std::string identity = scene_identity(scene);
  if (identity != var.scene_hash)
    throw std::runtime_error(fmt::format("the scene of variant {} changed after planning (scene identity {}, planned "
                                         "{}): {} or a material or spectrum file it names was changed; plan the "
                                         "sweep again into a new folder",
                                         var.id, identity, var.scene_hash, base.string()));
  LoadedVariant lv;
  lv.scene_text = resolved_scene_toml(scene);
  // Common random numbers: every variant keys its streams alike (variant 0),
  // so photon i of wavelength j draws the same numbers in every variant.
  lv.run = prepare_run(scene, f.random_streams == "independent" ? var.index : 0);
  lv.setup_seconds = seconds_since(t0);
  return lv;
}

/// Result files a lean sweep leaves out: the angle maps (CSV and EXR).
bool lean_drops(const std::string& name) {
  return name.rfind("escape_angles.", 0) == 0 || name.rfind("rear_angles.", 0) == 0;
}

/// The files of a variant's result folder: those of `lumtrap run` plus tallies.json.
std::vector<OutputFile> variant_files(const SweepFolder& f, std::size_t v, const LoadedVariant& lv,
                                      const std::vector<WavelengthTally>& tallies, const RunFacts& facts,
                                      Results* results_out) {
  const SweepFolderVariant& var = folder_variant(f, v);
  Results r = results_from_tallies(*lv.run, tallies);
  Summary& s = r.summary;
  s.tool_version = LUMTRAP_VERSION;
  s.scene_hash = var.scene_hash;
  s.sweep_hash = f.sweep_hash;
  s.variant = var.id;
  s.variant_index = var.index;
  s.parameters = variant_parameters(f, var);
  s.split_photons = f.split_photons;
  s.random_streams = f.random_streams;
  apply_run_facts(s, facts);
  std::vector<OutputFile> files = result_files(r, lv.scene_text);
  if (f.lean) std::erase_if(files, [](const OutputFile& o) { return lean_drops(o.name); });
  files.push_back({"tallies.json", tally_set_json(TallySet{var.scene_hash, LUMTRAP_VERSION, tallies}, lv.run->layout)});
  if (results_out) *results_out = std::move(r);
  return files;
}

// --- trace time of earlier attempts -------------------------------------------

/// Trace seconds that earlier attempts of a unit spent on the work its
/// checkpoint holds (0 without a checkpoint: that work is gone).
double earlier_trace_seconds(const fs::path& file, const fs::path& checkpoint, const std::string& key) {
  std::error_code ec;
  if (!fs::exists(checkpoint, ec) || !fs::exists(file, ec)) return 0;
  try {
    const auto j = nlohmann::json::parse(read_text_file(file));
    if (j.value("unit", std::string()) != key) return 0;
    return std::max(0.0, j.value("trace_seconds", 0.0));
  } catch (const std::exception&) {
    return 0;  // informative only
  }
}

void save_trace_seconds(const fs::path& file, const std::string& key, double seconds) {
  try {
    write_file_atomically(file, nlohmann::json{{"unit", key}, {"trace_seconds", seconds}}.dump() + "\n");
  } catch (const std::exception&) {  // informative only
  }
}

/// Writes the result folder; another process that wrote the same variant
/// first (same numbers: the tallies are exact) is not an error.
void write_result(const SweepFolder& f, std::size_t v, const std::vector<OutputFile>& files) {
  try {
    write_result_folder(result_dir(f, v), files, false);
  } catch (const std::exception&) {
    if (!result_complete(f, v)) throw;
  }
}

void remove_quietly(const fs::path& p) {
  std::error_code ec;
  fs::remove(p, ec);
}

std::string jg_text(const Results& r) {
  return fmt::format("J_G = {:.3f} ± {:.3f} mA/cm2", r.summary.J_G_mA_cm2, r.summary.J_G_sigma_mA_cm2);
}

bool assemble(const SweepFolder& f, std::size_t v, const LoadedVariant* loaded, std::string* line) {
  if (result_complete(f, v)) return true;
  if (f.split_photons == 1) return false;
  for (std::uint32_t k = 0; k < f.split_photons; ++k)
    if (!fs::exists(part_tallies(f, v, k))) return false;
  try {
    LoadedVariant own;
    if (!loaded) {
      own = load_variant(f, v);
      loaded = &own;
    }
    const PreparedRun& run = *loaded->run;
    const std::size_t nw = run.scene.illumination.wavelengths_nm.size();
    std::vector<WavelengthTally> total(nw, WavelengthTally(run.layout));
    RunFacts facts;
    for (std::uint32_t k = 0; k < f.split_photons; ++k) {
      const fs::path p = part_tallies(f, v, k);
      auto set = load_tally_set(p, run.layout);
      if (!set || set->scene_hash != unit_key(f, v, k) || set->tallies.size() != nw)
        throw std::runtime_error(fmt::format("{} does not belong to part {} of {} of variant {} of this sweep; "
                                             "remove it to run that part again",
                                             p.string(), k + 1, f.split_photons, folder_variant(f, v).id));
      for (std::size_t i = 0; i < nw; ++i) total[i] += set->tallies[i];
      try {
        const RunFacts part = run_facts_from_json(nlohmann::json::parse(read_text_file(part_facts(f, v, k))));
        facts = k == 0 ? part : combine_run_facts(facts, part);
      } catch (const std::exception&) {  // timing facts are informative only
      }
    }
    for (std::size_t i = 0; i < nw; ++i)
      if (total[i].photons != folder_variant(f, v).photons)
        throw std::runtime_error(fmt::format("the parts of variant {} hold {} photons at wavelength {}, expected {}",
                                             folder_variant(f, v).id, total[i].photons, i,
                                             folder_variant(f, v).photons));
    Results r;
    write_result(f, v, variant_files(f, v, *loaded, total, facts, &r));
    if (line)
      *line = fmt::format("{}: all {} parts done, result written: {}", folder_variant(f, v).id, f.split_photons,
                          jg_text(r));
    std::error_code ec;
    fs::remove_all(parts_dir(f, v), ec);
    return true;
  } catch (const std::exception&) {
    if (result_complete(f, v)) return true;  // another process assembled it meanwhile
    throw;
  }
}

}  // namespace

UnitReport run_work_unit(const SweepFolder& f, std::size_t unit, const UnitRunOptions& opt) {
  const WorkUnit u = unit_at(f, unit);
  const SweepFolderVariant& var = folder_variant(f, u.variant);
  const std::string name = f.split_photons == 1 ? var.id : fmt::format("{} part {}/{}", var.id, u.part + 1, f.split_photons);
  UnitReport rep;
  if (result_complete(f, u.variant)) {
    rep.line = fmt::format("{}: already done, skipped", name);
    return rep;
  }
  if (f.split_photons > 1 && fs::exists(part_tallies(f, u.variant, u.part))) {
    rep.line = fmt::format("{}: already done, skipped", name);
    std::string done;
    if (assemble(f, u.variant, nullptr, &done)) rep.line += "; " + done;
    return rep;
  }

  // The start mark tells `status` that the unit runs (and which process and
  // SLURM job runs it); it goes on every way out of here (finished,
  // interrupted, error), and stays only when the process is killed.
  fs::create_directories(unit_started(f, u).parent_path());
  write_run_mark(unit_started(f, u), this_run_mark());
  struct StartMark {
    fs::path path;
    ~StartMark() { remove_quietly(path); }
  } mark{unit_started(f, u)};
  const LoadedVariant lv = load_variant(f, u.variant);

  DriveOptions d;
  d.checkpoint = unit_checkpoint(f, u);
  d.scene_hash = unit_key(f, u.variant, u.part);
  d.batch = opt.batch;
  d.checkpoint_seconds = opt.checkpoint_seconds;
  d.stop = opt.stop;
  if (f.split_photons > 1) std::tie(d.first_photon, d.last_photon) = part_range(var.photons, u.part, f.split_photons);
  const bool resumed = fs::exists(d.checkpoint);
  // Trace time across attempts: earlier attempts' seconds (kept beside the
  // checkpoint, saved as often as the checkpoint) plus this one's.
  const fs::path time_file = unit_trace_time(f, u);
  const double earlier = earlier_trace_seconds(time_file, d.checkpoint, d.scene_hash);
  const auto t0 = Clock::now();
  auto last_time_save = t0;
  d.progress = [&](double x) {
    if (opt.progress) opt.progress(x);
    if (seconds_since(last_time_save) >= std::max(1.0, opt.checkpoint_seconds)) {
      last_time_save = Clock::now();
      save_trace_seconds(time_file, d.scene_hash, earlier + seconds_since(t0));
    }
  };
  DriveResult res = drive_run(*lv.run, d);
  const double trace_seconds = earlier + seconds_since(t0);
  if (!res.complete) {
    save_trace_seconds(time_file, d.scene_hash, trace_seconds);
    rep.outcome = UnitReport::interrupted;
    rep.line = fmt::format("{}: interrupted; the photons traced so far are kept in {}", name, d.checkpoint.string());
    return rep;
  }
  std::uint64_t photons = 0;
  for (const auto& t : res.tallies) photons += t.photons;
  const RunFacts facts{active_threads(), host_name(), lv.setup_seconds, trace_seconds, peak_memory_MB(), resumed};
  rep.outcome = UnitReport::finished;

  if (f.split_photons == 1) {
    Results r;
    write_result(f, u.variant, variant_files(f, u.variant, lv, res.tallies, facts, &r));
    remove_quietly(d.checkpoint);
    remove_quietly(time_file);
    rep.line = fmt::format("{}: done{}, {} ({:.1f} s, {} photons, {})", name, resumed ? " (resumed)" : "", jg_text(r),
                           trace_seconds, photons, threads_text());
    return rep;
  }
  save_tally_set(part_tallies(f, u.variant, u.part), TallySet{d.scene_hash, LUMTRAP_VERSION, res.tallies},
                 lv.run->layout);
  write_file_atomically(part_facts(f, u.variant, u.part), run_facts_json(facts).dump(2) + "\n");
  remove_quietly(d.checkpoint);
  remove_quietly(time_file);
  rep.line = fmt::format("{}: done{} (photons {} to {} of {} per wavelength, {:.1f} s, {})", name,
                         resumed ? " (resumed)" : "", d.first_photon, d.last_photon, var.photons, trace_seconds,
                         threads_text());
  std::string done;
  if (assemble(f, u.variant, &lv, &done)) rep.line += "\n" + done;
  return rep;
}

bool assemble_variant(const SweepFolder& f, std::size_t v) { return assemble(f, v, nullptr, nullptr); }

}  // namespace lumtrap
