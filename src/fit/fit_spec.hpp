#pragma once
// The [fit] table of a scene file: which scene keys are free, their start
// values and bounds, the wavelength range and what is compared with the
// measured curve (docs/scene-format.md, "Fits"):
//
//   [fit]
//   compare = "total_reflectance"   # default; or "first_surface_reflectance"
//   from = "400 nm"                 # optional: shortest measured wavelength used
//   to = "1000 nm"                  # optional: longest
//
//   [fit.parameters]                # keys as in [sweep] (dotted scene keys)
//   "front.films[0].thickness" = { start = "70 nm", min = "50 nm", max = "100 nm" }
//   "front.pyramids.gap" = { start = "0.5 um", min = "0 um", max = "2 um" }
//
// total_reflectance = reflected_front + escaped_front (all light leaving
// through the front, what an integrating sphere collects);
// first_surface_reflectance = reflected_front only.
// start, min and max are plain numbers, or quantities written in one and
// the same unit (the value set in the scene keeps that unit); min < max and
// min <= start <= max. Errors: FitSpecError naming FILE:LINE:COL, key,
// value and what is allowed. Pure: reads, traces nothing.
#include <filesystem>
#include <limits>
#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

#include <toml++/toml.h>

namespace lumtrap {

struct FitSpecError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

struct FitParameter {
  std::string key;      ///< dotted scene key, e.g. "front.films[0].thickness"
  double start = 0, lower = 0, upper = 0;  ///< in `unit`
  std::string unit;     ///< as written ("nm", "um", "deg"); empty for plain numbers
  std::string where;    ///< FILE:LINE:COL of the parameter's table
};

enum class CompareQuantity { total_reflectance, first_surface_reflectance };

struct FitSpec {
  std::vector<FitParameter> parameters;  ///< in written order
  CompareQuantity compare = CompareQuantity::total_reflectance;
  double from_nm = 0;
  double to_nm = std::numeric_limits<double>::infinity();
  std::string where;                     ///< FILE:LINE:COL of [fit]
};

/// Reads root["fit"]; FitSpecError when it is absent or malformed.
FitSpec read_fit_spec(const toml::table& root, const std::filesystem::path& file);

/// The TOML value text of parameter p at value x: "72.5 nm" or "0.25".
std::string parameter_value_toml(const FitParameter& p, double x);

/// (key, TOML value text) of every parameter at values x, for variant_table().
std::vector<std::pair<std::string, std::string>> parameter_values(const FitSpec& spec, const std::vector<double>& x);

}  // namespace lumtrap
