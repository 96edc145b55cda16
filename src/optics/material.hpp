#pragma once
// Optical constants n(λ), k(λ) of a material: a table read from a
// `wavelength_nm,n,k` CSV file (lines starting with '#' are comments that
// name the source), or a constant index given inline. Linear interpolation of
// n and k; a lookup outside the table's range is an error (no extrapolation).
#include <filesystem>
#include <stdexcept>
#include <string>
#include <vector>

#include "optics/complex_index.hpp"

namespace lumtrap {

struct Material {
  std::string name;          ///< id ("si_green2008"), path, or "n=2,k=0" for a constant
  std::string source;        ///< text after the file's first '# source:' ("" if none), or "constant"
  std::string file;          ///< the table's path as opened; empty for a constant
  std::vector<double> wavelength_nm, n, k;  ///< strictly increasing wavelengths (nm);
                                            ///< a constant has one entry each, wavelength_nm = {0} (unused)
  bool constant = false;

  /// n + ik at λ; throws MaterialError naming the material, its range and λ
  /// when λ lies outside the table.
  cplx index_at(double wavelength_nm) const;
  double min_wavelength_nm() const;  ///< -inf for a constant
  double max_wavelength_nm() const;  ///< +inf for a constant
};

struct MaterialError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// Reads a CSV table. Errors name the file and the line: missing columns,
/// non-numeric cells, unsorted or duplicate wavelengths, negative n or k,
/// no data rows.
Material load_material_file(const std::filesystem::path& file);

/// A numeric CSV file as read, before any physics checks (shared by the
/// material tables and the spectrum files). Rules: lines whose first
/// non-blank character is '#' are comments, blank lines are skipped, the
/// first other line may be the header (cells equal to `header`), every data
/// row has exactly header.size() finite numbers (spaces around cells and a
/// trailing '\r' tolerated), the first column is > 0 and strictly
/// increasing, the other columns are >= 0, and there is at least one row.
struct NumericTable {
  std::vector<std::vector<double>> columns;  ///< columns[c][row]
  std::vector<int> line_of_row;              ///< 1-based file line of each row
  std::string source;                         ///< text after the first '# source:' ("" if none)
};

/// Reads `file` by the rules above; throws std::runtime_error with the
/// message "FILE:LINE: what is wrong; what is allowed". A table read once
/// is kept by the process while its file keeps its size and modification
/// time (sweeps validate thousands of variants against the same tables).
NumericTable read_numeric_csv(const std::filesystem::path& file,
                              const std::vector<std::string>& header);

/// A constant index n + ik (n > 0, k >= 0).
Material constant_material(double n, double k);

/// Where the shipped tables are, and why there. Looked up in this order
/// (no source-tree path is compiled in, so an installed tree can be moved):
///   1. $LUMTRAP_MATERIALS, when set and not empty;
///   2. <folder of the running binary>/../share/lumtrap/materials (an
///      installed tree: PREFIX/bin/lumtrap, PREFIX/share/lumtrap/materials);
///   3. <folder of the running binary>/share/lumtrap/materials (the build
///      tree: CMake links build/share/lumtrap/materials to materials/).
/// When none exists, `dir` is candidate 2 and `how` says where it looked, so
/// the first failing lookup names the places.
struct MaterialsLocation {
  std::filesystem::path dir;
  std::string how;  ///< "LUMTRAP_MATERIALS", "installed beside the binary", "build tree" or "not found (...)"
};
MaterialsLocation locate_materials();

/// locate_materials().dir.
std::filesystem::path materials_dir();

/// Reads a dispersion-formula file (TOML) into a Material sampled from the
/// formula. The reader lives in src/io (io/formula_material_file.hpp), which
/// installs it here, as geometry's height-map loader is installed.
using FormulaFileLoader = Material (*)(const std::filesystem::path& file);
void set_formula_file_loader(FormulaFileLoader loader);

/// Resolves a material reference: "air" (built-in constant n = 1, k = 0), an
/// id of a shipped table (file materials/<id>.csv), an id of a shipped
/// formula (file materials/formulas/<id>.toml; a table of the same id wins),
/// or a path to a user's CSV or formula `.toml` file (absolute, or relative
/// to `relative_to`, typically the scene file's folder; relative to the
/// working directory when `relative_to` is empty). Formula files need the
/// loader above (MaterialError when none is installed).
/// Throws MaterialError listing the known ids when nothing matches.
Material find_material(const std::string& id_or_path,
                       const std::filesystem::path& relative_to = {});

/// Ids of the shipped tables (file stems in materials_dir()), sorted. The
/// solar spectrum table astm_g173_03 is not a material and is left out; the
/// built-in "air" is not a table and is left out too.
std::vector<std::string> shipped_material_ids();

/// Ids of the shipped formula files (stems of materials/formulas/*.toml), sorted.
std::vector<std::string> shipped_formula_ids();

}  // namespace lumtrap
