// Dispersion-formula files used as scene materials: `material = "ito_1e20"`
// finds materials/formulas/ito_1e20.toml, a path to a formula .toml works as
// a path to a CSV, and the scene identity follows the file's content.
// Check: the exact planar solver gives bit-identical results for a film
// given by the formula and for the same film given as an n, k table sampled
// from the formula (optics/dispersion.hpp, complex_index) at the scene's
// wavelengths — the formula material is exact at its 1 nm sample points and
// the scene's wavelengths are whole nanometres (common practice: a table
// carries the values it was sampled at).
#include <fmt/format.h>

#include <filesystem>
#include <fstream>

#include "io/dispersion_file.hpp"
#include "io/scene_identity.hpp"
#include "optics/dispersion.hpp"
#include "trace/planar_run.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

const std::vector<double> kWavelengths = {400, 500, 600, 700, 800, 900, 1000, 1100, 1200};

std::string scene_text(const std::string& front_film, const std::string& rear_film) {
  std::string wl;
  for (double w : kWavelengths) wl += fmt::format("{}\"{:g} nm\"", wl.empty() ? "" : ", ", w);
  return fmt::format(R"(
[wafer]
thickness = "180 um"
[front]
texture = "planar"
[[front.films]]
material = "{}"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[[rear.films]]
material = "{}"
thickness = "120 nm"
[illumination]
wavelengths = [{}]
[run]
photons = 1
seed = 3
)",
                     front_film, rear_film, wl);
}

/// The formula sampled at the scene's wavelengths, written as a CSV table.
std::filesystem::path table_from_formula(const std::string& id, const std::filesystem::path& folder) {
  const DispersionFormula f = read_dispersion_file(formulas_dir() / (id + ".toml"));
  const std::filesystem::path p = folder / (id + "_sampled.csv");
  std::ofstream out(p);
  out << "# source: sampled from materials/formulas/" << id << ".toml for this test\nwavelength_nm,n,k\n";
  for (double w : kWavelengths) {
    const cplx n = complex_index(f, w);
    out << fmt::format("{:.17g},{:.17g},{:.17g}\n", w, n.real(), n.imag());
  }
  return p;
}

void expect_identical(const Results& a, const Results& b) {
  ASSERT_EQ(a.bins.size(), b.bins.size());
  for (std::size_t i = 0; i < a.bins.size(); ++i) {
    // bin names carry the material's id or path and differ; the order is the scene's
    EXPECT_EQ(a.bins[i].fraction, b.bins[i].fraction) << a.bins[i].bin.name;
  }
}

TEST(FormulaMaterialScene, ShippedFormulaIdMatchesTableSampledFromIt) {
  const auto dir = test::temp_dir();
  const auto ito = table_from_formula("ito_1e20", dir);
  const auto poly = table_from_formula("poly_si_n_plus", dir);
  const Scene by_formula = test::scene_from_text(scene_text("ito_1e20", "poly_si_n_plus"), "by_formula");
  const Scene by_table = test::scene_from_text(scene_text(ito.string(), poly.string()), "by_table");
  EXPECT_EQ(by_formula.front.films[0].material.id_or_path, "ito_1e20");  // a shipped id stays an id
  const Results a = planar_results(by_formula), b = planar_results(by_table);
  expect_identical(a, b);
  // the ITO film absorbs: otherwise the comparison would prove little
  const ResultBin& film = a.bin(EndState::absorbed_front_film, 0);
  EXPECT_GT(film.fraction.back(), 1e-3) << "ITO absorption at 1200 nm";
}

TEST(FormulaMaterialScene, PathToFormulaFileWorksAndIdentityFollowsContent) {
  const auto dir = test::temp_dir();
  const std::filesystem::path copy = dir / "my_ito.toml";
  std::filesystem::copy_file(formulas_dir() / "ito_1e20.toml", copy,
                             std::filesystem::copy_options::overwrite_existing);
  const Scene by_path = test::scene_from_text(scene_text("my_ito.toml", "poly_si_n_plus"), "by_path");
  const Scene by_id = test::scene_from_text(scene_text("ito_1e20", "poly_si_n_plus"), "by_id");
  expect_identical(planar_results(by_path), planar_results(by_id));

  const std::string before = scene_identity(by_path);
  EXPECT_EQ(before, scene_identity(by_path));
  {
    std::ifstream in(copy);
    std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    const auto at = text.find("40 cm2/Vs");
    ASSERT_NE(at, std::string::npos);
    text.replace(at, 9, "30 cm2/Vs");
    std::ofstream(copy) << text;
  }
  EXPECT_NE(before, scene_identity(by_path)) << "the identity hashes the formula file's content";
}

TEST(FormulaMaterialScene, BadFormulaFileIsRefusedNamingFileAndKey) {
  const auto dir = test::temp_dir();
  std::ofstream(dir / "bad.toml") << "# source: test\nmodel = \"cauchy\"\nwavelength_range = [\"300 nm\", \"1200 nm\"]\n"
                                     "A = -1.5\n";
  try {
    test::scene_from_text(scene_text("bad.toml", "poly_si_n_plus"), "scene_naming_bad");
    FAIL() << "a formula with A < 0 was accepted";
  } catch (const std::exception& e) {
    const std::string m = e.what();
    EXPECT_NE(m.find("front.films"), std::string::npos) << m;
    EXPECT_NE(m.find("bad.toml"), std::string::npos) << m;
    EXPECT_NE(m.find("n = -1.5"), std::string::npos) << m;  // what the formula gives, and where
  }
}

}  // namespace
}  // namespace lumtrap
