// Solar spectra: ASTM G173-03 integrals, J_max, band weights, user files.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdlib>
#include <fstream>
#include <iomanip>
#include <iostream>
#include <sstream>
#include <string>

#include "optics/material.hpp"  // materials_dir
#include "optics/spectrum.hpp"

#include "common/temp_dir.hpp"

namespace fs = std::filesystem;
using namespace lumtrap;

namespace {

using test::TempDir;

/// ∫_lo^hi of the piecewise-linear interpolant of (x, y), written here
/// independently of the library: trapezoid, with the end pieces cut at
/// linearly interpolated values.
double trapezoid(const std::vector<double>& x, const std::vector<double>& y, double lo, double hi) {
  auto at = [&](double t) {
    for (std::size_t j = 0; j + 1 < x.size(); ++j) {
      if (t >= x[j] && t <= x[j + 1]) return y[j] + (y[j + 1] - y[j]) * (t - x[j]) / (x[j + 1] - x[j]);
    }
    return std::nan("");
  };
  double sum = 0;
  for (std::size_t j = 0; j + 1 < x.size(); ++j) {
    const double a = std::max(lo, x[j]), b = std::min(hi, x[j + 1]);
    if (b > a) sum += 0.5 * (b - a) * (at(a) + at(b));
  }
  return sum;
}

double relative(double a, double b) { return std::abs(a - b) / std::abs(b); }

}  // namespace

// ---------------------------------------------------------------------------
// ASTM G173-03 integrals over 280–4000 nm. Reference values: ASTM G173-03,
// "Standard Tables for Reference Solar Spectral Irradiances: Direct Normal
// and Hemispherical on 37° Tilted Surface" (ASTM International, 2003):
// AM1.5G 1000.4 W/m^2, AM1.5D 900.1 W/m^2, AM0 1348.0 W/m^2. The shipped
// file's own header states 1347.9 for AM0 (trapezoid); both within 0.1 %.

TEST(Spectrum, AstmG173Integrals) {
  const Spectrum g = builtin_spectrum("AM1.5G");
  const Spectrum d = builtin_spectrum("AM1.5D");
  const Spectrum o = builtin_spectrum("AM0");
  EXPECT_EQ(g.name, "AM1.5G");
  EXPECT_EQ(g.wavelength_nm.front(), 280.0);
  EXPECT_EQ(g.wavelength_nm.back(), 4000.0);
  EXPECT_EQ(g.wavelength_nm.size(), 2002u);
  const double eg = integrated_irradiance(g, 280, 4000);
  const double ed = integrated_irradiance(d, 280, 4000);
  const double eo = integrated_irradiance(o, 280, 4000);
  std::cout << std::fixed << std::setprecision(2) << "ASTM G173-03 integrals 280-4000 nm: AM1.5G "
            << eg << ", AM1.5D " << ed << ", AM0 " << eo << " W/m^2\n";
  EXPECT_LT(relative(eg, 1000.4), 1e-3);
  EXPECT_LT(relative(ed, 900.1), 1e-3);
  EXPECT_LT(relative(eo, 1348.0), 1e-3);
  EXPECT_LT(relative(eo, 1347.9), 1e-3);
  EXPECT_EQ(builtin_spectrum("am1.5g").name, "AM1.5G");
  EXPECT_THROW(builtin_spectrum("AM2"), SpectrumError);
}

// J_max over 300–1200 nm under AM1.5G, checked against a recomputation
// written here: own parser of the shipped file, own constants, plain
// trapezoid of E λ / (h c) on the file grid.
TEST(Spectrum, MaxCurrentAm15g300to1200) {
  const double j_lib = max_current_mA_per_cm2(builtin_spectrum("AM1.5G"), 300, 1200);

  std::ifstream in(materials_dir() / "astm_g173_03.csv");
  ASSERT_TRUE(in);
  std::vector<double> wl, e;
  std::string line;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#' || line[0] == 'w') continue;
    std::stringstream ss(line);
    std::string c0, c1, c2;
    std::getline(ss, c0, ',');
    std::getline(ss, c1, ',');  // am0
    std::getline(ss, c2, ',');  // am15g
    wl.push_back(std::strtod(c0.c_str(), nullptr));
    e.push_back(std::strtod(c2.c_str(), nullptr));
  }
  ASSERT_EQ(wl.size(), 2002u);
  const double h = 6.62607015e-34, c = 299792458.0, q = 1.602176634e-19;  // SI 2019 exact
  double photons = 0;  // m^-2 s^-1
  for (std::size_t j = 0; j + 1 < wl.size(); ++j) {
    if (wl[j] < 300 || wl[j + 1] > 1200) continue;
    const double p0 = e[j] * wl[j] * 1e-9 / (h * c), p1 = e[j + 1] * wl[j + 1] * 1e-9 / (h * c);
    photons += 0.5 * (wl[j + 1] - wl[j]) * (p0 + p1);
  }
  const double j_check = q * photons / 10.0;  // A/m^2 -> mA/cm^2
  std::cout << std::setprecision(4) << "J_max(AM1.5G, 300-1200 nm) = " << j_lib
            << " mA/cm^2 (recomputed: " << j_check << ")\n";
  EXPECT_LT(relative(j_lib, j_check), 1e-12);
}

TEST(Spectrum, CurrentUnits) {
  // 1e21 photons m^-2 s^-1 × q = 160.2176634 A/m^2 = 16.02176634 mA/cm^2.
  EXPECT_NEAR(current_mA_per_cm2(1e21), 16.02176634, 1e-12);
  EXPECT_EQ(current_mA_per_cm2(0), 0.0);
}

// ---------------------------------------------------------------------------
// Band weights

TEST(Spectrum, BandWeightsSumToPhotonFluxIntegral) {
  const Spectrum g = builtin_spectrum("AM1.5G");
  const std::vector<double> phi = photon_flux(g);
  std::vector<std::vector<double>> grids;
  {  // aligned with the spectrum grid, 10 nm
    std::vector<double> r;
    for (double l = 300; l <= 1200; l += 10) r.push_back(l);
    grids.push_back(r);
  }
  {  // irregular, not on the spectrum grid
    grids.push_back({300.25, 333.3, 401.7, 402.2, 555.55, 870.1, 1011.0, 1199.7});
  }
  {  // finer than the spectrum grid (0.5 nm there)
    std::vector<double> r;
    for (int i = 0; i <= 200; ++i) r.push_back(300.0 + 0.07 * i);
    grids.push_back(r);
  }
  {  // the whole spectrum, two points
    grids.push_back({280.0, 4000.0});
  }
  for (const auto& run : grids) {
    const std::vector<double> w = band_photon_weights(g, run);
    ASSERT_EQ(w.size(), run.size());
    double sum = 0;
    for (double wi : w) {
      EXPECT_GE(wi, 0.0);
      sum += wi;
    }
    const double expected = trapezoid(g.wavelength_nm, phi, run.front(), run.back());
    EXPECT_LT(relative(sum, expected), 1e-12) << run.front() << "–" << run.back();
    EXPECT_LT(relative(current_mA_per_cm2(sum),
                       max_current_mA_per_cm2(g, run.front(), run.back())),
              1e-12);
  }
}

TEST(Spectrum, BandWeightsExactOnLinearPhotonFlux) {
  // Two-point spectrum with Φ linear: Φ(x) = p + s (x - 400) on [400, 600].
  // Irradiance chosen so that Φ(400) = 1e18 and Φ(600) = 3e18 per nm.
  const double hc = 6.62607015e-34 * 299792458.0;
  Spectrum sp;
  sp.name = "linear";
  sp.wavelength_nm = {400, 600};
  sp.irradiance = {1e18 * hc / 400e-9, 3e18 * hc / 600e-9};
  const double p = 1e18, s = (3e18 - 1e18) / 200;
  const std::vector<double> w = band_photon_weights(sp, {400, 500, 600});
  // Hand integrals (u = x - 400):
  // w0 = ∫_0^100 (1 - u/100)(p + s u) du = 50 p + s (5000 - 10000/3)
  // w1 = ∫_0^100 (u/100)(p + s u) du + ∫_100^200 ((200 - u)/100)(p + s u) du
  //    = (50 p + s 10000/3) + (50 p + s (30000 - 70000/3))   [= 100 p + 10000 s]
  // w2 = ∫_100^200 ((u - 100)/100)(p + s u) du = 50 p + s (70000/3 - 15000)
  EXPECT_NEAR(w[0], 50 * p + s * (5000.0 - 10000.0 / 3), 1e-9 * p);
  EXPECT_NEAR(w[1], 100 * p + 10000 * s, 1e-9 * p);
  EXPECT_NEAR(w[2], 50 * p + s * (70000.0 / 3 - 15000), 1e-9 * p);

  // f linear in λ is reproduced exactly by the hats, so Σ f_i w_i = ∫ f Φ.
  // With f(x) = u/200: ∫_0^200 (u/200)(p + s u) du = 100 p + s 8000000/600.
  const double fw = 0.0 * w[0] + 0.5 * w[1] + 1.0 * w[2];
  EXPECT_NEAR(fw, 100 * p + s * 8e6 / 600, 1e-9 * p);

  // A monochromatic run: photon flux density × 1 nm.
  const std::vector<double> one = band_photon_weights(sp, {450});
  ASSERT_EQ(one.size(), 1u);
  EXPECT_NEAR(one[0], p + s * 50, 1e-9 * p);

  // Irradiance integral with partial ends: E is linear here too.
  const double e0 = sp.irradiance[0], e1 = sp.irradiance[1];
  const double e450 = e0 + (e1 - e0) * (450.0 - 400) / 200;
  const double e550 = e0 + (e1 - e0) * (550.0 - 400) / 200;
  EXPECT_NEAR(integrated_irradiance(sp, 450, 550), 0.5 * 100 * (e450 + e550), 1e-12 * e0 * 100);
}

TEST(Spectrum, BandWeightsRejectBadRunGrids) {
  const Spectrum g = builtin_spectrum("AM1.5G");
  EXPECT_THROW(band_photon_weights(g, {}), SpectrumError);
  EXPECT_THROW(band_photon_weights(g, {279.0, 500.0}), SpectrumError);
  EXPECT_THROW(band_photon_weights(g, {500.0, 4000.5}), SpectrumError);
  EXPECT_THROW(band_photon_weights(g, {600.0, 500.0}), SpectrumError);
  EXPECT_THROW(band_photon_weights(g, {500.0, 500.0}), SpectrumError);
  try {
    band_photon_weights(g, {300.0, 5000.0});
    FAIL();
  } catch (const SpectrumError& e) {
    const std::string msg = e.what();
    EXPECT_NE(msg.find("5000 nm"), std::string::npos) << msg;
    EXPECT_NE(msg.find("280–4000 nm"), std::string::npos) << msg;
  }
  EXPECT_THROW(integrated_irradiance(g, 250, 500), SpectrumError);
  EXPECT_THROW(max_current_mA_per_cm2(g, 300, 4500), SpectrumError);
}

// ---------------------------------------------------------------------------
// User spectrum files

TEST(Spectrum, UserFileLoads) {
  TempDir dir;
  const fs::path f = dir.write("lamp.csv",
                               "# source: a made-up lamp\r\n"
                               "wavelength_nm,irradiance_W_m2_nm\r\n"
                               "400, 1.0\r\n"
                               "500, 2.0\r\n"
                               "600, 0\r\n");
  const Spectrum s = load_spectrum_file(f);
  EXPECT_EQ(s.name, f.string());
  ASSERT_EQ(s.wavelength_nm.size(), 3u);
  EXPECT_DOUBLE_EQ(integrated_irradiance(s, 400, 600), 0.5 * 100 * 3 + 0.5 * 100 * 2);
}

TEST(Spectrum, UserFileErrorsNameFileAndLine) {
  struct Case {
    const char* name;
    const char* text;
    int line;
    const char* words;
  };
  const Case cases[] = {
      {"missing_column", "wavelength_nm,irradiance_W_m2_nm\n400,1\n500\n", 3, "found 1"},
      {"extra_column", "400,1\n500,1,2\n", 2, "found 3"},
      {"non_numeric", "# x\n400,1\n500,bright\n", 3, "\"bright\""},
      {"negative", "400,1\n500,-0.5\n", 2, "negative"},
      {"unsorted", "400,1\n500,1\n450,1\n", 3, "line 2"},
      {"duplicate", "400,1\n500,1\n500,2\n", 3, "line 2"},
      {"material_header", "wavelength_nm,n,k\n400,1\n", 1, "wavelength_nm,irradiance_W_m2_nm"},
      {"empty", "", 1, "empty"},
      {"comments_only", "# a\n# b\n", 2, "no data rows"},
      {"one_row", "# a\n400,1\n", 2, "at least two"},
  };
  TempDir dir;
  for (const Case& c : cases) {
    const fs::path f = dir.write(std::string(c.name) + ".csv", c.text);
    std::string msg;
    try {
      load_spectrum_file(f);
      ADD_FAILURE() << c.name << ": no error";
    } catch (const SpectrumError& e) {
      msg = e.what();
    }
    EXPECT_NE(msg.find(f.string() + ":" + std::to_string(c.line) + ":"), std::string::npos)
        << c.name << ": " << msg;
    EXPECT_NE(msg.find(c.words), std::string::npos) << c.name << ": " << msg;
  }
}
