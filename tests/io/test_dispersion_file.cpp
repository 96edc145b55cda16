// Dispersion-formula files (io/dispersion_file.hpp): every shipped file
// loads and samples into a table, a few values against outside references,
// and malformed files give FILE:LINE:COL, key, value and what is allowed.
#include "io/dispersion_file.hpp"

#include <numbers>
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <fstream>
#include <string>
#include <unistd.h>

#include "optics/material.hpp"

using namespace lumtrap;
using ::testing::HasSubstr;
namespace fs = std::filesystem;

namespace {


fs::path scratch_dir() {
  const fs::path d = fs::temp_directory_path() / ("lumtrap_dispersion_file_" + std::to_string(::getpid()));
  fs::create_directories(d);
  return d;
}

fs::path write_file(const std::string& name, const std::string& text) {
  const fs::path p = scratch_dir() / name;
  std::ofstream(p, std::ios::binary) << text;
  return p;
}

std::string error_of(const std::string& name, const std::string& text) {
  const fs::path p = write_file(name, text);
  try {
    read_dispersion_file(p);
  } catch (const DispersionFileError& e) {
    return e.what();
  }
  return "";
}

/// The message starts with FILE:LINE: and names the key (and the value).
void expect_error(const std::string& name, const std::string& text, int line, const std::string& key,
                  const std::string& value, const std::string& also) {
  const std::string e = error_of(name, text);
  ASSERT_FALSE(e.empty()) << name << " read without error";
  const std::string where = (scratch_dir() / name).string() + ":" + std::to_string(line) + ":";
  EXPECT_EQ(e.rfind(where, 0), 0u) << "message does not start with " << where << ":\n" << e;
  EXPECT_THAT(e, HasSubstr("key '" + key + "'")) << e;
  if (!value.empty()) {
    EXPECT_THAT(e, HasSubstr("value " + value)) << e;
  }
  EXPECT_THAT(e, HasSubstr(also)) << e;
}

const std::string kTaucLorentz =
    "# test film\n"
    "# source: illustrative values, not a measurement\n"
    "model = \"tauc_lorentz\"\n"
    "wavelength_range = [\"300 nm\", \"1200 nm\"]\n"
    "eps_inf = 1.0\n"
    "A = \"100 eV\"\n"
    "E0 = \"3.6 eV\"\n"
    "C = \"2.4 eV\"\n"
    "Eg = \"1.6 eV\"\n";

std::string replace(std::string s, const std::string& from, const std::string& to) {
  const std::size_t at = s.find(from);
  EXPECT_NE(at, std::string::npos) << from;
  return s.replace(at, from.size(), to);
}

}  // namespace

// ---------------------------------------------------------------------------
// Shipped files

TEST(DispersionFile, EveryShippedFileLoadsAndSamples) {
  const std::vector<fs::path> files = shipped_formula_files();
  EXPECT_EQ(files.size(), 9u);
  for (const fs::path& p : files) {
    SCOPED_TRACE(p.string());
    const DispersionFormula f = read_dispersion_file(p);
    EXPECT_EQ(f.name, p.stem().string());
    EXPECT_FALSE(f.source.empty()) << "no '# source:' line";
    const Material m = formula_material(f);
    EXPECT_EQ(m.wavelength_nm.front(), f.min_wavelength_nm);
    EXPECT_EQ(m.wavelength_nm.back(), f.max_wavelength_nm);
    for (std::size_t i = 0; i < m.n.size(); ++i) {
      ASSERT_GT(m.n[i], 0.0) << m.wavelength_nm[i];
      ASSERT_GE(m.k[i], 0.0) << m.wavelength_nm[i];
    }
    std::printf("%-30s n(633 nm) = %.4f, k(633 nm) = %.3e  [%s]\n", f.name.c_str(),
                m.index_at(633.0).real(), m.index_at(633.0).imag(), m.source.substr(0, 60).c_str());
  }
}

TEST(DispersionFile, SapphireSellmeierAgreesWithShippedTable) {
  // Sellmeier coefficients of I. H. Malitson, J. Opt. Soc. Am. 52, 1377
  // (1962), from memory, against the shipped table of the same paper. The
  // table deviates from the recalled formula by a small, irregular 4–10e-5
  // (its own rounding/processing is not documented), so the bound is 1.2e-4.
  const DispersionFormula f = read_dispersion_file(formulas_dir() / "al2o3_sapphire_malitson1962.toml");
  const Material table = find_material("al2o3_malitson1962");
  double worst = 0.0;
  for (std::size_t i = 0; i < table.wavelength_nm.size(); ++i) {
    const double wl = table.wavelength_nm[i];
    if (wl < 270.0 || wl > 2000.0) continue;
    worst = std::max(worst, std::abs(complex_index(f, wl).real() - table.n[i]));
  }
  std::printf("sapphire Sellmeier vs shipped table: max |Δn| = %.2e\n", worst);
  EXPECT_LT(worst, 1.2e-4);
}

TEST(DispersionFile, ShippedModelsBehaveAsTheirFormulas) {
  // a-Si:H: Tauc-Lorentz ε2 = 0 below Eg = 1.65 eV (λ > 751.4 nm).
  const DispersionFormula asi = read_dispersion_file(formulas_dir() / "a_si_h_intrinsic.toml");
  EXPECT_EQ(complex_index(asi, 760.0).imag(), 0.0);
  EXPECT_GT(complex_index(asi, 740.0).imag(), 0.0);
  // ITO: the Drude term read from carriers equals drude_term_from_carriers.
  const DispersionFormula ito = read_dispersion_file(formulas_dir() / "ito_5e20.toml");
  const auto& sum = std::get<OscillatorSumFormula>(ito.model);
  ASSERT_EQ(sum.drude.size(), 1u);
  const DrudeTerm d = drude_term_from_carriers(5e20, 30.0, 0.35);
  EXPECT_EQ(sum.drude[0].plasma_energy_eV, d.plasma_energy_eV);
  EXPECT_EQ(sum.drude[0].broadening_eV, d.broadening_eV);
  // ...and free carriers make the film more absorbing towards the infrared.
  EXPECT_GT(complex_index(ito, 2000.0).imag(), complex_index(ito, 1000.0).imag());
  // n+ polysilicon at 1200 nm by hand: green1995 n-type (from memory)
  // α = 2.6e-27 · 1200³ · 2e20 = 898.56 /cm = 8.9856e-5 /nm, k_fca = α λ/(4π);
  // band-to-band k of si_green2008 at 1200 nm = 2.1008e-7.
  const DispersionFormula poly = read_dispersion_file(formulas_dir() / "poly_si_n_plus.toml");
  EXPECT_NEAR(complex_index(poly, 1200.0).imag(), 2.1008e-7 + 8.9856e-5 * 1200.0 / (4.0 * std::numbers::pi), 1e-12);
}

// ---------------------------------------------------------------------------
// Malformed files

TEST(DispersionFile, GoodTestFileReads) {
  const DispersionFormula f = read_dispersion_file(write_file("good.toml", kTaucLorentz));
  EXPECT_EQ(f.name, "good");
  EXPECT_EQ(f.source, "illustrative values, not a measurement");
  const auto& t = std::get<TaucLorentzFormula>(f.model);
  EXPECT_EQ(t.oscillator.E0_eV, 3.6);
  EXPECT_EQ(f.min_wavelength_nm, 300.0);
  EXPECT_EQ(f.max_wavelength_nm, 1200.0);
}

TEST(DispersionFile, ErrorsNamePlaceKeyValueAndWhatIsAllowed) {
  expect_error("unknown_key.toml", kTaucLorentz + "E1 = \"3 eV\"\n", 10, "E1", "",
               "unknown key; allowed keys for model \"tauc_lorentz\": model, wavelength_range, "
               "eps_inf, A, E0, C, Eg");
  expect_error("bare.toml", replace(kTaucLorentz, "E0 = \"3.6 eV\"", "E0 = 3.6"), 7, "E0", "3.6",
               "a bare number; write the value as a string with its unit; allowed: an energy");
  expect_error("unit.toml", replace(kTaucLorentz, "\"3.6 eV\"", "\"3.6 eW\""), 7, "E0", "\"3.6 eW\"",
               "unit \"eW\" is not accepted; allowed: an energy with one of the units eV, meV");
  expect_error("c_too_big.toml", replace(kTaucLorentz, "\"2.4 eV\"", "\"8 eV\""), 8, "C", "\"8 eV\"",
               "must lie in (0, 2·E0) = (0, 7.2) eV");
  expect_error("missing.toml", replace(kTaucLorentz, "Eg = \"1.6 eV\"\n", ""), 1, "Eg", "",
               "missing; required: the gap Eg in eV");
  expect_error("model.toml", replace(kTaucLorentz, "\"tauc_lorentz\"", "\"tauc-lorentz\""), 3,
               "model", "\"tauc-lorentz\"",
               "unknown model; allowed: \"cauchy\", \"sellmeier\", \"tauc_lorentz\", \"drude\", "
               "\"oscillator_sum\", \"doped_silicon\"");
  expect_error("eps_string.toml", replace(kTaucLorentz, "eps_inf = 1.0", "eps_inf = \"1.0\""), 5,
               "eps_inf", "\"1.0\"", "a string where a plain number was expected");
  expect_error("range.toml", replace(kTaucLorentz, "[\"300 nm\", \"1200 nm\"]", "[\"300 nm\"]"), 4,
               "wavelength_range", "[\"300 nm\"]", "an array of two lengths");
  expect_error("range_unit.toml", replace(kTaucLorentz, "\"1200 nm\"", "\"1200\""), 4,
               "wavelength_range[2]", "\"1200\"", "a bare number");
  // The scan of the range: a Cauchy n that turns negative names the wavelength.
  expect_error("negative_n.toml",
               "model = \"cauchy\"\nwavelength_range = [\"300 nm\", \"1200 nm\"]\nA = -0.5\nB = "
               "\"0.1 um2\"\n",
               2, "wavelength_range", "", "gives n = -0.00175383, k = 0 at 448 nm");
  expect_error("sellmeier_both.toml",
               "model = \"sellmeier\"\nwavelength_range = [\"300 nm\", \"1200 nm\"]\n[[term]]\nB = "
               "1.0\nC = \"0.01 um2\"\nresonance = \"0.1 um\"\n",
               6, "term[1].resonance", "\"0.1 um\"", "given together with C");
  expect_error("drude_mixed.toml",
               "model = \"drude\"\nwavelength_range = [\"300 nm\", \"1200 nm\"]\neps_inf = 3.5\n"
               "plasma_energy = \"1 eV\"\nbroadening = \"0.1 eV\"\nmobility = \"30 cm2/Vs\"\n",
               6, "mobility", "\"30 cm2/Vs\"", "mixes the two forms of a Drude term");
  expect_error("drude_nested.toml",
               "model = \"oscillator_sum\"\nwavelength_range = [\"300 nm\", \"1200 nm\"]\neps_inf = 3.5\n"
               "[[drude]]\ncarrier_density = \"1e20 cm-3\"\nmobility = \"-30 cm2/Vs\"\neffective_mass = 0.35\n",
               6, "drude[1].mobility", "\"-30 cm2/Vs\"", "must be finite and > 0");
  expect_error("poly_base.toml",
               "model = \"doped_silicon\"\nwavelength_range = [\"300 nm\", \"1200 nm\"]\n"
               "band_to_band = \"si_nonexistent\"\ndoping = \"n\"\ncarrier_density = \"1e20 cm-3\"\n"
               "free_carrier_model = \"green1995\"\n",
               3, "band_to_band", "\"si_nonexistent\"", "unknown material 'si_nonexistent'");
  expect_error("poly_fca.toml",
               "model = \"doped_silicon\"\nwavelength_range = [\"300 nm\", \"1200 nm\"]\n"
               "band_to_band = \"si_green2008\"\ndoping = \"n\"\ncarrier_density = \"1e20 cm-3\"\n"
               "free_carrier_model = \"other\"\n",
               6, "free_carrier_model", "\"other\"", "allowed: \"schroder1978\", \"green1995\"");
}

TEST(DispersionFile, SyntaxErrorsAndMissingFiles) {
  const std::string e = error_of("syntax.toml", "model = \"cauchy\"\nA = = 1\n");
  const std::string where = (scratch_dir() / "syntax.toml").string() + ":2:";
  EXPECT_EQ(e.rfind(where, 0), 0u) << e;
  EXPECT_THAT(e, HasSubstr("TOML syntax error"));
  try {
    read_dispersion_file(scratch_dir() / "none.toml");
    FAIL();
  } catch (const DispersionFileError& err) {
    EXPECT_THAT(err.what(), HasSubstr("none.toml: cannot read the formula file: no such file"));
  }
}
