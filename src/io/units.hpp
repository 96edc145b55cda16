#pragma once
// Quantities with units, as written in scene files: a number followed by a
// unit, e.g. "75 nm", "180 um", "180 µm", "0.18 mm", "54.74 deg", "0.5 rad",
// "0.02 mA/cm2". The space between number and unit is optional. The whole
// text must be consumed; a bare number ("75") is an error, because a
// missing unit is the commonest silent mistake in optics inputs.
//
// Accepted units (case-sensitive):
//   length:          nm, um, µm (U+00B5 or U+03BC), mm   (not m: wafer optics
//                    never needs it and "1 m" is usually a typo)
//   angle:           deg, ° , rad
//   current density: mA/cm2, mA/cm^2, mA/cm², A/m2, A/m^2, A/m²
//
// Errors are UnitError; the message starts with `value "<text>"` and ends
// with the allowed units, so that a caller can prefix file, line and key.
#include <cstdint>
#include <stdexcept>
#include <string>
#include <string_view>

namespace lumtrap {

struct UnitError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// A quantity's text split into its leading number and the rest (its unit),
/// spaces around either trimmed. The number is what std::from_chars reads in
/// general format after an optional sign. The views point into the text.
struct QuantityText {
  enum Problem { none, empty, no_number, out_of_range, not_finite } problem = none;
  double number = 0;
  std::string_view number_text;  ///< as written, sign included
  std::string_view unit;         ///< empty for a plain number
  bool integer = false;          ///< a plain number written as an integer (no '.', no exponent)
  std::int64_t as_int = 0;
};
QuantityText split_quantity(std::string_view text);

/// Length in nanometres. Sign is kept (range checks belong to the caller).
double parse_length_nm(std::string_view text);
/// Length in micrometres.
double parse_length_um(std::string_view text);
/// Angle in radians ("45 deg", "45°", "0.5 rad").
double parse_angle_rad(std::string_view text);
/// Angle in degrees (same syntax as parse_angle_rad).
double parse_angle_deg(std::string_view text);
/// Current density in mA/cm² (1 A/m² = 0.1 mA/cm²).
double parse_current_mA_cm2(std::string_view text);

/// Shortest decimal text that reads back to exactly the same double
/// ("75", "0.1", "1e-05"). Throws UnitError for inf/nan.
std::string format_number(double x);
/// "75 nm"
std::string format_length_nm(double nm);
/// "160 um"
std::string format_length_um(double um);
/// "54.735610317245346 deg"
std::string format_angle_deg(double deg);
/// An angle given in radians, written in degrees when that text reads back
/// to exactly the same radians ("45 deg"), else in radians ("0.5 rad").
std::string format_angle_rad(double rad);
/// "0.02 mA/cm2"
std::string format_current_mA_cm2(double mA_cm2);

}  // namespace lumtrap
