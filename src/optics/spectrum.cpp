// Solar spectra, photon flux and band weights. See spectrum.hpp.
#include "optics/spectrum.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>

#include "optics/material.hpp"  // read_numeric_csv, materials_dir

namespace lumtrap {

namespace {

// SI 2019 defining constants (exact), as listed in CODATA 2018
// (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021).
constexpr double kPlanck_J_s = 6.62607015e-34;
constexpr double kSpeedOfLight_m_s = 299792458.0;
constexpr double kElementaryCharge_C = 1.602176634e-19;

std::string upper(std::string s) {
  for (char& c : s) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
  return s;
}

/// Value at x of the piecewise-linear function through (xs[j], ys[j]);
/// x must lie in [xs.front(), xs.back()].
double interpolate(const std::vector<double>& xs, const std::vector<double>& ys, double x) {
  auto it = std::upper_bound(xs.begin(), xs.end(), x);
  if (it == xs.begin()) return ys.front();
  std::size_t i = static_cast<std::size_t>(it - xs.begin()) - 1;
  if (xs[i] == x || i + 1 == xs.size()) return ys[i];
  const double t = (x - xs[i]) / (xs[i + 1] - xs[i]);
  return ys[i] + t * (ys[i + 1] - ys[i]);
}

void check_range(const Spectrum& s, double lo_nm, double hi_nm, const char* what) {
  if (s.wavelength_nm.size() < 2) {
    throw SpectrumError(fmt::format("spectrum '{}' has {} row(s); {} needs at least two", s.name,
                                    s.wavelength_nm.size(), what));
  }
  const double first = s.wavelength_nm.front(), last = s.wavelength_nm.back();
  if (!(lo_nm >= first && hi_nm <= last && lo_nm <= hi_nm)) {
    throw SpectrumError(fmt::format(
        "{} over {:g}–{:g} nm: spectrum '{}' covers {:g}–{:g} nm (lo <= hi inside that range required)",
        what, lo_nm, hi_nm, s.name, first, last));
  }
}

/// ∫_lo^hi of the piecewise-linear function through (xs[j], ys[j]); exact
/// (trapezoid on every grid interval, partial intervals at the ends cut at
/// interpolated values). Requires xs.front() <= lo <= hi <= xs.back().
double integrate_piecewise_linear(const std::vector<double>& xs, const std::vector<double>& ys,
                                  double lo, double hi) {
  if (hi <= lo) return 0.0;
  double sum = 0.0;
  // First grid point strictly above lo.
  std::size_t j = static_cast<std::size_t>(std::upper_bound(xs.begin(), xs.end(), lo) - xs.begin());
  double a = lo, ya = interpolate(xs, ys, lo);
  for (; j < xs.size() && xs[j] < hi; ++j) {
    sum += 0.5 * (xs[j] - a) * (ya + ys[j]);
    a = xs[j];
    ya = ys[j];
  }
  sum += 0.5 * (hi - a) * (ya + interpolate(xs, ys, hi));
  return sum;
}

Spectrum spectrum_from_columns(std::string name, std::vector<double> wl, std::vector<double> e) {
  Spectrum s;
  s.name = std::move(name);
  s.wavelength_nm = std::move(wl);
  s.irradiance = std::move(e);
  return s;
}

}  // namespace

Spectrum builtin_spectrum(const std::string& name) {
  const std::string key = upper(name);
  std::size_t column = 0;
  std::string canonical;
  if (key == "AM0") {
    column = 1, canonical = "AM0";
  } else if (key == "AM1.5G") {
    column = 2, canonical = "AM1.5G";
  } else if (key == "AM1.5D") {
    column = 3, canonical = "AM1.5D";
  } else {
    throw SpectrumError(fmt::format(
        "unknown built-in spectrum '{}'; allowed: AM1.5G, AM1.5D, AM0 (ASTM G173-03), or a "
        "`wavelength_nm,irradiance_W_m2_nm` CSV file",
        name));
  }
  NumericTable t;
  try {
    t = read_numeric_csv(materials_dir() / "astm_g173_03.csv", {"wavelength_nm", "am0", "am15g", "am15d"});
  } catch (const std::runtime_error& e) {
    throw SpectrumError(e.what());
  }
  return spectrum_from_columns(canonical, std::move(t.columns[0]), std::move(t.columns[column]));
}

Spectrum load_spectrum_file(const std::filesystem::path& file) {
  NumericTable t;
  try {
    t = read_numeric_csv(file, {"wavelength_nm", "irradiance_W_m2_nm"});
  } catch (const std::runtime_error& e) {
    throw SpectrumError(e.what());
  }
  if (t.line_of_row.size() < 2) {
    throw SpectrumError(fmt::format("{}:{}: only one data row; a spectrum needs at least two",
                                    file.string(), t.line_of_row.front()));
  }
  Spectrum s = spectrum_from_columns(file.string(), std::move(t.columns[0]), std::move(t.columns[1]));
  // Every photon flux, and its integral up to every row, must be a finite
  // double: currents are sums of them.
  const std::vector<double> phi = photon_flux(s);
  double integral = 0;
  for (std::size_t j = 0; j < phi.size(); ++j) {
    if (j > 0) integral += 0.5 * (phi[j - 1] + phi[j]) * (s.wavelength_nm[j] - s.wavelength_nm[j - 1]);
    if (!std::isfinite(phi[j]) || !std::isfinite(integral))
      throw SpectrumError(fmt::format(
          "{}:{}: irradiance_W_m2_nm = {:g} at {:g} nm: the photon flux {} is beyond the range of double "
          "precision; allowed: irradiances of real light sources (the ASTM G173-03 spectra, 2003, stay below "
          "2.2 W m^-2 nm^-1)",
          file.string(), t.line_of_row[j], s.irradiance[j], s.wavelength_nm[j],
          std::isfinite(phi[j]) ? "integrated up to this row" : "here"));
  }
  return s;
}

double integrated_irradiance(const Spectrum& s, double lo_nm, double hi_nm) {
  check_range(s, lo_nm, hi_nm, "irradiance integral");
  return integrate_piecewise_linear(s.wavelength_nm, s.irradiance, lo_nm, hi_nm);
}

std::vector<double> photon_flux(const Spectrum& s) {
  // Φ = E λ / (h c): W m^-2 nm^-1 × m / (J s × m s^-1) = photons m^-2 s^-1 nm^-1.
  std::vector<double> phi(s.wavelength_nm.size());
  for (std::size_t j = 0; j < phi.size(); ++j) {
    phi[j] = s.irradiance[j] * (s.wavelength_nm[j] * 1e-9) / (kPlanck_J_s * kSpeedOfLight_m_s);
  }
  return phi;
}

std::vector<double> band_photon_weights(const Spectrum& s, const std::vector<double>& run) {
  if (run.empty()) throw SpectrumError("band weights: no run wavelengths given");
  if (s.wavelength_nm.empty()) throw SpectrumError(fmt::format("spectrum '{}' has no rows", s.name));
  const double first = s.wavelength_nm.front(), last = s.wavelength_nm.back();
  for (std::size_t i = 0; i < run.size(); ++i) {
    if (!(run[i] >= first && run[i] <= last)) {
      throw SpectrumError(fmt::format(
          "run wavelength {:g} nm lies outside spectrum '{}', which covers {:g}–{:g} nm", run[i],
          s.name, first, last));
    }
    if (i > 0 && !(run[i] > run[i - 1])) {
      throw SpectrumError(fmt::format(
          "run wavelengths must strictly increase: {:g} nm follows {:g} nm", run[i], run[i - 1]));
    }
  }
  const std::vector<double> phi = photon_flux(s);
  const std::vector<double>& xs = s.wavelength_nm;

  // Monochromatic run: photon flux density × 1 nm.
  if (run.size() == 1) return {interpolate(xs, phi, run[0]) * 1.0};

  // Hat functions on the run grid × Φ piecewise linear on the spectrum grid.
  // On every sub-interval [a, b] of the merged breakpoints both factors are
  // linear, so ∫ h Φ = (b - a)/6 (2 h_a Φ_a + h_a Φ_b + h_b Φ_a + 2 h_b Φ_b)
  // exactly (Simpson's rule on a quadratic).
  std::vector<double> w(run.size(), 0.0);
  for (std::size_t i = 0; i + 1 < run.size(); ++i) {
    const double l0 = run[i], l1 = run[i + 1], width = l1 - l0;
    // h_down = weight of run[i] (1 at l0, 0 at l1); h_up = 1 - h_down.
    const auto down = [&](double x) { return (l1 - x) / width; };
    double a = l0, phi_a = interpolate(xs, phi, l0);
    std::size_t j = static_cast<std::size_t>(std::upper_bound(xs.begin(), xs.end(), l0) - xs.begin());
    while (true) {
      const bool last_piece = !(j < xs.size() && xs[j] < l1);
      const double b = last_piece ? l1 : xs[j];
      const double phi_b = last_piece ? interpolate(xs, phi, l1) : phi[j];
      const double da = down(a), db = last_piece ? 0.0 : down(b);
      const double ua = 1.0 - da, ub = 1.0 - db;
      const double f = (b - a) / 6.0;
      w[i] += f * (2.0 * da * phi_a + da * phi_b + db * phi_a + 2.0 * db * phi_b);
      w[i + 1] += f * (2.0 * ua * phi_a + ua * phi_b + ub * phi_a + 2.0 * ub * phi_b);
      if (last_piece) break;
      a = b, phi_a = phi_b, ++j;
    }
  }
  return w;
}

double current_mA_per_cm2(double photons_per_m2_s) {
  // q Φ in A/m^2; 1 A/m^2 = 1000 mA / 10^4 cm^2 = 0.1 mA/cm^2.
  return kElementaryCharge_C * photons_per_m2_s * 0.1;
}

double max_current_mA_per_cm2(const Spectrum& s, double lo_nm, double hi_nm) {
  check_range(s, lo_nm, hi_nm, "J_max");
  return current_mA_per_cm2(integrate_piecewise_linear(s.wavelength_nm, photon_flux(s), lo_nm, hi_nm));
}

}  // namespace lumtrap
