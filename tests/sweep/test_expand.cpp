// Sweep expansion: grid, zip and range axes, stable ids, the variants
// table, and the errors (unknown key, bad unit in a range, zip length
// mismatch, an invalid variant rejected before anything runs).
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "io/scene_reader.hpp"
#include "io/scene_writer.hpp"
#include "sweep/expand.hpp"

namespace fs = std::filesystem;
using namespace lumtrap;
using ::testing::HasSubstr;
using ::testing::Not;

namespace {

// A small valid scene: planar wafer, one front film, three wavelengths.
const std::string kBase = R"(
[wafer]
thickness = "160 um"

[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"

[rear]
medium = "al_rakic1995"

[illumination]
wavelengths = ["800 nm", "1000 nm", "1100 nm"]

[run]
photons = 100
)";

fs::path write_file(const std::string& name, const std::string& text) {
  const fs::path dir = fs::temp_directory_path() / "lumtrap_test_sweep";
  fs::create_directories(dir);
  const fs::path p = dir / name;
  std::ofstream(p) << text;
  return p;
}

Sweep expand(const std::string& name, const std::string& sweep_text) {
  return read_sweep_file(write_file(name, kBase + sweep_text));
}

std::string error_of(const std::string& name, const std::string& sweep_text) {
  try {
    expand(name, sweep_text);
  } catch (const SweepError& e) {
    return e.what();
  } catch (const SceneError& e) {
    return std::string("SceneError: ") + e.what();
  }
  return "no error";
}

std::vector<std::string> strings_of(const toml::array& a) {
  std::vector<std::string> out;
  for (const auto& n : a) out.push_back(n.is_string() ? n.as_string()->get() : "<not a string>");
  return out;
}

}  // namespace

// ---------------------------------------------------------------------------
// Ranges

TEST(SweepRange, LengthsInTheUnitOfFrom) {
  EXPECT_EQ(strings_of(sweep_range_values("60 nm .. 90 nm step 5 nm")),
            (std::vector<std::string>{"60 nm", "65 nm", "70 nm", "75 nm", "80 nm", "85 nm", "90 nm"}));
  // TO and STEP may use other units of the same kind; values take FROM's unit.
  EXPECT_EQ(strings_of(sweep_range_values("0.1 um..0.2um step 50 nm")),
            (std::vector<std::string>{"0.1 um", "0.15 um", "0.2 um"}));
  // Decimal steps come out clean (rounded to 12 significant digits).
  EXPECT_EQ(strings_of(sweep_range_values("0.1 um .. 0.4 um step 0.1 um")),
            (std::vector<std::string>{"0.1 um", "0.2 um", "0.3 um", "0.4 um"}));
  EXPECT_EQ(strings_of(sweep_range_values("0 deg .. 60 deg step 30 deg")),
            (std::vector<std::string>{"0 deg", "30 deg", "60 deg"}));
  EXPECT_EQ(strings_of(sweep_range_values("75 nm .. 75 nm step 5 nm")), (std::vector<std::string>{"75 nm"}));
}

TEST(SweepRange, PlainNumbersAndIntegers) {
  const toml::array f = sweep_range_values("0 .. 1 step 0.25");
  ASSERT_EQ(f.size(), 5u);
  EXPECT_TRUE(f.get(0)->is_floating_point());
  EXPECT_EQ(f.get(1)->as_floating_point()->get(), 0.25);
  EXPECT_EQ(f.get(4)->as_floating_point()->get(), 1.0);
  const toml::array i = sweep_range_values("1 .. 7 step 3");
  ASSERT_EQ(i.size(), 3u);
  EXPECT_TRUE(i.get(0)->is_integer());
  EXPECT_EQ(i.get(2)->as_integer()->get(), 7);
}

TEST(SweepRange, Errors) {
  auto error = [](const std::string& text) -> std::string {
    try {
      sweep_range_values(text);
    } catch (const SweepError& e) {
      return e.what();
    }
    return "no error";
  };
  // a bad unit in TO names the unit and the allowed ones
  EXPECT_THAT(error("60 nm .. 90 nx step 5 nm"), HasSubstr("unit \"nx\" is not accepted"));
  EXPECT_THAT(error("60 nm .. 90 nx step 5 nm"), HasSubstr("nm, um, µm, mm"));
  EXPECT_THAT(error("60 nx .. 90 nx step 5 nx"), HasSubstr("FROM \"60 nx\": unit \"nx\" is not accepted"));
  // mixed kinds, missing units
  EXPECT_THAT(error("60 nm .. 90 deg step 5 nm"), HasSubstr("TO (a length like FROM)"));
  EXPECT_THAT(error("60 nm .. 90 nm step 5"), HasSubstr("STEP (a length like FROM)"));
  EXPECT_THAT(error("60 .. 90 nm step 5 nm"), HasSubstr("TO \"90 nm\" is not a plain number"));
  // shape
  EXPECT_THAT(error("60 nm .. 90 nm step 7 nm"), HasSubstr("is not a whole number"));
  EXPECT_THAT(error("90 nm .. 60 nm step 5 nm"), HasSubstr("TO is smaller than FROM"));
  EXPECT_THAT(error("60 nm .. 90 nm step 0 nm"), HasSubstr("STEP \"0 nm\" is not > 0"));
  EXPECT_THAT(error("60 nm .. 90 nm"), HasSubstr("no 'step'"));
  EXPECT_THAT(error("60 nm .. 90 nm step 5 nm"), Not(HasSubstr("value")));  // (valid: "no error")
  EXPECT_THAT(error("60 nm .. 90 nx step 5 nm"), HasSubstr("value \"60 nm .. 90 nx step 5 nm\""));
}

// ---------------------------------------------------------------------------
// Expansion

TEST(SweepExpand, GridIsEveryCombinationFirstAxisSlowest) {
  const Sweep s = expand("grid.toml", R"(
[sweep.grid]
"wafer.thickness" = ["120 um", "160 um"]
"front.films[0].thickness" = "60 nm .. 70 nm step 5 nm"
)");
  ASSERT_EQ(s.variants.size(), 6u);
  EXPECT_EQ(s.keys, (std::vector<std::string>{"wafer.thickness", "front.films[0].thickness"}));
  const double wafer[] = {120, 120, 120, 160, 160, 160};
  const double film[] = {60, 65, 70, 60, 65, 70};
  for (std::size_t v = 0; v < 6; ++v) {
    const SweepVariant& var = s.variants[v];
    EXPECT_EQ(var.index, v);
    EXPECT_EQ(var.id, "v000" + std::to_string(v));
    EXPECT_EQ(var.scene.wafer.thickness_um, wafer[v]) << var.id;
    EXPECT_EQ(var.scene.front.films.at(0).thickness_nm, film[v]) << var.id;
    // the rest of the base scene is untouched
    EXPECT_EQ(var.scene.illumination.wavelengths_nm.size(), 3u);
    EXPECT_EQ(var.scene.rear_medium.id_or_path, "al_rakic1995");
    ASSERT_EQ(var.values.size(), 2u);
    EXPECT_EQ(var.values[1].key, "front.films[0].thickness");
    // each variant's resolved scene reads back to the same scene
    EXPECT_EQ(resolved_scene_toml(scene_from_table(toml::parse(var.resolved), s.file)), var.resolved);
  }
  EXPECT_EQ(s.variants[4].values[1].toml, "\"65 nm\"");
  EXPECT_EQ(s.variants[4].values[1].json, "65 nm");
}

TEST(SweepExpand, AxesFollowTheWrittenOrderNotTheKeyOrder) {
  // "wafer..." sorts after "front..." alphabetically, but is written first.
  const Sweep s = expand("order.toml", R"(
[sweep.grid]
"wafer.thickness" = ["120 um", "160 um"]
"front.films[0].thickness" = ["60 nm", "70 nm"]
"rear.medium" = ["al_rakic1995", "air"]
)");
  EXPECT_EQ(s.keys, (std::vector<std::string>{"wafer.thickness", "front.films[0].thickness", "rear.medium"}));
  ASSERT_EQ(s.variants.size(), 8u);
  EXPECT_EQ(s.variants[1].scene.rear_medium.id_or_path, "air");
  EXPECT_EQ(s.variants[1].scene.wafer.thickness_um, 120.0);
  EXPECT_EQ(s.variants[4].scene.wafer.thickness_um, 160.0);
}

TEST(SweepExpand, ZipPairsValuesAndCombinesWithTheGrid) {
  const Sweep s = expand("zip.toml", R"(
[front]
texture = "random_pyramids"
[front.random_pyramids]
distribution = "uniform"
tile = "40 um"

[sweep.grid]
"wafer.thickness" = ["120 um", "160 um"]

[[sweep.zip]]
"front.random_pyramids.min" = ["1 um", "2 um", "3 um"]
"front.random_pyramids.max" = ["3 um", "5 um", "7 um"]
)");
  // grid axis written first (slowest), then the zip axis (3 pairs)
  ASSERT_EQ(s.variants.size(), 6u);
  EXPECT_EQ(s.keys,
            (std::vector<std::string>{"wafer.thickness", "front.random_pyramids.min", "front.random_pyramids.max"}));
  for (std::size_t v = 0; v < 6; ++v) {
    const auto& r = s.variants[v].scene.front.texture;
    EXPECT_EQ(r.number("min"), 1.0 + double(v % 3)) << v;
    EXPECT_EQ(r.number("max"), 3.0 + 2.0 * double(v % 3)) << v;
    EXPECT_EQ(s.variants[v].scene.wafer.thickness_um, v < 3 ? 120.0 : 160.0);
  }
}

TEST(SweepExpand, ValuesOfAnyTypeAndTablesCreatedOnTheWay) {
  const Sweep s = expand("types.toml", R"(
[sweep.grid]
"front.texture" = ["upright_pyramids"]
"front.pyramids.base" = ["2 um", "4 um"]
"rear.films" = [[], [{ material = "sio2_malitson1965", thickness = "100 nm" }]]
"run.seed" = "1 .. 2 step 1"
"ambient.material" = [{ n = 1.5, k = 0 }]
)");
  ASSERT_EQ(s.variants.size(), 8u);
  EXPECT_EQ(s.variants[0].scene.front.texture.number("base"), 2.0);
  EXPECT_EQ(s.variants[0].scene.rear.films.size(), 0u);
  EXPECT_EQ(s.variants[2].scene.rear.films.size(), 1u);
  EXPECT_EQ(s.variants[1].scene.run.seed, 2u);
  EXPECT_TRUE(s.variants[0].scene.ambient.constant);
  EXPECT_EQ(s.variants[0].values[4].toml, "{ k = 0, n = 1.5 }");
}

TEST(SweepExpand, IdsAreStableAndWidenBeyondTenThousand) {
  const std::string text = R"(
[sweep.grid]
"front.films[0].thickness" = "60 nm .. 70 nm step 1 nm"
)";
  const Sweep a = expand("ids_a.toml", text), b = expand("ids_a.toml", text);
  ASSERT_EQ(a.variants.size(), 11u);
  for (std::size_t v = 0; v < a.variants.size(); ++v) {
    EXPECT_EQ(a.variants[v].id, b.variants[v].id);
    EXPECT_EQ(a.variants[v].resolved, b.variants[v].resolved);
  }
  EXPECT_EQ(a.variants[10].id, "v0010");
  EXPECT_EQ(sweep_identity_text(a), sweep_identity_text(b));
  // other values: another identity
  const Sweep c = expand("ids_a.toml", R"(
[sweep.grid]
"front.films[0].thickness" = "60 nm .. 70 nm step 2 nm"
)");
  EXPECT_NE(sweep_identity_text(a), sweep_identity_text(c));

  // (constant indices and a two-line spectrum: no long tables to read 10001 times)
  write_file("ids_big_spectrum.csv", "wavelength_nm,irradiance_W_m2_nm\n700,1\n900,1\n");
  const Sweep big = read_sweep_file(write_file("ids_big.toml", R"(
[wafer]
material = { n = 3.5, k = 0.001 }
[illumination]
spectrum = "ids_big_spectrum.csv"
wavelengths = "800 nm"
[sweep.grid]
"run.seed" = "0 .. 10000 step 1"
)"));
  ASSERT_EQ(big.variants.size(), 10001u);
  EXPECT_EQ(big.variants.front().id, "v00000");
  EXPECT_EQ(big.variants.back().id, "v10000");
}

TEST(SweepExpand, VariantsTableHasUnitsInTheHeader) {
  const Sweep s = expand("table.toml", R"(
[sweep.grid]
"front.films[0].thickness" = ["60 nm", "70 nm"]
"rear.medium" = ["al_rakic1995", { n = 1.5, k = 0 }]
"wafer.thickness" = ["0.16 mm", "120 um"]
)");
  EXPECT_EQ(variants_csv(s).substr(0, variants_csv(s).find('\n')),
            "id,front.films[0].thickness [nm],rear.medium,wafer.thickness");
  const std::string csv = variants_csv(s);
  EXPECT_THAT(csv, HasSubstr("\nv0000,60,al_rakic1995,0.16 mm\n"));
  EXPECT_THAT(csv, HasSubstr("\nv0003,60,\"{ k = 0, n = 1.5 }\",120 um\n"));
  EXPECT_EQ(csv_field("a,b"), "\"a,b\"");
  EXPECT_EQ(csv_field("say \"x\""), "\"say \"\"x\"\"\"");
}

TEST(SweepExpand, SetAtKeyPath) {
  toml::table t = toml::parse(kBase);
  set_at_key_path(t, "front.films[0].thickness", toml::value<std::string>("80 nm"));
  EXPECT_EQ(t.at_path("front.films[0].thickness").value<std::string>(), "80 nm");
  set_at_key_path(t, "front.random_pyramids.mean", toml::value<std::string>("3 um"));
  EXPECT_EQ(t.at_path("front.random_pyramids.mean").value<std::string>(), "3 um");
  auto error = [&](const std::string& path) -> std::string {
    try {
      set_at_key_path(t, path, toml::value<std::int64_t>(1));
    } catch (const SweepError& e) {
      return e.what();
    }
    return "no error";
  };
  EXPECT_THAT(error("front.films[3].thickness"), HasSubstr("'front.films' has 1 element, so there is no [3]"));
  EXPECT_THAT(error("rear.films[0].thickness"), HasSubstr("'rear.films' is not in the scene"));
  EXPECT_THAT(error("wafer.thickness.value"), HasSubstr("'wafer.thickness' is a string, not a table"));
  EXPECT_THAT(error("wafer..thickness"), HasSubstr("an empty part"));
  EXPECT_THAT(error("front.films[x]"), HasSubstr("index [x] is not a whole number"));
}

// ---------------------------------------------------------------------------
// Errors: all found before anything runs, naming the variant

TEST(SweepErrors, UnknownKeyNamesKeyAndVariant) {
  const std::string e = error_of("unknown.toml", R"(
[sweep.grid]
"wafer.thicknes" = ["120 um", "160 um"]
)");
  EXPECT_THAT(e, HasSubstr("2 of 2 sweep variants are invalid (nothing was run;"));
  EXPECT_THAT(e, HasSubstr("variant v0000 (wafer.thicknes = \"120 um\")"));
  EXPECT_THAT(e, HasSubstr("key 'wafer.thicknes'"));
  EXPECT_THAT(e, HasSubstr("unknown key (did you mean 'thickness'?)"));
  // where the swept key is written in the [sweep] table is named
  EXPECT_THAT(e, HasSubstr("swept keys: wafer.thicknes at "));
  EXPECT_THAT(e, HasSubstr("unknown.toml:19:"));
}

TEST(SweepErrors, BadUnitInARangeNamesFileLineAndKey) {
  const std::string e = error_of("badunit.toml", R"(
[sweep.grid]
"front.films[0].thickness" = "60 nm .. 90 nx step 5 nm"
)");
  EXPECT_THAT(e, HasSubstr("badunit.toml:19:30: "));
  EXPECT_THAT(e, HasSubstr("sweep key 'sweep.grid.\"front.films[0].thickness\"'"));
  EXPECT_THAT(e, HasSubstr("unit \"nx\" is not accepted"));
}

TEST(SweepErrors, ZipLengthMismatch) {
  const std::string e = error_of("ziplen.toml", R"(
[sweep.zip]
"wafer.thickness" = ["120 um", "160 um"]
"front.films[0].thickness" = ["60 nm", "70 nm", "80 nm"]
)");
  EXPECT_THAT(e, HasSubstr("zipped lists of different lengths: 'wafer.thickness' has 2 values"));
  EXPECT_THAT(e, HasSubstr("'front.films[0].thickness' has 3"));
}

TEST(SweepErrors, InvalidVariantIsRejectedNamingItAndItsParameters) {
  // Only one combination is invalid: a negative film thickness.
  const std::string e = error_of("invalid.toml", R"(
[sweep.grid]
"wafer.thickness" = ["120 um", "160 um"]
"front.films[0].thickness" = ["60 nm", "-5 nm"]
)");
  EXPECT_THAT(e, HasSubstr("2 of 4 sweep variants are invalid"));
  EXPECT_THAT(e, HasSubstr("variant v0001 (wafer.thickness = \"120 um\", front.films[0].thickness = \"-5 nm\")"));
  EXPECT_THAT(e, HasSubstr("variant v0003 (wafer.thickness = \"160 um\", front.films[0].thickness = \"-5 nm\")"));
  EXPECT_THAT(e, Not(HasSubstr("variant v0000")));
  EXPECT_THAT(e, HasSubstr("key 'front.films[0].thickness': value \"-5 nm\""));
}

TEST(SweepErrors, MalformedSweepTables) {
  EXPECT_THAT(error_of("nosweep.toml", ""), HasSubstr("no [sweep] table"));
  EXPECT_THAT(error_of("empty.toml", "[sweep]\n"), HasSubstr("[sweep] names no values to sweep"));
  EXPECT_THAT(error_of("unknownsec.toml", "[sweep]\ngird = 1\n"),
              HasSubstr("key 'sweep.gird': unknown key; allowed keys in [sweep]: grid, zip"));
  EXPECT_THAT(error_of("single.toml", "[sweep.grid]\n\"wafer.thickness\" = \"120 um\"\n"),
              HasSubstr("a single value; allowed: a list"));
  EXPECT_THAT(error_of("emptylist.toml", "[sweep.grid]\n\"wafer.thickness\" = []\n"), HasSubstr("an empty list"));
  EXPECT_THAT(error_of("twice.toml",
                       "[sweep.grid]\n\"wafer.thickness\" = [\"1 um\"]\n[sweep.zip]\n\"wafer.thickness\" = [\"2 um\"]\n"),
              HasSubstr("is swept twice"));
  EXPECT_THAT(error_of("self.toml", "[sweep.grid]\n\"sweep.grid\" = [1]\n"),
              HasSubstr("a sweep cannot change its own [sweep] table"));
}
