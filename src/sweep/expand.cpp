// Sweep expansion: [sweep] table -> validated variants. See expand.hpp and
// docs/scene-format.md ("Sweeps").
#include "sweep/expand.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <limits>
#include <optional>
#include <sstream>
#include <utility>

#include "io/scene_identity.hpp"
#include "io/scene_reader.hpp"
#include "io/scene_writer.hpp"
#include "io/toml_text.hpp"
#include "io/units.hpp"

namespace lumtrap {
namespace fs = std::filesystem;

namespace {

/// More variants than this is almost certainly a mistake in the sweep file
/// (and more array tasks than any cluster accepts).
constexpr std::size_t kMaxVariants = 100000;
/// (TO - FROM)/STEP may differ from a whole number by this many steps.
constexpr double kRangeStepTolerance = 1e-6;
/// Invalid variants listed in one error message.
constexpr std::size_t kMaxListedErrors = 10;

const char* const kRangeAllowed =
    "a range \"FROM .. TO step STEP\" with FROM <= TO and STEP > 0, all three quantities of one kind "
    "(length: nm, um, µm, mm; angle: deg, °, rad; current density: mA/cm2, A/m2, ...) or all plain numbers, "
    "e.g. \"60 nm .. 90 nm step 5 nm\"";

// ---------------------------------------------------------------------------
// Values as TOML text and as JSON.

nlohmann::json json_of(const toml::node& n) {
  if (auto* s = n.as_string()) return s->get();
  if (auto* i = n.as_integer()) return i->get();
  if (auto* f = n.as_floating_point()) {
    if (std::isfinite(f->get())) return f->get();
    return toml_float_text(f->get());
  }
  if (auto* b = n.as_boolean()) return b->get();
  if (auto* a = n.as_array()) {
    nlohmann::json j = nlohmann::json::array();
    for (const auto& e : *a) j.push_back(json_of(e));
    return j;
  }
  if (auto* t = n.as_table()) {
    nlohmann::json j = nlohmann::json::object();
    for (auto&& [k, v] : *t) j[std::string(k.str())] = json_of(v);
    return j;
  }
  return toml_value_text(n);
}

std::string where(const fs::path& file, const toml::source_region& r) { return toml_where(file, r); }

// ---------------------------------------------------------------------------
// Numbers with units.

struct UnitKind {
  const char* name;
  double (*parse)(std::string_view);  ///< to a base unit (nm, deg, mA/cm2)
};
const UnitKind kUnitKinds[] = {{"length", parse_length_nm},
                               {"angle", parse_angle_deg},
                               {"current density", parse_current_mA_cm2}};

/// The kind whose parser reads `text`, or nullptr.
const UnitKind* unit_kind_of(std::string_view text) {
  for (const UnitKind& k : kUnitKinds) {
    try {
      k.parse(text);
      return &k;
    } catch (const UnitError&) {
    }
  }
  return nullptr;
}

/// x rounded to 12 significant digits, in its shortest exact text.
std::string rounded_text(double x) {
  double r = std::strtod(fmt::format("{:.12g}", x).c_str(), nullptr);
  if (r == 0) r = 0;  // no "-0"
  return format_number(r);
}

[[noreturn]] void range_fail(std::string_view text, const std::string& what) {
  throw SweepError(fmt::format("value {}: {}; allowed: {}", toml_quote(text), what, kRangeAllowed));
}

// ---------------------------------------------------------------------------
// Key paths.

struct PathStep {
  std::string name;
  std::vector<std::size_t> indices;
};

std::vector<PathStep> parse_key_path(std::string_view path) {
  auto bad = [&](const std::string& why) -> SweepError {
    return SweepError(fmt::format(
        "sweep key '{}': {}; allowed: a dotted scene key such as \"wafer.thickness\" or "
        "\"front.films[0].thickness\"",
        path, why));
  };
  std::vector<PathStep> steps;
  std::size_t i = 0;
  while (true) {
    PathStep s;
    while (i < path.size() && path[i] != '.' && path[i] != '[') s.name += path[i++];
    if (!is_bare_key(s.name)) throw bad(s.name.empty() ? "an empty part" : "a part '" + s.name + "' with characters other than letters, digits, _ and -");
    while (i < path.size() && path[i] == '[') {
      const std::size_t close = path.find(']', i);
      if (close == std::string_view::npos) throw bad("'[' without ']'");
      const std::string_view digits = path.substr(i + 1, close - i - 1);
      std::size_t idx = 0;
      auto [end, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), idx);
      if (digits.empty() || ec != std::errc() || end != digits.data() + digits.size())
        throw bad("index [" + std::string(digits) + "] is not a whole number >= 0");
      s.indices.push_back(idx);
      i = close + 1;
    }
    steps.push_back(std::move(s));
    if (i == path.size()) break;
    if (path[i] != '.') throw bad(fmt::format("unexpected '{}' after ']'", path[i]));
    ++i;
  }
  return steps;
}


// ---------------------------------------------------------------------------
// Axes.

/// One axis of the grid: a single key (grid) or several keys whose lists
/// move together (zip).
struct Axis {
  std::vector<std::string> keys;
  std::vector<toml::array> values;   ///< values[k] = the list of key k
  std::vector<std::string> wheres;   ///< FILE:L:C of each key's list
  std::size_t size = 0;
  std::pair<std::uint32_t, std::uint32_t> position{std::numeric_limits<std::uint32_t>::max(), 0};
};

std::pair<std::uint32_t, std::uint32_t> position_of(const toml::node& n) {
  const auto& b = n.source().begin;
  if (b.line == 0) return {std::numeric_limits<std::uint32_t>::max(), 0};
  return {b.line, b.column};
}

/// The list of values of one swept key: an array as written, or a range string expanded.
toml::array axis_values(const toml::node& n, const std::string& key, const fs::path& file) {
  const std::string at = where(file, n.source());
  if (auto* a = n.as_array()) {
    if (a->empty())
      throw SweepError(fmt::format("{}: sweep key '{}': an empty list; allowed: a non-empty list of values, or {}",
                                   at, key, kRangeAllowed));
    return *a;
  }
  if (auto* s = n.as_string()) {
    if (s->get().find("..") == std::string::npos)
      throw SweepError(fmt::format(
          "{}: sweep key '{}': value {}: a single value; allowed: a list of values [\"a\", \"b\"], or {}", at, key,
          toml_quote(s->get()), kRangeAllowed));
    try {
      return sweep_range_values(s->get());
    } catch (const SweepError& e) {
      throw SweepError(fmt::format("{}: sweep key '{}': {}", at, key, e.what()));
    }
  }
  throw SweepError(fmt::format("{}: sweep key '{}': {} where a list was expected; allowed: a list of values, or {}",
                               at, key, toml_type_name(n), kRangeAllowed));
}

void check_sweep_key(const std::string& key, const toml::node& n, const fs::path& file) {
  try {
    const auto steps = parse_key_path(key);
    if (steps.front().name == "sweep")
      throw SweepError(fmt::format("sweep key '{}': a sweep cannot change its own [sweep] table", key));
  } catch (const SweepError& e) {
    throw SweepError(fmt::format("{}: {}", where(file, n.source()), e.what()));
  }
}

Axis grid_axis(const std::string& key, const toml::node& n, const fs::path& file) {
  check_sweep_key(key, n, file);
  Axis a;
  a.keys.push_back(key);
  a.values.push_back(axis_values(n, "sweep.grid.\"" + key + "\"", file));
  a.wheres.push_back(where(file, n.source()));
  a.size = a.values.back().size();
  a.position = position_of(n);
  return a;
}

Axis zip_axis(const toml::table& t, const std::string& name, const fs::path& file) {
  if (t.empty())
    throw SweepError(fmt::format("{}: {}: an empty zip; allowed: two or more keys with lists of the same length",
                                 where(file, t.source()), name));
  std::vector<std::pair<std::pair<std::uint32_t, std::uint32_t>, std::string>> order;
  for (auto&& [k, v] : t) order.push_back({position_of(v), std::string(k.str())});
  std::stable_sort(order.begin(), order.end(),
                   [](const auto& x, const auto& y) { return x.first < y.first; });
  Axis a;
  for (const auto& [pos, key] : order) {
    const toml::node& v = *t.get(key);
    check_sweep_key(key, v, file);
    a.keys.push_back(key);
    a.values.push_back(axis_values(v, name + ".\"" + key + "\"", file));
    a.wheres.push_back(where(file, v.source()));
    a.position = std::min(a.position, pos);
  }
  a.size = a.values.front().size();
  for (std::size_t k = 1; k < a.keys.size(); ++k)
    if (a.values[k].size() != a.size)
      throw SweepError(fmt::format(
          "{}: {}: zipped lists of different lengths: '{}' has {} values ({}), '{}' has {} ({}); allowed: lists of "
          "the same length (their values are paired by position)",
          where(file, t.source()), name, a.keys[0], a.size, a.wheres[0], a.keys[k], a.values[k].size(),
          a.wheres[k]));
  return a;
}

std::vector<Axis> read_axes(const toml::table& sweep, const fs::path& file) {
  std::vector<Axis> axes;
  for (auto&& [k, v] : sweep) {
    const std::string name(k.str());
    if (name == "grid") {
      const toml::table* g = v.as_table();
      if (!g)
        throw SweepError(fmt::format("{}: key 'sweep.grid': {} where a table was expected; allowed: a table "
                                     "[sweep.grid] of \"scene.key\" = [values] or \"FROM .. TO step STEP\"",
                                     where(file, v.source()), toml_type_name(v)));
      for (auto&& [gk, gv] : *g) axes.push_back(grid_axis(std::string(gk.str()), gv, file));
    } else if (name == "zip") {
      if (const toml::table* z = v.as_table()) {
        axes.push_back(zip_axis(*z, "sweep.zip", file));
      } else if (const toml::array* za = v.as_array(); za && za->is_array_of_tables()) {
        for (std::size_t i = 0; i < za->size(); ++i)
          axes.push_back(zip_axis(*za->get(i)->as_table(), fmt::format("sweep.zip[{}]", i), file));
      } else {
        throw SweepError(fmt::format("{}: key 'sweep.zip': {} where a table was expected; allowed: [sweep.zip] or "
                                     "[[sweep.zip]] tables of \"scene.key\" = [values] of the same length",
                                     where(file, v.source()), toml_type_name(v)));
      }
    } else if (name == "random_streams") {
      continue;  // read by random_streams_of()
    } else {
      throw SweepError(fmt::format("{}: key 'sweep.{}': unknown key; allowed keys in [sweep]: grid, zip, random_streams",
                                   where(file, v.source()), name));
    }
  }
  if (axes.empty())
    throw SweepError(fmt::format("{}: [sweep] names no values to sweep; allowed: [sweep.grid] and/or [[sweep.zip]] "
                                 "tables of \"scene.key\" = [values]",
                                 where(file, sweep.source())));
  std::stable_sort(axes.begin(), axes.end(), [](const Axis& x, const Axis& y) { return x.position < y.position; });
  // A key swept twice would silently lose one of its axes.
  std::vector<std::pair<std::string, std::string>> seen;
  for (const Axis& a : axes)
    for (std::size_t k = 0; k < a.keys.size(); ++k) {
      for (const auto& [key, at] : seen)
        if (key == a.keys[k])
          throw SweepError(fmt::format("{}: sweep key '{}' is swept twice (also at {}); allowed: each key once",
                                       a.wheres[k], key, at));
      seen.push_back({a.keys[k], a.wheres[k]});
    }
  return axes;
}

// [sweep] random_streams: "common" (the default: every variant draws the
// random numbers of photon i at wavelength j from the same stream, so
// differences between variants have small errors) or "independent".
std::string random_streams_of(const toml::table& sweep, const fs::path& file) {
  const toml::node* n = sweep.get("random_streams");
  if (!n) return "common";
  const auto* text = n->as_string();
  if (!text || (text->get() != "common" && text->get() != "independent"))
    throw SweepError(fmt::format("{}: key 'sweep.random_streams': value {}; allowed: \"common\" (variants share "
                                 "random streams: small errors of differences) or \"independent\"",
                                 where(file, n->source()), toml_value_text(*n)));
  return text->get();
}

}  // namespace

// ---------------------------------------------------------------------------

toml::array sweep_range_values(std::string_view text) {
  const std::size_t dots = text.find("..");
  if (dots == std::string_view::npos) range_fail(text, "no '..' between FROM and TO");
  const std::string_view from_text = trim_blanks(text.substr(0, dots));
  std::string_view rest = text.substr(dots + 2);
  const std::size_t step_at = rest.find("step");
  if (step_at == std::string_view::npos) range_fail(text, "no 'step' after TO");
  const std::string_view to_text = trim_blanks(rest.substr(0, step_at));
  const std::string_view step_text = trim_blanks(rest.substr(step_at + 4));
  if (from_text.empty() || to_text.empty() || step_text.empty())
    range_fail(text, "FROM, TO or STEP is missing");

  const auto from = split_quantity(from_text);
  if (from.problem != QuantityText::none) range_fail(text, fmt::format("FROM {} does not start with a number", toml_quote(from_text)));

  toml::array out;
  if (from.unit.empty()) {
    // Plain numbers: all three must be plain.
    const auto to = split_quantity(to_text), step = split_quantity(step_text);
    for (const auto& [q, t, what] : {std::tuple{&to, to_text, "TO"}, std::tuple{&step, step_text, "STEP"}})
      if (q->problem != QuantityText::none || !q->unit.empty())
        range_fail(text, fmt::format("{} {} is not a plain number, but FROM {} is one", what, toml_quote(t),
                                     toml_quote(from_text)));
    if (!(step.number > 0)) range_fail(text, fmt::format("STEP {} is not > 0", toml_quote(step_text)));
    if (to.number < from.number) range_fail(text, "TO is smaller than FROM");
    if (from.integer && to.integer && step.integer) {
      if ((to.as_int - from.as_int) % step.as_int != 0)
        range_fail(text, "(TO - FROM) is not a whole number of STEPs");
      const std::int64_t n = (to.as_int - from.as_int) / step.as_int + 1;
      if (std::uint64_t(n) > kMaxVariants) range_fail(text, fmt::format("{} values; at most {}", n, kMaxVariants));
      for (std::int64_t k = 0; k < n; ++k) out.push_back(from.as_int + k * step.as_int);
      return out;
    }
    const double steps = (to.number - from.number) / step.number;
    if (std::abs(steps - std::round(steps)) > kRangeStepTolerance)
      range_fail(text, fmt::format("(TO - FROM)/STEP = {} is not a whole number", format_number(steps)));
    const auto n = std::size_t(std::llround(steps)) + 1;
    if (n > kMaxVariants) range_fail(text, fmt::format("{} values; at most {}", n, kMaxVariants));
    for (std::size_t k = 0; k + 1 < n; ++k)
      out.push_back(std::strtod(rounded_text(from.number + double(k) * step.number).c_str(), nullptr));
    out.push_back(std::strtod(rounded_text(to.number).c_str(), nullptr));
    return out;
  }

  // Quantities: the kind is that of FROM; TO and STEP must be of the same kind.
  const UnitKind* kind = unit_kind_of(from_text);
  if (!kind)
    range_fail(text, fmt::format("FROM {}: unit \"{}\" is not accepted", toml_quote(from_text), from.unit));
  auto base = [&](std::string_view part, const char* what) {
    try {
      return kind->parse(part);
    } catch (const UnitError& e) {
      throw SweepError(fmt::format("value {}: {} (a {} like FROM): {}", toml_quote(text), what, kind->name, e.what()));
    }
  };
  const double unit = base(fmt::format("1 {}", from.unit), "FROM");  // one FROM unit in base units
  const double to = base(to_text, "TO") / unit, step = base(step_text, "STEP") / unit;
  if (!(step > 0)) range_fail(text, fmt::format("STEP {} is not > 0", toml_quote(step_text)));
  if (to < from.number) range_fail(text, "TO is smaller than FROM");
  const double steps = (to - from.number) / step;
  if (std::abs(steps - std::round(steps)) > kRangeStepTolerance)
    range_fail(text, fmt::format("(TO - FROM)/STEP = {} is not a whole number", format_number(steps)));
  const auto n = std::size_t(std::llround(steps)) + 1;
  if (n > kMaxVariants) range_fail(text, fmt::format("{} values; at most {}", n, kMaxVariants));
  for (std::size_t k = 0; k + 1 < n; ++k)
    out.push_back(rounded_text(from.number + double(k) * step) + " " + std::string(from.unit));
  out.push_back(rounded_text(to) + " " + std::string(from.unit));
  return out;
}

void set_at_key_path(toml::table& root, std::string_view path, const toml::node& value) {
  const std::vector<PathStep> steps = parse_key_path(path);
  auto fail = [&](const std::string& why) -> SweepError {
    return SweepError(fmt::format("sweep key '{}': {}", path, why));
  };
  toml::table* table = &root;
  std::string walked;
  for (std::size_t s = 0; s < steps.size(); ++s) {
    const PathStep& step = steps[s];
    const bool last = s + 1 == steps.size();
    walked += (walked.empty() ? "" : ".") + step.name;
    if (last && step.indices.empty()) {
      value.visit([&](const auto& v) { table->insert_or_assign(step.name, v); });
      return;
    }
    toml::node* node = table->get(step.name);
    if (!node) {
      if (!step.indices.empty())
        throw fail(fmt::format("'{}' is not in the scene, so it has no element [{}]; allowed: elements that the "
                               "scene file writes",
                               walked, step.indices.front()));
      table->insert(step.name, toml::table{});
      node = table->get(step.name);
    }
    for (std::size_t k = 0; k < step.indices.size(); ++k) {
      toml::array* arr = node->as_array();
      if (!arr) throw fail(fmt::format("'{}' is {}, not an array", walked, toml_type_name(*node)));
      const std::size_t idx = step.indices[k];
      if (idx >= arr->size())
        throw fail(fmt::format("'{}' has {} element{}, so there is no [{}]; allowed: an index below {} (elements "
                               "that the scene file writes)",
                               walked, arr->size(), arr->size() == 1 ? "" : "s", idx, arr->size()));
      walked += fmt::format("[{}]", idx);
      if (last && k + 1 == step.indices.size()) {
        value.visit([&](const auto& v) { arr->replace(arr->cbegin() + std::ptrdiff_t(idx), v); });
        return;
      }
      node = arr->get(idx);
    }
    table = node->as_table();
    if (!table) throw fail(fmt::format("'{}' is {}, not a table", walked, toml_type_name(*node)));
  }
}

Sweep expand_sweep(const toml::table& root, const fs::path& file, const SceneCheck& check) {
  const toml::node* sweep_node = root.get("sweep");
  if (!sweep_node)
    throw SweepError(fmt::format("{}: no [sweep] table; a sweep file is a scene file with a [sweep] table of the "
                                 "values to vary (docs/scene-format.md, \"Sweeps\")",
                                 file.string()));
  const toml::table* sweep_table = sweep_node->as_table();
  if (!sweep_table)
    throw SweepError(fmt::format("{}: key 'sweep': {} where a table was expected; allowed: a [sweep] table",
                                 where(file, sweep_node->source()), toml_type_name(*sweep_node)));
  const std::vector<Axis> axes = read_axes(*sweep_table, file);

  std::size_t total = 1;
  for (const Axis& a : axes) {
    if (total > kMaxVariants / a.size)
      throw SweepError(fmt::format("{}: the sweep has more than {} variants; allowed: at most {} (split it into "
                                   "several sweep files)",
                                   where(file, sweep_table->source()), kMaxVariants, kMaxVariants));
    total *= a.size;
  }

  Sweep out;
  out.file = file;
  out.random_streams = random_streams_of(*sweep_table, file);
  for (const Axis& a : axes)
    for (const auto& k : a.keys) out.keys.push_back(k);
  const int width = std::max<int>(4, int(std::to_string(total - 1).size()));

  std::vector<std::string> errors;
  std::size_t invalid = 0;
  for (std::size_t v = 0; v < total; ++v) {
    SweepVariant var;
    var.index = v;
    var.id = fmt::format("v{:0{}}", v, width);
    // Mixed-radix digits of v: the last axis varies fastest.
    std::vector<std::size_t> pick(axes.size());
    std::size_t rest = v;
    for (std::size_t a = axes.size(); a-- > 0;) {
      pick[a] = rest % axes[a].size;
      rest /= axes[a].size;
    }
    toml::table t = root;
    std::string label;
    try {
      for (std::size_t a = 0; a < axes.size(); ++a)
        for (std::size_t k = 0; k < axes[a].keys.size(); ++k) {
          const toml::node& value = *axes[a].values[k].get(pick[a]);
          var.values.push_back({axes[a].keys[k], toml_value_text(value), json_of(value)});
          label += (label.empty() ? "" : ", ") + axes[a].keys[k] + " = " + var.values.back().toml;
        }
      for (std::size_t a = 0; a < axes.size(); ++a)
        for (std::size_t k = 0; k < axes[a].keys.size(); ++k)
          set_at_key_path(t, axes[a].keys[k], *axes[a].values[k].get(pick[a]));
      var.scene = scene_from_table(t, file, {"sweep"});
      if (check) check(var.scene);
      var.resolved = resolved_scene_toml(var.scene);
      var.identity = scene_identity(var.scene);
    } catch (const std::runtime_error& e) {  // SceneError, SweepError
      ++invalid;
      if (errors.size() < kMaxListedErrors) errors.push_back(fmt::format("variant {} ({}): {}", var.id, label, e.what()));
      continue;
    }
    out.variants.push_back(std::move(var));
  }
  if (invalid) {
    // Values set by the sweep carry no source position in the scene
    // reader's messages: name where each swept key is written instead.
    std::string keys;
    for (const Axis& a : axes)
      for (std::size_t k = 0; k < a.keys.size(); ++k) keys += (keys.empty() ? "" : ", ") + a.keys[k] + " at " + a.wheres[k];
    std::string msg = fmt::format("{}: {} of {} sweep variant{} invalid (nothing was run; swept keys: {}):",
                                  file.string(), invalid, total, invalid == 1 ? " is" : "s are", keys);
    for (const auto& e : errors) msg += "\n  " + e;
    if (invalid > errors.size()) msg += fmt::format("\n  ... and {} more", invalid - errors.size());
    throw SweepError(msg);
  }
  return out;
}

toml::table variant_table(const toml::table& root, const std::vector<std::pair<std::string, std::string>>& values) {
  toml::table t = root;
  for (const auto& [key, text] : values) {
    toml::table holder;
    try {
      holder = toml::parse("v = " + text);
    } catch (const toml::parse_error& e) {
      throw SweepError(fmt::format("sweep key '{}': value {} is not a TOML value ({})", key, text, e.description()));
    }
    const toml::node* v = holder.get("v");
    if (!v || holder.size() != 1)
      throw SweepError(fmt::format("sweep key '{}': value {} is not a single TOML value", key, text));
    set_at_key_path(t, key, *v);
  }
  return t;
}

Sweep read_sweep_file(const fs::path& file, const SceneCheck& check) {
  return expand_sweep(read_scene_table(file), file, check);
}

std::string csv_field(std::string_view text) {
  if (text.find_first_of(",\"\n\r") == std::string_view::npos) return std::string(text);
  std::string s = "\"";
  for (char c : text) s += c == '"' ? std::string("\"\"") : std::string(1, c);
  return s + "\"";
}

ParameterTable parameter_table(const Sweep& sweep) {
  ParameterTable t;
  t.rows.assign(sweep.variants.size(), {});
  for (std::size_t k = 0; k < sweep.keys.size(); ++k) {
    // One unit of a known kind for every value of this key?
    std::optional<std::string> unit;
    bool same = !sweep.variants.empty();
    for (const auto& v : sweep.variants) {
      const nlohmann::json& j = v.values[k].json;
      if (!j.is_string()) {
        same = false;
        break;
      }
      const std::string& text = j.get_ref<const std::string&>();
      const QuantityText q = split_quantity(text);
      if (q.problem != QuantityText::none || q.unit.empty() || !unit_kind_of(text) || (unit && *unit != q.unit)) {
        same = false;
        break;
      }
      unit = std::string(q.unit);
    }
    t.headers.push_back(same ? fmt::format("{} [{}]", sweep.keys[k], *unit) : sweep.keys[k]);
    for (std::size_t v = 0; v < sweep.variants.size(); ++v) {
      const SweepValue& sv = sweep.variants[v].values[k];
      if (same)
        t.rows[v].push_back(format_number(split_quantity(sv.json.get_ref<const std::string&>()).number));
      else
        t.rows[v].push_back(sv.json.is_string() ? sv.json.get<std::string>() : sv.toml);
    }
  }
  return t;
}

std::string variants_csv(const Sweep& sweep) {
  const ParameterTable t = parameter_table(sweep);
  std::string out = "id";
  for (const auto& h : t.headers) {
    out += ',';
    out += csv_field(h);
  }
  out += "\n";
  for (std::size_t v = 0; v < sweep.variants.size(); ++v) {
    out += sweep.variants[v].id;
    for (const auto& c : t.rows[v]) {
      out += ',';
      out += csv_field(c);
    }
    out += "\n";
  }
  return out;
}

std::string sweep_identity_text(const Sweep& sweep) {
  std::string s = "lumtrap sweep\nkeys:";
  for (const auto& k : sweep.keys) s += " " + k;
  s += "\n";
  for (const auto& v : sweep.variants) {
    s += "=== " + v.id + "\n";
    for (const auto& sv : v.values) s += sv.key + " = " + sv.toml + "\n";
    s += "scene " + v.identity + "\n";
  }
  return s;
}

}  // namespace lumtrap
