#pragma once
// Solar spectra and photogenerated current. Built in: ASTM G173-03 (2003)
// AM1.5G (global tilt 37°), AM1.5D (direct + circumsolar) and AM0
// (extraterrestrial), read from materials/astm_g173_03.csv; a user spectrum
// is a `wavelength_nm,irradiance_W_m2_nm` CSV.
//
// Currents: J = q ∫ f(λ) Φ(λ) dλ with Φ = E λ / (h c) the photon flux
// (h, c, q: SI 2019 exact values, CODATA 2018).
// Φ is evaluated at the spectrum's grid points and taken piecewise linear
// between them. A quantity f known at the run's wavelengths λ_i (e.g.
// absorptance) is taken piecewise linear between them (hat functions h_i),
// so J = Σ_i f_i w_i with band weights w_i = ∫ h_i(λ) Φ(λ) dλ. The weights
// are integrated exactly: the breakpoints of the run grid and the spectrum
// grid are merged, and on each merged sub-interval h_i and Φ are both linear,
// so Simpson's rule on their (quadratic) product is exact. Hence Σ_i w_i is
// the trapezoid integral of Φ over [λ_first, λ_last] (to rounding), and as
// J is linear in f, losses and J_G add up to J_max = Σ_i w_i exactly.
#include <filesystem>
#include <stdexcept>
#include <string>
#include <vector>

namespace lumtrap {

struct Spectrum {
  std::string name;                      ///< "AM1.5G", "AM1.5D", "AM0" or the file path
  std::vector<double> wavelength_nm;     ///< strictly increasing
  std::vector<double> irradiance;        ///< W m^-2 nm^-1
};

struct SpectrumError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// One of "AM1.5G", "AM1.5D", "AM0" (ASTM G173-03). Throws on other names.
Spectrum builtin_spectrum(const std::string& name);

/// A user spectrum file (`wavelength_nm,irradiance_W_m2_nm`, '#' comments);
/// errors name file and line.
Spectrum load_spectrum_file(const std::filesystem::path& file);

/// ∫ E dλ over [lo, hi] (W/m^2), trapezoid on the spectrum's own grid
/// (partial intervals at the ends interpolated linearly). Throws
/// SpectrumError unless first <= lo <= hi <= last of the spectrum grid.
double integrated_irradiance(const Spectrum& s, double lo_nm, double hi_nm);

/// Photon flux density at the spectrum's grid points, photons m^-2 s^-1 nm^-1.
std::vector<double> photon_flux(const Spectrum& s);

/// Band weights w_i (photons m^-2 s^-1) of the run wavelengths (strictly
/// increasing, inside the spectrum's range). A single wavelength gets the
/// spectrum's photon flux density times 1 nm (documented: monochromatic runs
/// report currents per nm). Throws SpectrumError for an empty, unsorted or
/// out-of-range run grid.
std::vector<double> band_photon_weights(const Spectrum& s, const std::vector<double>& run_wavelengths_nm);

/// Current density in mA/cm^2 of a photon flux in photons m^-2 s^-1 (q Φ).
double current_mA_per_cm2(double photons_per_m2_s);

/// J_max in mA/cm^2: every photon between lo and hi absorbed (trapezoid of
/// Φ on the spectrum grid, partial end intervals interpolated; same range
/// rule as integrated_irradiance).
double max_current_mA_per_cm2(const Spectrum& s, double lo_nm, double hi_nm);

}  // namespace lumtrap
