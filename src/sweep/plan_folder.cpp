// The sweep folder: plan, layout, units. See plan_folder.hpp.
#include "sweep/plan_folder.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <stdexcept>

#include "io/text_file.hpp"
#include "io/text_hash.hpp"

namespace lumtrap {

namespace fs = std::filesystem;
using ojson = nlohmann::ordered_json;

namespace {

constexpr const char* kFolderFormat = "lumtrap sweep 2";

ojson folder_json(const SweepFolder& f) {
  ojson j;
  j["format"] = kFolderFormat;
  j["sweep_hash"] = f.sweep_hash;
  j["tool_version"] = f.tool_version;
  j["source"] = f.source;
  j["variant_count"] = f.variants.size();
  j["split_photons"] = f.split_photons;
  j["per_task"] = f.per_task;
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
  f.split_photons = opt.split_photons;
  f.requests = requests;
  const ParameterTable table = parameter_table(sweep);
  f.headers = table.headers;
  for (std::size_t v = 0; v < sweep.variants.size(); ++v) {
    const SweepVariant& sv = sweep.variants[v];
    SweepFolderVariant fv;
    fv.id = sv.id;
    fv.index = sv.index;
    fv.scene_hash = sv.identity;
    fv.photons = sv.scene.run.photons;
    fv.parameters = ojson::object();
    for (const auto& val : sv.values) fv.parameters[val.key] = ojson::parse(val.json.dump());
    fv.cells = table.rows[v];
    if (f.split_photons > 1 && sv.scene.run.target_jg_error > 0)
      throw std::invalid_argument(fmt::format(
          "variant {} sets run.target_jg_error (precision mode): its photon counts are chosen while it runs, so it "
          "cannot be split by photon ranges; plan without --split-photons or set fixed run.photons",
          sv.id));
    if (f.split_photons > fv.photons)
      throw std::invalid_argument(fmt::format("--split-photons {} is more than the {} photons per wavelength of "
                                              "variant {}",
                                              f.split_photons, fv.photons, sv.id));
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
    if (!fs::exists(scene, ec) || read_text_file(scene) != sweep.variants[v].resolved)
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
  const ojson j = read_json_file(file);
  SweepFolder f;
  f.dir = fs::absolute(dir).lexically_normal();
  try {
    const std::string format = j.value("format", std::string("(none)"));
    if (format != kFolderFormat)
      throw std::runtime_error(fmt::format("sweep folder format \"{}\", this lumtrap reads \"{}\" (planned by another "
                                           "lumtrap version); plan the sweep again into a new folder",
                                           format, kFolderFormat));
    f.sweep_hash = j.at("sweep_hash");
    f.tool_version = j.at("tool_version");
    f.source = j.at("source");
    f.split_photons = j.at("split_photons");
    f.per_task = j.at("per_task");
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
  if (f.split_photons < 1 || f.per_task < 1 || f.variants.empty() || f.tasks != (unit_count(f) + f.per_task - 1) / f.per_task)
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

std::size_t unit_count(const SweepFolder& f) { return f.variants.size() * f.split_photons; }

WorkUnit unit_at(const SweepFolder& f, std::size_t unit) {
  return WorkUnit{unit / f.split_photons, std::uint32_t(unit % f.split_photons)};
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

std::pair<std::uint64_t, std::uint64_t> part_range(std::uint64_t photons, std::uint32_t part, std::uint32_t split) {
  using u128 = unsigned __int128;
  return {std::uint64_t(u128(photons) * part / split), std::uint64_t(u128(photons) * (part + 1) / split)};
}

namespace {
std::string part_stem(const SweepFolder& f, std::uint32_t part) {
  const int w = std::max<int>(2, int(std::to_string(f.split_photons - 1).size()));
  return fmt::format("p{:0{}}of{:0{}}", part, w, f.split_photons, w);
}
}  // namespace

fs::path parts_dir(const SweepFolder& f, std::size_t v) { return variant_dir(f, v) / "parts"; }
fs::path part_tallies(const SweepFolder& f, std::size_t v, std::uint32_t part) {
  return parts_dir(f, v) / (part_stem(f, part) + ".tallies.json");
}
fs::path part_facts(const SweepFolder& f, std::size_t v, std::uint32_t part) {
  return parts_dir(f, v) / (part_stem(f, part) + ".json");
}
fs::path unit_checkpoint(const SweepFolder& f, const WorkUnit& u) {
  if (f.split_photons == 1) return variant_dir(f, u.variant) / "checkpoint.json";
  return parts_dir(f, u.variant) / (part_stem(f, u.part) + ".checkpoint.json");
}
fs::path unit_started(const SweepFolder& f, const WorkUnit& u) {
  if (f.split_photons == 1) return variant_dir(f, u.variant) / "started";
  return parts_dir(f, u.variant) / (part_stem(f, u.part) + ".started");
}

bool result_complete(const SweepFolder& f, std::size_t v) {
  const fs::path r = result_dir(f, v);
  std::error_code ec;
  return fs::exists(r / "summary.json", ec) && fs::exists(r / "tallies.json", ec);
}

std::string unit_key(const SweepFolder& f, std::size_t v, std::uint32_t part) {
  return fmt::format("{} variant {} part {}/{}", f.variants[v].scene_hash, f.variants[v].index, part, f.split_photons);
}

}  // namespace lumtrap
