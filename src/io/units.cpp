#include "io/units.hpp"

#include "io/toml_text.hpp"

#include <charconv>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <numbers>
#include <system_error>
#include <vector>

namespace lumtrap {
namespace {


/// A unit word and how to convert a number given in it to the target unit:
/// result = value * mul / div (two factors, so that e.g. nm -> um divides by
/// exactly 1000 instead of multiplying by the inexact 0.001).
struct UnitEntry {
  std::string_view word;
  double mul, div;
};

struct UnitFamily {
  const char* what;           ///< "a length", for messages
  std::string_view example;   ///< unit used in the "e.g." hint
  std::string_view allowed;   ///< list shown in messages
  std::vector<UnitEntry> units;
};

std::string quoted(std::string_view text) {
  std::string s = "\"";
  s += shortened(text);
  s += '"';
  return s;
}

bool is_space(char c) { return c == ' ' || c == '\t'; }

std::string_view trim(std::string_view s) {
  while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
  while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
  return s;
}

[[noreturn]] void fail(std::string_view text, const std::string& why, const UnitFamily& f) {
  throw UnitError("value " + quoted(text) + ": " + why + "; allowed: " + f.what +
                  " with one of the units " + std::string(f.allowed));
}

double parse_in(std::string_view text, const UnitFamily& f) {
  const QuantityText q = split_quantity(text);
  if (q.problem == QuantityText::empty)
    fail(text, "empty; write a number and a unit, e.g. \"1 " + std::string(f.example) + "\"", f);
  if (q.problem == QuantityText::no_number)
    fail(text, "does not start with a number; write e.g. \"75 " + std::string(f.example) + "\"", f);
  if (q.problem == QuantityText::out_of_range) fail(text, "number out of range", f);
  if (q.problem == QuantityText::not_finite) fail(text, "not a finite number", f);
  if (q.unit.empty())
    fail(text, "a bare number; write the unit: e.g. \"" + std::string(q.number_text) + " " + std::string(f.example) +
                   "\"",
         f);
  for (const UnitEntry& u : f.units)
    if (q.unit == u.word) {
      const double value = q.number * u.mul / u.div;
      if (!std::isfinite(value)) fail(text, "number out of range (too large in this unit)", f);
      return value;
    }
  fail(text, "unit " + quoted(q.unit) + " is not accepted", f);
}

const UnitFamily& length_nm() {
  static const UnitFamily f{"a length", "nm", "nm, um, µm, mm",
                            {{"nm", 1, 1},
                             {"um", 1000, 1},
                             {"\xC2\xB5m", 1000, 1},   // U+00B5 micro sign
                             {"\xCE\xBCm", 1000, 1},   // U+03BC Greek small mu
                             {"mm", 1e6, 1}}};
  return f;
}

const UnitFamily& length_um() {
  static const UnitFamily f{"a length", "um", "nm, um, µm, mm",
                            {{"nm", 1, 1000},
                             {"um", 1, 1},
                             {"\xC2\xB5m", 1, 1},
                             {"\xCE\xBCm", 1, 1},
                             {"mm", 1000, 1}}};
  return f;
}

const UnitFamily& angle_rad() {
  static const UnitFamily f{"an angle", "deg", "deg, °, rad",
                            {{"deg", std::numbers::pi, 180}, {"\xC2\xB0", std::numbers::pi, 180}, {"rad", 1, 1}}};
  return f;
}

const UnitFamily& angle_deg() {
  static const UnitFamily f{"an angle", "deg", "deg, °, rad",
                            {{"deg", 1, 1}, {"\xC2\xB0", 1, 1}, {"rad", 180, std::numbers::pi}}};
  return f;
}

const UnitFamily& current() {
  static const UnitFamily f{"a current density", "mA/cm2", "mA/cm2, mA/cm^2, mA/cm², A/m2, A/m^2, A/m²",
                            {{"mA/cm2", 1, 1},
                             {"mA/cm^2", 1, 1},
                             {"mA/cm\xC2\xB2", 1, 1},
                             {"A/m2", 1, 10},
                             {"A/m^2", 1, 10},
                             {"A/m\xC2\xB2", 1, 10}}};
  return f;
}

}  // namespace

QuantityText split_quantity(std::string_view text) {
  QuantityText q;
  const std::string_view s = trim(text);
  if (s.empty()) {
    q.problem = QuantityText::empty;
    return q;
  }
  // The number: optional sign, then what std::from_chars reads in general
  // (fixed or scientific) format. from_chars takes no '+', so handle it here.
  bool negative = false;
  std::string_view num = s;
  if (num.front() == '+' || num.front() == '-') {
    negative = num.front() == '-';
    num.remove_prefix(1);
    if (num.empty() || num.front() == '+' || num.front() == '-') {
      q.problem = QuantityText::no_number;
      return q;
    }
  }
  auto [end, ec] = std::from_chars(num.data(), num.data() + num.size(), q.number, std::chars_format::general);
  if (ec == std::errc::invalid_argument || end == num.data()) {
    q.problem = QuantityText::no_number;
    return q;
  }
  if (ec == std::errc::result_out_of_range) {
    q.problem = QuantityText::out_of_range;
    return q;
  }
  if (!std::isfinite(q.number)) {  // "nan", "inf", "infinity"
    q.problem = QuantityText::not_finite;
    return q;
  }
  if (negative) q.number = -q.number;
  const std::string_view digits(num.data(), std::size_t(end - num.data()));
  q.unit = trim(std::string_view(end, std::size_t(num.data() + num.size() - end)));
  q.number_text = trim(s.substr(0, s.size() - q.unit.size()));
  if (q.unit.empty() && digits.find_first_of(".eE") == std::string_view::npos) {
    std::int64_t v = 0;
    auto [iend, iec] = std::from_chars(digits.data(), digits.data() + digits.size(), v);
    if (iec == std::errc() && iend == digits.data() + digits.size()) {
      q.integer = true;
      q.as_int = negative ? -v : v;
    }
  }
  return q;
}

double parse_length_nm(std::string_view text) { return parse_in(text, length_nm()); }
double parse_length_um(std::string_view text) { return parse_in(text, length_um()); }
double parse_angle_rad(std::string_view text) { return parse_in(text, angle_rad()); }
double parse_angle_deg(std::string_view text) { return parse_in(text, angle_deg()); }
double parse_current_mA_cm2(std::string_view text) { return parse_in(text, current()); }

std::string format_number(double x) {
  if (!std::isfinite(x)) throw UnitError("cannot write a non-finite number");
  if (x == 0) return "0";  // also turns -0 into 0
  char buf[64];
  auto [end, ec] = std::to_chars(buf, buf + sizeof buf, x);  // shortest round-trip form
  if (ec != std::errc()) throw UnitError("cannot format a number");
  return std::string(buf, end);
}

std::string format_length_nm(double nm) { return format_number(nm) + " nm"; }
std::string format_length_um(double um) { return format_number(um) + " um"; }
std::string format_angle_deg(double deg) { return format_number(deg) + " deg"; }

std::string format_angle_rad(double rad) {
  // The fewest significant digits in degrees that read back to exactly `rad`
  // (several degree values can map to the same radians: prefer "330 deg" to
  // "329.99999999999994 deg").
  const double deg = rad * 180 / std::numbers::pi;
  if (!std::isfinite(deg)) throw UnitError("cannot write a non-finite angle");
  for (int digits = 1; digits <= 17; ++digits) {
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.*g", digits, deg);
    const std::string in_deg = format_number(std::strtod(buf, nullptr)) + " deg";
    if (parse_angle_rad(in_deg) == rad) return in_deg;
  }
  return format_number(rad) + " rad";
}

std::string format_current_mA_cm2(double mA_cm2) { return format_number(mA_cm2) + " mA/cm2"; }

}  // namespace lumtrap
