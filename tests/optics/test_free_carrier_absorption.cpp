// Free-carrier absorption of crystalline silicon
// (optics/free_carrier_absorption.hpp): the formulas at a few points against
// hand evaluation, broad order-of-magnitude brackets against band-to-band
// absorption of intrinsic silicon (shipped table si_green2008), validity
// flags and argument errors.
#include "optics/free_carrier_absorption.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>

#include "optics/complex_index.hpp"
#include "optics/material.hpp"

using namespace lumtrap;
using ::testing::HasSubstr;

namespace {

/// Band-to-band α of intrinsic silicon in 1/cm from M. A. Green, Sol. Energ.
/// Mat. Sol. Cells 92, 1305 (2008) (shipped table), α = 4πk/λ.
double alpha_bb_per_cm(const Material& si, double wavelength_nm) {
  return absorption_coefficient_per_nm(si.index_at(wavelength_nm), wavelength_nm) * 1e7;
}

/// First wavelength on a 5 nm grid from 800 nm up where α_fca > α_bb.
double crossover_nm(const Material& si, FcaParametrization p, DopingType t, double N) {
  for (double wl = 800.0; wl <= 1450.0; wl += 5.0)
    if (free_carrier_absorption_per_cm(p, t, wl, N) > alpha_bb_per_cm(si, wl)) return wl;
  return INFINITY;
}

}  // namespace

TEST(FreeCarrierAbsorption, FormulasAgainstHandEvaluation) {
  // Coefficients as recalled (from memory) in free_carrier_absorption.hpp.
  // schroder1978, n-type, N = 1e19, λ = 1.5 µm: 1.0e-18 · 1.5² · 1e19 = 22.5 /cm
  EXPECT_NEAR(free_carrier_absorption_per_cm(FcaParametrization::schroder1978, DopingType::n,
                                             1500.0, 1e19),
              22.5, 22.5 * 1e-14);
  // schroder1978, p-type, N = 1e20, λ = 1.5 µm: 2.7e-18 · 2.25 · 1e20 = 607.5 /cm
  EXPECT_NEAR(free_carrier_absorption_per_cm(FcaParametrization::schroder1978, DopingType::p,
                                             1500.0, 1e20),
              607.5, 607.5 * 1e-14);
  // green1995, n-type, N = 1e19, λ = 1000 nm: 2.6e-27 · 1000³ · 1e19 = 26 /cm
  EXPECT_NEAR(free_carrier_absorption_per_cm(FcaParametrization::green1995, DopingType::n, 1000.0,
                                             1e19),
              26.0, 26.0 * 1e-14);
  // green1995, p-type, N = 5e18, λ = 1200 nm: 2.7e-24 · 1200² · 5e18 = 19.44 /cm
  EXPECT_NEAR(free_carrier_absorption_per_cm(FcaParametrization::green1995, DopingType::p, 1200.0,
                                             5e18),
              19.44, 19.44 * 1e-14);
  // The p-type laws coincide (2.7e-18 (λ/µm)² = 2.7e-24 (λ/nm)²).
  for (double wl : {1000.0, 1300.0, 1800.0})
    EXPECT_NEAR(free_carrier_absorption_per_cm(FcaParametrization::green1995, DopingType::p, wl, 1e19),
                free_carrier_absorption_per_cm(FcaParametrization::schroder1978, DopingType::p, wl, 1e19),
                1e-12);
  EXPECT_EQ(free_carrier_absorption_per_cm(FcaParametrization::green1995, DopingType::n, 1000.0, 0.0),
            0.0);
}

TEST(FreeCarrierAbsorption, PowerLawScaling) {
  // α ∝ λ^a N^b with the exponents of the law: doubling N doubles α (b = 1);
  // doubling λ multiplies α by 2^a.
  for (FcaParametrization p : all_fca_parametrizations())
    for (DopingType t : {DopingType::n, DopingType::p}) {
      const FcaPowerLaw law = fca_power_law(p, t);
      const double a = free_carrier_absorption_per_cm(p, t, 700.0, 3e18);
      EXPECT_NEAR(free_carrier_absorption_per_cm(p, t, 1400.0, 3e18) / a,
                  std::pow(2.0, law.wavelength_exponent), 1e-12);
      EXPECT_NEAR(free_carrier_absorption_per_cm(p, t, 700.0, 6e18) / a,
                  std::pow(2.0, law.density_exponent), 1e-12);
      EXPECT_NEAR(fca_wavelength_factor(p, t, 700.0) * std::pow(3e18, law.density_exponent), a,
                  a * 1e-14);
    }
}

TEST(FreeCarrierAbsorption, HeavyDopingOvertakesBandToBandNearTheGap) {
  // Statement of the trade (from memory, used as a broad bracket): at
  // N ≈ 1e19–1e20 cm⁻³ free-carrier absorption exceeds band-to-band
  // absorption of intrinsic silicon from about 1000–1100 nm upward. Checked
  // as: the crossover lies in [900, 1100] nm, and beyond it FCA stays larger
  // up to 1450 nm (end of the table).
  const Material si = find_material("si_green2008");
  for (FcaParametrization p : all_fca_parametrizations())
    for (DopingType t : {DopingType::n, DopingType::p})
      for (double N : {1e19, 1e20}) {
        const double x = crossover_nm(si, p, t, N);
        std::printf("%s %s-type N = %.0e: FCA > band-to-band from %.0f nm\n",
                    std::string(fca_parametrization_id(p)).c_str(),
                    std::string(doping_type_name(t)).c_str(), N, x);
        EXPECT_GE(x, 900.0);
        EXPECT_LE(x, 1100.0);
        for (double wl = x; wl <= 1450.0; wl += 5.0)
          EXPECT_GT(free_carrier_absorption_per_cm(p, t, wl, N), alpha_bb_per_cm(si, wl)) << wl;
      }
}

TEST(FreeCarrierAbsorption, LightDopingMattersOnlyBeyond1150nm) {
  // Statement of the trade (from memory, broad bracket): at 1e16 cm⁻³ FCA
  // matters only near 1150–1200 nm. Checked as: crossover in [1150, 1250] nm,
  // and FCA below 1 % of band-to-band absorption up to 1100 nm.
  const Material si = find_material("si_green2008");
  for (FcaParametrization p : all_fca_parametrizations())
    for (DopingType t : {DopingType::n, DopingType::p}) {
      const double x = crossover_nm(si, p, t, 1e16);
      std::printf("%s %s-type N = 1e16: FCA > band-to-band from %.0f nm\n",
                  std::string(fca_parametrization_id(p)).c_str(),
                  std::string(doping_type_name(t)).c_str(), x);
      EXPECT_GE(x, 1150.0);
      EXPECT_LE(x, 1250.0);
      for (double wl = 800.0; wl <= 1100.0; wl += 10.0)
        EXPECT_LT(free_carrier_absorption_per_cm(p, t, wl, 1e16), 0.01 * alpha_bb_per_cm(si, wl))
            << wl;
    }
}

TEST(FreeCarrierAbsorption, ValidityWindowAndIds) {
  for (FcaParametrization p : all_fca_parametrizations()) {
    EXPECT_EQ(fca_parametrization_from_id(fca_parametrization_id(p)), p);
    EXPECT_FALSE(fca_citation(p).empty());
    for (DopingType t : {DopingType::n, DopingType::p}) {
      const FcaValidity v = fca_validity(p, t);
      EXPECT_TRUE(fca_within_validity(p, t, v.min_wavelength_nm, v.min_density_cm3));
      EXPECT_TRUE(fca_within_validity(p, t, v.max_wavelength_nm, v.max_density_cm3));
      EXPECT_FALSE(fca_within_validity(p, t, v.min_wavelength_nm - 1.0, 1e18));
      EXPECT_FALSE(fca_within_validity(p, t, v.max_wavelength_nm + 1.0, 1e18));
      EXPECT_FALSE(fca_within_validity(p, t, 1200.0, v.max_density_cm3 * 2.0));
      EXPECT_FALSE(fca_within_validity(p, t, 1200.0, v.min_density_cm3 / 2.0));
    }
  }
  try {
    fca_parametrization_from_id("baker");
    FAIL();
  } catch (const FreeCarrierError& e) {
    EXPECT_THAT(e.what(), HasSubstr("\"baker\""));
    EXPECT_THAT(e.what(), HasSubstr("allowed: \"schroder1978\", \"green1995\""));
  }
}

TEST(FreeCarrierAbsorption, ArgumentErrorsSayWhatIsAllowed) {
  const auto msg = [](double wl, double N) {
    try {
      free_carrier_absorption_per_cm(FcaParametrization::green1995, DopingType::n, wl, N);
    } catch (const FreeCarrierError& e) {
      return std::string(e.what());
    }
    return std::string();
  };
  EXPECT_THAT(msg(0.0, 1e19), HasSubstr("wavelength 0 nm is not allowed; it must be finite and > 0"));
  EXPECT_THAT(msg(1000.0, -1.0), HasSubstr("carrier density -1 cm^-3 is not allowed"));
  EXPECT_THAT(msg(1000.0, NAN), HasSubstr("must be finite and >= 0"));
}
