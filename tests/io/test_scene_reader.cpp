// Scene files -> Scene structs (io/scene_reader.hpp): a full scene, every
// class of error with file, line, key and value in the message, the sweep
// hooks, and the round trip through resolved_scene_toml (scene_writer.hpp).
#include "io/scene_reader.hpp"
#include "io/scene_writer.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <fstream>
#include <string>
#include <vector>

#include "geometry/textures.hpp"
#include "io/units.hpp"
#include "optics/material.hpp"

using namespace lumtrap;
using ::testing::HasSubstr;
using ::testing::Not;
namespace fs = std::filesystem;

namespace {


fs::path data_dir() { return fs::path(LUMTRAP_SOURCE_DIR) / "tests" / "io" / "data"; }

/// A scratch folder for scene files written by the tests.
fs::path scratch_dir() {
  const fs::path d = fs::path(::testing::TempDir()) / "lumtrap_scene_parser_test";
  fs::create_directories(d);
  return d;
}

fs::path write_file(const std::string& name, const std::string& text) {
  const fs::path p = scratch_dir() / name;
  std::ofstream(p) << text;
  return p;
}

/// The SceneError message from parsing `text` as file `name`, "" if it parsed.
std::string error_of(const std::string& name, const std::string& text) {
  const fs::path p = write_file(name, text);
  try {
    parse_scene_file(p);
  } catch (const SceneError& e) {
    return e.what();
  }
  return "";
}

/// Checks the parts every error message must have.
void expect_error(const std::string& name, const std::string& text, int line, const std::string& key,
                  const std::string& value, const std::string& also = "") {
  const std::string e = error_of(name, text);
  ASSERT_FALSE(e.empty()) << name << " parsed without error";
  const std::string where = (scratch_dir() / name).string() + ":" + std::to_string(line) + ":";
  EXPECT_EQ(e.rfind(where, 0), 0u) << "message does not start with " << where << ":\n" << e;
  EXPECT_THAT(e, HasSubstr("key '" + key + "'"));
  if (!value.empty()) {
    EXPECT_THAT(e, HasSubstr(value));
  }
  if (!also.empty()) {
    EXPECT_THAT(e, HasSubstr(also));
  }
}

void expect_same_material(const MaterialRef& a, const MaterialRef& b, const std::string& what) {
  EXPECT_EQ(a.constant, b.constant) << what;
  EXPECT_EQ(a.id_or_path, b.id_or_path) << what;
  EXPECT_EQ(a.n, b.n) << what;
  EXPECT_EQ(a.k, b.k) << what;
}

void expect_same_surface(const Surface& a, const Surface& b, const std::string& what) {
  EXPECT_EQ(a.texture.kind, b.texture.kind) << what;
  EXPECT_EQ(a.texture.numbers, b.texture.numbers) << what;
  EXPECT_EQ(a.texture.words, b.texture.words) << what;
  ASSERT_EQ(a.films.size(), b.films.size()) << what;
  for (std::size_t i = 0; i < a.films.size(); ++i) {
    expect_same_material(a.films[i].material, b.films[i].material, what + " film");
    EXPECT_EQ(a.films[i].thickness_nm, b.films[i].thickness_nm) << what;
  }
  EXPECT_EQ(a.conformality, b.conformality) << what;
  EXPECT_EQ(a.scattering, b.scattering) << what;
  EXPECT_EQ(a.diffuse_fraction, b.diffuse_fraction) << what;
}

/// Field-by-field equality of two scenes (all but `file`).
void expect_same_scene(const Scene& a, const Scene& b) {
  EXPECT_EQ(a.name, b.name);
  expect_same_material(a.ambient, b.ambient, "ambient");
  expect_same_material(a.wafer.material, b.wafer.material, "wafer");
  EXPECT_EQ(a.wafer.thickness_um, b.wafer.thickness_um);
  EXPECT_EQ(a.wafer.thickness_convention, b.wafer.thickness_convention);
  expect_same_surface(a.front, b.front, "front");
  expect_same_surface(a.rear, b.rear, "rear");
  expect_same_material(a.rear_medium, b.rear_medium, "rear medium");
  const Illumination &i = a.illumination, &j = b.illumination;
  EXPECT_EQ(i.spectrum, j.spectrum);
  EXPECT_EQ(i.spectrum_file, j.spectrum_file);
  EXPECT_EQ(i.kind, j.kind);
  EXPECT_EQ(i.polar_rad, j.polar_rad);
  EXPECT_EQ(i.azimuth_rad, j.azimuth_rad);
  EXPECT_EQ(i.polarization, j.polarization);
  EXPECT_EQ(i.wavelengths_nm, j.wavelengths_nm);
  EXPECT_EQ(a.run.photons, b.run.photons);
  EXPECT_EQ(a.run.seed, b.run.seed);
  EXPECT_EQ(a.run.max_bounces, b.run.max_bounces);
  EXPECT_EQ(a.run.randomize_lateral, b.run.randomize_lateral);
  EXPECT_EQ(a.run.threads, b.run.threads);
  EXPECT_EQ(a.run.depth_histograms, b.run.depth_histograms);
  EXPECT_EQ(a.run.target_jg_error, b.run.target_jg_error);
}

/// resolved_scene_toml, written to a file of its own and read back.
Scene round_trip(const Scene& s, const std::string& name) {
  const std::string text = resolved_scene_toml(s);
  Scene back = parse_scene_file(write_file(name, text));
  const std::string again = resolved_scene_toml(back);
  EXPECT_EQ(again.substr(again.find("[scene]")), text.substr(text.find("[scene]")))
      << "the resolved text is not a fixed point";
  return back;
}

}  // namespace

// ---------------------------------------------------------------------------
// A full scene

TEST(SceneParser, FullSceneGivesTheExpectedStructs) {
  const fs::path file = data_dir() / "recipe_b.toml";
  const Scene s = parse_scene_file(file);
  EXPECT_EQ(s.file, file);
  EXPECT_EQ(s.name, "line 3 recipe B");
  EXPECT_FALSE(s.ambient.constant);
  EXPECT_EQ(s.ambient.id_or_path, "air");  // find_material's built-in n = 1, k = 0
  EXPECT_EQ(s.ambient.describe(), "air");
  EXPECT_FALSE(s.wafer.material.constant);
  EXPECT_EQ(s.wafer.material.id_or_path, "si_green2008");
  EXPECT_EQ(s.wafer.thickness_um, 160.0);
  EXPECT_EQ(s.wafer.thickness_convention, ThicknessConvention::mean);

  EXPECT_EQ(s.front.texture.kind, "random_pyramids");
  EXPECT_EQ(s.front.conformality, Conformality::conformal);
  EXPECT_EQ(s.front.scattering, SurfaceScattering::specular);
  const geometry::RandomPyramidsSpec r = geometry::random_pyramids_spec(s.front.texture);
  EXPECT_EQ(r.distribution, geometry::SizeDistribution::uniform);
  EXPECT_EQ(r.size_a_um, 1.0);
  EXPECT_EQ(r.size_b_um, 5.0);
  EXPECT_EQ(r.facet_deg, 54.74);
  EXPECT_EQ(r.flat_fraction, 0.0);
  EXPECT_EQ(r.tile_um, 40.0);
  EXPECT_EQ(r.seed, 7u);
  ASSERT_EQ(s.front.films.size(), 1u);
  EXPECT_EQ(s.front.films[0].material.id_or_path, "sinx_pecvd_n209");
  EXPECT_EQ(s.front.films[0].thickness_nm, 75.0);

  EXPECT_EQ(s.rear.texture.kind, "planar");
  EXPECT_EQ(s.rear.scattering, SurfaceScattering::mixed);
  EXPECT_EQ(s.rear.diffuse_fraction, 0.3);
  ASSERT_EQ(s.rear.films.size(), 1u);
  EXPECT_EQ(s.rear.films[0].material.id_or_path, "sio2_malitson1965");
  EXPECT_EQ(s.rear.films[0].thickness_nm, 100.0);
  EXPECT_EQ(s.rear_medium.id_or_path, "al_rakic1995");
  EXPECT_FALSE(s.rear_medium.constant);

  const Illumination& ill = s.illumination;
  EXPECT_EQ(ill.spectrum, SpectrumKind::am15g);
  EXPECT_EQ(ill.kind, IlluminationKind::collimated);
  EXPECT_DOUBLE_EQ(ill.polar_rad, 8 * std::numbers::pi / 180);
  EXPECT_EQ(ill.azimuth_rad, 0.0);
  EXPECT_EQ(ill.polarization, PolarizationKind::unpolarized);
  ASSERT_EQ(ill.wavelengths_nm.size(), 91u);
  for (std::size_t i = 0; i < 91; ++i) EXPECT_EQ(ill.wavelengths_nm[i], 300.0 + 10.0 * i);

  EXPECT_EQ(s.run.photons, 20000u);
  EXPECT_EQ(s.run.seed, 1u);
  EXPECT_EQ(s.run.max_bounces, 10000);
  EXPECT_TRUE(s.run.randomize_lateral);
  EXPECT_EQ(s.run.threads, 0);
  EXPECT_FALSE(s.run.depth_histograms);
  EXPECT_EQ(s.run.target_jg_error, 0.02);
}

TEST(SceneParser, EmptyFileGivesTheDefaults) {
  const Scene s = parse_scene_file(write_file("my_defaults.toml", "# nothing\n"));
  const Scene def;  // the defaults of scene.hpp
  EXPECT_EQ(s.name, "my_defaults");
  EXPECT_EQ(s.ambient.id_or_path, "air");
  EXPECT_EQ(s.wafer.material.id_or_path, "si_green2008");
  EXPECT_EQ(s.wafer.thickness_um, def.wafer.thickness_um);
  EXPECT_EQ(s.front.texture.kind, "planar");
  EXPECT_TRUE(s.front.films.empty());
  EXPECT_EQ(s.rear_medium.id_or_path, "air");
  EXPECT_EQ(s.illumination.spectrum, SpectrumKind::am15g);
  EXPECT_EQ(s.illumination.wavelengths_nm.size(), 91u);
  EXPECT_EQ(s.illumination.wavelengths_nm.front(), 300.0);
  EXPECT_EQ(s.illumination.wavelengths_nm.back(), 1200.0);
  EXPECT_EQ(s.run.photons, def.run.photons);
  EXPECT_EQ(s.run.max_bounces, def.run.max_bounces);
  EXPECT_EQ(s.run.target_jg_error, 0.0);
}

TEST(SceneParser, PathsUnitsAndAnglesResolve) {
  const Scene s = parse_scene_file(data_dir() / "inverted_paths.toml");
  EXPECT_EQ(s.wafer.thickness_um, 150.0);  // "0.15 mm"
  EXPECT_EQ(s.wafer.thickness_convention, ThicknessConvention::base);
  EXPECT_EQ(s.front.texture.kind, "inverted_pyramids");
  EXPECT_EQ(s.front.conformality, Conformality::directional);
  EXPECT_EQ(s.front.texture.number("base"), 10.0);  // "10 µm"
  EXPECT_EQ(s.front.texture.number("gap"), 1.0);
  EXPECT_DOUBLE_EQ(s.front.texture.number("facet_angle"), std::atan(std::sqrt(2.0)) * 180 / std::numbers::pi);  // default {111}
  ASSERT_EQ(s.front.films.size(), 2u);
  const fs::path oxide = fs::absolute(data_dir() / "local" / "test_oxide.csv").lexically_normal();
  EXPECT_EQ(s.front.films[0].material.id_or_path, oxide.string());
  EXPECT_FALSE(s.front.films[0].material.constant);
  EXPECT_TRUE(s.front.films[1].material.constant);
  EXPECT_EQ(s.front.films[1].material.n, 2.0);
  EXPECT_EQ(s.front.films[1].material.k, 0.001);
  EXPECT_EQ(s.front.films[1].material.describe(), "n=2, k=0.001");
  EXPECT_EQ(s.rear.texture.kind, "upright_pyramids");
  EXPECT_EQ(s.rear.scattering, SurfaceScattering::lambertian);
  EXPECT_EQ(s.illumination.spectrum, SpectrumKind::file);
  EXPECT_EQ(s.illumination.spectrum_file,
            fs::absolute(data_dir() / "local" / "flat_spectrum.csv").lexically_normal());
  EXPECT_EQ(s.illumination.polar_rad, 0.5);
  EXPECT_EQ(s.illumination.azimuth_rad, 330 * std::numbers::pi / 180);  // -30 deg reduced to [0, 360)
  EXPECT_EQ(s.illumination.polarization, PolarizationKind::s);
  EXPECT_EQ(s.illumination.wavelengths_nm, (std::vector<double>{400, 800, 1100}));
}

TEST(SceneParser, RandomPyramidDistributions) {
  const auto random_of = [](const std::string& name, const std::string& table) {
    return parse_scene_file(write_file(name, "[front]\ntexture = \"random_pyramids\"\n[front.random_pyramids]\n" + table))
        .front.texture;
  };
  auto r = geometry::random_pyramids_spec(random_of("rp_fixed.toml", "distribution = \"fixed\"\nsize = \"3 um\"\n"));
  EXPECT_EQ(r.distribution, geometry::SizeDistribution::fixed);
  EXPECT_EQ(r.size_a_um, 3.0);
  r = geometry::random_pyramids_spec(
      random_of("rp_normal.toml", "distribution = \"normal\"\nmean = \"3 um\"\nsd = \"1 um\"\nmin_size = \"0.5 um\"\n"));
  EXPECT_EQ(r.distribution, geometry::SizeDistribution::normal);
  EXPECT_EQ(r.size_a_um, 3.0);
  EXPECT_EQ(r.size_b_um, 1.0);
  EXPECT_EQ(r.min_size_um, 0.5);
  r = geometry::random_pyramids_spec(random_of(
      "rp_lognormal.toml", "distribution = \"lognormal\"\nmean = \"2 um\"\nsd = \"0.5 um\"\nflat_fraction = 0.1\nseed = 0\n"));
  EXPECT_EQ(r.distribution, geometry::SizeDistribution::lognormal);
  EXPECT_EQ(r.flat_fraction, 0.1);
  EXPECT_EQ(r.seed, 0u);
}

// ---------------------------------------------------------------------------
// Errors: file name, line, key path and value in every message

TEST(SceneErrors, EtchShapeKeys) {
  const std::string rp = "[front]\ntexture = \"random_inverted_pyramids\"\n[front.random_pyramids]\ntile = \"20 um\"\n";
  expect_error("tip_negative.toml", "[front]\ntexture = \"upright_pyramids\"\n[front.pyramids]\ntip_radius = \"-0.1 um\"\n",
               4, "front.pyramids.tip_radius", "value \"-0.1 um\"", "allowed: a length >= 0 um");
  expect_error("tip_too_large.toml",
               "[front]\ntexture = \"inverted_pyramids\"\n[front.pyramids]\nbase = \"2 um\"\nvalley_radius = \"1.5 um\"\n", 5,
               "front.pyramids.valley_radius", "value \"1.5 um\"", "allowed: 0 to 1 um");
  expect_error("sd_too_wide.toml",
               rp + "facet_angle_distribution = \"normal\"\nfacet_angle = \"54 deg\"\nfacet_angle_sd = \"20 deg\"\n", 7,
               "front.random_pyramids.facet_angle_sd", "value \"20 deg\"", "allowed: facet_angle_sd below 12 deg");
  expect_error("sd_missing.toml", rp + "facet_angle_distribution = \"normal\"\n", 3,
               "front.random_pyramids.facet_angle_sd", "", "required");
  expect_error("angles_swapped.toml",
               rp + "facet_angle_distribution = \"uniform\"\nfacet_angle_min = \"56 deg\"\nfacet_angle_max = \"50 deg\"\n",
               7, "front.random_pyramids.facet_angle_max", "value \"50 deg\"", "allowed: min < max");
  expect_error("angular_error.toml", rp + "angular_error = \"0.1 deg\"\n", 5, "front.random_pyramids.angular_error",
               "value \"0.1 deg\"", "allowed: 0.5 deg <= angular_error <= 20 deg");
  expect_error("directional_rounded.toml",
               "[front]\ntexture = \"upright_pyramids\"\nconformality = \"directional\"\n[front.pyramids]\n"
               "tip_radius = \"0.1 um\"\n",
               3, "front.conformality", "value \"directional\"", "allowed: \"conformal\" here");
  expect_error("too_many_triangles.toml", rp + "tip_radius = \"0.001 um\"\nangular_error = \"0.5 deg\"\n", 6,
               "front.random_pyramids.angular_error", "value \"0.5 deg\"", "allowed: at most 16384");
}

TEST(SceneErrors, UnknownKeyAtTopLevel) {
  expect_error("unknown_top.toml", "[wafer]\nthickness = \"160 um\"\n\n[wafr]\nthickness = \"1 um\"\n", 4, "wafr",
               "allowed keys at the top level: scene, ambient, wafer");
}

TEST(SceneErrors, UnknownKeyNested) {
  expect_error("unknown_nested.toml",
               "[front]\ntexture = \"planar\"\n\n[[front.films]]\nmaterial = \"sinx_pecvd_n209\"\nthicknes = \"75 nm\"\n", 6,
               "front.films[0].thicknes", "did you mean 'thickness'?", "allowed keys in [front.films[0]]: material, thickness");
  expect_error("unknown_nested2.toml", "[front]\ntextur = \"planar\"\n", 2, "front.textur", "did you mean 'texture'?");
  expect_error("unknown_nested3.toml", "[run]\nphotons = 5\nverbose = true\n", 3, "run.verbose", "value true");
}

TEST(SceneErrors, WrongUnit) {
  expect_error("wrong_unit.toml", "[[front.films]]\nmaterial = \"sinx_pecvd_n209\"\nthickness = \"75 um2\"\n", 3,
               "front.films[0].thickness", "value \"75 um2\"", "allowed: a length with one of the units nm, um, µm, mm");
  expect_error("metres.toml", "[wafer]\nthickness = \"1.6e-4 m\"\n", 2, "wafer.thickness", "value \"1.6e-4 m\"",
               "unit \"m\" is not accepted");
  expect_error("bare.toml", "[wafer]\nthickness = 160\n", 2, "wafer.thickness", "value 160",
               "write the unit: e.g. \"160 um\"");
  expect_error("bare_string.toml", "\n[wafer]\nthickness = \"160\"\n", 3, "wafer.thickness", "value \"160\"",
               "write the unit: e.g. \"160 um\"");
  expect_error("angle_unit.toml", "[illumination]\npolar_angle = \"8 nm\"\n", 2, "illumination.polar_angle",
               "value \"8 nm\"", "deg, °, rad");
}

TEST(SceneErrors, NegativeThickness) {
  expect_error("negative_film.toml",
               "[[front.films]]\nmaterial = \"sinx_pecvd_n209\"\nthickness = \"75 nm\"\n\n[[front.films]]\n"
               "material = \"sio2_malitson1965\"\nthickness = \"-10 nm\"\n",
               7, "front.films[1].thickness", "value \"-10 nm\"", "allowed: a thickness >= 0");
  expect_error("negative_wafer.toml", "[wafer]\nthickness = \"-160 um\"\n", 2, "wafer.thickness", "value \"-160 um\"",
               "allowed: a length > 0");
}

TEST(SceneErrors, AngleOutOfRange) {
  expect_error("polar95.toml", "[illumination]\npolar_angle = \"95 deg\"\n", 2, "illumination.polar_angle",
               "value \"95 deg\"", "allowed: 0 deg <= polar angle <= 89 deg");
  expect_error("polar90.toml", "[illumination]\npolar_angle = \"90 deg\"\n", 2, "illumination.polar_angle",
               "value \"90 deg\"");
  // Grazing light is refused above 89 deg, with the reason.
  expect_error("polar_grazing.toml", "[illumination]\npolar_angle = \"89.99999 deg\"\n", 2,
               "illumination.polar_angle", "value \"89.99999 deg\"", "skims over the texture");
  expect_error("polar_rad.toml", "[illumination]\npolar_angle = \"1.56 rad\"\n", 2, "illumination.polar_angle",
               "value \"1.56 rad\"", "<= 89 deg");
  expect_error("facet95.toml",
               "[front]\ntexture = \"upright_pyramids\"\n[front.pyramids]\nbase = \"5 um\"\nfacet_angle = \"95 deg\"\n", 5,
               "front.pyramids.facet_angle", "value \"95 deg\"", "0 deg < facet_angle < 90 deg");
}

TEST(SceneErrors, UnknownMaterial) {
  expect_error("unknown_material.toml", "[wafer]\nthickness = \"160 um\"\n\n[[rear.films]]\nmaterial = \"unobtainium\"\nthickness = \"10 nm\"\n",
               5, "rear.films[0].material", "value \"unobtainium\"", "known ids:");
  expect_error("missing_path.toml", "[ambient]\nmaterial = \"nowhere/glass.csv\"\n", 2, "ambient.material",
               "value \"nowhere/glass.csv\"", "no file");
  expect_error("bad_constant.toml", "[ambient]\nmaterial = { n = -1 }\n", 2, "ambient.material.n", "value -1",
               "allowed: a real part n > 0");
}

TEST(SceneErrors, UnknownTextureWord) {
  expect_error("texture_word.toml", "[front]\ntexture = \"pyramids\"\n", 2, "front.texture", "value \"pyramids\"",
               "allowed: one of \"planar\", \"upright_pyramids\", \"inverted_pyramids\", \"random_pyramids\"");
  expect_error("enum_word.toml", "[illumination]\npolarization = \"circular\"\n", 2, "illumination.polarization",
               "value \"circular\"", "\"unpolarized\", \"s\", \"p\"");
}

TEST(SceneErrors, MaterialNotCoveringTheWavelengths) {
  // ag_mcpeak2015 starts at 300 nm; AM1.5G (ASTM G173-03) starts at 280 nm.
  const std::string text =
      "[rear]\nmedium = \"ag_mcpeak2015\"\n\n[illumination]\nwavelengths = { from = \"280 nm\", to = \"1200 nm\", step = \"20 nm\" }\n";
  expect_error("coverage.toml", text, 2, "rear.medium", "value \"ag_mcpeak2015\"", "covers 300–1700 nm");
  EXPECT_THAT(error_of("coverage.toml", text), HasSubstr("run wavelength 280 nm"));
  // A default material names the key and points at the wavelengths.
  const std::string far = "\n[illumination]\nwavelengths = [\"1000 nm\", \"1500 nm\"]\n";
  expect_error("coverage_default.toml", far, 3, "wafer.material", "\"si_green2008\" (default)", "covers 250–1450 nm");
  EXPECT_THAT(error_of("coverage_default.toml", far), HasSubstr("run wavelength 1500 nm"));
  // The spectrum is checked too.
  expect_error("coverage_spectrum.toml", "[illumination]\nspectrum = \"AM0\"\nwavelengths = \"260 nm\"\n", 2,
               "illumination.spectrum", "covers 280–4000 nm", "run wavelength 260 nm");
}

TEST(SceneErrors, DiffuseFractionWithoutMixed) {
  expect_error("diffuse_fraction.toml", "[rear]\nscattering = \"lambertian\"\ndiffuse_fraction = 0.3\n", 3,
               "rear.diffuse_fraction", "value 0.3", "allowed only with scattering = \"mixed\"");
  expect_error("mixed_missing.toml", "[rear]\nscattering = \"mixed\"\n", 1, "rear.diffuse_fraction", "missing");
  expect_error("fraction_range.toml", "[rear]\nscattering = \"mixed\"\ndiffuse_fraction = 1.5\n", 3,
               "rear.diffuse_fraction", "value 1.5", "[0, 1]");
}

TEST(SceneErrors, PyramidsTableWithPlanarTexture) {
  expect_error("pyramids_planar.toml", "[front]\ntexture = \"planar\"\n\n[front.pyramids]\nbase = \"5 um\"\n", 4,
               "front.pyramids", "", "allowed only with texture = \"upright_pyramids\" or \"inverted_pyramids\"");
  expect_error("random_wrong.toml", "[front]\ntexture = \"upright_pyramids\"\n[front.random_pyramids]\nseed = 1\n", 3,
               "front.random_pyramids", "", "texture = \"random_pyramids\"");
  expect_error("random_key.toml",
               "[front]\ntexture = \"random_pyramids\"\n[front.random_pyramids]\ndistribution = \"fixed\"\nsize = \"3 um\"\nsd = \"1 um\"\n",
               6, "front.random_pyramids.sd", "value \"1 um\"", "only with distribution = \"normal\" or \"lognormal\"");
  expect_error("random_tile.toml",
               "[front]\ntexture = \"random_pyramids\"\n[front.random_pyramids]\ndistribution = \"fixed\"\nsize = \"5 um\"\ntile = \"15 um\"\n",
               6, "front.random_pyramids.tile", "value \"15 um\"", "tile >= 20 um");
  expect_error("random_min_size.toml",
               "[front]\ntexture = \"random_pyramids\"\n[front.random_pyramids]\ndistribution = \"fixed\"\nsize = \"0.1 um\"\n",
               5, "front.random_pyramids.size", "value \"0.1 um\"", "min_size 0.2 um is above size = 0.1 um");
}

TEST(SceneErrors, WavelengthsNotIncreasing) {
  expect_error("wl_order.toml", "[illumination]\nwavelengths = [\"600 nm\", \"900 nm\", \"800 nm\"]\n", 2,
               "illumination.wavelengths[2]", "value \"800 nm\"", "strictly increasing");
  expect_error("wl_step.toml", "[illumination]\nwavelengths = { from = \"300 nm\", to = \"1200 nm\", step = \"7 nm\" }\n", 2,
               "illumination.wavelengths.step", "value \"7 nm\"", "not a whole number");
  expect_error("wl_to.toml", "[illumination]\nwavelengths = { from = \"900 nm\", to = \"600 nm\", step = \"10 nm\" }\n", 2,
               "illumination.wavelengths.to", "value \"600 nm\"", "to > from");
}

TEST(SceneErrors, WrongTypesAndIntegers) {
  expect_error("photons_float.toml", "[run]\nphotons = 2e4\n", 2, "run.photons", "value 20000.0", "integer");
  expect_error("photons_zero.toml", "[run]\nphotons = 0\n", 2, "run.photons", "value 0", "an integer from 1 to 9007199254740992");
  expect_error("bool.toml", "[run]\nrandomize_lateral = \"yes\"\n", 2, "run.randomize_lateral", "value \"yes\"",
               "allowed: true, false");
  expect_error("section_type.toml", "front = 3\n", 1, "front", "value 3", "a table [front]");
  expect_error("medium_front.toml", "[front]\nmedium = \"air\"\n", 2, "front.medium", "value \"air\"");
  expect_error("diffuse_polar.toml", "[illumination]\nkind = \"diffuse\"\npolar_angle = \"10 deg\"\n", 3,
               "illumination.polar_angle", "value \"10 deg\"", "only with kind = \"collimated\"");
}

TEST(SceneErrors, SyntaxErrorAndMissingFile) {
  const std::string e = error_of("syntax.toml", "[wafer]\nthickness = \"160 um\n");
  EXPECT_EQ(e.rfind((scratch_dir() / "syntax.toml").string() + ":2:", 0), 0u) << e;
  EXPECT_THAT(e, HasSubstr("TOML syntax error"));
  try {
    parse_scene_file(scratch_dir() / "does_not_exist.toml");
    FAIL() << "no error";
  } catch (const SceneError& e) {
    EXPECT_THAT(std::string(e.what()), HasSubstr("does_not_exist.toml: cannot read the scene file"));
  }
}

// ---------------------------------------------------------------------------
// Hooks for sweeps: edit the table, re-validate

TEST(SceneSweepHooks, SweepTableIsRejectedHereButCanBeIgnored) {
  const std::string text = "[wafer]\nthickness = \"160 um\"\n\n[sweep]\nkey = \"wafer.thickness\"\n";
  expect_error("with_sweep.toml", text, 4, "sweep", "", "sweep command");
  const fs::path p = write_file("with_sweep.toml", text);
  const Scene s = scene_from_table(read_scene_table(p), p, {"sweep"});
  EXPECT_EQ(s.wafer.thickness_um, 160.0);
}

TEST(SceneSweepHooks, ValuesSetByAProgramAreValidatedAndNamed) {
  const fs::path p = data_dir() / "recipe_b.toml";
  toml::table t = read_scene_table(p);
  toml::table* film = t.at_path("front.films[0]").as_table();
  ASSERT_NE(film, nullptr);
  film->insert_or_assign("thickness", "80 nm");
  EXPECT_EQ(scene_from_table(t, p).front.films[0].thickness_nm, 80.0);

  film->insert_or_assign("thickness", "-5 nm");
  try {
    scene_from_table(t, p);
    FAIL() << "no error";
  } catch (const SceneError& e) {
    // No source position for a value set by a program: "FILE: key ...".
    EXPECT_EQ(std::string(e.what()).rfind(p.string() + ": key 'front.films[0].thickness': value \"-5 nm\"", 0), 0u)
        << e.what();
  }
  t.at_path("wafer").as_table()->insert_or_assign("thickness", "0.2 mm");
  t.at_path("front.films[0]").as_table()->insert_or_assign("thickness", "70 nm");
  EXPECT_EQ(scene_from_table(t, p).wafer.thickness_um, 200.0);
}

// ---------------------------------------------------------------------------
// Round trip

TEST(SceneRoundTrip, ResolvedTomlReadsBackIdentical) {
  const Scene a = parse_scene_file(data_dir() / "recipe_b.toml");
  expect_same_scene(a, round_trip(a, "rt_recipe_b.toml"));

  const Scene b = parse_scene_file(data_dir() / "inverted_paths.toml");
  const std::string text = resolved_scene_toml(b);
  EXPECT_THAT(text, HasSubstr("azimuth = \"330 deg\""));
  EXPECT_THAT(text, HasSubstr("thickness = \"150 um\""));
  EXPECT_THAT(text, HasSubstr("material = { n = 2.0, k = 0.001 }"));
  EXPECT_THAT(text, HasSubstr(fs::absolute(data_dir() / "local" / "test_oxide.csv").lexically_normal().string()));
  EXPECT_THAT(text, Not(HasSubstr("target_jg_error =")));
  expect_same_scene(b, round_trip(b, "rt_inverted_paths.toml"));

  const Scene c = parse_scene_file(write_file("rt_defaults.toml", ""));
  expect_same_scene(c, round_trip(c, "rt_defaults_back.toml"));

  const Scene d = parse_scene_file(write_file(
      "rt_misc.toml",
      "[scene]\nname = \"quote \\\" and \\\\ backslash\"\n"
      "[ambient]\nmaterial = { n = 1.5 }\n"
      "[front]\ntexture = \"random_pyramids\"\nscattering = \"mixed\"\ndiffuse_fraction = 1\n"
      "[front.random_pyramids]\ndistribution = \"lognormal\"\nmean = \"2.5 um\"\nsd = \"0.7 um\"\ntile = \"0.03 mm\"\n"
      "[rear]\ntexture = \"random_pyramids\"\nmedium = \"al_rakic1995\"\n"
      "[rear.random_pyramids]\ndistribution = \"fixed\"\nsize = \"2 um\"\nfacet_angle = \"0.9 rad\"\n"
      "[illumination]\nkind = \"diffuse\"\npolarization = \"p\"\n"
      "wavelengths = { from = \"400 nm\", to = \"401 nm\", step = \"0.1 nm\" }\n"
      "[run]\nphotons = 123\nseed = 99\nmax_bounces = 77\nrandomize_lateral = false\nthreads = 2\n"
      "depth_histograms = true\ntarget_jg_error = \"0.5 A/m2\"\n"));
  EXPECT_EQ(d.illumination.wavelengths_nm.size(), 11u);
  EXPECT_EQ(d.illumination.wavelengths_nm.back(), 401.0);
  EXPECT_DOUBLE_EQ(d.run.target_jg_error, 0.05);
  expect_same_scene(d, round_trip(d, "rt_misc_back.toml"));

  const Scene e = parse_scene_file(write_file(
      "rt_angles.toml",
      "[front]\ntexture = \"upright_pyramids\"\n[front.pyramids]\nbase = \"3 um\"\ngap = \"0.25 um\"\nfacet_angle = \"50 deg\"\n"
      "[illumination]\npolar_angle = \"45 deg\"\nazimuth = \"400 deg\"\n"
      "wavelengths = [\"350 nm\", \"351.5 nm\", \"700 nm\", \"1.1 um\"]\n"));
  EXPECT_EQ(e.illumination.azimuth_rad, 40 * std::numbers::pi / 180);
  EXPECT_THAT(resolved_scene_toml(e), HasSubstr("azimuth = \"40 deg\""));
  expect_same_scene(e, round_trip(e, "rt_angles_back.toml"));
}
