// Quantities with units as written in scene files (io/units.hpp).
#include "io/units.hpp"

#include <numbers>
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <string>

using namespace lumtrap;
using ::testing::HasSubstr;

namespace {


/// The UnitError message of `f(text)`, or "" when nothing was thrown.
template <class F>
std::string error_of(F f, const std::string& text) {
  try {
    f(text);
  } catch (const UnitError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

TEST(Units, LengthsInNanometres) {
  EXPECT_DOUBLE_EQ(parse_length_nm("75 nm"), 75.0);
  EXPECT_DOUBLE_EQ(parse_length_nm("75nm"), 75.0);
  EXPECT_DOUBLE_EQ(parse_length_nm("  75   nm "), 75.0);
  EXPECT_DOUBLE_EQ(parse_length_nm("0.18 um"), 180.0);
  EXPECT_DOUBLE_EQ(parse_length_nm("0.18 \xC2\xB5m"), 180.0);  // micro sign U+00B5
  EXPECT_DOUBLE_EQ(parse_length_nm("0.18 \xCE\xBCm"), 180.0);  // Greek mu U+03BC
  EXPECT_DOUBLE_EQ(parse_length_nm("1e-3 mm"), 1000.0);
  EXPECT_DOUBLE_EQ(parse_length_nm("-5 nm"), -5.0);
  EXPECT_DOUBLE_EQ(parse_length_nm("+5 nm"), 5.0);
  EXPECT_DOUBLE_EQ(parse_length_nm(".5 nm"), 0.5);
  EXPECT_EQ(parse_length_nm("75 nm"), 75.0);  // exact, no scaling
}

TEST(Units, LengthsInMicrometres) {
  EXPECT_EQ(parse_length_um("180 um"), 180.0);
  EXPECT_EQ(parse_length_um("180 \xC2\xB5m"), 180.0);
  EXPECT_EQ(parse_length_um("0.18 mm"), 180.0);
  EXPECT_EQ(parse_length_um("75 nm"), 0.075);  // divides by exactly 1000
  EXPECT_EQ(parse_length_um("1.5e2 um"), 150.0);
}

TEST(Units, Angles) {
  EXPECT_DOUBLE_EQ(parse_angle_rad("45 deg"), std::numbers::pi / 4);
  EXPECT_DOUBLE_EQ(parse_angle_rad("45\xC2\xB0"), std::numbers::pi / 4);  // "45°"
  EXPECT_EQ(parse_angle_rad("0.5 rad"), 0.5);
  EXPECT_EQ(parse_angle_deg("54.74 deg"), 54.74);
  EXPECT_DOUBLE_EQ(parse_angle_deg("0.5 rad"), 0.5 * 180 / std::numbers::pi);
  EXPECT_DOUBLE_EQ(parse_angle_rad("-30 deg"), -std::numbers::pi / 6);
}

TEST(Units, CurrentDensity) {
  EXPECT_EQ(parse_current_mA_cm2("0.02 mA/cm2"), 0.02);
  EXPECT_EQ(parse_current_mA_cm2("0.02 mA/cm^2"), 0.02);
  EXPECT_EQ(parse_current_mA_cm2("0.02 mA/cm\xC2\xB2"), 0.02);
  // 1 A/m² = 1000 mA / 10⁴ cm² = 0.1 mA/cm² (SI prefixes).
  EXPECT_DOUBLE_EQ(parse_current_mA_cm2("0.2 A/m2"), 0.02);
  EXPECT_DOUBLE_EQ(parse_current_mA_cm2("400 A/m^2"), 40.0);
}

TEST(Units, BareNumberAsksForTheUnit) {
  EXPECT_THAT(error_of(parse_length_nm, "75"), HasSubstr("write the unit: e.g. \"75 nm\""));
  EXPECT_THAT(error_of(parse_length_um, "180"), HasSubstr("write the unit: e.g. \"180 um\""));
  EXPECT_THAT(error_of(parse_angle_rad, "45"), HasSubstr("e.g. \"45 deg\""));
  EXPECT_THAT(error_of(parse_current_mA_cm2, "0.02"), HasSubstr("e.g. \"0.02 mA/cm2\""));
  const std::string e = error_of(parse_length_nm, " 75 ");
  EXPECT_THAT(e, HasSubstr("value \" 75 \""));
  EXPECT_THAT(e, HasSubstr("bare number"));
}

TEST(Units, UnknownUnitsAreRejectedWithTheAllowedList) {
  const std::string metres = error_of(parse_length_nm, "1e-3 m");
  EXPECT_THAT(metres, HasSubstr("value \"1e-3 m\""));
  EXPECT_THAT(metres, HasSubstr("unit \"m\" is not accepted"));
  EXPECT_THAT(metres, HasSubstr("allowed: a length with one of the units nm, um, µm, mm"));
  for (const char* text : {"5 cm", "5 NM", "5 nm2", "5 nm nm", "5 um.", "5 in"})
    EXPECT_THAT(error_of(parse_length_um, text), HasSubstr("is not accepted")) << text;
  EXPECT_THAT(error_of(parse_angle_rad, "45 degrees"), HasSubstr("allowed: an angle with one of the units deg, °, rad"));
  EXPECT_THAT(error_of(parse_angle_rad, "45 nm"), HasSubstr("unit \"nm\" is not accepted"));
  EXPECT_THAT(error_of(parse_current_mA_cm2, "0.02 mA"), HasSubstr("mA/cm2, mA/cm^2"));
  // A length unit is not an angle and vice versa.
  EXPECT_THAT(error_of(parse_length_nm, "45 deg"), HasSubstr("unit \"deg\" is not accepted"));
}

TEST(Units, GarbageIsRejected) {
  for (const char* text : {"", "   ", "nm", "abc", "--5 nm", "+-5 nm", "5,0 nm", "inf nm", "nan nm", "1e999 nm",
                           "0x10 nm", "five nm"}) {
    const std::string e = error_of(parse_length_nm, text);
    EXPECT_FALSE(e.empty()) << "accepted: '" << text << "'";
    EXPECT_THAT(e, HasSubstr(std::string("value \"") + text + "\"")) << text;
    EXPECT_THAT(e, HasSubstr("allowed:")) << text;
  }
}

TEST(Units, FormatReadsBackExactly) {
  EXPECT_EQ(format_length_nm(75), "75 nm");
  EXPECT_EQ(format_length_um(160), "160 um");
  EXPECT_EQ(format_length_um(0.075), "0.075 um");
  EXPECT_EQ(format_angle_deg(54.74), "54.74 deg");
  EXPECT_EQ(format_current_mA_cm2(0.02), "0.02 mA/cm2");
  EXPECT_EQ(format_number(-0.0), "0");
  EXPECT_EQ(format_number(1e-5), "1e-05");
  EXPECT_THROW(format_number(std::nan("")), UnitError);

  EXPECT_EQ(format_angle_rad(std::numbers::pi / 4), "45 deg");
  EXPECT_EQ(format_angle_rad(0), "0 deg");
  for (double rad : {0.5, 0.1, 1.0, std::numbers::pi / 3, 5.75958653158129, 1e-9}) {
    const std::string text = format_angle_rad(rad);
    EXPECT_EQ(parse_angle_rad(text), rad) << text;
  }
  for (double x : {0.1, 1.0 / 3, 123456.789, 3e-7, 2.5e10, 54.735610317245346}) {
    EXPECT_EQ(parse_length_nm(format_length_nm(x)), x);
    EXPECT_EQ(parse_length_um(format_length_um(x)), x);
    EXPECT_EQ(parse_angle_deg(format_angle_deg(x)), x);
    EXPECT_EQ(parse_current_mA_cm2(format_current_mA_cm2(x)), x);
  }
}
