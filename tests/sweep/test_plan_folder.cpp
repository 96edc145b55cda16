// The sweep folder on disk: what plan writes, its size per variant, a task
// reading only its own variants (by seeking), the variant scene rebuilt
// from the shared base with the planned identity, re-planning, and the
// refusals.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>

#include "io/scene_identity.hpp"
#include "io/scene_reader.hpp"
#include "sweep_fixture.hpp"

namespace fs = std::filesystem;
using namespace lumtrap;
using namespace lumtrap::test;
using ::testing::HasSubstr;

namespace {

// 5 x 6 x 10 = 300 variants.
const std::string kGrid = R"("wafer.thickness" = "120 um .. 160 um step 10 um"
"front.films[0].thickness" = "65 nm .. 90 nm step 5 nm"
"illumination.polar_angle" = "0 deg .. 45 deg step 5 deg"
)";

std::uintmax_t folder_bytes(const fs::path& dir) {
  std::uintmax_t n = 0;
  for (const auto& e : fs::recursive_directory_iterator(dir))
    if (e.is_regular_file()) n += e.file_size();
  return n;
}

}  // namespace

TEST(PlanFolder, WritesTheLayoutWithoutPerVariantFiles) {
  TempDir tmp("plan_layout");
  const PlannedSweep p = plan_sweep(tmp.path, kGrid);
  const fs::path d = p.folder.dir;
  for (const char* f : {"sweep.json", "sweep.toml", "variants.jsonl", "variants.csv"})
    EXPECT_TRUE(fs::exists(d / f)) << f;
  EXPECT_TRUE(fs::is_directory(d / "logs" / "per-task-1"));
  EXPECT_FALSE(fs::exists(d / "variants")) << "variant folders are made when a variant first runs";
  EXPECT_EQ(p.folder.variant_count, 300u);
  EXPECT_EQ(p.folder.tasks, 300u);
  EXPECT_EQ(task_log(p.folder, 7), d / "logs" / "per-task-1" / "task_7.log");
}

TEST(PlanFolder, StaysUnderOneKilobytePerVariant) {
  // Scale target of the issue: plan folder <= 1 KB per variant plus results.
  TempDir tmp("plan_size");
  const PlannedSweep p = plan_sweep(tmp.path, kGrid);
  const double per_variant = double(folder_bytes(p.folder.dir)) / double(p.folder.variant_count);
  EXPECT_LT(per_variant, 1024.0);
  RecordProperty("bytes_per_variant", std::to_string(per_variant));
}

TEST(PlanFolder, IndexLinesHaveOneLengthAndTasksReadOnlyTheirOwn) {
  TempDir tmp("plan_seek");
  SweepPlanOptions opt;
  opt.per_task = 7;
  const PlannedSweep p = plan_sweep(tmp.path, kGrid, opt);
  std::ifstream in(p.folder.dir / "variants.jsonl");
  std::string line;
  std::size_t n = 0;
  while (std::getline(in, line)) {
    EXPECT_EQ(line.size() + 1, p.folder.line_bytes) << "line " << n;
    ++n;
  }
  EXPECT_EQ(n, 300u);
  const SweepFolder all = load_sweep_folder(p.folder.dir);
  ASSERT_EQ(all.variants.size(), 300u);
  for (std::size_t t : {std::size_t(0), std::size_t(13), all.tasks - 1}) {
    const SweepFolder one = load_sweep_task(p.folder.dir, t);
    const auto units = units_of_task(one, t);
    EXPECT_EQ(one.first_variant, units.front());
    EXPECT_EQ(one.variants.size(), units.size()) << "task " << t << " read more than its own variants";
    for (std::size_t u : units) {
      EXPECT_EQ(folder_variant(one, u).id, all.variants[u].id);
      EXPECT_EQ(folder_variant(one, u).scene_hash, all.variants[u].scene_hash);
      EXPECT_EQ(folder_variant(one, u).toml, all.variants[u].toml);
    }
    EXPECT_THROW(folder_variant(one, units.back() + 1), std::logic_error);
  }
  EXPECT_THROW(load_sweep_task(p.folder.dir, all.tasks), std::out_of_range);
}

TEST(PlanFolder, VariantSceneRebuildsFromTheBaseWithThePlannedIdentity) {
  TempDir tmp("plan_rebuild");
  const PlannedSweep p = plan_sweep(tmp.path, kGrid);
  const SweepFolder f = load_sweep_folder(p.folder.dir);
  const toml::table base = read_scene_table(f.dir / "sweep.toml");
  for (std::size_t v : {0, 1, 157, 299}) {
    const SweepFolderVariant& var = folder_variant(f, v);
    std::vector<std::pair<std::string, std::string>> values;
    for (std::size_t k = 0; k < f.keys.size(); ++k) values.emplace_back(f.keys[k], var.toml[k]);
    const Scene s = scene_from_table(variant_table(base, values), f.source, {"sweep"});
    EXPECT_EQ(scene_identity(s), p.sweep.variants[v].identity) << var.id;
    EXPECT_EQ(scene_identity(s), var.scene_hash) << var.id;
  }
  EXPECT_EQ(variant_parameters(f, folder_variant(f, 157)).dump(),
            R"({"wafer.thickness":"140 um","front.films[0].thickness":"80 nm","illumination.polar_angle":"35 deg"})");
}

TEST(PlanFolder, ReplanKeepsResultsAndMovesLogsToTheNewPlan) {
  TempDir tmp("plan_replan");
  const PlannedSweep p = plan_sweep(tmp.path, kGrid);
  fake_done(p.folder, 5);
  SweepPlanOptions opt;
  opt.per_task = 4;
  const SweepFolder g =
      write_sweep_plan(p.sweep, sweep_text(kGrid), p.folder.dir, opt, nlohmann::ordered_json::object());
  EXPECT_TRUE(result_complete(g, 5));
  EXPECT_EQ(g.plan_id, "per-task-4");
  EXPECT_EQ(g.tasks, 75u);
  EXPECT_EQ(task_log(g, 1), g.dir / "logs" / "per-task-4" / "task_1.log");
  EXPECT_EQ(load_sweep_header(g.dir).plan_id, "per-task-4");
}

TEST(PlanFolder, RefusesAnotherSweepAndForeignFolders) {
  TempDir tmp("plan_refuse");
  const PlannedSweep p = plan_sweep(tmp.path, kGrid);
  const fs::path other_file = tmp.path / "other.toml";
  write_file_atomically(other_file, sweep_text(R"("wafer.thickness" = ["100 um", "200 um"])"));
  const Sweep other = read_sweep_file(other_file);
  try {
    write_sweep_plan(other, "", p.folder.dir, {}, nlohmann::ordered_json::object());
    FAIL() << "another sweep was planned into the folder";
  } catch (const std::runtime_error& e) {
    EXPECT_THAT(e.what(), HasSubstr("holds another sweep"));
  }
  const fs::path junk = tmp.path / "junk";
  fs::create_directories(junk);
  write_file_atomically(junk / "notes.txt", "mine");
  EXPECT_THROW(write_sweep_plan(other, "", junk, {}, nlohmann::ordered_json::object()), std::runtime_error);
  EXPECT_TRUE(fs::exists(junk / "notes.txt"));
  EXPECT_FALSE(fs::exists(junk / "sweep.json"));
}

TEST(PlanFolder, IdsAndUnitsOfASplitPlan) {
  TempDir tmp("plan_split");
  SweepPlanOptions opt;
  opt.per_task = 4;
  opt.split_photons = 3;
  const PlannedSweep p = plan_sweep(tmp.path, R"("wafer.thickness" = ["100 um", "150 um", "200 um"])", opt);
  EXPECT_EQ(p.folder.plan_id, "per-task-4-split-3");
  EXPECT_EQ(p.folder.tasks, 3u);  // 9 units / 4
  const SweepFolder t2 = load_sweep_task(p.folder.dir, 2);
  EXPECT_EQ(t2.first_variant, 2u);  // unit 8 = variant 2 part 2
  EXPECT_EQ(t2.variants.size(), 1u);
  EXPECT_EQ(variant_id(p.folder, 2), "v0002");
  EXPECT_EQ(unit_trace_time(p.folder, WorkUnit{1, 2}), p.folder.dir / "variants" / "v0001" / "parts" /
                                                            "p02of03.trace_time.json");
}
