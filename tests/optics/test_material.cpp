// Optical-constants tables: CSV parsing, error messages, interpolation,
// lookup by id or path, and every shipped table.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <fstream>
#include <sstream>
#include <string>

#include "optics/material.hpp"

#include "common/temp_dir.hpp"

namespace fs = std::filesystem;
using namespace lumtrap;

namespace {

using test::TempDir;

/// The MaterialError message of loading `file`; fails the test if none.
std::string load_error(const fs::path& file) {
  try {
    load_material_file(file);
  } catch (const MaterialError& e) {
    return e.what();
  }
  ADD_FAILURE() << "no MaterialError for " << file;
  return {};
}

/// The n, k cells of the data row of `file` whose wavelength cell reads
/// `wavelength_text`, read with a minimal parser independent of lumtrap's.
bool read_row(const fs::path& file, const std::string& wavelength_text, double& n, double& k) {
  std::ifstream in(file);
  std::string line;
  while (std::getline(in, line)) {
    if (line.rfind(wavelength_text + ",", 0) != 0) continue;
    std::stringstream ss(line.substr(wavelength_text.size() + 1));
    std::string n_cell, k_cell;
    std::getline(ss, n_cell, ',');
    std::getline(ss, k_cell, ',');
    n = std::strtod(n_cell.c_str(), nullptr);
    k = std::strtod(k_cell.c_str(), nullptr);
    return true;
  }
  return false;
}

}  // namespace

// ---------------------------------------------------------------------------
// Interpolation

TEST(Material, ExactAtEveryGridPointOfShippedSilicon) {
  const Material si = find_material("si_green2008");
  ASSERT_GE(si.wavelength_nm.size(), 2u);
  for (std::size_t i = 0; i < si.wavelength_nm.size(); ++i) {
    const cplx nk = si.index_at(si.wavelength_nm[i]);
    EXPECT_EQ(nk.real(), si.n[i]) << si.wavelength_nm[i];
    EXPECT_EQ(nk.imag(), si.k[i]) << si.wavelength_nm[i];
  }
}

TEST(Material, LinearBetweenGridPoints) {
  TempDir dir;
  const fs::path f = dir.write("lin.csv",
                               "# source: made up for this test\n"
                               "wavelength_nm,n,k\n"
                               "500,2.0,0.1\n"
                               "600,3.0,0.3\n"
                               "800,1.0,0.0\n");
  const Material m = load_material_file(f);
  EXPECT_EQ(m.source, "made up for this test");
  EXPECT_EQ(m.name, "lin");
  EXPECT_EQ(m.min_wavelength_nm(), 500.0);
  EXPECT_EQ(m.max_wavelength_nm(), 800.0);
  EXPECT_NEAR(m.index_at(550).real(), 2.5, 1e-15);
  EXPECT_NEAR(m.index_at(550).imag(), 0.2, 1e-15);
  EXPECT_NEAR(m.index_at(525).real(), 2.25, 1e-15);
  EXPECT_NEAR(m.index_at(525).imag(), 0.15, 1e-15);
  EXPECT_NEAR(m.index_at(650).real(), 2.5, 1e-15);
  EXPECT_NEAR(m.index_at(650).imag(), 0.225, 1e-15);
  EXPECT_EQ(m.index_at(800).real(), 1.0);  // last grid point exact
  EXPECT_EQ(m.index_at(600).imag(), 0.3);

  // On the shipped silicon table: midpoint of each interval = mean of ends.
  const Material si = find_material("si_green2008");
  for (std::size_t i = 0; i + 1 < si.wavelength_nm.size(); ++i) {
    const double mid = 0.5 * (si.wavelength_nm[i] + si.wavelength_nm[i + 1]);
    const cplx nk = si.index_at(mid);
    EXPECT_NEAR(nk.real(), 0.5 * (si.n[i] + si.n[i + 1]), 1e-12);
    EXPECT_NEAR(nk.imag(), 0.5 * (si.k[i] + si.k[i + 1]), 1e-12 * (1 + si.k[i]));
  }
}

TEST(Material, OutsideRangeNamesMaterialRangeAndWavelength) {
  const Material si = find_material("si_green2008");
  try {
    si.index_at(1500);
    FAIL() << "no error above the range";
  } catch (const MaterialError& e) {
    const std::string msg = e.what();
    EXPECT_NE(msg.find("'si_green2008'"), std::string::npos) << msg;
    EXPECT_NE(msg.find("si_green2008.csv"), std::string::npos) << msg;
    EXPECT_NE(msg.find("250–1450 nm"), std::string::npos) << msg;
    EXPECT_NE(msg.find("1500 nm requested"), std::string::npos) << msg;
  }
  EXPECT_THROW(si.index_at(249.9), MaterialError);
  EXPECT_THROW(si.index_at(std::nan("")), MaterialError);
  EXPECT_NO_THROW(si.index_at(250));
  EXPECT_NO_THROW(si.index_at(1450));
}

// ---------------------------------------------------------------------------
// Malformed files: each error names the file and the line.

struct BadCase {
  const char* name;
  const char* text;
  int line;
  const char* words;  // must appear in the message
};

TEST(Material, MalformedFilesNameFileAndLine) {
  const BadCase cases[] = {
      {"missing_column", "# source: test\nwavelength_nm,n,k\n500,2,0\n600,2\n", 4, "found 2"},
      {"extra_column", "wavelength_nm,n,k\n500,2,0\n600,2,0,7\n", 3, "found 4"},
      {"trailing_comma", "500,2,0,\n", 1, "found 4"},
      {"non_numeric", "# c\n\n500,2,0\n600,abc,0\n", 4, "\"abc\""},
      {"unsorted", "wavelength_nm,n,k\n500,2,0\n600,2,0\n550,2,0\n", 4, "line 3"},
      {"duplicate", "wavelength_nm,n,k\n500,2,0\n600,2,0\n# comment\n600,2.1,0\n", 5, "line 3"},
      {"negative_k", "wavelength_nm,n,k\n500,2,0\n600,2,-0.1\n", 3, "k = -0.1"},
      {"negative_n", "wavelength_nm,n,k\n500,-2,0\n", 2, "n = -2"},
      {"zero_n", "wavelength_nm,n,k\n500,2,0\n600,0,0\n", 3, "n must be > 0"},
      {"nan_cell", "500,nan,0\n", 1, "\"nan\""},
      {"zero_wavelength", "0,2,0\n", 1, "wavelength_nm = 0"},
      {"other_header", "# x\nlambda,n,k\n500,2,0\n", 2, "\"lambda\""},
      {"second_header", "wavelength_nm,n,k\n500,2,0\nwavelength_nm,n,k\n", 3, "\"wavelength_nm\""},
      {"empty", "", 1, "empty"},
      {"comments_only", "# source: nothing\n# more\n\n", 3, "no data rows"},
      {"header_only", "# a\nwavelength_nm,n,k\n", 2, "no data rows"},
  };
  TempDir dir;
  for (const BadCase& c : cases) {
    const fs::path f = dir.write(std::string(c.name) + ".csv", c.text);
    const std::string msg = load_error(f);
    const std::string where = f.string() + ":" + std::to_string(c.line) + ":";
    EXPECT_NE(msg.find(where), std::string::npos) << c.name << ": " << msg;
    EXPECT_NE(msg.find(c.words), std::string::npos) << c.name << ": " << msg;
  }
  // Unsorted and duplicate name both lines.
  const std::string unsorted = load_error(dir.path() / "unsorted.csv");
  EXPECT_NE(unsorted.find(":4:"), std::string::npos);
  EXPECT_NE(unsorted.find("line 3"), std::string::npos);
  // A missing file is an error naming it.
  const std::string missing = load_error(dir.path() / "nope.csv");
  EXPECT_NE(missing.find("nope.csv"), std::string::npos);
}

TEST(Material, ToleratesSpacesCrlfBomAndNoHeader) {
  TempDir dir;
  const fs::path f = dir.write("loose.csv",
                               "\xEF\xBB\xBF  # source:  spaced out  \r\n"
                               "\r\n"
                               "  wavelength_nm , n , k \r\n"
                               " 500 , 2.0 ,0.5\r\n"
                               "\t600,+2.5, 1e-3 \r\n");
  const Material m = load_material_file(f);
  EXPECT_EQ(m.source, "spaced out");
  ASSERT_EQ(m.wavelength_nm.size(), 2u);
  EXPECT_EQ(m.n[1], 2.5);
  EXPECT_EQ(m.k[1], 1e-3);

  const fs::path g = dir.write("bare.csv", "500,2,0\n");  // no header, no source
  const Material b = load_material_file(g);
  EXPECT_EQ(b.source, "");
  EXPECT_EQ(b.index_at(500).real(), 2.0);
}

// ---------------------------------------------------------------------------
// Shipped tables

TEST(Material, EveryShippedTableLoads) {
  const std::vector<std::string> ids = shipped_material_ids();
  const char* expected[] = {"si_green2008",        "si_schinke2015",        "sinx_pecvd_n191",
                            "sinx_pecvd_n209",     "sinx_pecvd_n213",       "sio2_malitson1965",
                            "al2o3_malitson1962",  "mgf2_dodge1984",        "al_rakic1995",
                            "ag_johnson1972",      "ag_mcpeak2015",         "glass_sodalime_5ppm_fe",
                            "eva_uv_transparent"};
  for (const char* id : expected) {
    EXPECT_NE(std::find(ids.begin(), ids.end(), id), ids.end()) << id;
  }
  EXPECT_EQ(std::find(ids.begin(), ids.end(), "astm_g173_03"), ids.end());
  EXPECT_TRUE(std::is_sorted(ids.begin(), ids.end()));
  for (const std::string& id : ids) {
    const Material m = find_material(id);
    EXPECT_EQ(m.name, id);
    EXPECT_FALSE(m.source.empty()) << id;
    EXPECT_GE(m.wavelength_nm.size(), 2u) << id;
    EXPECT_FALSE(m.constant);
    const double mid = 0.5 * (m.min_wavelength_nm() + m.max_wavelength_nm());
    EXPECT_GT(m.index_at(mid).real(), 0.0) << id;
  }
}

TEST(Material, SiliconAt1000nmEqualsTheFileRow) {
  const fs::path file = materials_dir() / "si_green2008.csv";
  double n_file = 0, k_file = 0;
  ASSERT_TRUE(read_row(file, "1000", n_file, k_file)) << "no 1000 nm row in " << file;
  const cplx nk = find_material("si_green2008").index_at(1000.0);
  EXPECT_EQ(nk.real(), n_file);
  EXPECT_EQ(nk.imag(), k_file);
  EXPECT_NE(find_material("si_green2008").source.find("Green"), std::string::npos);
}

// ---------------------------------------------------------------------------
// Constants and lookup

TEST(Material, ConstantAtAnyWavelength) {
  const Material c = constant_material(2.0, 0.01);
  EXPECT_TRUE(c.constant);
  EXPECT_EQ(c.source, "constant");
  for (double wl : {1e-3, 300.0, 1e4, 1e9}) {
    EXPECT_EQ(c.index_at(wl), cplx(2.0, 0.01));
  }
  EXPECT_TRUE(std::isinf(c.min_wavelength_nm()) && c.min_wavelength_nm() < 0);
  EXPECT_TRUE(std::isinf(c.max_wavelength_nm()) && c.max_wavelength_nm() > 0);
  EXPECT_THROW(constant_material(0.0, 0.0), MaterialError);
  EXPECT_THROW(constant_material(-1.0, 0.0), MaterialError);
  EXPECT_THROW(constant_material(1.5, -0.1), MaterialError);
  EXPECT_THROW(constant_material(std::nan(""), 0.0), MaterialError);

  const Material air = find_material("air");
  EXPECT_EQ(air.name, "air");
  EXPECT_TRUE(air.constant);
  EXPECT_EQ(air.index_at(200.0), cplx(1.0, 0.0));
  EXPECT_EQ(air.index_at(5000.0), cplx(1.0, 0.0));
}

TEST(Material, UnknownIdListsShippedIds) {
  try {
    find_material("unobtainium");
    FAIL() << "no error";
  } catch (const MaterialError& e) {
    const std::string msg = e.what();
    EXPECT_NE(msg.find("'unobtainium'"), std::string::npos) << msg;
    EXPECT_NE(msg.find("air"), std::string::npos) << msg;
    for (const std::string& id : shipped_material_ids()) {
      EXPECT_NE(msg.find(id), std::string::npos) << id << " missing from: " << msg;
    }
    EXPECT_EQ(msg.find("astm_g173_03"), std::string::npos) << msg;
  }
  EXPECT_THROW(find_material("astm_g173_03"), MaterialError);
  EXPECT_THROW(find_material(""), MaterialError);
}

TEST(Material, PathRelativeToSceneFolder) {
  TempDir dir;
  fs::create_directories(dir.path() / "optics");
  dir.write("optics/my_film.csv", "# source: test film\n400,1.8,0\n900,1.7,0\n");
  const Material m = find_material("optics/my_film.csv", dir.path());
  EXPECT_EQ(m.name, "optics/my_film.csv");
  EXPECT_EQ(m.source, "test film");
  EXPECT_NEAR(m.index_at(650).real(), 1.75, 1e-15);
  // Absolute path works without relative_to.
  const Material a = find_material((dir.path() / "optics/my_film.csv").string());
  EXPECT_EQ(a.n.size(), 2u);
  // Errors inside a user file keep their file:line.
  dir.write("bad.csv", "400,1.8,0\n300,1.7,0\n");
  try {
    find_material("bad.csv", dir.path());
    FAIL();
  } catch (const MaterialError& e) {
    EXPECT_NE(std::string(e.what()).find("bad.csv:2:"), std::string::npos) << e.what();
  }
}

TEST(Material, EnvironmentOverridesMaterialsDir) {
  TempDir dir;
  dir.write("zz_test.csv", "500,1.5,0\n600,1.5,0\n");
  dir.write("astm_g173_03.csv", "# not a material\n");
  const char* old = std::getenv("LUMTRAP_MATERIALS");
  const std::string saved = old ? old : "";
  ::setenv("LUMTRAP_MATERIALS", dir.path().c_str(), 1);
  EXPECT_EQ(materials_dir(), dir.path());
  EXPECT_EQ(shipped_material_ids(), std::vector<std::string>{"zz_test"});
  EXPECT_EQ(find_material("zz_test").index_at(550).real(), 1.5);
  if (old) {
    ::setenv("LUMTRAP_MATERIALS", saved.c_str(), 1);
  } else {
    ::unsetenv("LUMTRAP_MATERIALS");
  }
}
