// The sweep folder: plan, layout, units. See plan_folder.hpp.
#include "sweep/plan_folder.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <fstream>
#include <stdexcept>

#include "io/text_file.hpp"
#include "io/text_hash.hpp"

namespace lumtrap {

namespace fs = std::filesystem;
using ojson = nlohmann::ordered_json;

namespace {

constexpr const char* kFolderFormat = "lumtrap sweep 4";

ojson header_json(const SweepFolder& f) {
  ojson j;
  j["format"] = kFolderFormat;
  j["sweep_hash"] = f.sweep_hash;
  j["tool_version"] = f.tool_version;
  j["source"] = f.source;
  j["plan_id"] = f.plan_id;
  j["variant_count"] = f.variant_count;
  j["split_photons"] = f.split_photons;
  j["per_task"] = f.per_task;
  j["tasks"] = f.tasks;
  j["lean"] = f.lean;
  j["random_streams"] = f.random_streams;
  j["requests"] = f.requests;
  j["keys"] = f.keys;
  j["headers"] = f.headers;
  j["index_line_bytes"] = f.line_bytes;
  return j;
}

std::string variant_line(const SweepFolderVariant& v) {
  ojson j;
  j["id"] = v.id;
  j["index"] = v.index;
  j["scene_hash"] = v.scene_hash;
  j["photons"] = v.photons;
  j["toml"] = v.toml;
  j["json"] = v.json;
  j["cells"] = v.cells;
  return j.dump();
}

SweepFolderVariant variant_from_line(const std::string& line, const fs::path& file, std::size_t expected) {
  try {
    const ojson j = ojson::parse(line);
    SweepFolderVariant v;
    v.id = j.at("id");
    v.index = j.at("index");
    v.scene_hash = j.at("scene_hash");
    v.photons = j.at("photons");
    v.toml = j.at("toml").get<std::vector<std::string>>();
    for (const auto& e : j.at("json")) v.json.push_back(nlohmann::json::parse(e.dump()));
    v.cells = j.at("cells").get<std::vector<std::string>>();
    if (v.index != expected) throw std::runtime_error(fmt::format("holds variant {}", v.index));
    return v;
  } catch (const std::exception& e) {
    throw std::runtime_error(fmt::format("{}: line {}: not the line of variant {} ({}); plan the sweep again",
                                         file.string(), expected + 1, expected, e.what()));
  }
}

/// Reads variants [first, first + count) of variants.jsonl by seeking.
std::vector<SweepFolderVariant> read_variant_lines(const SweepFolder& f, std::size_t first, std::size_t count) {
  const fs::path file = f.dir / "variants.jsonl";
  std::ifstream in(file, std::ios::binary);
  if (!in) throw std::runtime_error(fmt::format("cannot read {}; plan the sweep again", file.string()));
  std::string buf(f.line_bytes * count, '\0');
  in.seekg(std::streamoff(first * f.line_bytes));
  in.read(buf.data(), std::streamsize(buf.size()));
  if (std::size_t(in.gcount()) != buf.size())
    throw std::runtime_error(fmt::format("{} is shorter than its {} variants; plan the sweep again", file.string(),
                                         f.variant_count));
  std::vector<SweepFolderVariant> out;
  out.reserve(count);
  for (std::size_t k = 0; k < count; ++k)
    out.push_back(variant_from_line(buf.substr(k * f.line_bytes, f.line_bytes), file, first + k));
  return out;
}

}  // namespace

std::string plan_id_of(std::size_t per_task, std::uint32_t split) {
  return split > 1 ? fmt::format("per-task-{}-split-{}", per_task, split) : fmt::format("per-task-{}", per_task);
}

void check_plan_target(const fs::path& dir_in, const std::string& sweep_hash) {
  const fs::path dir = fs::absolute(dir_in).lexically_normal();
  std::error_code ec;
  if (fs::exists(dir / "sweep.json", ec)) {
    SweepFolder old;
    try {
      old = load_sweep_header(dir);
    } catch (const std::exception& e) {
      throw std::runtime_error(fmt::format("{}: {}; choose another --out or delete that folder", dir.string(),
                                           e.what()));
    }
    if (old.sweep_hash != sweep_hash)
      throw std::runtime_error(fmt::format("{} holds another sweep (hash {}, planned from {}; this sweep {}); choose "
                                           "another --out or delete that folder",
                                           dir.string(), old.sweep_hash, old.source, sweep_hash));
    if (old.tool_version != LUMTRAP_VERSION)
      throw std::runtime_error(fmt::format("{} was planned by lumtrap {} (this is {}); its results cannot be mixed "
                                           "with new ones: choose another --out or delete that folder",
                                           dir.string(), old.tool_version, LUMTRAP_VERSION));
  } else if (fs::exists(dir, ec) && !fs::is_empty(dir, ec)) {
    throw std::runtime_error(
        fmt::format("{} exists and is not a sweep folder (no sweep.json); choose another --out", dir.string()));
  }
}

SweepFolder write_sweep_plan(const Sweep& sweep, const std::string& sweep_text, const fs::path& dir_in,
                             const SweepPlanOptions& opt, const ojson& requests) {
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
  f.plan_id = plan_id_of(opt.per_task, opt.split_photons);
  f.lean = opt.lean;
  f.random_streams = sweep.random_streams;
  f.requests = requests;
  f.keys = sweep.keys;
  f.variant_count = sweep.variants.size();
  const ParameterTable table = parameter_table(sweep);
  f.headers = table.headers;
  for (std::size_t v = 0; v < sweep.variants.size(); ++v) {
    const SweepVariant& sv = sweep.variants[v];
    SweepFolderVariant fv;
    fv.id = sv.id;
    fv.index = sv.index;
    fv.scene_hash = sv.identity;
    fv.photons = sv.scene.run.photons;
    for (const auto& val : sv.values) {
      fv.toml.push_back(val.toml);
      fv.json.push_back(val.json);
    }
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
    if (fv.id != fmt::format("v{:0{}}", v, std::max<int>(4, int(std::to_string(f.variant_count - 1).size()))))
      throw std::logic_error("variant ids out of expansion order");
    f.variants.push_back(std::move(fv));
  }
  f.tasks = (unit_count(f) + f.per_task - 1) / f.per_task;
  check_plan_target(f.dir, f.sweep_hash);

  // variants.jsonl: every line padded to one length.
  std::vector<std::string> lines;
  lines.reserve(f.variants.size());
  std::size_t width = 0;
  for (const auto& v : f.variants) {
    lines.push_back(variant_line(v));
    width = std::max(width, lines.back().size());
  }
  f.line_bytes = width + 1;
  std::string index;
  index.reserve(f.line_bytes * lines.size());
  for (const auto& l : lines) {
    index += l;
    index.append(width - l.size(), ' ');
    index += '\n';
  }

  fs::create_directories(log_dir(f));
  write_file_atomically(f.dir / "sweep.toml", sweep_text);
  write_file_atomically(f.dir / "variants.jsonl", index);
  write_file_atomically(f.dir / "variants.csv", variants_csv(sweep));
  write_file_atomically(f.dir / "sweep.json", header_json(f).dump(2) + "\n");  // last: the plan is complete
  return f;
}

SweepFolder load_sweep_header(const fs::path& dir) {
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
    f.plan_id = j.at("plan_id");
    f.variant_count = j.at("variant_count");
    f.split_photons = j.at("split_photons");
    f.per_task = j.at("per_task");
    f.tasks = j.at("tasks");
    f.lean = j.at("lean");
    f.random_streams = j.at("random_streams");
    f.requests = j.value("requests", ojson::object());
    f.keys = j.at("keys").get<std::vector<std::string>>();
    f.headers = j.at("headers").get<std::vector<std::string>>();
    f.line_bytes = j.at("index_line_bytes");
  } catch (const std::exception& e) {
    throw std::runtime_error(fmt::format("{}: not a lumtrap sweep file ({})", file.string(), e.what()));
  }
  if (f.split_photons < 1 || f.per_task < 1 || f.variant_count == 0 || f.line_bytes < 2 ||
      f.tasks != (unit_count(f) + f.per_task - 1) / f.per_task || f.plan_id != plan_id_of(f.per_task, f.split_photons))
    throw std::runtime_error(fmt::format("{}: inconsistent task counts", file.string()));
  return f;
}

SweepFolder load_sweep_folder(const fs::path& dir) {
  SweepFolder f = load_sweep_header(dir);
  f.first_variant = 0;
  f.variants = read_variant_lines(f, 0, f.variant_count);
  return f;
}

SweepFolder load_sweep_task(const fs::path& dir, std::size_t task) {
  SweepFolder f = load_sweep_header(dir);
  const std::vector<std::size_t> units = units_of_task(f, task);
  const std::size_t first = unit_at(f, units.front()).variant, last = unit_at(f, units.back()).variant;
  f.first_variant = first;
  f.variants = read_variant_lines(f, first, last - first + 1);
  return f;
}

const SweepFolderVariant& folder_variant(const SweepFolder& f, std::size_t v) {
  if (v < f.first_variant || v - f.first_variant >= f.variants.size())
    throw std::logic_error(fmt::format("variant {} of {} was not read", v, f.dir.string()));
  return f.variants[v - f.first_variant];
}

std::string variant_id(const SweepFolder& f, std::size_t v) {
  const int width = std::max<int>(4, int(std::to_string(f.variant_count - 1).size()));
  return fmt::format("v{:0{}}", v, width);
}

ojson variant_parameters(const SweepFolder& f, const SweepFolderVariant& v) {
  ojson p = ojson::object();
  for (std::size_t k = 0; k < f.keys.size() && k < v.json.size(); ++k) p[f.keys[k]] = ojson::parse(v.json[k].dump());
  return p;
}

void require_same_tool_version(const SweepFolder& f) {
  if (f.tool_version != LUMTRAP_VERSION)
    throw std::runtime_error(fmt::format("{} was planned by lumtrap {}, this is lumtrap {}; results of different "
                                         "versions are not mixed: run it with lumtrap {} or plan it again into a "
                                         "new folder",
                                         f.dir.string(), f.tool_version, LUMTRAP_VERSION, f.tool_version));
}

std::size_t unit_count(const SweepFolder& f) { return f.variant_count * f.split_photons; }

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

fs::path variant_dir(const SweepFolder& f, std::size_t v) { return f.dir / "variants" / variant_id(f, v); }
fs::path result_dir(const SweepFolder& f, std::size_t v) { return variant_dir(f, v) / "result"; }
fs::path log_dir(const SweepFolder& f) { return f.dir / "logs" / f.plan_id; }
fs::path task_log(const SweepFolder& f, std::size_t task) { return log_dir(f) / fmt::format("task_{}.log", task); }
fs::path task_record(const SweepFolder& f, std::size_t task) {
  return log_dir(f) / fmt::format("task_{}.json", task);
}
fs::path merge_log(const SweepFolder& f) { return log_dir(f) / "merge.log"; }

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
fs::path unit_trace_time(const SweepFolder& f, const WorkUnit& u) {
  if (f.split_photons == 1) return variant_dir(f, u.variant) / "trace_time.json";
  return parts_dir(f, u.variant) / (part_stem(f, u.part) + ".trace_time.json");
}

bool result_complete(const SweepFolder& f, std::size_t v) {
  const fs::path r = result_dir(f, v);
  std::error_code ec;
  return fs::exists(r / "summary.json", ec) && fs::exists(r / "tallies.json", ec);
}

std::string unit_key(const SweepFolder& f, std::size_t v, std::uint32_t part) {
  const SweepFolderVariant& var = folder_variant(f, v);
  return fmt::format("{} variant {} part {}/{}", var.scene_hash, var.index, part, f.split_photons);
}

}  // namespace lumtrap
