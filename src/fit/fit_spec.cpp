#include "fit/fit_spec.hpp"

#include <fmt/format.h>

#include <cmath>

#include "io/units.hpp"

namespace lumtrap {

namespace {

std::string where_of(const std::filesystem::path& file, const toml::node& n) {
  const auto& s = n.source();
  if (!s.begin) return file.string();
  return fmt::format("{}:{}:{}", file.string(), s.begin.line, s.begin.column);
}

struct Number {
  double value;
  std::string unit;
};

Number read_number(const toml::node& n, const std::string& where, const std::string& key) {
  if (auto v = n.value<double>(); v && !n.is_string()) return {*v, ""};
  if (const auto* s = n.as_string()) {
    const QuantityText q = split_quantity(s->get());
    if (q.problem == QuantityText::none && !q.unit.empty() && std::isfinite(q.number))
      return {q.number, std::string(q.unit)};
    throw FitSpecError(fmt::format("{}: key '{}': value \"{}\": allowed: a number or a quantity such as \"75 nm\"",
                                   where, key, s->get()));
  }
  throw FitSpecError(fmt::format("{}: key '{}': allowed: a number or a quantity such as \"75 nm\"", where, key));
}

}  // namespace

FitSpec read_fit_spec(const toml::table& root, const std::filesystem::path& file) {
  const toml::node* fit_node = root.get("fit");
  if (!fit_node)
    throw FitSpecError(fmt::format("{}: no [fit] table; a fit needs [fit.parameters] with at least one key "
                                   "(docs/scene-format.md, \"Fits\")",
                                   file.string()));
  const toml::table* fit = fit_node->as_table();
  FitSpec spec;
  spec.where = where_of(file, *fit_node);
  if (!fit) throw FitSpecError(fmt::format("{}: key 'fit': allowed: a table", spec.where));
  for (const auto& [k, v] : *fit) {
    const std::string key(k.str());
    const std::string at = where_of(file, v);
    if (key == "compare") {
      const auto* s = v.as_string();
      const std::string word = s ? s->get() : std::string("?");
      if (word == "total_reflectance") spec.compare = CompareQuantity::total_reflectance;
      else if (word == "first_surface_reflectance") spec.compare = CompareQuantity::first_surface_reflectance;
      else
        throw FitSpecError(fmt::format("{}: key 'fit.compare': value \"{}\": allowed: \"total_reflectance\" "
                                       "(front reflection + escape), \"first_surface_reflectance\"",
                                       at, word));
    } else if (key == "from" || key == "to") {
      const auto* s = v.as_string();
      double nm = 0;
      try {
        if (!s) throw UnitError("not a string");
        nm = parse_length_nm(s->get());
      } catch (const UnitError&) {
        throw FitSpecError(fmt::format("{}: key 'fit.{}': value \"{}\": allowed: a wavelength such as \"400 nm\"",
                                       at, key, s ? s->get() : std::string("?")));
      }
      if (!(nm > 0))
        throw FitSpecError(fmt::format("{}: key 'fit.{}': value \"{}\": allowed: > 0", at, key, s->get()));
      (key == "from" ? spec.from_nm : spec.to_nm) = nm;
    } else if (key == "parameters") {
      const auto* params = v.as_table();
      if (!params) throw FitSpecError(fmt::format("{}: key 'fit.parameters': allowed: a table", at));
      for (const auto& [pk, pv] : *params) {
        FitParameter p;
        p.key = std::string(pk.str());
        p.where = where_of(file, pv);
        const auto* t = pv.as_table();
        if (!t)
          throw FitSpecError(fmt::format("{}: key 'fit.parameters.\"{}\"': allowed: a table {{ start = ..., min = "
                                         "..., max = ... }}",
                                         p.where, p.key));
        for (const auto& [ik, iv] : *t) {
          const std::string ikey(ik.str());
          if (ikey != "start" && ikey != "min" && ikey != "max")
            throw FitSpecError(fmt::format("{}: key 'fit.parameters.\"{}\".{}': unknown; allowed: start, min, max",
                                           where_of(file, iv), p.key, ikey));
        }
        Number vals[3];
        const char* names[3] = {"start", "min", "max"};
        for (int i = 0; i < 3; ++i) {
          const toml::node* n = t->get(names[i]);
          if (!n)
            throw FitSpecError(fmt::format("{}: key 'fit.parameters.\"{}\"': missing '{}'; allowed: a table "
                                           "{{ start = ..., min = ..., max = ... }}",
                                           p.where, p.key, names[i]));
          vals[i] = read_number(*n, where_of(file, *n), fmt::format("fit.parameters.\"{}\".{}", p.key, names[i]));
        }
        if (vals[1].unit != vals[0].unit || vals[2].unit != vals[0].unit)
          throw FitSpecError(fmt::format("{}: key 'fit.parameters.\"{}\"': start, min and max in units \"{}\", "
                                         "\"{}\", \"{}\"; allowed: all three in one unit",
                                         p.where, p.key, vals[0].unit, vals[1].unit, vals[2].unit));
        p.unit = vals[0].unit;
        p.start = vals[0].value;
        p.lower = vals[1].value;
        p.upper = vals[2].value;
        if (!(p.lower < p.upper))
          throw FitSpecError(fmt::format("{}: key 'fit.parameters.\"{}\"': min {} max {}: allowed: min < max",
                                         p.where, p.key, format_number(p.lower), format_number(p.upper)));
        if (p.start < p.lower || p.start > p.upper)
          throw FitSpecError(fmt::format("{}: key 'fit.parameters.\"{}\".start': value {}{}: outside its bounds; "
                                         "allowed: {} to {}",
                                         p.where, p.key, format_number(p.start), p.unit.empty() ? "" : " " + p.unit,
                                         format_number(p.lower), format_number(p.upper)));
        for (const auto& q : spec.parameters)
          if (q.key == p.key)
            throw FitSpecError(fmt::format("{}: key 'fit.parameters.\"{}\"': given twice", p.where, p.key));
        spec.parameters.push_back(p);
      }
    } else {
      throw FitSpecError(fmt::format("{}: key 'fit.{}': unknown; allowed: compare, from, to, parameters", at, key));
    }
  }
  if (spec.parameters.empty())
    throw FitSpecError(fmt::format("{}: [fit] has no parameters; allowed: [fit.parameters] with at least one "
                                   "dotted scene key",
                                   spec.where));
  if (spec.from_nm >= spec.to_nm)
    throw FitSpecError(fmt::format("{}: fit.from {} nm fit.to {} nm: allowed: from < to", spec.where,
                                   format_number(spec.from_nm), format_number(spec.to_nm)));
  return spec;
}

std::string parameter_value_toml(const FitParameter& p, double x) {
  // 12 significant digits: a readable value in the fitted scene; finer than any fit resolves
  const std::string num = format_number(std::stod(fmt::format("{:.12g}", x)));
  if (p.unit.empty()) return num.find_first_of(".e") == std::string::npos ? num + ".0" : num;
  return fmt::format("\"{} {}\"", num, p.unit);
}

std::vector<std::pair<std::string, std::string>> parameter_values(const FitSpec& spec, const std::vector<double>& x) {
  std::vector<std::pair<std::string, std::string>> out;
  for (std::size_t i = 0; i < spec.parameters.size(); ++i)
    out.emplace_back(spec.parameters[i].key, parameter_value_toml(spec.parameters[i], x[i]));
  return out;
}

}  // namespace lumtrap
