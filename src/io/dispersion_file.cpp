// Dispersion-formula TOML files -> DispersionFormula. See dispersion_file.hpp
// and materials/formulas/README.md.
#include "io/dispersion_file.hpp"

#include <fmt/format.h>
#include <toml++/toml.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <fstream>
#include <string>
#include <string_view>
#include <system_error>
#include <utility>

#include "io/toml_text.hpp"
#include "io/units.hpp"
#include "optics/material.hpp"

namespace lumtrap {
namespace fs = std::filesystem;

namespace {

// ---------------------------------------------------------------------------
// Units of the value strings.

struct UnitWord {
  std::string_view word;
  double factor;  ///< value in the family's base unit = number · factor
};

struct UnitFamily {
  std::string_view what;     ///< "an energy"
  std::string_view example;  ///< "3.6 eV"
  std::vector<UnitWord> units;
};

std::string allowed_units(const UnitFamily& f) {
  std::string s;
  for (const UnitWord& u : f.units) s += (s.empty() ? "" : ", ") + std::string(u.word);
  return fmt::format("{} with one of the units {} (e.g. \"{}\")", f.what, s, f.example);
}

const UnitFamily kEnergy{"an energy", "3.6 eV", {{"eV", 1.0}, {"meV", 1e-3}}};
const UnitFamily kArea{"an area in µm² (or nm²)",
                       "0.0047 um2",
                       {{"um2", 1.0},
                        {"um^2", 1.0},
                        {"\xC2\xB5m2", 1.0},
                        {"\xC2\xB5m\xC2\xB2", 1.0},
                        {"nm2", 1e-6},
                        {"nm^2", 1e-6},
                        {"nm\xC2\xB2", 1e-6}}};
const UnitFamily kQuartic{"a fourth power of length in µm⁴ (or nm⁴)",
                          "0.0001 um4",
                          {{"um4", 1.0},
                           {"um^4", 1.0},
                           {"\xC2\xB5m4", 1.0},
                           {"\xC2\xB5m\xE2\x81\xB4", 1.0},
                           {"nm4", 1e-12},
                           {"nm^4", 1e-12},
                           {"nm\xE2\x81\xB4", 1e-12}}};
const UnitFamily kDensity{"a density in cm⁻³",
                          "1e20 cm-3",
                          {{"cm-3", 1.0}, {"cm^-3", 1.0}, {"cm\xE2\x81\xBB\xC2\xB3", 1.0}, {"/cm3", 1.0}}};
const UnitFamily kMobility{"a mobility",
                           "35 cm2/Vs",
                           {{"cm2/Vs", 1.0}, {"cm^2/Vs", 1.0}, {"cm\xC2\xB2/Vs", 1.0}, {"cm2/(V s)", 1.0}}};

std::string_view trim(std::string_view s) { return trim_blanks(s); }

/// Number + unit of `family`; throws UnitError (message starts with `value "..."`).
double parse_in(std::string_view text, const UnitFamily& f) {
  const std::string quoted = "value \"" + std::string(text) + "\"";
  const std::string allowed = "; allowed: " + allowed_units(f);
  std::string_view s = trim(text);
  std::string_view num = s;
  bool negative = false;
  if (!num.empty() && (num.front() == '+' || num.front() == '-')) {
    negative = num.front() == '-';
    num.remove_prefix(1);
  }
  double value = 0.0;
  const auto [end, ec] = std::from_chars(num.data(), num.data() + num.size(), value,
                                         std::chars_format::general);
  if (ec != std::errc() || end == num.data() || !std::isfinite(value))
    throw UnitError(quoted + ": does not start with a finite number" + allowed);
  const std::string_view unit = trim(std::string_view(end, num.data() + num.size() - end));
  if (unit.empty()) throw UnitError(quoted + ": a bare number; write the unit" + allowed);
  for (const UnitWord& u : f.units)
    if (unit == u.word) return (negative ? -value : value) * u.factor;
  throw UnitError(quoted + ": unit \"" + std::string(unit) + "\" is not accepted" + allowed);
}

// ---------------------------------------------------------------------------
// Words

const std::vector<std::string_view> kModels = {"cauchy", "sellmeier", "tauc_lorentz",
                                               "drude", "oscillator_sum", "doped_silicon"};


std::string join(const std::vector<std::string_view>& items) {
  std::string s;
  for (std::string_view i : items) s += (s.empty() ? "" : ", ") + std::string(i);
  return s;
}



// ---------------------------------------------------------------------------
// The reader

class Reader {
 public:
  explicit Reader(fs::path file) : file_(std::move(file)) {}

  DispersionFormula read(const toml::table& root, std::string source);

 private:
  fs::path file_;

  std::string where(const toml::source_region& r) const { return toml_where(file_, r); }
  [[noreturn]] void fail_at(const toml::source_region& r, const std::string& key,
                            const std::string& what) const {
    throw DispersionFileError(fmt::format("{}: key '{}': {}", where(r), key, what));
  }
  [[noreturn]] void fail_value(const toml::node& n, const std::string& key,
                               const std::string& what) const {
    fail_at(n.source(), key, "value " + toml_value_text(n, 6) + ": " + what);
  }

  void check_keys(const toml::table& t, const std::string& path,
                  const std::vector<std::string_view>& allowed, const std::string& context) const {
    for (auto&& [k, v] : t) {
      if (std::find(allowed.begin(), allowed.end(), k.str()) != allowed.end()) continue;
      const toml::source_region& r = k.source().begin.line ? k.source() : v.source();
      fail_at(r, toml_child_key(path, k.str()),
              fmt::format("value {}: unknown key; allowed keys {}: {}", toml_value_text(v, 6),
                          context, join(allowed)));
    }
  }

  const toml::node& require(const toml::table& t, const std::string& path, std::string_view key,
                            const std::string& what) const {
    if (const toml::node* n = t.get(key)) return *n;
    fail_at(t.source(), toml_child_key(path, key), "missing; required: " + what);
  }

  double number(const toml::node& n, const std::string& key, std::string_view allowed) const {
    double x = 0.0;
    if (const auto* i = n.as_integer())
      x = static_cast<double>(i->get());
    else if (const auto* f = n.as_floating_point())
      x = f->get();
    else
      fail_value(n, key, fmt::format("{} where a plain number was expected (dimensionless, no "
                                     "unit); allowed: {}",
                                     toml_type_name(n), allowed));
    if (!std::isfinite(x)) fail_value(n, key, fmt::format("not a finite number; allowed: {}", allowed));
    return x;
  }

  const std::string& text(const toml::node& n, const std::string& key, std::string_view allowed) const {
    if (!n.is_string())
      fail_value(n, key, fmt::format("{} where a string was expected; allowed: {}", toml_type_name(n), allowed));
    return n.as_string()->get();
  }

  double quantity(const toml::node& n, const std::string& key, const UnitFamily& f) const {
    if (n.is_number())
      fail_value(n, key, fmt::format("a bare number; write the value as a string with its unit; "
                                     "allowed: {}",
                                     allowed_units(f)));
    const std::string& s = text(n, key, allowed_units(f));
    try {
      return parse_in(s, f);
    } catch (const UnitError& e) {
      fail_at(n.source(), key, e.what());
    }
  }

  double length_nm(const toml::node& n, const std::string& key) const {
    const std::string allowed = "a length with one of the units nm, um, µm, mm (e.g. \"300 nm\")";
    if (n.is_number())
      fail_value(n, key, "a bare number; write the value as a string with its unit; allowed: " + allowed);
    const std::string& s = text(n, key, allowed);
    try {
      return parse_length_nm(s);
    } catch (const UnitError& e) {
      fail_at(n.source(), key, e.what());
    }
  }

  /// Array of tables `key` (also inline), each element checked by `read_one`.
  template <class F>
  void table_array(const toml::node& n, const std::string& key, F read_one) const {
    const toml::array* a = n.as_array();
    if (!a || a->empty())
      fail_value(n, key, fmt::format("{} where a non-empty array of tables was expected; allowed: "
                                     "one or more [[{}]] tables",
                                     a ? "an empty array" : toml_type_name(n), key));
    for (std::size_t i = 0; i < a->size(); ++i) {
      const toml::node& e = (*a)[i];
      const std::string k = fmt::format("{}[{}]", key, i + 1);
      if (!e.is_table()) fail_value(e, k, fmt::format("{} where a table was expected", toml_type_name(e)));
      read_one(*e.as_table(), k);
    }
  }

  /// Runs an optics check and reports a DispersionError at the node of the
  /// parameter it names (or at `fallback`).
  template <class F>
  void checked(const toml::table& t, const std::string& path, const toml::node& fallback,
               const std::string& fallback_key, F check) const {
    try {
      check();
    } catch (const DispersionError& e) {
      if (const toml::node* n = t.get(e.parameter)) fail_value(*n, toml_child_key(path, e.parameter), e.what());
      fail_value(fallback, fallback_key, e.what());
    }
  }

  // --- components ----------------------------------------------------------
  TaucLorentzOscillator tauc_lorentz(const toml::table& t, const std::string& path) const {
    TaucLorentzOscillator o;
    o.A_eV = quantity(require(t, path, "A", "the amplitude A in eV"), toml_child_key(path, "A"), kEnergy);
    o.E0_eV = quantity(require(t, path, "E0", "the peak energy E0 in eV"), toml_child_key(path, "E0"), kEnergy);
    o.C_eV = quantity(require(t, path, "C", "the broadening C in eV"), toml_child_key(path, "C"), kEnergy);
    o.Eg_eV = quantity(require(t, path, "Eg", "the gap Eg in eV"), toml_child_key(path, "Eg"), kEnergy);
    checked(t, path, *t.get("A"), toml_child_key(path, "A"), [&] { check_tauc_lorentz(o); });
    return o;
  }

  DrudeTerm drude(const toml::table& t, const std::string& path) const {
    const toml::node* ep = t.get("plasma_energy");
    const toml::node* gb = t.get("broadening");
    const toml::node* N = t.get("carrier_density");
    const toml::node* mu = t.get("mobility");
    const toml::node* m = t.get("effective_mass");
    const std::string forms =
        "either plasma_energy and broadening (eV), or carrier_density (cm-3), mobility (cm2/Vs) "
        "and effective_mass (in electron masses)";
    const bool direct = ep || gb;
    const bool carriers = N || mu || m;
    if (direct && carriers) {
      const toml::node& second = N ? *N : (mu ? *mu : *m);
      const std::string k = N ? "carrier_density" : (mu ? "mobility" : "effective_mass");
      fail_value(second, toml_child_key(path, k), "mixes the two forms of a Drude term; allowed: " + forms);
    }
    DrudeTerm d;
    if (carriers) {
      const double density = quantity(require(t, path, "carrier_density", forms),
                                      toml_child_key(path, "carrier_density"), kDensity);
      const double mobility =
          quantity(require(t, path, "mobility", forms), toml_child_key(path, "mobility"), kMobility);
      const double mass = number(require(t, path, "effective_mass", forms),
                                 toml_child_key(path, "effective_mass"), "a number > 0 (electron masses)");
      checked(t, path, *N, toml_child_key(path, "carrier_density"),
              [&] { d = drude_term_from_carriers(density, mobility, mass); });
    } else {
      d.plasma_energy_eV =
          quantity(require(t, path, "plasma_energy", forms), toml_child_key(path, "plasma_energy"), kEnergy);
      d.broadening_eV =
          quantity(require(t, path, "broadening", forms), toml_child_key(path, "broadening"), kEnergy);
      checked(t, path, *ep, toml_child_key(path, "plasma_energy"), [&] { check_drude(d); });
    }
    return d;
  }

  double eps_inf(const toml::table& t) const {
    const toml::node& n = require(t, "", "eps_inf", "eps_inf, a number > 0");
    const double v = number(n, "eps_inf", "a number > 0");
    if (!(v > 0.0)) fail_value(n, "eps_inf", "eps_inf must be > 0; allowed: a number > 0");
    return v;
  }

  // --- models ----------------------------------------------------------------
  CauchyFormula cauchy(const toml::table& t) const {
    CauchyFormula c;
    c.A = number(require(t, "", "A", "A, a plain number"), "A", "a number");
    if (const toml::node* n = t.get("B")) c.B_um2 = quantity(*n, "B", kArea);
    if (const toml::node* n = t.get("C")) c.C_um4 = quantity(*n, "C", kQuartic);
    const toml::node* amp = t.get("k_amplitude");
    const toml::node* edge = t.get("urbach_edge");
    const toml::node* width = t.get("urbach_width");
    if (amp || edge || width) {
      const std::string all = "k_amplitude (number >= 0), urbach_edge and urbach_width (eV), all three";
      c.k_amplitude = number(require(t, "", "k_amplitude", all), "k_amplitude", "a number >= 0");
      c.urbach_edge_eV = quantity(require(t, "", "urbach_edge", all), "urbach_edge", kEnergy);
      c.urbach_width_eV = quantity(require(t, "", "urbach_width", all), "urbach_width", kEnergy);
    }
    return c;
  }

  SellmeierFormula sellmeier(const toml::table& t) const {
    SellmeierFormula s;
    table_array(require(t, "", "term", "one or more [[term]] tables with B and C (or resonance)"),
                "term", [&](const toml::table& e, const std::string& path) {
                  check_keys(e, path, {"B", "C", "resonance"}, "in a Sellmeier [[term]]");
                  SellmeierTerm term;
                  term.B = number(require(e, path, "B", "B, a plain number"), toml_child_key(path, "B"), "a number");
                  const toml::node* C = e.get("C");
                  const toml::node* res = e.get("resonance");
                  const std::string either = "either C (um2) or resonance (a length, C = resonance²)";
                  if (C && res) fail_value(*res, toml_child_key(path, "resonance"), "given together with C; allowed: " + either);
                  if (!C && !res) fail_at(e.source(), toml_child_key(path, "C"), "missing; required: " + either);
                  if (C) {
                    term.C_um2 = quantity(*C, toml_child_key(path, "C"), kArea);
                  } else {
                    const double um = length_nm(*res, toml_child_key(path, "resonance")) / 1000.0;
                    if (!(um >= 0.0)) fail_value(*res, toml_child_key(path, "resonance"), "must be >= 0");
                    term.C_um2 = um * um;
                  }
                  checked(e, path, *e.get("B"), toml_child_key(path, "B"), [&] { check_sellmeier_term(term); });
                  s.terms.push_back(term);
                });
    return s;
  }

  DopedSiliconFormula doped_silicon(const toml::table& t) const {
    DopedSiliconFormula d;
    const toml::node& bb = require(t, "", "band_to_band", "the id or path of a crystalline silicon n, k table");
    const std::string& id = text(bb, "band_to_band", "a material id or path, e.g. \"si_green2008\"");
    try {
      d.band_to_band = find_material(id, file_.parent_path());
    } catch (const MaterialError& e) {
      fail_value(bb, "band_to_band", e.what());
    }
    const toml::node& type = require(t, "", "doping", "\"n\" or \"p\"");
    const std::string& ts = text(type, "doping", "\"n\" or \"p\"");
    if (ts == "n") d.type = DopingType::n;
    else if (ts == "p") d.type = DopingType::p;
    else fail_value(type, "doping", "unknown doping type; allowed: \"n\", \"p\"");
    d.density_cm3 = quantity(require(t, "", "carrier_density", "the free-carrier density in cm-3"),
                             "carrier_density", kDensity);
    std::string allowed_ids;
    for (FcaParametrization p : all_fca_parametrizations())
      allowed_ids += (allowed_ids.empty() ? "\"" : ", \"") + std::string(fca_parametrization_id(p)) + "\"";
    const toml::node& fm = require(t, "", "free_carrier_model", "one of " + allowed_ids);
    try {
      d.fca = fca_parametrization_from_id(text(fm, "free_carrier_model", "one of " + allowed_ids));
    } catch (const FreeCarrierError& e) {
      fail_value(fm, "free_carrier_model", e.what());
    }
    return d;
  }
};

DispersionFormula Reader::read(const toml::table& root, std::string source) {
  const toml::node& model_node = require(root, "", "model", "one of " + quoted_word_list(kModels));
  const std::string& model = text(model_node, "model", "one of " + quoted_word_list(kModels));
  std::vector<std::string_view> keys = {"model", "wavelength_range"};
  const auto add = [&](std::vector<std::string_view> more) { keys.insert(keys.end(), more.begin(), more.end()); };
  if (model == "cauchy") add({"A", "B", "C", "k_amplitude", "urbach_edge", "urbach_width"});
  else if (model == "sellmeier") add({"term"});
  else if (model == "tauc_lorentz") add({"eps_inf", "A", "E0", "C", "Eg"});
  else if (model == "drude")
    add({"eps_inf", "plasma_energy", "broadening", "carrier_density", "mobility", "effective_mass"});
  else if (model == "oscillator_sum") add({"eps_inf", "drude", "tauc_lorentz"});
  else if (model == "doped_silicon") add({"band_to_band", "doping", "carrier_density", "free_carrier_model"});
  else fail_value(model_node, "model", "unknown model; allowed: " + quoted_word_list(kModels));
  check_keys(root, "", keys, fmt::format("for model \"{}\"", model));

  DispersionFormula f;
  f.name = file_.stem().string();
  f.file = file_.string();
  f.source = std::move(source);

  const toml::node& range = require(root, "", "wavelength_range",
                                    "[\"MIN nm\", \"MAX nm\"], the validity range of the formula");
  const toml::array* r = range.as_array();
  if (!r || r->size() != 2)
    fail_value(range, "wavelength_range",
               "allowed: an array of two lengths [minimum, maximum], e.g. [\"300 nm\", \"1200 nm\"]");
  f.min_wavelength_nm = length_nm((*r)[0], "wavelength_range[1]");
  f.max_wavelength_nm = length_nm((*r)[1], "wavelength_range[2]");
  if (!(f.min_wavelength_nm > 0.0 && f.min_wavelength_nm <= f.max_wavelength_nm))
    fail_value(range, "wavelength_range", "allowed: 0 < minimum <= maximum");

  if (model == "cauchy") {
    f.model = cauchy(root);
  } else if (model == "sellmeier") {
    f.model = sellmeier(root);
  } else if (model == "tauc_lorentz") {
    TaucLorentzFormula t;
    t.eps_inf = eps_inf(root);
    t.oscillator = tauc_lorentz(root, "");
    f.model = t;
  } else if (model == "drude") {
    DrudeFormula d;
    d.eps_inf = eps_inf(root);
    d.term = drude(root, "");
    f.model = d;
  } else if (model == "oscillator_sum") {
    OscillatorSumFormula s;
    s.eps_inf = eps_inf(root);
    if (!root.get("drude") && !root.get("tauc_lorentz"))
      fail_at(root.source(), "drude",
              "missing; required: at least one [[drude]] or [[tauc_lorentz]] table");
    if (const toml::node* n = root.get("drude"))
      table_array(*n, "drude", [&](const toml::table& t, const std::string& path) {
        check_keys(t, path, {"plasma_energy", "broadening", "carrier_density", "mobility", "effective_mass"},
                   "in a [[drude]] term");
        s.drude.push_back(drude(t, path));
      });
    if (const toml::node* n = root.get("tauc_lorentz"))
      table_array(*n, "tauc_lorentz", [&](const toml::table& t, const std::string& path) {
        check_keys(t, path, {"A", "E0", "C", "Eg"}, "in a [[tauc_lorentz]] term");
        s.tauc_lorentz.push_back(tauc_lorentz(t, path));
      });
    f.model = s;
  } else {
    f.model = doped_silicon(root);
  }

  // Whole-formula checks and the scan of the range (n > 0, k >= 0).
  try {
    check_formula(f);
    formula_material(f, 1.0);
  } catch (const DispersionError& e) {
    if (const toml::node* n = root.get(e.parameter)) fail_value(*n, e.parameter, e.what());
    fail_value(range, "wavelength_range", e.what());
  } catch (const std::exception& e) {  // e.g. the free-carrier law outside its arguments
    fail_value(range, "wavelength_range", e.what());
  }
  return f;
}

/// Text after the first '# source:' comment line ("" if none).
std::string source_line(const fs::path& file) {
  std::ifstream in(file, std::ios::binary);
  std::string line;
  while (std::getline(in, line)) {
    std::string_view s = trim(line);
    if (!s.empty() && s.back() == '\r') s = trim(s.substr(0, s.size() - 1));
    if (s.empty() || s.front() != '#') continue;
    s = trim(s.substr(1));
    constexpr std::string_view tag = "source:";
    if (s.substr(0, tag.size()) == tag) return std::string(trim(s.substr(tag.size())));
  }
  return "";
}

}  // namespace

DispersionFormula read_dispersion_file(const fs::path& file) {
  std::error_code ec;
  if (!fs::is_regular_file(file, ec))
    throw DispersionFileError(fmt::format("{}: cannot read the formula file: {}", file.string(),
                                          fs::exists(file, ec) ? "not a regular file" : "no such file"));
  toml::table root;
  try {
    root = toml::parse_file(file.string());
  } catch (const toml::parse_error& e) {
    const auto& b = e.source().begin;
    throw DispersionFileError(fmt::format("{}:{}:{}: TOML syntax error: {}", file.string(), b.line,
                                          b.column, e.description()));
  }
  return Reader(file).read(root, source_line(file));
}

fs::path formulas_dir() { return materials_dir() / "formulas"; }

std::vector<fs::path> shipped_formula_files() {
  std::vector<fs::path> files;
  std::error_code ec;
  for (fs::directory_iterator it(formulas_dir(), ec), end; !ec && it != end; it.increment(ec))
    if (it->path().extension() == ".toml" && it->is_regular_file(ec)) files.push_back(it->path());
  std::sort(files.begin(), files.end());
  return files;
}

}  // namespace lumtrap
