#pragma once
// A rear given by its measured internal reflectance instead of a film stack
// and a medium: `rear.medium = { reflectance = 0.65, diffuse_fraction = 1.0 }`
// or `reflectance = "file.csv"` (columns wavelength_nm,reflectance).
//
// Light in the silicon that meets the rear is reflected with probability
// R(λ) (the same at every angle and for both polarizations), Lambertian with
// probability diffuse_fraction and as a mirror otherwise; the rest is
// absorbed in the reflector (end state absorbed_rear_reflector). Nothing is
// transmitted. R is the reflectance seen from inside the silicon, as used to
// describe alloyed aluminium rears or to fit measurements (common practice).
#include <filesystem>
#include <vector>

namespace lumtrap {

struct RearReflector {
  double constant_reflectance = 0;   ///< when `file` is empty, in [0, 1]
  std::filesystem::path file;        ///< CSV of wavelength_nm,reflectance (absolute), or empty
  std::vector<double> wavelength_nm; ///< the CSV's rows, strictly increasing
  std::vector<double> reflectance;   ///< in [0, 1]
  double diffuse_fraction = 0;       ///< Lambertian share of the reflected light, [0, 1]

  /// R at a wavelength (nm): the constant, or linear between the CSV's rows
  /// (the scene reader refuses wavelengths outside the rows).
  double reflectance_at(double wavelength_nm) const;
};

/// Reads a reflectance CSV into r.wavelength_nm / r.reflectance: `#` comment
/// lines, the header `wavelength_nm,reflectance`, then rows with strictly
/// increasing wavelengths > 0 and reflectances in [0, 1]. Throws
/// std::runtime_error "FILE:LINE: what is wrong; allowed: ...".
void read_reflectance_csv(const std::filesystem::path& file, RearReflector& r);

}  // namespace lumtrap
