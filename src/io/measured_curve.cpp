#include "io/measured_curve.hpp"

#include <fmt/format.h>

#include <cmath>
#include <fstream>
#include <sstream>
#include <string>

#include "io/units.hpp"

namespace lumtrap {

namespace {

std::string trim(const std::string& s) {
  const auto b = s.find_first_not_of(" \t\r");
  if (b == std::string::npos) return {};
  const auto e = s.find_last_not_of(" \t\r");
  return s.substr(b, e - b + 1);
}

std::vector<std::string> split_commas(const std::string& s) {
  std::vector<std::string> out;
  std::stringstream ss(s);
  std::string cell;
  while (std::getline(ss, cell, ',')) out.push_back(trim(cell));
  if (!s.empty() && s.back() == ',') out.push_back({});
  return out;
}

}  // namespace

MeasuredCurve read_measured_curve(const std::filesystem::path& file) {
  std::ifstream in(file);
  if (!in) throw MeasuredCurveError(fmt::format("{}: cannot read the measured curve", file.string()));
  MeasuredCurve c;
  c.file = file;
  const std::string name = file.string();
  std::string text;
  int line = 0;
  std::vector<std::string> header;
  int header_line = 0;
  int col_sigma = -1, col_t = -1;
  while (std::getline(in, text)) {
    ++line;
    const std::string t = trim(text);
    if (t.empty() || t[0] == '#') continue;
    const auto cells = split_commas(t);
    if (header.empty()) {
      header = cells;
      header_line = line;
      if (header.size() < 2 || header[0] != "wavelength_nm" || header[1] != "reflectance")
        throw MeasuredCurveError(fmt::format(
            "{}:{}: header \"{}\": the first two columns must be wavelength_nm,reflectance; allowed further "
            "columns: uncertainty, transmittance",
            name, line, t));
      for (std::size_t k = 2; k < header.size(); ++k) {
        if (header[k] == "uncertainty" && col_sigma < 0) col_sigma = int(k);
        else if (header[k] == "transmittance" && col_t < 0) col_t = int(k);
        else
          throw MeasuredCurveError(fmt::format("{}:{}: column \"{}\": unknown or repeated; allowed after "
                                               "wavelength_nm,reflectance: uncertainty, transmittance",
                                               name, line, header[k]));
      }
      continue;
    }
    if (cells.size() != header.size())
      throw MeasuredCurveError(fmt::format("{}:{}: {} values, the header (line {}) has {} columns", name, line,
                                           cells.size(), header_line, header.size()));
    std::vector<double> v(cells.size());
    for (std::size_t k = 0; k < cells.size(); ++k) {
      const QuantityText q = split_quantity(cells[k]);
      if (q.problem != QuantityText::none || !q.unit.empty() || !std::isfinite(q.number))
        throw MeasuredCurveError(fmt::format("{}:{}: column {}: value \"{}\" is not a plain number", name, line,
                                             header[k], cells[k]));
      v[k] = q.number;
    }
    if (v[0] <= 0)
      throw MeasuredCurveError(fmt::format("{}:{}: column wavelength_nm: value \"{}\": allowed: > 0 (nm)", name,
                                           line, cells[0]));
    if (!c.wavelength_nm.empty() && v[0] <= c.wavelength_nm.back())
      throw MeasuredCurveError(fmt::format("{}:{}: column wavelength_nm: value \"{}\": wavelengths must increase "
                                           "strictly (previous row {} nm)",
                                           name, line, cells[0], format_number(c.wavelength_nm.back())));
    auto fraction = [&](int k) {
      if (v[k] < 0 || v[k] > 1)
        throw MeasuredCurveError(fmt::format("{}:{}: column {}: value \"{}\": allowed: a fraction 0 to 1 (not "
                                             "percent)",
                                             name, line, header[k], cells[k]));
      return v[k];
    };
    c.wavelength_nm.push_back(v[0]);
    c.reflectance.push_back(fraction(1));
    if (col_sigma >= 0) {
      if (!(v[col_sigma] > 0))
        throw MeasuredCurveError(fmt::format("{}:{}: column uncertainty: value \"{}\": allowed: > 0 (standard "
                                             "error of the reflectance, a fraction)",
                                             name, line, cells[col_sigma]));
      c.uncertainty.push_back(v[col_sigma]);
    }
    if (col_t >= 0) c.transmittance.push_back(fraction(col_t));
    c.line.push_back(line);
  }
  if (header.empty())
    throw MeasuredCurveError(fmt::format("{}: no header; expected wavelength_nm,reflectance[,uncertainty]"
                                         "[,transmittance]",
                                         name));
  if (c.wavelength_nm.empty()) throw MeasuredCurveError(fmt::format("{}: no data rows", name));
  return c;
}

}  // namespace lumtrap
