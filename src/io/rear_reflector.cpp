// See rear_reflector.hpp.
#include "io/rear_reflector.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <sstream>
#include <stdexcept>

#include "io/text_file.hpp"

namespace lumtrap {

double RearReflector::reflectance_at(double lambda) const {
  if (wavelength_nm.empty()) return constant_reflectance;
  if (lambda <= wavelength_nm.front()) return reflectance.front();
  if (lambda >= wavelength_nm.back()) return reflectance.back();
  const auto it = std::upper_bound(wavelength_nm.begin(), wavelength_nm.end(), lambda);
  const std::size_t j = std::size_t(it - wavelength_nm.begin());
  const double f = (lambda - wavelength_nm[j - 1]) / (wavelength_nm[j] - wavelength_nm[j - 1]);
  return reflectance[j - 1] + f * (reflectance[j] - reflectance[j - 1]);
}

namespace {

std::string trim(const std::string& s) {
  const auto b = s.find_first_not_of(" \t\r");
  if (b == std::string::npos) return "";
  return s.substr(b, s.find_last_not_of(" \t\r") - b + 1);
}

bool parse_number(const std::string& text, double& v) {
  try {
    std::size_t used = 0;
    v = std::stod(text, &used);
    return used == text.size() && std::isfinite(v);
  } catch (const std::exception&) {
    return false;
  }
}

}  // namespace

void read_reflectance_csv(const std::filesystem::path& file, RearReflector& r) {
  const std::string text = read_text_file(file);
  std::istringstream in(text);
  std::string line;
  int number = 0;
  bool header = false;
  const auto fail = [&](const std::string& what) {
    throw std::runtime_error(fmt::format("{}:{}: {}", file.string(), number, what));
  };
  r.wavelength_nm.clear();
  r.reflectance.clear();
  while (std::getline(in, line)) {
    ++number;
    const std::string t = trim(line);
    if (t.empty() || t[0] == '#') continue;
    if (!header) {
      if (t != "wavelength_nm,reflectance")
        fail(fmt::format("header '{}'; allowed: wavelength_nm,reflectance", t));
      header = true;
      continue;
    }
    const auto comma = t.find(',');
    double w = 0, R = 0;
    if (comma == std::string::npos || !parse_number(trim(t.substr(0, comma)), w) ||
        !parse_number(trim(t.substr(comma + 1)), R))
      fail(fmt::format("row '{}'; allowed: two numbers, wavelength in nm and reflectance, e.g. 1000,0.65", t));
    if (!(w > 0)) fail(fmt::format("wavelength {}; allowed: > 0 nm", t.substr(0, comma)));
    if (!r.wavelength_nm.empty() && !(w > r.wavelength_nm.back()))
      fail(fmt::format("wavelength {} after {}; allowed: strictly increasing wavelengths", w,
                       r.wavelength_nm.back()));
    if (!(R >= 0 && R <= 1)) fail(fmt::format("reflectance {}; allowed: a number in [0, 1]", R));
    r.wavelength_nm.push_back(w);
    r.reflectance.push_back(R);
  }
  if (!header) throw std::runtime_error(fmt::format("{}: no header; allowed: wavelength_nm,reflectance", file.string()));
  if (r.wavelength_nm.empty())
    throw std::runtime_error(fmt::format("{}: no rows; allowed: at least one row wavelength_nm,reflectance", file.string()));
}

}  // namespace lumtrap
