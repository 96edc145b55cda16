// Bad fit input is refused with a message naming the file, line, key,
// value and what is allowed, before any tracing; and a parameter the curve
// does not depend on (flat direction) is refused by name.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <string>

#include <fmt/format.h>

#include "common/temp_dir.hpp"
#include "fit/fit_spec.hpp"
#include "fit/least_squares_fit.hpp"
#include "io/measured_curve.hpp"

namespace lumtrap {
namespace {

using ::testing::HasSubstr;

const char* kScene = R"([wafer]
thickness = "160 um"
[front]
texture = "planar"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = {{ from = "400 nm", to = "1000 nm", step = "50 nm" }}
{}
)";

const char* kCurve = "wavelength_nm,reflectance\n400,0.2\n500,0.1\n600,0.05\n700,0.06\n";

std::string error_of(const test::TempDir& dir, const std::string& fit, const std::string& curve = kCurve) {
  const auto scene = dir.write("scene.toml", fmt::format(fmt::runtime(kScene), fit));
  const auto measured = dir.write("measured.csv", curve);
  try {
    const FitSetup s = prepare_fit(scene, measured);
    fit_model(s);
  } catch (const std::exception& e) {
    return e.what();
  }
  return "no error";
}

const std::string kThickness = "[fit.parameters]\n\"front.films[0].thickness\" = ";

TEST(FitInputErrors, StartOutsideBounds) {
  const test::TempDir dir;
  const auto e = error_of(dir, kThickness + "{ start = \"120 nm\", min = \"50 nm\", max = \"100 nm\" }");
  EXPECT_THAT(e, HasSubstr("scene.toml:13:"));
  EXPECT_THAT(e, HasSubstr("front.films[0].thickness"));
  EXPECT_THAT(e, HasSubstr("120 nm"));
  EXPECT_THAT(e, HasSubstr("allowed: 50 to 100"));
}

TEST(FitInputErrors, MixedUnitsAndUnknownKeys) {
  const test::TempDir dir;
  EXPECT_THAT(error_of(dir, kThickness + "{ start = \"70 nm\", min = \"0.05 um\", max = \"100 nm\" }"),
              HasSubstr("allowed: all three in one unit"));
  EXPECT_THAT(error_of(dir, kThickness + "{ start = \"70 nm\", low = \"50 nm\", max = \"100 nm\" }"),
              HasSubstr("allowed: start, min, max"));
  EXPECT_THAT(error_of(dir, "[fit]\ncompare = \"transmission\"\n" + kThickness +
                                "{ start = \"70 nm\", min = \"50 nm\", max = \"100 nm\" }"),
              HasSubstr("value \"transmission\": allowed: \"total_reflectance\""));
  // a key the scene does not have is found by the scene reader, before tracing
  const auto e = error_of(dir, "[fit.parameters]\n\"front.films[0].thicknes\" = { start = \"70 nm\", min = \"50 nm\", "
                               "max = \"100 nm\" }");
  EXPECT_THAT(e, HasSubstr("thicknes"));
}

TEST(FitInputErrors, NonOverlappingWavelengths) {
  const test::TempDir dir;
  const auto e = error_of(dir, "[fit]\nfrom = \"1100 nm\"\nto = \"1200 nm\"\n" + kThickness +
                                   "{ start = \"70 nm\", min = \"50 nm\", max = \"100 nm\" }");
  EXPECT_THAT(e, HasSubstr("measured.csv"));
  EXPECT_THAT(e, HasSubstr("400 to 700 nm"));
  EXPECT_THAT(e, HasSubstr("allowed: ranges that overlap"));
}

TEST(FitInputErrors, BadMeasuredCurve) {
  const test::TempDir dir;
  const std::string fit = kThickness + "{ start = \"70 nm\", min = \"50 nm\", max = \"100 nm\" }";
  auto e = error_of(dir, fit, "wavelength_nm,reflectance\n400,0.2\n500,12.5\n600,0.05\n");
  EXPECT_THAT(e, HasSubstr("measured.csv:3: column reflectance: value \"12.5\": allowed: a fraction 0 to 1"));
  e = error_of(dir, fit, "wavelength_nm,reflectance\n400,0.2\n400,0.1\n600,0.05\n");
  EXPECT_THAT(e, HasSubstr("measured.csv:3: column wavelength_nm"));
  e = error_of(dir, fit, "wavelength_nm,reflectance,sigma\n400,0.2,0.01\n");
  EXPECT_THAT(e, HasSubstr("column \"sigma\""));
  e = error_of(dir, fit, "# no data\nwavelength_nm,reflectance,uncertainty\n400,0.2,0\n");
  EXPECT_THAT(e, HasSubstr("measured.csv:3: column uncertainty: value \"0\": allowed: > 0"));
}

// The planar solver at normal incidence with unpolarized light does not
// depend on the azimuth (rotational symmetry of a planar stack, common
// practice): a flat direction.
TEST(FitInputErrors, FlatDirection) {
  const test::TempDir dir;
  const auto e = error_of(dir, kThickness + "{ start = \"70 nm\", min = \"50 nm\", max = \"100 nm\" }\n"
                                            "\"illumination.azimuth\" = { start = \"10 deg\", min = \"0 deg\", max = \"90 deg\" }");
  EXPECT_THAT(e, HasSubstr("illumination.azimuth"));
  EXPECT_THAT(e, HasSubstr("flat direction"));
}

}  // namespace
}  // namespace lumtrap
