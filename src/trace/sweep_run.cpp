// Sweep folders: plan, run units with checkpoints, assemble split variants,
// status and merge. See sweep_run.hpp.
#include "trace/sweep_run.hpp"

#include <fmt/format.h>
#include <sys/resource.h>
#include <tbb/global_control.h>
#include <unistd.h>

#include <algorithm>
#include <cctype>
#include <chrono>
#include <fstream>
#include <memory>
#include <sstream>
#include <stdexcept>
#include <tuple>

#include "io/result_writer.hpp"
#include "io/scene_parser.hpp"
#include "trace/checkpoint.hpp"
#include "trace/driver.hpp"
#include "trace/run.hpp"

namespace lumtrap {

namespace fs = std::filesystem;
using ojson = nlohmann::ordered_json;

namespace {

constexpr const char* kFolderFormat = "lumtrap sweep 1";
constexpr const char* kMergeFormat = "lumtrap sweep merge 1";

using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point t) { return std::chrono::duration<double>(Clock::now() - t).count(); }

std::string read_text(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read " + p.string());
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

ojson read_json(const fs::path& p) {
  const std::string text = read_text(p);
  try {
    return ojson::parse(text);
  } catch (const nlohmann::json::exception& e) {
    throw std::runtime_error(fmt::format("{}: not valid JSON ({})", p.string(), e.what()));
  }
}

std::string host_name() {
  char buf[256] = {};
  if (::gethostname(buf, sizeof buf - 1) != 0) return "?";
  return buf;
}

double peak_memory_MB() {
  rusage ru{};
  ::getrusage(RUSAGE_SELF, &ru);
  return double(ru.ru_maxrss) / 1024.0;  // ru_maxrss is in KiB on Linux
}

int active_threads() {
  return int(tbb::global_control::active_value(tbb::global_control::max_allowed_parallelism));
}

std::string threads_text() {
  const int n = active_threads();
  return fmt::format("{} thread{}", n, n == 1 ? "" : "s");
}

// --- paths of a unit --------------------------------------------------------

std::string part_stem(const SweepFolder& f, std::uint32_t part) {
  const int w = std::max<int>(2, int(std::to_string(f.split - 1).size()));
  return fmt::format("p{:0{}}of{:0{}}", part, w, f.split, w);
}
fs::path parts_dir(const SweepFolder& f, std::size_t v) { return variant_dir(f, v) / "parts"; }
fs::path part_tallies(const SweepFolder& f, std::size_t v, std::uint32_t part) {
  return parts_dir(f, v) / (part_stem(f, part) + ".tallies.json");
}
fs::path part_facts(const SweepFolder& f, std::size_t v, std::uint32_t part) {
  return parts_dir(f, v) / (part_stem(f, part) + ".json");
}
fs::path unit_checkpoint(const SweepFolder& f, const WorkUnit& u) {
  if (f.split == 1) return variant_dir(f, u.variant) / "checkpoint.json";
  return parts_dir(f, u.variant) / (part_stem(f, u.part) + ".checkpoint.json");
}
fs::path unit_started(const SweepFolder& f, const WorkUnit& u) {
  if (f.split == 1) return variant_dir(f, u.variant) / "started";
  return parts_dir(f, u.variant) / (part_stem(f, u.part) + ".started");
}

bool result_complete(const SweepFolder& f, std::size_t v) {
  const fs::path r = result_dir(f, v);
  std::error_code ec;
  return fs::exists(r / "summary.json", ec) && fs::exists(r / "tallies.json", ec);
}

/// Photons [first, last) of every wavelength in part k of K.
std::pair<std::uint64_t, std::uint64_t> part_range(std::uint64_t photons, std::uint32_t part, std::uint32_t split) {
  using u128 = unsigned __int128;
  return {std::uint64_t(u128(photons) * part / split), std::uint64_t(u128(photons) * (part + 1) / split)};
}

/// What a checkpoint or part file of this unit must carry: the scene, the
/// variant index (it keys the random numbers) and the part.
std::string unit_key(const SweepFolder& f, std::size_t v, std::uint32_t part) {
  return fmt::format("{} variant {} part {}/{}", f.variants[v].scene_hash, f.variants[v].index, part, f.split);
}

// --- one variant, prepared ---------------------------------------------------

struct LoadedVariant {
  std::unique_ptr<PreparedRun> run;
  std::string scene_text;
  double setup_seconds = 0;
};

LoadedVariant load_variant(const SweepFolder& f, std::size_t v) {
  const auto t0 = Clock::now();
  const SweepFolderVariant& var = f.variants[v];
  const fs::path path = variant_dir(f, v) / "scene.toml";
  LoadedVariant lv;
  lv.scene_text = read_text(path);
  if (text_hash(lv.scene_text) != var.scene_hash)
    throw std::runtime_error(fmt::format("{} was changed after planning (hash {}, planned {}); plan the sweep again "
                                         "into a new folder",
                                         path.string(), text_hash(lv.scene_text), var.scene_hash));
  const Scene scene = scene_from_table(read_scene_table(path), path);
  lv.run = prepare_run(scene, var.index);
  lv.setup_seconds = seconds_since(t0);
  return lv;
}

nlohmann::json plain_json(const ojson& j) { return nlohmann::json::parse(j.dump()); }

/// The files of a variant's result folder: those of `lumtrap run` plus tallies.json.
std::vector<OutputFile> result_files(const SweepFolder& f, std::size_t v, const LoadedVariant& lv,
                                     const std::vector<WavelengthTally>& tallies, const nlohmann::json& facts,
                                     Results* results_out) {
  const SweepFolderVariant& var = f.variants[v];
  Results r = results_from_tallies(*lv.run, tallies);
  r.summary["sweep_hash"] = f.sweep_hash;
  r.summary["variant"] = var.id;
  r.summary["variant_index"] = var.index;
  r.summary["parameters"] = plain_json(var.parameters);
  r.summary["scene_hash"] = var.scene_hash;
  r.summary["tool_version"] = LUMTRAP_VERSION;
  for (auto it = facts.begin(); it != facts.end(); ++it) r.summary[it.key()] = it.value();
  std::vector<OutputFile> files = trace_result_files(*lv.run, r, tallies, lv.scene_text);
  files.push_back({"tallies.json", tally_set_json(TallySet{var.scene_hash, LUMTRAP_VERSION, tallies})});
  if (results_out) *results_out = std::move(r);
  return files;
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
  return fmt::format("J_G = {:.3f} ± {:.3f} mA/cm2", r.bins.front().current_mA_cm2,
                     r.bins.front().current_sigma_mA_cm2);
}

bool assemble(const SweepFolder& f, std::size_t v, const LoadedVariant* loaded, std::string* line) {
  if (result_complete(f, v)) return true;
  if (f.split == 1) return false;
  for (std::uint32_t k = 0; k < f.split; ++k)
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
    double trace_seconds = 0, setup_seconds = 0, peak = 0;
    for (std::uint32_t k = 0; k < f.split; ++k) {
      const fs::path p = part_tallies(f, v, k);
      auto set = load_tally_set(p, run.layout);
      if (!set || set->scene_hash != unit_key(f, v, k) || set->tallies.size() != nw)
        throw std::runtime_error(fmt::format("{} does not belong to part {} of {} of variant {} of this sweep; "
                                             "remove it to run that part again",
                                             p.string(), k + 1, f.split, f.variants[v].id));
      for (std::size_t i = 0; i < nw; ++i) total[i] += set->tallies[i];
      try {
        const ojson facts = read_json(part_facts(f, v, k));
        trace_seconds += facts.value("trace_seconds", 0.0);
        setup_seconds += facts.value("setup_seconds", 0.0);
        peak = std::max(peak, facts.value("peak_memory_MB", 0.0));
      } catch (const std::exception&) {  // timing facts are informative only
      }
    }
    for (std::size_t i = 0; i < nw; ++i)
      if (total[i].photons != f.variants[v].photons)
        throw std::runtime_error(fmt::format("the parts of variant {} hold {} photons at wavelength {}, expected {}",
                                             f.variants[v].id, total[i].photons, i, f.variants[v].photons));
    std::uint64_t photons = 0;
    for (const auto& t : total) photons += t.photons;
    nlohmann::json facts;
    facts["split_parts"] = f.split;
    facts["setup_seconds"] = setup_seconds;
    facts["trace_seconds"] = trace_seconds;
    facts["photons_per_second"] = trace_seconds > 0 ? double(photons) / trace_seconds : 0.0;
    facts["peak_memory_MB"] = peak;
    Results r;
    write_result(f, v, result_files(f, v, *loaded, total, facts, &r));
    if (line) *line = fmt::format("{}: all {} parts done, result written: {}", f.variants[v].id, f.split, jg_text(r));
    std::error_code ec;
    fs::remove_all(parts_dir(f, v), ec);
    return true;
  } catch (const std::exception&) {
    if (result_complete(f, v)) return true;  // another process assembled it meanwhile
    throw;
  }
}

/// The last line of a task log that reports an error, or "".
std::string log_error_line(const fs::path& log) {
  std::ifstream in(log);
  std::string line, found;
  while (std::getline(in, line)) {
    std::string low = line;
    for (char& c : low) c = char(std::tolower(static_cast<unsigned char>(c)));
    if (low.find("error") != std::string::npos || low.find("cancelled") != std::string::npos ||
        low.find("killed") != std::string::npos || low.find("oom") != std::string::npos)
      found = line;
  }
  return found;
}

bool fresh(const fs::path& p, double seconds) {
  std::error_code ec;
  const auto t = fs::last_write_time(p, ec);
  if (ec) return false;
  return std::chrono::duration<double>(fs::file_time_type::clock::now() - t).count() < seconds;
}

ojson folder_json(const SweepFolder& f) {
  ojson j;
  j["format"] = kFolderFormat;
  j["sweep_hash"] = f.sweep_hash;
  j["tool_version"] = f.tool_version;
  j["source"] = f.source;
  j["variant_count"] = f.variants.size();
  j["split_photons"] = f.split;
  j["units_per_task"] = f.per_task;
  j["tasks"] = f.tasks;
  j["requests"] = f.requests;
  j["headers"] = f.headers;
  j["variants"] = ojson::array();
  for (const auto& v : f.variants)
    j["variants"].push_back({{"id", v.id},
                             {"index", v.index},
                             {"scene_hash", v.scene_hash},
                             {"photons", v.photons},
                             {"parameters", v.parameters},
                             {"cells", v.cells}});
  return j;
}

}  // namespace

// ---------------------------------------------------------------------------
// Plan

SweepFolder write_sweep_plan(const Sweep& sweep, const fs::path& dir_in, const SweepPlanOptions& opt,
                             const ojson& requests) {
  if (opt.per_task < 1) throw std::invalid_argument("--per-task must be at least 1");
  if (opt.split_photons < 1) throw std::invalid_argument("--split-photons must be at least 1");
  if (sweep.variants.empty()) throw std::invalid_argument("the sweep has no variants");
  SweepFolder f;
  f.dir = fs::absolute(dir_in).lexically_normal();
  f.sweep_hash = text_hash(sweep_identity_text(sweep));
  f.tool_version = LUMTRAP_VERSION;
  f.source = fs::absolute(sweep.file).lexically_normal().string();
  f.per_task = opt.per_task;
  f.split = opt.split_photons;
  f.requests = requests;
  const ParameterTable table = parameter_table(sweep);
  f.headers = table.headers;
  for (std::size_t v = 0; v < sweep.variants.size(); ++v) {
    const SweepVariant& sv = sweep.variants[v];
    SweepFolderVariant fv;
    fv.id = sv.id;
    fv.index = sv.index;
    fv.scene_hash = text_hash(sv.resolved);
    fv.photons = sv.scene.run.photons;
    fv.parameters = ojson::object();
    for (const auto& val : sv.values) fv.parameters[val.key] = ojson::parse(val.json.dump());
    fv.cells = table.rows[v];
    if (f.split > 1 && sv.scene.run.target_jg_error > 0)
      throw std::invalid_argument(fmt::format(
          "variant {} sets run.target_jg_error (precision mode): its photon counts are chosen while it runs, so it "
          "cannot be split by photon ranges; plan without --split-photons or set fixed run.photons",
          sv.id));
    if (f.split > fv.photons)
      throw std::invalid_argument(fmt::format("--split-photons {} is more than the {} photons per wavelength of "
                                              "variant {}",
                                              f.split, fv.photons, sv.id));
    f.variants.push_back(std::move(fv));
  }
  f.tasks = (unit_count(f) + f.per_task - 1) / f.per_task;

  // An existing folder: the same sweep (keep its results) or refuse.
  std::error_code ec;
  if (fs::exists(f.dir / "sweep.json", ec)) {
    const SweepFolder old = load_sweep_folder(f.dir);
    if (old.sweep_hash != f.sweep_hash)
      throw std::runtime_error(fmt::format("{} holds another sweep (hash {}, planned from {}; this sweep {}); choose "
                                           "another --out or delete that folder",
                                           f.dir.string(), old.sweep_hash, old.source, f.sweep_hash));
    if (old.tool_version != f.tool_version)
      throw std::runtime_error(fmt::format("{} was planned by lumtrap {} (this is {}); its results cannot be mixed "
                                           "with new ones: choose another --out or delete that folder",
                                           f.dir.string(), old.tool_version, f.tool_version));
  } else if (fs::exists(f.dir, ec) && !fs::is_empty(f.dir, ec)) {
    throw std::runtime_error(fmt::format("{} exists and is not a sweep folder (no sweep.json); choose another --out",
                                         f.dir.string()));
  }

  fs::create_directories(f.dir / "logs");
  for (std::size_t v = 0; v < sweep.variants.size(); ++v) {
    const fs::path d = variant_dir(f, v);
    fs::create_directories(d);
    const fs::path scene = d / "scene.toml";
    if (!fs::exists(scene, ec) || read_text(scene) != sweep.variants[v].resolved)
      write_file_atomically(scene, sweep.variants[v].resolved);
  }
  write_file_atomically(f.dir / "variants.csv", variants_csv(sweep));
  write_file_atomically(f.dir / "sweep.json", folder_json(f).dump(2) + "\n");
  return f;
}

SweepFolder load_sweep_folder(const fs::path& dir) {
  const fs::path file = dir / "sweep.json";
  std::error_code ec;
  if (!fs::exists(file, ec))
    throw std::runtime_error(fmt::format("{} is not a sweep folder (no sweep.json); create one with `lumtrap sweep "
                                         "plan SWEEP.toml --out {}`",
                                         dir.string(), dir.string()));
  const ojson j = read_json(file);
  SweepFolder f;
  f.dir = fs::absolute(dir).lexically_normal();
  try {
    if (j.at("format") != kFolderFormat) throw std::runtime_error("unknown format");
    f.sweep_hash = j.at("sweep_hash");
    f.tool_version = j.at("tool_version");
    f.source = j.at("source");
    f.split = j.at("split_photons");
    f.per_task = j.at("units_per_task");
    f.tasks = j.at("tasks");
    f.requests = j.value("requests", ojson::object());
    f.headers = j.at("headers").get<std::vector<std::string>>();
    for (const auto& e : j.at("variants")) {
      SweepFolderVariant v;
      v.id = e.at("id");
      v.index = e.at("index");
      v.scene_hash = e.at("scene_hash");
      v.photons = e.at("photons");
      v.parameters = e.at("parameters");
      v.cells = e.at("cells").get<std::vector<std::string>>();
      f.variants.push_back(std::move(v));
    }
  } catch (const std::exception& e) {
    throw std::runtime_error(fmt::format("{}: not a lumtrap sweep file ({})", file.string(), e.what()));
  }
  if (f.split < 1 || f.per_task < 1 || f.variants.empty() || f.tasks != (unit_count(f) + f.per_task - 1) / f.per_task)
    throw std::runtime_error(fmt::format("{}: inconsistent task counts", file.string()));
  return f;
}

void require_same_tool_version(const SweepFolder& f) {
  if (f.tool_version != LUMTRAP_VERSION)
    throw std::runtime_error(fmt::format("{} was planned by lumtrap {}, this is lumtrap {}; results of different "
                                         "versions are not mixed: run it with lumtrap {} or plan it again into a "
                                         "new folder",
                                         f.dir.string(), f.tool_version, LUMTRAP_VERSION, f.tool_version));
}

// ---------------------------------------------------------------------------
// Units

std::size_t unit_count(const SweepFolder& f) { return f.variants.size() * f.split; }

WorkUnit unit_at(const SweepFolder& f, std::size_t unit) {
  return WorkUnit{unit / f.split, std::uint32_t(unit % f.split)};
}

std::vector<std::size_t> units_of_task(const SweepFolder& f, std::size_t task) {
  if (task >= f.tasks)
    throw std::out_of_range(fmt::format("array task {} does not exist: {} has tasks 0 to {}", task, f.dir.string(),
                                        f.tasks - 1));
  std::vector<std::size_t> out;
  for (std::size_t u = task * f.per_task; u < std::min(unit_count(f), (task + 1) * f.per_task); ++u) out.push_back(u);
  return out;
}

std::size_t task_of_unit(const SweepFolder& f, std::size_t unit) { return unit / f.per_task; }

fs::path variant_dir(const SweepFolder& f, std::size_t v) { return f.dir / "variants" / f.variants.at(v).id; }
fs::path result_dir(const SweepFolder& f, std::size_t v) { return variant_dir(f, v) / "result"; }
fs::path task_log(const SweepFolder& f, std::size_t task) {
  return f.dir / "logs" / fmt::format("task_{}.log", task);
}

UnitReport run_work_unit(const SweepFolder& f, std::size_t unit, const UnitRunOptions& opt) {
  const WorkUnit u = unit_at(f, unit);
  const SweepFolderVariant& var = f.variants.at(u.variant);
  const std::string name = f.split == 1 ? var.id : fmt::format("{} part {}/{}", var.id, u.part + 1, f.split);
  UnitReport rep;
  if (result_complete(f, u.variant)) {
    rep.line = fmt::format("{}: already done, skipped", name);
    return rep;
  }
  if (f.split > 1 && fs::exists(part_tallies(f, u.variant, u.part))) {
    rep.line = fmt::format("{}: already done, skipped", name);
    std::string done;
    if (assemble(f, u.variant, nullptr, &done)) rep.line += "; " + done;
    return rep;
  }

  // The start mark tells `status` that the unit runs; it goes on every way
  // out of here (finished, interrupted, error), and stays only when the
  // process is killed.
  fs::create_directories(unit_started(f, u).parent_path());
  write_file_atomically(unit_started(f, u), fmt::format("host {} pid {}\n", host_name(), ::getpid()));
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
  d.progress = opt.progress;
  d.stop = opt.stop;
  if (f.split > 1) std::tie(d.first_photon, d.last_photon) = part_range(var.photons, u.part, f.split);
  const bool resumed = fs::exists(d.checkpoint);
  const auto t0 = Clock::now();
  DriveResult res = drive_run(*lv.run, d);
  const double trace_seconds = seconds_since(t0);
  if (!res.complete) {
    rep.outcome = UnitReport::interrupted;
    rep.line = fmt::format("{}: interrupted; the photons traced so far are kept in {}", name, d.checkpoint.string());
    return rep;
  }
  std::uint64_t photons = 0;
  for (const auto& t : res.tallies) photons += t.photons;
  nlohmann::json facts;
  facts["threads"] = active_threads();
  facts["host"] = host_name();
  facts["setup_seconds"] = lv.setup_seconds;
  facts["trace_seconds"] = trace_seconds;
  facts["photons_per_second"] = trace_seconds > 0 ? double(photons) / trace_seconds : 0.0;
  facts["peak_memory_MB"] = peak_memory_MB();
  facts["resumed_from_checkpoint"] = resumed;
  rep.outcome = UnitReport::finished;

  if (f.split == 1) {
    Results r;
    write_result(f, u.variant, result_files(f, u.variant, lv, res.tallies, facts, &r));
    remove_quietly(d.checkpoint);
    rep.line = fmt::format("{}: done{}, {} ({:.1f} s, {} photons, {})", name, resumed ? " (resumed)" : "", jg_text(r),
                           trace_seconds, photons, threads_text());
    return rep;
  }
  save_tally_set(part_tallies(f, u.variant, u.part), TallySet{d.scene_hash, LUMTRAP_VERSION, res.tallies});
  write_file_atomically(part_facts(f, u.variant, u.part), facts.dump(2) + "\n");
  remove_quietly(d.checkpoint);
  rep.line = fmt::format("{}: done{} (photons {} to {} of {} per wavelength, {:.1f} s, {})", name,
                         resumed ? " (resumed)" : "", d.first_photon, d.last_photon, var.photons, trace_seconds,
                         threads_text());
  std::string done;
  if (assemble(f, u.variant, &lv, &done)) rep.line += "\n" + done;
  return rep;
}

bool assemble_variant(const SweepFolder& f, std::size_t v) { return assemble(f, v, nullptr, nullptr); }

// ---------------------------------------------------------------------------
// Status and merge

const char* state_name(VariantState s) {
  switch (s) {
    case VariantState::done: return "done";
    case VariantState::running: return "running";
    case VariantState::failed: return "failed";
    case VariantState::missing: return "missing";
  }
  return "?";
}

VariantStatus variant_status(const SweepFolder& f, std::size_t v, double running_seconds) {
  VariantStatus st;
  if (result_complete(f, v)) {
    st.state = VariantState::done;
    return st;
  }
  std::vector<std::size_t> open;  // unfinished units of the variant
  for (std::uint32_t k = 0; k < f.split; ++k)
    if (f.split == 1 || !fs::exists(part_tallies(f, v, k))) open.push_back(v * f.split + k);
  if (f.split > 1) {
    if (open.empty()) {
      st.state = VariantState::done;
      st.detail = "all parts done (merge writes the result folder)";
      return st;
    }
    st.detail = fmt::format("{} of {} parts done", f.split - open.size(), f.split);
  }
  st.log = task_log(f, task_of_unit(f, open.front()));
  for (std::size_t unit : open) {
    const WorkUnit u = unit_at(f, unit);
    if (fresh(unit_checkpoint(f, u), running_seconds) || fresh(unit_started(f, u), running_seconds)) {
      st.state = VariantState::running;
      st.log = task_log(f, task_of_unit(f, unit));
      return st;
    }
  }
  for (std::size_t unit : open) {
    const fs::path log = task_log(f, task_of_unit(f, unit));
    const std::string line = log_error_line(log);
    if (!line.empty()) {
      st.state = VariantState::failed;
      st.log = log;
      st.detail = st.detail.empty() ? line : st.detail + "; " + line;
      return st;
    }
  }
  st.state = VariantState::missing;
  return st;
}

MergeReport merge_sweep(const SweepFolder& f) {
  MergeReport report;
  std::vector<std::string> foreign;
  std::vector<std::pair<std::size_t, ojson>> rows;
  std::vector<std::string> losses;  // loss names in order of first appearance
  for (std::size_t v = 0; v < f.variants.size(); ++v) {
    const SweepFolderVariant& var = f.variants[v];
    std::string assembly_error;
    if (!result_complete(f, v) && f.split > 1) {
      try {
        assemble_variant(f, v);
      } catch (const std::exception& e) {
        assembly_error = e.what();
      }
    }
    if (!result_complete(f, v)) {
      VariantStatus st = variant_status(f, v);
      if (!assembly_error.empty()) {
        st.state = VariantState::failed;
        st.detail = assembly_error;
      }
      report.missing.push_back({v, st});
      continue;
    }
    const fs::path summary_path = result_dir(f, v) / "summary.json";
    const ojson s = read_json(summary_path);
    const std::string sh = s.value("sweep_hash", ""), tv = s.value("tool_version", ""), id = s.value("variant", ""),
                      sc = s.value("scene_hash", "");
    if (sh != f.sweep_hash || tv != f.tool_version || id != var.id || sc != var.scene_hash) {
      foreign.push_back(fmt::format("{}: variant '{}' of sweep {} by lumtrap {} (this folder: variant {} of sweep {} "
                                    "by lumtrap {})",
                                    result_dir(f, v).string(), id, sh.empty() ? "?" : sh, tv.empty() ? "?" : tv,
                                    var.id, f.sweep_hash, f.tool_version));
      continue;
    }
    for (auto it = s.at("losses").begin(); it != s.at("losses").end(); ++it)
      if (std::find(losses.begin(), losses.end(), it.key()) == losses.end()) losses.push_back(it.key());
    rows.push_back({v, s});
  }
  if (!foreign.empty()) {
    std::string msg = fmt::format("refusing to merge {}: {} result{} belong{} to another sweep or lumtrap version "
                                  "(hash check):",
                                  f.dir.string(), foreign.size(), foreign.size() == 1 ? "" : "s",
                                  foreign.size() == 1 ? "s" : "");
    for (const auto& e : foreign) msg += "\n  " + e;
    msg += "\nremove those result folders (`lumtrap sweep task` then runs the variants again) and merge again";
    throw std::runtime_error(msg);
  }

  // merged.csv: full precision (shortest exact text), so equal tallies give equal bytes.
  std::string csv = "id";
  auto add = [&csv](const std::string& cell) {
    csv += ',';
    csv += csv_field(cell);
  };
  for (const auto& h : f.headers) add(h);
  add("J_G_mA_cm2");
  add("J_G_sigma_mA_cm2");
  for (const auto& l : losses) {
    add(l + "_mA_cm2");
    add(l + "_sigma_mA_cm2");
  }
  add("J_max_mA_cm2");
  add("photons");
  csv += "\n";
  ojson j;
  j["format"] = kMergeFormat;
  j["sweep_hash"] = f.sweep_hash;
  j["tool_version"] = f.tool_version;
  j["source"] = f.source;
  j["variant_count"] = f.variants.size();
  j["merged"] = rows.size();
  j["complete"] = report.missing.empty();
  j["columns"] = f.headers;
  j["variants"] = ojson::array();
  for (const auto& [v, s] : rows) {
    const SweepFolderVariant& var = f.variants[v];
    csv += var.id;
    for (const auto& c : var.cells) add(c);
    add(fmt::format("{}", s.at("J_G_mA_cm2").get<double>()));
    add(fmt::format("{}", s.at("J_G_sigma_mA_cm2").get<double>()));
    ojson lj = ojson::object();
    for (const auto& l : losses) {
      if (s.at("losses").contains(l)) {
        const auto& e = s.at("losses").at(l);
        add(fmt::format("{}", e.at("mA_cm2").get<double>()));
        add(fmt::format("{}", e.at("sigma_mA_cm2").get<double>()));
        lj[l] = {{"mA_cm2", e.at("mA_cm2")}, {"sigma_mA_cm2", e.at("sigma_mA_cm2")}};
      } else {
        add("");
        add("");
      }
    }
    add(fmt::format("{}", s.at("J_max_mA_cm2").get<double>()));
    add(fmt::format("{}", s.at("photons").get<std::uint64_t>()));
    csv += "\n";
    j["variants"].push_back({{"id", var.id},
                             {"index", var.index},
                             {"parameters", var.parameters},
                             {"J_G_mA_cm2", s.at("J_G_mA_cm2")},
                             {"J_G_sigma_mA_cm2", s.at("J_G_sigma_mA_cm2")},
                             {"losses", lj},
                             {"J_max_mA_cm2", s.at("J_max_mA_cm2")},
                             {"photons", s.at("photons")},
                             {"trace_seconds", s.value("trace_seconds", 0.0)},
                             {"peak_memory_MB", s.value("peak_memory_MB", 0.0)},
                             {"result", fs::relative(result_dir(f, v), f.dir).string()}});
  }
  j["missing"] = ojson::array();
  for (const auto& [v, st] : report.missing)
    j["missing"].push_back({{"id", f.variants[v].id},
                            {"state", state_name(st.state)},
                            {"log", st.log.string()},
                            {"detail", st.detail}});
  write_file_atomically(f.dir / "merged.csv", csv);
  write_file_atomically(f.dir / "merged.json", j.dump(2) + "\n");
  report.merged = rows.size();
  return report;
}

}  // namespace lumtrap
