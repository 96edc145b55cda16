// The closed forms used as references (optics/closed_forms.hpp) against
// values and limits stated in their sources.
#include <gtest/gtest.h>

#include <cmath>

#include "optics/closed_forms.hpp"

namespace lumtrap {
namespace {

// Air / n = 4.3: R = 38.8 % (common practice); symmetric in the two media.
TEST(ClosedForms, NormalIncidenceReflectance) {
  EXPECT_NEAR(normal_incidence_reflectance(1.0, 4.3), 0.388, 5e-4);
  EXPECT_DOUBLE_EQ(normal_incidence_reflectance(4.3, 1.0), normal_incidence_reflectance(1.0, 4.3));
}

// A layer of index sqrt(n0 ns) cancels the reflection; a layer of the
// substrate's own index changes nothing (Macleod, Thin-Film Optical
// Filters, 2010).
TEST(ClosedForms, QuarterWave) {
  EXPECT_NEAR(quarter_wave_reflectance(1.0, std::sqrt(4.3), 4.3), 0.0, 1e-16);
  // n1 = 1 (an "air" layer): R = ((ns - 1)/(ns + 1))², the bare substrate.
  EXPECT_NEAR(quarter_wave_reflectance(1.0, 1.0, 4.3), normal_incidence_reflectance(1.0, 4.3), 1e-16);
}

// Lossless slab in air: R = 2R1/(1 + R1), T = (1 - R1)/(1 + R1) (Born &
// Wolf, Principles of Optics, 1999 / common practice); an opaque slab
// reflects R1 only.
TEST(ClosedForms, IncoherentSlab) {
  const double R1 = 0.3;
  const SlabPowers lossless = incoherent_slab(R1, R1, 1.0);
  EXPECT_NEAR(lossless.R, 2 * R1 / (1 + R1), 1e-15);
  EXPECT_NEAR(lossless.T, (1 - R1) / (1 + R1), 1e-15);
  EXPECT_NEAR(lossless.A, 0.0, 1e-15);
  const SlabPowers opaque = incoherent_slab(R1, 0.9, 0.0);
  EXPECT_EQ(opaque.R, R1);
  EXPECT_EQ(opaque.T, 0.0);
}

// E3(0) = 1/2 and E3(1) = 0.109692 (Abramowitz & Stegun 1964, table 5.4,
// from memory); Green's absorptance tends to 4n²αW for weak absorption
// (Yablonovitch, J. Opt. Soc. Am. 72, 899, 1982) and to 1 for strong.
TEST(ClosedForms, LambertianAbsorptance) {
  EXPECT_EQ(exponential_integral_E3(0.0), 0.5);
  EXPECT_NEAR(exponential_integral_E3(1.0), 0.109692, 2e-6);
  const double n = 3.5;
  EXPECT_NEAR(lambertian_absorptance(1e-6, n) / 1e-6, 4 * n * n, 0.001 * 4 * n * n);
  EXPECT_NEAR(lambertian_absorptance(20.0, n), 1.0, 1e-9);
}

}  // namespace
}  // namespace lumtrap
