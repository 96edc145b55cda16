// Scene file reading and validation. See scene_reader.hpp and
// docs/scene-format.md.
#include "io/scene_reader.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <map>
#include <numbers>
#include <climits>
#include <cmath>
#include <cerrno>
#include <cstdint>
#include <fstream>
#include <sstream>
#include <string_view>
#include <utility>
#include <vector>

#include "io/height_map_file.hpp"
#include "io/io_error.hpp"
#include "io/formula_material_file.hpp"
#include "io/scene_words.hpp"
#include "io/toml_text.hpp"
#include "io/units.hpp"
#include "optics/material.hpp"
#include "optics/spectrum.hpp"

namespace lumtrap {
namespace fs = std::filesystem;

namespace {

constexpr std::size_t kMaxWavelengths = 100000;
/// (to - from)/step may differ from a whole number by this many steps.
constexpr double kStepTolerance = 1e-6;

std::string join(const std::vector<std::string_view>& items, std::string_view sep) {
  std::string s;
  for (std::size_t i = 0; i < items.size(); ++i) {
    if (i) s += sep;
    s += items[i];
  }
  return s;
}

// ---------------------------------------------------------------------------
// Showing values in messages and writing them as TOML.

/// The value of a node as it would read in TOML, for messages.
std::string show(const toml::node& n) { return shortened(toml_value_text(n, 6)); }


/// Levenshtein distance, for "did you mean" hints on unknown keys.
std::size_t edit_distance(std::string_view a, std::string_view b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diag = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t up = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diag + (a[i - 1] == b[j - 1] ? 0 : 1)});
      diag = up;
    }
  }
  return row[b.size()];
}

std::string trimmed(std::string_view s) { return std::string(trim_blanks(s)); }

std::string upper(std::string s) {
  for (char& c : s)
    if (c >= 'a' && c <= 'z') c = static_cast<char>(c - 'a' + 'A');
  return s;
}


// ---------------------------------------------------------------------------
// The validating reader.

/// A material named somewhere in the scene, kept to check that it covers
/// every run wavelength once the wavelengths are known.
struct MaterialUse {
  std::string key;
  std::string where;    ///< "FILE:L:C", or empty for a default (then: the wavelengths' position)
  std::string shown;    ///< the value as written, or `"air" (default)`
  Material material;
};

class SceneReader {
 public:
  SceneReader(const fs::path& file) : file_(file) {
    install_height_map_reader();  // texture = "height_map" reads its file while it is validated
    install_formula_file_reader();  // material = a dispersion-formula file
    std::error_code ec;
    fs::path abs = file.empty() ? fs::current_path(ec) / "scene.toml" : fs::absolute(file, ec);
    dir_ = abs.lexically_normal().parent_path();
  }

  Scene read(const toml::table& root, const std::set<std::string>& ignored);

 private:
  fs::path file_, dir_;
  bool rear_mirror_ = false;  // rear.medium = "perfect_mirror"
  std::optional<RearReflector> reflector_;  // rear.medium = { reflectance = ... }
  std::string reflector_where_;
  std::optional<RearPattern> pattern_;  // [rear.pattern]
  std::optional<FrontGrid> grid_;       // [front.grid]
  std::string pattern_reflector_where_;
  std::vector<MaterialUse> uses_;
  std::string wavelengths_where_;

  // --- messages ------------------------------------------------------------
  std::string where(const toml::source_region& r) const { return toml_where(file_, r); }
  [[noreturn]] void fail_at(const toml::source_region& r, const std::string& key,
                            const std::string& what) const {
    throw SceneError(fmt::format("{}: key '{}': {}", where(r), key, what));
  }
  [[noreturn]] void fail_value(const toml::node& n, const std::string& key,
                               const std::string& what) const {
    fail_at(n.source(), key, "value " + show(n) + ": " + what);
  }
  [[noreturn]] void fail_missing(const toml::table& t, const std::string& key,
                                 const std::string& what) const {
    fail_at(t.source(), key, "missing; required: " + what);
  }

  // --- structure -----------------------------------------------------------
  /// Every key of `t` must be in `allowed` (or in `ignored`).
  void check_keys(const toml::table& t, const std::string& path,
                  const std::vector<std::string_view>& allowed,
                  const std::set<std::string>& ignored = {}) const {
    for (auto&& [k, v] : t) {
      const std::string_view name = k.str();
      if (ignored.count(std::string(name))) continue;
      if (std::find(allowed.begin(), allowed.end(), name) != allowed.end()) continue;
      std::string hint;
      for (std::string_view a : allowed)
        if (edit_distance(name, a) <= 2) {
          hint = fmt::format(" (did you mean '{}'?)", a);
          break;
        }
      const toml::source_region& r = k.source().begin.line ? k.source() : v.source();
      const std::string table = path.empty() ? "at the top level" : "in [" + path + "]";
      fail_at(r, toml_child_key(path, name),
              fmt::format("value {}: unknown key{}; allowed keys {}: {}", show(v), hint, table,
                          join(allowed, ", ")));
    }
  }

  /// The sub-table `key` of `t`, or nullptr when absent.
  const toml::table* sub_table(const toml::table& t, const std::string& path, std::string_view key) const {
    const toml::node* n = t.get(key);
    if (!n) return nullptr;
    const std::string k = toml_child_key(path, key);
    if (!n->is_table())
      fail_value(*n, k, fmt::format("{} where a table was expected; allowed: a table [{}]", toml_type_name(*n), k));
    return n->as_table();
  }

  // --- scalar values ---------------------------------------------------------
  const std::string& string_value(const toml::node& n, const std::string& key,
                                  std::string_view allowed) const {
    if (!n.is_string())
      fail_value(n, key, fmt::format("{} where a string was expected; allowed: {}", toml_type_name(n), allowed));
    return n.as_string()->get();
  }

  template <class E>
  E word(const toml::node& n, const std::string& key, const Words<E>& words) const {
    const std::string allowed = "one of " + word_list(words);
    const std::string& s = string_value(n, key, allowed);
    for (const auto& [w, v] : words)
      if (s == w) return v;
    fail_value(n, key, "unknown word; allowed: " + allowed);
  }

  template <class E>
  E word_or(const toml::table& t, const std::string& path, std::string_view key, const Words<E>& words,
            E fallback) const {
    const toml::node* n = t.get(key);
    return n ? word(*n, toml_child_key(path, key), words) : fallback;
  }

  double number(const toml::node& n, const std::string& key, std::string_view allowed) const {
    double x;
    if (auto* i = n.as_integer())
      x = static_cast<double>(i->get());
    else if (auto* f = n.as_floating_point())
      x = f->get();
    else
      fail_value(n, key, fmt::format("{} where a number was expected; allowed: {}", toml_type_name(n), allowed));
    if (!std::isfinite(x)) fail_value(n, key, fmt::format("not a finite number; allowed: {}", allowed));
    return x;
  }

  std::int64_t integer(const toml::node& n, const std::string& key, std::int64_t lo, std::int64_t hi,
                       std::string_view allowed) const {
    auto* i = n.as_integer();
    if (!i)
      fail_value(n, key, fmt::format("{} where an integer was expected; allowed: {}", toml_type_name(n), allowed));
    if (i->get() < lo || i->get() > hi) fail_value(n, key, fmt::format("out of range; allowed: {}", allowed));
    return i->get();
  }

  bool boolean(const toml::node& n, const std::string& key) const {
    if (auto* b = n.as_boolean()) return b->get();
    fail_value(n, key, fmt::format("{} where a boolean was expected; allowed: true, false", toml_type_name(n)));
  }

  /// A quantity with a unit, read by `parse` (units.hpp). `example` is shown
  /// for bare numbers ("75 nm").
  template <class Parse>
  double quantity(const toml::node& n, const std::string& key, Parse parse, std::string_view example,
                  std::string_view allowed_units) const {
    if (n.is_number())
      fail_value(n, key,
                 fmt::format("a bare number; write the unit: e.g. \"{} {}\"; allowed units: {}", show(n),
                             example, allowed_units));
    const std::string& s = string_value(n, key, fmt::format("a string with a unit, e.g. \"1 {}\"", example));
    try {
      return parse(s);
    } catch (const UnitError& e) {
      fail_at(n.source(), key, e.what());
    }
  }

  double length_nm(const toml::node& n, const std::string& key) const {
    return quantity(n, key, parse_length_nm, "nm", "nm, um, µm, mm");
  }
  double length_um(const toml::node& n, const std::string& key) const {
    return quantity(n, key, parse_length_um, "um", "nm, um, µm, mm");
  }
  double angle_deg(const toml::node& n, const std::string& key) const {
    return quantity(n, key, parse_angle_deg, "deg", "deg, °, rad");
  }
  double angle_rad(const toml::node& n, const std::string& key) const {
    return quantity(n, key, parse_angle_rad, "deg", "deg, °, rad");
  }

  /// A length in µm that must be > 0 (strict) or >= 0.
  double length_um_checked(const toml::node& n, const std::string& key, bool strict,
                           std::string_view example) const {
    const double v = length_um(n, key);
    if (strict ? !(v > 0) : !(v >= 0))
      fail_value(n, key, fmt::format("{}; allowed: a length {} 0, e.g. \"{}\"", v < 0 ? "negative" : "zero",
                                     strict ? ">" : ">=", example));
    return v;
  }

  // --- materials -------------------------------------------------------------
  MaterialRef material(const toml::node* n, const std::string& key, std::string_view fallback,
                       const toml::table& parent);
  MaterialRef material_from_text(const std::string& text, const std::string& key, const toml::node* n,
                                 const toml::table& parent);

  // --- sections -----------------------------------------------------------------
  void read_wafer(const toml::table* t, Wafer& w);
  Surface read_surface(const toml::table* t, const std::string& path, MaterialRef* rear_medium);
  RearReflector read_rear_reflector(const toml::table& t, const std::string& key);
  std::vector<Film> read_films(const toml::table& t, const std::string& path);
  RearPattern read_rear_pattern(const toml::table& t, const std::string& path);
  FrontGrid read_front_grid(const toml::table& t, const std::string& path);
  Texture read_texture(const toml::table& surface, const std::string& path, const toml::node* kind_node);
  double texture_number(const toml::node& n, const std::string& key, const geometry::ParamSpec& spec) const;
  void read_illumination(const toml::table* t, Illumination& ill, std::pair<double, double>& spectrum_range,
                         std::string& spectrum_where, std::string& spectrum_shown);
  std::vector<double> read_wavelengths(const toml::node& n, const std::string& key);
  void read_run(const toml::table* t, RunSettings& run);
  void check_coverage(const std::vector<double>& wl) const;
  void record_positions(const toml::node& n, const std::string& key, std::map<std::string, std::string>& out) const;
};

MaterialRef SceneReader::material(const toml::node* n, const std::string& key, std::string_view fallback,
                                  const toml::table& parent) {
  const std::string allowed =
      "a material id (e.g. \"si_green2008\" or a formula id as \"ito_1e20\"), \"air\", a path to a `wavelength_nm,n,k` CSV file or "
      "to a dispersion-formula .toml file, or a "
      "constant index { n = 1.5, k = 0 }";
  if (!n) return material_from_text(std::string(fallback), key, nullptr, parent);
  if (auto* t = n->as_table()) {
    check_keys(*t, key, {"n", "k"});
    const toml::node* nn = t->get("n");
    if (!nn) fail_missing(*t, key + ".n", "the real part n > 0 of a constant index { n = 1.5, k = 0 }");
    MaterialRef ref;
    ref.constant = true;
    ref.n = number(*nn, key + ".n", "a number > 0");
    if (!(ref.n > 0)) fail_value(*nn, key + ".n", "not > 0; allowed: a real part n > 0");
    if (const toml::node* kn = t->get("k")) {
      ref.k = number(*kn, key + ".k", "a number >= 0");
      if (!(ref.k >= 0)) fail_value(*kn, key + ".k", "negative; allowed: an extinction coefficient k >= 0");
    }
    return ref;
  }
  if (!n->is_string())
    fail_value(*n, key, fmt::format("{} where a material was expected; allowed: {}", toml_type_name(*n), allowed));
  return material_from_text(n->as_string()->get(), key, n, parent);
}

MaterialRef SceneReader::material_from_text(const std::string& raw, const std::string& key,
                                            const toml::node* n, const toml::table& parent) {
  const std::string text = trimmed(raw);
  MaterialRef ref;
  Material m;
  try {
    m = find_material(text, dir_);
  } catch (const std::exception& e) {
    if (n) fail_value(*n, key, e.what());
    fail_at(parent.source(), key, fmt::format("default material \"{}\": {}", text, e.what()));
  }
  std::error_code ec;
  if (text == "air" || (is_bare_key(text) && (fs::is_regular_file(materials_dir() / (text + ".csv"), ec) ||
                                               fs::is_regular_file(materials_dir() / "formulas" / (text + ".toml"), ec)))) {
    ref.id_or_path = text;  // "air" (built-in n = 1, k = 0) or a shipped table or formula: keep the id
  } else {
    fs::path p(text);
    if (p.is_relative()) p = dir_ / p;
    ref.id_or_path = fs::absolute(p, ec).lexically_normal().string();
  }
  uses_.push_back({key, n ? where(n->source()) : std::string(),
                   n ? show(*n) : toml_quote(text) + " (default)", std::move(m)});
  return ref;
}

void SceneReader::read_wafer(const toml::table* t, Wafer& w) {
  static const toml::table empty;
  const toml::table& tb = t ? *t : empty;
  check_keys(tb, "wafer", {"material", "thickness", "thickness_convention"});
  w.material = material(tb.get("material"), "wafer.material", "si_green2008", tb);
  if (const toml::node* n = tb.get("thickness"))
    w.thickness_um = length_um_checked(*n, "wafer.thickness", true, "180 um");
  w.thickness_convention =
      word_or(tb, "wafer", "thickness_convention", kConventionWords, ThicknessConvention::mean);
}

Texture SceneReader::read_texture(const toml::table& surface, const std::string& path, const toml::node* kind_node) {
  using geometry::ParamKind;
  using geometry::ParamSpec;
  using geometry::TextureDescriptor;
  const auto descriptors = geometry::texture_descriptors();
  std::string kinds;
  for (const TextureDescriptor* d : descriptors) kinds += (kinds.empty() ? "\"" : ", \"") + std::string(d->kind) + "\"";
  const std::string kind_key = toml_child_key(path, "texture");
  const std::string kind = kind_node ? string_value(*kind_node, kind_key, "one of " + kinds) : "planar";
  const TextureDescriptor* d = geometry::find_texture(kind);
  if (!d) fail_value(*kind_node, kind_key, "unknown word; allowed: one of " + kinds);

  // The tables of other textures are refused, naming the textures they belong to.
  for (const TextureDescriptor* other : descriptors) {
    if (other->table.empty() || other->table == d->table) continue;
    const toml::node* n = surface.get(other->table);
    if (!n) continue;
    std::vector<std::string_view> owners;
    for (const TextureDescriptor* e : descriptors)
      if (e->table == other->table) owners.push_back(e->kind);
    std::string owner_text;
    for (std::size_t i = 0; i < owners.size(); ++i)
      owner_text += fmt::format("{}\"{}\"", i == 0 ? "" : i + 1 == owners.size() ? " or " : ", ", owners[i]);
    const std::string k = toml_child_key(path, other->table);
    fail_at(n->source(), k,
            fmt::format("a [{}] table is allowed only with texture = {} (here texture = \"{}\")", k, owner_text, kind));
  }

  Texture tex;
  tex.kind = kind;
  if (d->table.empty()) return tex;
  static const toml::table empty;
  const std::string tpath = toml_child_key(path, d->table);
  const toml::table* t = sub_table(surface, path, d->table);
  const toml::table& tb = t ? *t : empty;
  std::vector<std::string_view> allowed;
  for (const ParamSpec& p : d->params) allowed.push_back(p.key);
  check_keys(tb, tpath, allowed);

  // In descriptor order, so that a key's condition (a word key) is read before it.
  for (const ParamSpec& p : d->params) {
    const toml::node* n = tb.get(p.key);
    const std::string key = toml_child_key(tpath, p.key);
    const bool applies = geometry::param_applies(p, tex);
    std::string condition;
    if (!p.when_key.empty()) {
      std::string words;
      for (std::size_t i = 0; i < p.when_words.size(); ++i)
        words += fmt::format("{}\"{}\"", i == 0 ? "" : i + 1 == p.when_words.size() ? " or " : ", ", p.when_words[i]);
      condition = fmt::format("{} = {}", p.when_key, words);
    }
    if (n && !applies)
      fail_value(*n, key,
                 fmt::format("'{}' is allowed only with {} (here {} = \"{}\")", p.key, condition, p.when_key,
                             tex.word(p.when_key)));
    if (!applies) continue;
    if (!n) {
      if (p.required)
        fail_missing(tb, key,
                     fmt::format("{}{}, e.g. \"{}\"", p.kind == ParamKind::length_um ? "a length" : "a value",
                                 condition.empty() ? "" : fmt::format(" with {} = \"{}\"", p.when_key,
                                                                      tex.word(p.when_key)),
                                 p.example));
      if (p.kind == ParamKind::word || p.kind == ParamKind::file_path)
        tex.words[std::string(p.key)] = std::string(p.fallback_word);
      else
        tex.numbers[std::string(p.key)] = p.fallback;
      continue;
    }
    if (p.kind == ParamKind::file_path) {
      // Relative to the scene file's folder, as material tables are; kept absolute.
      const std::string allowed = fmt::format("a path to a file, relative to the scene file's folder or absolute, "
                                              "e.g. \"{}\"", p.example);
      const std::string text = trimmed(string_value(*n, key, allowed));
      fs::path file(text);
      if (file.is_relative()) file = dir_ / file;
      std::error_code ec;
      file = fs::absolute(file, ec).lexically_normal();
      if (text.empty() || !fs::is_regular_file(file, ec))
        fail_value(*n, key, fmt::format("no file {}; allowed: {}", file.string(), allowed));
      tex.words[std::string(p.key)] = file.string();
    } else if (p.kind == ParamKind::word) {
      std::string list;
      for (auto w : p.words) list += (list.empty() ? "\"" : ", \"") + std::string(w) + "\"";
      const std::string& w = string_value(*n, key, "one of " + list);
      if (std::find(p.words.begin(), p.words.end(), w) == p.words.end())
        fail_value(*n, key, "unknown word; allowed: one of " + list);
      tex.words[std::string(p.key)] = w;
    } else {
      tex.numbers[std::string(p.key)] = texture_number(*n, key, p);
    }
  }
  if (d->check)
    if (auto problem = d->check(tex)) {
      for (const std::string& k : problem->keys)
        if (const toml::node* n = tb.get(k)) fail_value(*n, toml_child_key(tpath, k), problem->message);
      const std::string& k = problem->keys.front();
      fail_at(tb.source(), toml_child_key(tpath, k), fmt::format("default {} (set '{}')", problem->message, k));
    }
  return tex;
}

double SceneReader::texture_number(const toml::node& n, const std::string& key, const geometry::ParamSpec& p) const {
  using geometry::ParamKind;
  double v = 0;
  std::string unit, what;
  switch (p.kind) {
    case ParamKind::length_um:
      v = length_um(n, key);
      unit = " um";
      what = "a length";
      break;
    case ParamKind::angle_deg:
      v = angle_deg(n, key);
      unit = " deg";
      what = "an angle";
      break;
    case ParamKind::number:
      v = number(n, key, fmt::format("a number, e.g. {}", p.example));
      what = "a number";
      break;
    case ParamKind::integer:
      v = double(integer(n, key, std::int64_t(std::max(p.lo, -9e15)), std::int64_t(std::min(p.hi, 9e15)),
                         fmt::format("an integer >= {}", format_number(p.lo))));
      return v;
    case ParamKind::word:
    case ParamKind::file_path: break;
  }
  const bool lo_ok = p.lo_open ? v > p.lo : v >= p.lo;
  const bool hi_ok = p.hi_open ? v < p.hi : v <= p.hi;
  if (lo_ok && hi_ok) return v;
  // (an open end of the range is never written: it is infinite)
  const auto bound = [&](double b) { return std::isfinite(b) ? format_number(b) + unit : std::string(); };
  const std::string lo = bound(p.lo), hi = bound(p.hi);
  std::string allowed;
  if (std::isinf(p.hi))
    allowed = fmt::format("{} {} {}, e.g. \"{}\"", what, p.lo_open ? ">" : ">=", lo, p.example);
  else
    allowed = fmt::format("{} {} {} {} {} (e.g. \"{}\")", lo, p.lo_open ? "<" : "<=", p.key, p.hi_open ? "<" : "<=",
                          hi, p.example);
  const char* problem = !lo_ok && p.lo == 0 ? (v < 0 ? "negative" : "zero") : "out of range";
  fail_value(n, key, fmt::format("{}; allowed: {}", problem, allowed));
}

Surface SceneReader::read_surface(const toml::table* t, const std::string& path, MaterialRef* rear_medium) {
  static const toml::table empty;
  const toml::table& tb = t ? *t : empty;
  std::vector<std::string_view> allowed = {"texture", "conformality", "scattering", "diffuse_fraction", "films",
                                           "interface"};
  for (const geometry::TextureDescriptor* d : geometry::texture_descriptors())
    if (!d->table.empty() && std::find(allowed.begin(), allowed.end(), d->table) == allowed.end())
      allowed.push_back(d->table);
  if (rear_medium) {
    allowed.push_back("medium");
    allowed.push_back("pattern");
  } else {
    allowed.push_back("grid");
  }
  check_keys(tb, path, allowed);

  Surface s;
  s.texture = read_texture(tb, path, tb.get("texture"));
  s.conformality = word_or(tb, path, "conformality", kConformalityWords, Conformality::conformal);
  if (s.conformality == Conformality::directional) {
    // one film table per distinct facet tilt: a rounded surface (or one
    // with a spread of facet angles) has as many tilts as triangles
    const auto& t = s.texture;
    const bool rounded = (t.numbers.count("tip_radius") && t.number("tip_radius") > 0) ||
                         (t.numbers.count("valley_radius") && t.number("valley_radius") > 0) ||
                         (t.words.count("facet_angle_distribution") && t.word("facet_angle_distribution") != "fixed");
    if (rounded)
      fail_value(*tb.get("conformality"), path + ".conformality",
                 "directional films need a few distinct facet tilts, and this texture is rounded or has a spread "
                 "of facet angles; allowed: \"conformal\" here, or radii 0 and facet_angle_distribution = "
                 "\"fixed\"");
  }
  s.scattering = word_or(tb, path, "scattering", kScatteringWords, SurfaceScattering::specular);
  s.interface_model = word_or(tb, path, "interface", kInterfaceWords, InterfaceModel::films);

  const std::string df_key = path + ".diffuse_fraction";
  const toml::node* df = tb.get("diffuse_fraction");
  if (s.scattering == SurfaceScattering::mixed) {
    if (!df) fail_missing(tb, df_key, "a number in [0, 1] with scattering = \"mixed\"");
    s.diffuse_fraction = number(*df, df_key, "a number in [0, 1]");
    if (!(s.diffuse_fraction >= 0 && s.diffuse_fraction <= 1))
      fail_value(*df, df_key, "out of range; allowed: a number in [0, 1]");
  } else if (df) {
    fail_value(*df, df_key,
               fmt::format("allowed only with scattering = \"mixed\" (here scattering = \"{}\")",
                           word_of(s.scattering, kScatteringWords)));
  }

  s.films = read_films(tb, path);
  if (!rear_medium)
    if (const toml::table* gt = sub_table(tb, path, "grid")) grid_ = read_front_grid(*gt, path + ".grid");
  if (rear_medium) {
    const toml::node* mn = tb.get("medium");
    if (mn && mn->is_string() && mn->as_string()->get() == "perfect_mirror") {
      // R = 1 at every angle; films in front of it would never be reached by
      // a consistent model, so they are refused.
      if (!s.films.empty())
        fail_value(*mn, path + ".medium",
                   "cannot have films in front of it; allowed: \"perfect_mirror\" without [[rear.films]], or a "
                   "material");
      if (s.interface_model == InterfaceModel::ideal)
        fail_value(*mn, path + ".medium", "a perfect mirror has no ideal interface; allowed: interface = \"films\"");
      rear_mirror_ = true;
      *rear_medium = material(nullptr, path + ".medium", "air", tb);
    } else if (mn && mn->is_table() && mn->as_table()->contains("reflectance")) {
      if (!s.films.empty())
        fail_value(*mn, path + ".medium",
                   "a measured reflectance describes the whole rear and cannot have films in front of it; "
                   "allowed: { reflectance = ... } without [[rear.films]], or a material");
      if (s.interface_model == InterfaceModel::ideal)
        fail_value(*mn, path + ".medium", "a measured reflectance has no ideal interface; allowed: interface = \"films\"");
      if (s.scattering != SurfaceScattering::specular)
        fail_value(*mn, path + ".medium",
                   "a measured reflectance sets its own scattering with diffuse_fraction; allowed: rear.scattering "
                   "= \"specular\" (the default) with it");
      reflector_ = read_rear_reflector(*mn->as_table(), path + ".medium");
      *rear_medium = material(nullptr, path + ".medium", "air", tb);
    } else {
      *rear_medium = material(mn, path + ".medium", "air", tb);
    }
    if (const toml::table* pt = sub_table(tb, path, "pattern")) {
      if (s.interface_model == InterfaceModel::ideal)
        fail_at(pt->source(), path + ".pattern",
                "a patterned rear has films and media in each region; allowed: rear.interface = \"films\" with it");
      if (rear_mirror_)
        fail_at(pt->source(), path + ".pattern",
                "the rear around the openings is a perfect mirror; allowed: a material or a measured reflectance "
                "as rear.medium with [rear.pattern]");
      pattern_ = read_rear_pattern(*pt, path + ".pattern");
    }
  }
  return s;
}

std::vector<Film> SceneReader::read_films(const toml::table& tb, const std::string& path) {
  std::vector<Film> films;
  if (const toml::node* fn = tb.get("films")) {
    const std::string fk = path + ".films";
    const toml::array* arr = fn->as_array();
    if (!arr)
      fail_value(*fn, fk,
                 fmt::format("{} where an array of tables was expected; allowed: [[{}]] tables with material "
                             "and thickness",
                             toml_type_name(*fn), fk));
    for (std::size_t i = 0; i < arr->size(); ++i) {
      const toml::node& e = *arr->get(i);
      const std::string ek = fmt::format("{}[{}]", fk, i);
      const toml::table* ft = e.as_table();
      if (!ft)
        fail_value(e, ek, fmt::format("{} where a table was expected; allowed: {{ material = ..., thickness = ... }}",
                                      toml_type_name(e)));
      check_keys(*ft, ek, {"material", "thickness"});
      Film film;
      const toml::node* m = ft->get("material");
      if (!m) fail_missing(*ft, ek + ".material", "the film's material, e.g. \"sinx_pecvd_n209\"");
      film.material = material(m, ek + ".material", "", *ft);
      const toml::node* th = ft->get("thickness");
      if (!th) fail_missing(*ft, ek + ".thickness", "the film's thickness as deposited on a planar wafer, e.g. \"75 nm\"");
      film.thickness_nm = length_nm(*th, ek + ".thickness");
      if (!(film.thickness_nm >= 0))
        fail_value(*th, ek + ".thickness", "negative; allowed: a thickness >= 0, e.g. \"75 nm\"");
      films.push_back(std::move(film));
    }
  }
  return films;
}

FrontGrid SceneReader::read_front_grid(const toml::table& t, const std::string& path) {
  check_keys(t, path, {"finger_shape", "finger_width", "finger_height", "finger_pitch", "busbar_pitch",
                       "busbar_width", "material", "scattering", "diffuse_fraction"});
  FrontGrid grid;
  FrontGridGeometry& g = grid.geometry;
  g.shape = word_or(t, path, "finger_shape", kFingerShapeWords, FingerShape::rectangle);
  const auto required_length = [&](const char* key, const char* example) {
    const toml::node* n = t.get(key);
    if (!n) fail_missing(t, path + "." + key, fmt::format("a length > 0, e.g. \"{}\"", example));
    return length_um_checked(*n, path + "." + key, true, example);
  };
  g.finger_width_um = required_length("finger_width", "40 um");
  const bool wire = g.shape == FingerShape::round_wire;
  if (wire) {
    if (const toml::node* n = t.get("finger_height"))
      fail_value(*n, path + ".finger_height",
                 "a round wire's height is its diameter (finger_width); allowed: no finger_height with "
                 "finger_shape = \"round_wire\"");
    g.finger_height_um = g.finger_width_um;
  } else {
    g.finger_height_um = required_length("finger_height", "15 um");
  }
  const toml::node* pn = t.get("finger_pitch");
  g.finger_pitch_um = required_length("finger_pitch", "1.5 mm");
  if (!(g.finger_pitch_um > g.finger_width_um))
    fail_value(*pn, path + ".finger_pitch",
               fmt::format("not larger than finger_width ({} µm); allowed: a pitch > finger_width",
                           format_number(g.finger_width_um)));
  const toml::node* bp = t.get("busbar_pitch");
  const toml::node* bw = t.get("busbar_width");
  if (bp || bw) {
    if (!bp) fail_missing(t, path + ".busbar_pitch", "the busbar pitch (a length > busbar_width) with busbar_width");
    if (!bw) fail_missing(t, path + ".busbar_width", "the busbar width (a length > 0) with busbar_pitch");
    g.busbar_pitch_um = length_um_checked(*bp, path + ".busbar_pitch", true, "39 mm");
    g.busbar_width_um = length_um_checked(*bw, path + ".busbar_width", true, "1 mm");
    if (!(g.busbar_pitch_um > g.busbar_width_um))
      fail_value(*bp, path + ".busbar_pitch",
                 fmt::format("not larger than busbar_width ({} µm); allowed: a pitch > busbar_width",
                             format_number(g.busbar_width_um)));
  }
  const toml::node* mn = t.get("material");
  if (!mn) fail_missing(t, path + ".material", "the metal's optical constants, e.g. \"ag_mcpeak2015\"");
  grid.metal = material(mn, path + ".material", "", t);
  grid.scattering = word_or(t, path, "scattering", kScatteringWords, SurfaceScattering::specular);
  const toml::node* df = t.get("diffuse_fraction");
  if (grid.scattering == SurfaceScattering::mixed) {
    if (!df) fail_missing(t, path + ".diffuse_fraction", "a number in [0, 1] with scattering = \"mixed\"");
    grid.diffuse_fraction = number(*df, path + ".diffuse_fraction", "a number in [0, 1]");
    if (!(grid.diffuse_fraction >= 0 && grid.diffuse_fraction <= 1))
      fail_value(*df, path + ".diffuse_fraction", "out of range; allowed: a number in [0, 1]");
  } else if (df) {
    fail_value(*df, path + ".diffuse_fraction", "allowed only with scattering = \"mixed\"");
  }
  return grid;
}

RearPattern SceneReader::read_rear_pattern(const toml::table& t, const std::string& path) {
  check_keys(t, path, {"layout", "pitch", "width", "diameter", "lattice", "films", "medium"});
  RearPattern p;
  RearPatternGeometry& g = p.geometry;
  const toml::node* ln = t.get("layout");
  if (!ln) fail_missing(t, path + ".layout", "\"lines\" or \"dots\"");
  g.layout = word(*ln, path + ".layout", kPatternLayoutWords);
  const toml::node* pn = t.get("pitch");
  if (!pn) fail_missing(t, path + ".pitch", "the pattern's pitch, a length > 0, e.g. \"1 mm\"");
  g.pitch_um = length_um_checked(*pn, path + ".pitch", true, "1 mm");
  const bool lines = g.layout == RearPatternLayout::lines;
  const std::string size_key = lines ? "width" : "diameter";
  const std::string other_key = lines ? "diameter" : "width";
  if (const toml::node* o = t.get(other_key))
    fail_value(*o, path + "." + other_key,
               fmt::format("not a key of layout = \"{}\"; allowed: {} (lines: width; dots: diameter, lattice)",
                           lines ? "lines" : "dots", size_key));
  const toml::node* sn = t.get(size_key);
  if (!sn)
    fail_missing(t, path + "." + size_key,
                 fmt::format("the {} of the openings, a length in [0, pitch], e.g. \"{}\"",
                             lines ? "width" : "diameter", lines ? "40 um" : "60 um"));
  g.size_um = length_um_checked(*sn, path + "." + size_key, false, lines ? "40 um" : "60 um");
  if (g.size_um > g.pitch_um)
    fail_value(*sn, path + "." + size_key,
               fmt::format("larger than the pitch ({} µm); allowed: a length in [0, pitch]", format_number(g.pitch_um)));
  if (lines) {
    if (const toml::node* o = t.get("lattice"))
      fail_value(*o, path + ".lattice", "allowed only with layout = \"dots\"");
  } else {
    g.lattice = word_or(t, path, "lattice", kDotLatticeWords, DotLattice::square);
  }
  p.films = read_films(t, path);
  const toml::node* mn = t.get("medium");
  if (mn && mn->is_table() && mn->as_table()->contains("reflectance")) {
    if (!p.films.empty())
      fail_value(*mn, path + ".medium",
                 "a measured reflectance describes the whole rear and cannot have films in front of it; "
                 "allowed: { reflectance = ... } without [[" + path + ".films]], or a material");
    const std::string keep = reflector_where_;
    p.reflector = read_rear_reflector(*mn->as_table(), path + ".medium");
    pattern_reflector_where_ = reflector_where_;
    reflector_where_ = keep;
    p.medium = material(nullptr, path + ".medium", "air", t);
  } else {
    p.medium = material(mn, path + ".medium", "air", t);
  }
  return p;
}

RearReflector SceneReader::read_rear_reflector(const toml::table& t, const std::string& key) {
  check_keys(t, key, {"reflectance", "diffuse_fraction"});
  RearReflector r;
  const toml::node& rn = *t.get("reflectance");
  if (rn.is_string()) {
    fs::path p = rn.as_string()->get();
    if (p.is_relative()) p = dir_ / p;
    std::error_code ec;
    if (!fs::is_regular_file(p, ec))
      fail_value(rn, key + ".reflectance",
                 fmt::format("no file {}; allowed: a number in [0, 1] or a CSV of wavelength_nm,reflectance", p.string()));
    try {
      read_reflectance_csv(p, r);
    } catch (const std::runtime_error& e) {
      fail_value(rn, key + ".reflectance", e.what());
    }
    r.file = p.lexically_normal();
  } else {
    r.constant_reflectance = number(rn, key + ".reflectance", "a number in [0, 1] or a CSV file name");
    if (!(r.constant_reflectance >= 0 && r.constant_reflectance <= 1))
      fail_value(rn, key + ".reflectance", "out of range; allowed: a number in [0, 1] or a CSV file name");
  }
  if (const toml::node* df = t.get("diffuse_fraction")) {
    r.diffuse_fraction = number(*df, key + ".diffuse_fraction", "a number in [0, 1]");
    if (!(r.diffuse_fraction >= 0 && r.diffuse_fraction <= 1))
      fail_value(*df, key + ".diffuse_fraction", "out of range; allowed: a number in [0, 1]");
  }
  reflector_where_ = where(rn.source());
  return r;
}

std::vector<double> SceneReader::read_wavelengths(const toml::node& n, const std::string& key) {
  const auto positive = [&](const toml::node& e, const std::string& k) {
    const double v = length_nm(e, k);
    if (!(v > 0)) fail_value(e, k, "not > 0; allowed: a wavelength > 0, e.g. \"600 nm\"");
    return v;
  };
  std::vector<double> wl;
  if (n.is_string()) {
    wl.push_back(positive(n, key));
  } else if (auto* a = n.as_array()) {
    if (a->empty()) fail_value(n, key, "empty; allowed: at least one wavelength, e.g. [\"600 nm\", \"900 nm\"]");
    if (a->size() > kMaxWavelengths)
      fail_value(n, key, fmt::format("{} wavelengths; allowed: at most {}", a->size(), kMaxWavelengths));
    for (std::size_t i = 0; i < a->size(); ++i) {
      const toml::node& e = *a->get(i);
      const std::string k = fmt::format("{}[{}]", key, i);
      const double v = positive(e, k);
      if (!wl.empty() && !(v > wl.back()))
        fail_value(e, k,
                   fmt::format("not greater than the previous wavelength {}; allowed: strictly increasing "
                               "wavelengths",
                               show(*a->get(i - 1))));
      wl.push_back(v);
    }
  } else if (auto* t = n.as_table()) {
    check_keys(*t, key, {"from", "to", "step"});
    for (std::string_view req : {"from", "to", "step"})
      if (!t->get(req))
        fail_missing(*t, toml_child_key(key, req), "from, to and step, e.g. { from = \"300 nm\", to = \"1200 nm\", step = \"10 nm\" }");
    const toml::node &nf = *t->get("from"), &nt = *t->get("to"), &ns = *t->get("step");
    const double from = positive(nf, key + ".from"), to = positive(nt, key + ".to"),
                 step = positive(ns, key + ".step");
    if (!(to > from))
      fail_value(nt, key + ".to",
                 fmt::format("not greater than from = {}; allowed: to > from (a single wavelength is written "
                             "as one string, e.g. \"1000 nm\")",
                             show(nf)));
    const double steps = (to - from) / step;
    if (steps + 1 > static_cast<double>(kMaxWavelengths))
      fail_value(ns, key + ".step",
                 fmt::format("gives {:.0f} wavelengths; allowed: at most {}", steps + 1, kMaxWavelengths));
    const double whole = std::round(steps);
    if (std::abs(steps - whole) > kStepTolerance)
      fail_value(ns, key + ".step",
                 fmt::format("(to - from)/step = {} is not a whole number; allowed: a step that divides "
                             "to - from = {} nm",
                             format_number(steps), format_number(to - from)));
    const auto count = static_cast<std::size_t>(whole);
    for (std::size_t i = 0; i < count; ++i) wl.push_back(from + static_cast<double>(i) * step);
    wl.push_back(to);  // exactly `to`, whatever the rounding of from + count·step
  } else {
    fail_value(n, key,
               fmt::format("{} where wavelengths were expected; allowed: \"1000 nm\", [\"600 nm\", \"900 nm\"] or "
                           "{{ from = \"300 nm\", to = \"1200 nm\", step = \"10 nm\" }}",
                           toml_type_name(n)));
  }
  return wl;
}

void SceneReader::read_illumination(const toml::table* t, Illumination& ill,
                                    std::pair<double, double>& spectrum_range, std::string& spectrum_where,
                                    std::string& spectrum_shown) {
  static const toml::table empty;
  const toml::table& tb = t ? *t : empty;
  check_keys(tb, "illumination", {"spectrum", "kind", "polar_angle", "azimuth", "polarization", "wavelengths"});

  // Spectrum: a built-in name or a file.
  Spectrum spec;
  if (const toml::node* n = tb.get("spectrum")) {
    const std::string allowed =
        "\"AM1.5G\", \"AM1.5D\", \"AM0\" (ASTM G173-03) or a path to a `wavelength_nm,irradiance_W_m2_nm` CSV file";
    const std::string text = trimmed(string_value(*n, "illumination.spectrum", allowed));
    spectrum_where = where(n->source());
    spectrum_shown = show(*n);
    bool builtin = false;
    for (const auto& [w, v] : kSpectrumWords)
      if (upper(text) == w) {
        ill.spectrum = v;
        builtin = true;
      }
    try {
      if (builtin) {
        spec = builtin_spectrum(std::string(word_of(ill.spectrum, kSpectrumWords)));
      } else {
        fs::path p(text);
        if (p.is_relative()) p = dir_ / p;
        std::error_code ec;
        p = fs::absolute(p, ec).lexically_normal();
        if (text.empty() || !fs::is_regular_file(p, ec))
          fail_value(*n, "illumination.spectrum",
                     fmt::format("not a built-in spectrum and no file {}; allowed: {}", p.string(), allowed));
        ill.spectrum = SpectrumKind::file;
        ill.spectrum_file = p;
        spec = load_spectrum_file(p);
      }
    } catch (const SceneError&) {
      throw;
    } catch (const std::exception& e) {
      fail_value(*n, "illumination.spectrum", e.what());
    }
  } else {
    spectrum_where = where(tb.source());
    spectrum_shown = "\"AM1.5G\" (default)";
    try {
      spec = builtin_spectrum("AM1.5G");
    } catch (const std::exception& e) {
      fail_at(tb.source(), "illumination.spectrum", fmt::format("default \"AM1.5G\": {}", e.what()));
    }
  }
  spectrum_range = {spec.wavelength_nm.front(), spec.wavelength_nm.back()};

  ill.kind = word_or(tb, "illumination", "kind", kIlluminationWords, IlluminationKind::collimated);
  for (std::string_view k : {"polar_angle", "azimuth"}) {
    const toml::node* n = tb.get(k);
    if (n && ill.kind != IlluminationKind::collimated)
      fail_value(*n, toml_child_key("illumination", k),
                 "allowed only with kind = \"collimated\" (here kind = \"diffuse\": light from the whole "
                 "hemisphere has no direction)");
  }
  if (const toml::node* n = tb.get("polar_angle")) {
    ill.polar_rad = angle_rad(*n, "illumination.polar_angle");
    const double deg = angle_deg(*n, "illumination.polar_angle");  // compared in degrees whatever the unit
    if (!(ill.polar_rad >= 0 && deg >= 0 && deg <= kMaxPolarAngleDeg))
      fail_value(*n, "illumination.polar_angle",
                 fmt::format("out of range; allowed: 0 deg <= polar angle <= {:g} deg (from the wafer normal). "
                             "Nearer to grazing, light skims over the texture for tan(polar angle) times its "
                             "height before it meets a facet, so tracing becomes very slow and photons are lost, "
                             "while the light reaching the wafer vanishes as cos(polar angle)",
                             kMaxPolarAngleDeg));
  }
  if (const toml::node* n = tb.get("azimuth")) {
    // Reduced to [0, 2π). Values already inside are kept bit for bit (so a
    // resolved file reads back exactly); others are reduced in degrees, so
    // that "-30 deg" becomes exactly what "330 deg" gives.
    double a = angle_rad(*n, "illumination.azimuth");
    if (!(a >= 0 && a < (2 * std::numbers::pi))) {
      double deg = std::fmod(angle_deg(*n, "illumination.azimuth"), 360.0);
      if (deg < 0) deg += 360.0;
      a = deg * std::numbers::pi / 180;  // the same arithmetic as parse_angle_rad("... deg")
      if (!(a < (2 * std::numbers::pi))) a = 0;      // -tiny + 360 rounds up to 360
    }
    ill.azimuth_rad = a;
  }
  ill.polarization = word_or(tb, "illumination", "polarization", kPolarizationWords, PolarizationKind::unpolarized);

  if (const toml::node* n = tb.get("wavelengths")) {
    ill.wavelengths_nm = read_wavelengths(*n, "illumination.wavelengths");
    wavelengths_where_ = where(n->source());
  } else {
    for (int w = 300; w <= 1200; w += 10) ill.wavelengths_nm.push_back(w);
    wavelengths_where_ = where(tb.source());
  }
}

void SceneReader::read_run(const toml::table* t, RunSettings& run) {
  static const toml::table empty;
  const toml::table& tb = t ? *t : empty;
  check_keys(tb, "run",
             {"photons", "seed", "max_bounces", "randomize_lateral", "threads", "depth_histograms", "target_jg_error",
              "polarization"});
  if (const toml::node* n = tb.get("photons"))
    run.photons = static_cast<std::uint64_t>(
        integer(*n, "run.photons", 1, std::int64_t(kMaxPhotonsPerWavelength),
                fmt::format("an integer from 1 to {} per wavelength ({})", kMaxPhotonsPerWavelength,
                            kMaxPhotonsReason)));
  if (const toml::node* n = tb.get("seed"))
    run.seed = static_cast<std::uint64_t>(integer(*n, "run.seed", 0, INT64_MAX, "an integer >= 0"));
  if (const toml::node* n = tb.get("max_bounces"))
    run.max_bounces = static_cast<int>(integer(*n, "run.max_bounces", 1, INT_MAX, fmt::format("an integer in [1, {}]", INT_MAX)));
  if (const toml::node* n = tb.get("randomize_lateral")) run.randomize_lateral = boolean(*n, "run.randomize_lateral");
  run.track_polarization = word_or(tb, "run", "polarization", kPolarizationTrackingWords, true);
  if (const toml::node* n = tb.get("threads"))
    run.threads = static_cast<int>(
        integer(*n, "run.threads", 0, INT_MAX, fmt::format("an integer in [0, {}] (0 = all cores)", INT_MAX)));
  if (const toml::node* n = tb.get("depth_histograms")) run.depth_histograms = boolean(*n, "run.depth_histograms");
  if (const toml::node* n = tb.get("target_jg_error")) {
    run.target_jg_error =
        quantity(*n, "run.target_jg_error", parse_current_mA_cm2, "mA/cm2", "mA/cm2, mA/cm^2, mA/cm², A/m2, A/m^2, A/m²");
    if (!(run.target_jg_error > 0))
      fail_value(*n, "run.target_jg_error", "not > 0; allowed: a current density > 0, e.g. \"0.02 mA/cm2\"");
  }
}

void SceneReader::check_coverage(const std::vector<double>& wl) const {
  for (const MaterialUse& u : uses_) {
    const double lo = u.material.min_wavelength_nm(), hi = u.material.max_wavelength_nm();
    for (double w : wl) {
      if (w >= lo && w <= hi) continue;
      throw SceneError(fmt::format(
          "{}: key '{}': value {}: material '{}' covers {}–{} nm, but the run wavelength {} "
          "(illumination.wavelengths{}) lies outside; allowed: a material covering every run wavelength, "
          "or run wavelengths inside {}–{} nm",
          u.where.empty() ? wavelengths_where_ : u.where, u.key, u.shown, u.material.name, format_number(lo),
          format_number(hi), format_length_nm(w), u.where.empty() ? "" : ", " + wavelengths_where_,
          format_number(lo), format_number(hi)));
    }
  }
}

/// Where each value of the file stands, by dotted key ("front.films[0].thickness").
void SceneReader::record_positions(const toml::node& n, const std::string& key,
                                   std::map<std::string, std::string>& out) const {
  if (const toml::table* t = n.as_table()) {
    for (auto&& [k, v] : *t) record_positions(v, toml_child_key(key, k.str()), out);
  } else if (const toml::array* a = n.as_array()) {
    for (std::size_t i = 0; i < a->size(); ++i)
      if (a->get(i)->is_table()) record_positions(*a->get(i), fmt::format("{}[{}]", key, i), out);
    out[key] = where(n.source());
  } else {
    out[key] = where(n.source());
  }
}

Scene SceneReader::read(const toml::table& root, const std::set<std::string>& ignored) {
  if (!ignored.count("sweep"))
    if (const toml::node* n = root.get("sweep"))
      fail_at(n->source(), "sweep",
              "a [sweep] table describes a parameter sweep; run this file with the sweep command, not as a "
              "single scene (or remove [sweep])");
  check_keys(root, "", {"scene", "ambient", "wafer", "front", "rear", "illumination", "run"}, ignored);

  Scene s;
  s.file = file_;
  s.name = file_.stem().string();
  if (const toml::table* t = sub_table(root, "", "scene")) {
    check_keys(*t, "scene", {"name"});
    if (const toml::node* n = t->get("name")) {
      s.name = string_value(*n, "scene.name", "a non-empty string");
      if (trimmed(s.name).empty()) fail_value(*n, "scene.name", "empty; allowed: a non-empty string");
    }
  }

  {
    static const toml::table empty;
    const toml::table* t = sub_table(root, "", "ambient");
    const toml::table& tb = t ? *t : empty;
    check_keys(tb, "ambient", {"material"});
    s.ambient = material(tb.get("material"), "ambient.material", "air", tb);
  }
  read_wafer(sub_table(root, "", "wafer"), s.wafer);
  s.front = read_surface(sub_table(root, "", "front"), "front", nullptr);
  s.rear = read_surface(sub_table(root, "", "rear"), "rear", &s.rear_medium);
  s.rear_perfect_mirror = rear_mirror_;
  s.rear_reflector = reflector_;
  s.rear_pattern = pattern_;
  s.front_grid = grid_;

  std::pair<double, double> spectrum_range;
  std::string spectrum_where, spectrum_shown;
  read_illumination(sub_table(root, "", "illumination"), s.illumination, spectrum_range, spectrum_where,
                    spectrum_shown);
  read_run(sub_table(root, "", "run"), s.run);

  const std::vector<double>& wl = s.illumination.wavelengths_nm;
  for (double w : wl)
    if (w < spectrum_range.first || w > spectrum_range.second)
      throw SceneError(fmt::format(
          "{}: key 'illumination.spectrum': value {}: the spectrum covers {}–{} nm, but the run wavelength {} "
          "(illumination.wavelengths, {}) lies outside; allowed: run wavelengths inside {}–{} nm",
          spectrum_where, spectrum_shown, format_number(spectrum_range.first), format_number(spectrum_range.second),
          format_length_nm(w), wavelengths_where_, format_number(spectrum_range.first),
          format_number(spectrum_range.second)));
  check_coverage(wl);
  if (reflector_ && !reflector_->wavelength_nm.empty())
    for (double w : wl)
      if (w < reflector_->wavelength_nm.front() || w > reflector_->wavelength_nm.back())
        throw SceneError(fmt::format(
            "{}: key 'rear.medium.reflectance': value \"{}\": the reflectance covers {}–{} nm, but the run "
            "wavelength {} lies outside; allowed: run wavelengths inside {}–{} nm",
            reflector_where_, reflector_->file.string(), format_number(reflector_->wavelength_nm.front()),
            format_number(reflector_->wavelength_nm.back()), format_length_nm(w),
            format_number(reflector_->wavelength_nm.front()), format_number(reflector_->wavelength_nm.back())));
  if (pattern_ && pattern_->reflector && !pattern_->reflector->wavelength_nm.empty())
    for (double w : wl)
      if (w < pattern_->reflector->wavelength_nm.front() || w > pattern_->reflector->wavelength_nm.back())
        throw SceneError(fmt::format(
            "{}: key 'rear.pattern.medium.reflectance': value \"{}\": the reflectance covers {}–{} nm, but the run "
            "wavelength {} lies outside; allowed: run wavelengths inside {}–{} nm",
            pattern_reflector_where_, pattern_->reflector->file.string(),
            format_number(pattern_->reflector->wavelength_nm.front()),
            format_number(pattern_->reflector->wavelength_nm.back()), format_length_nm(w),
            format_number(pattern_->reflector->wavelength_nm.front()),
            format_number(pattern_->reflector->wavelength_nm.back())));
  record_positions(root, "", s.positions);
  return s;
}

}  // namespace

toml::table read_scene_table(const fs::path& file) {
  std::error_code ec;
  if (!fs::is_regular_file(file, ec))
    throw SceneError(fmt::format("{}: cannot read the scene file: {}", file.string(),
                                 fs::exists(file, ec) ? "not a regular file" : "no such file"));
  std::ifstream probe(file, std::ios::binary);
  if (!probe) throw SceneError(fmt::format("cannot read {}: {}", file.string(), io_error_text(errno)));
  probe.close();
  try {
    return toml::parse_file(file.string());
  } catch (const toml::parse_error& e) {
    const auto& b = e.source().begin;
    throw SceneError(fmt::format("{}:{}:{}: TOML syntax error: {}", file.string(), b.line, b.column,
                                 e.description()));
  }
}

Scene scene_from_table(const toml::table& t, const fs::path& file, const std::set<std::string>& ignored_top_level) {
  return SceneReader(file).read(t, ignored_top_level);
}

Scene parse_scene_file(const fs::path& file) { return scene_from_table(read_scene_table(file), file); }

}  // namespace lumtrap
