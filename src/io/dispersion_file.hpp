#pragma once
// Dispersion-formula files: a TOML file describing one material by a formula
// (optics/dispersion.hpp), read into a DispersionFormula. The schema is
// documented in materials/formulas/README.md; in short:
//
//   # what it is
//   # source: AUTHOR, JOURNAL VOLUME, PAGE (YEAR)   (or "illustrative values, not a measurement")
//   model = "tauc_lorentz"          # cauchy, sellmeier, tauc_lorentz, drude,
//                                   # oscillator_sum, doped_silicon
//   wavelength_range = ["300 nm", "1200 nm"]
//   eps_inf = 1.0                   # dimensionless values are TOML numbers
//   A = "100 eV"                    # quantities are strings with a unit
//   ...
//
// Units accepted in value strings (case-sensitive):
//   energy           eV, meV
//   length           nm, um, µm, mm (io/units.hpp)
//   area (Sellmeier C, Cauchy B)   um2, um^2, µm2, µm², nm2, nm^2, nm²
//   µm⁴ (Cauchy C)   um4, um^4, µm4, µm⁴, nm4, nm^4, nm⁴
//   density          cm-3, cm^-3, cm⁻³, /cm3
//   mobility         cm2/Vs, cm^2/Vs, cm²/Vs, cm2/(V s)
//
// The file's first '# source:' comment line becomes DispersionFormula::source
// and name is the file stem. Every parameter is checked when the file is
// read, and the formula is sampled once on a 1 nm grid over its range (n > 0,
// k >= 0), so that a file that reads is usable. Errors are
// DispersionFileError with the message
//   "FILE:LINE:COL: key 'KEY': value VALUE: what is wrong; allowed: ..."
// (FILE alone when the place is not known, e.g. an unreadable file).
// Unknown keys are errors.
#include <filesystem>
#include <stdexcept>
#include <vector>

#include "optics/dispersion.hpp"

namespace lumtrap {

struct DispersionFileError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// Reads and checks one formula file. A `band_to_band` material reference of
/// a doped_silicon file is resolved by find_material() relative to the
/// file's folder.
DispersionFormula read_dispersion_file(const std::filesystem::path& file);

/// Folder of the shipped formula files: materials_dir() / "formulas".
std::filesystem::path formulas_dir();

/// The shipped formula files (*.toml in formulas_dir()), sorted by name.
std::vector<std::filesystem::path> shipped_formula_files();

}  // namespace lumtrap
