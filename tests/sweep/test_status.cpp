// Sweep status: every state a variant can be in after the faults a cluster
// user meets (SIGKILL, time limit, scancel before start, never submitted,
// still queued or running), the array index of each, the tasks to submit
// again, the exit-code rule (all done), and lists that stay short for
// 10 000 variants. SLURM's answers are given as data (the formats are
// tested in test_slurm_query.cpp); the expected states are those that
// docs/cluster.md ("In the morning") promises.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <sys/wait.h>
#include <unistd.h>

#include "sweep/run_mark.hpp"
#include "sweep/status.hpp"
#include "sweep_fixture.hpp"

namespace fs = std::filesystem;
using namespace lumtrap;
using namespace lumtrap::test;
using ::testing::HasSubstr;

namespace {

const std::string kGrid = R"("wafer.thickness" = "100 um .. 190 um step 10 um")";  // 10 variants

RunMark mark(long pid, const std::string& job = "", const std::string& array_job = "") {
  RunMark m = this_run_mark();
  m.pid = pid;
  m.slurm_job = job;
  m.slurm_array_job = array_job;
  return m;
}

/// A pid that is certainly not running: a child that has exited and been reaped.
long dead_pid() {
  const pid_t p = ::fork();
  if (p == 0) ::_exit(0);
  int st = 0;
  ::waitpid(p, &st, 0);
  return long(p);
}

SlurmJob job(const std::string& array, long task, const std::string& state, const std::string& exit = "0:0") {
  SlurmJob j;
  j.array_job = array;
  j.array_task = task;
  j.job = array + "_" + std::to_string(task);
  j.state = state;
  j.exit_code = exit;
  return j;
}

}  // namespace

TEST(SweepStatus, EveryFaultFoundWithItsArrayIndexAndResubmitted) {
  TempDir tmp("status_faults");
  SweepPlanOptions opt;
  opt.per_task = 2;  // variant v is in array task v / 2
  const SweepFolder f = plan_sweep(tmp.path, kGrid, opt).folder;
  auto unit_dir = [&](std::size_t v) {
    fs::create_directories(variant_dir(f, v));
    return variant_dir(f, v);
  };
  fake_done(f, 0);
  fake_done(f, 1);
  // v2 (task 1): SIGKILLed in SLURM job 77_1 while tracing: start mark and checkpoint left.
  write_run_mark(unit_dir(2) / "started", mark(dead_pid(), "77_1", "77"));
  write_file_atomically(unit_dir(2) / "checkpoint.json", "{}");
  write_run_mark(task_record(f, 1), mark(dead_pid(), "77_1", "77"));
  // v3: same task, not reached.
  // v4 (task 2): stopped at the time limit: checkpoint, task record ended, SLURM says TIMEOUT.
  write_file_atomically(unit_dir(4) / "checkpoint.json", "{}");
  RunMark ended = mark(dead_pid(), "77_2", "77");
  ended.ended = "2026-03-04T03:12:55Z";
  ended.outcome = "0 finished, 0 already done, 0 failed, interrupted";
  write_run_mark(task_record(f, 2), ended);
  fake_done(f, 5);
  // v6, v7 (task 3): cancelled before it started (SLURM still knows it).
  // v8 (task 4): traced right now by this very process.
  write_run_mark(unit_dir(8) / "started", mark(long(::getpid())));
  // v9: same task as v8 (running task): waits its turn.

  SlurmSource slurm;
  slurm.queue = [] { return std::optional<std::vector<SlurmJob>>(std::vector<SlurmJob>{}); };
  slurm.job_states = [](const std::vector<std::string>& arrays) {
    EXPECT_EQ(arrays, std::vector<std::string>{"77"});
    return std::map<std::string, SlurmJob>{{"77_1", job("77", 1, "FAILED", "0:9")},
                                           {"77_2", job("77", 2, "TIMEOUT")},
                                           {"77_3", job("77", 3, "CANCELLED")}};
  };
  const SweepStatus st = sweep_status(f, slurm);
  EXPECT_TRUE(st.slurm_answered);
  EXPECT_EQ(st.variants[0].state, VariantState::done);
  EXPECT_EQ(st.variants[2].state, VariantState::failed);
  EXPECT_EQ(st.variants[2].task, 1u);
  EXPECT_THAT(st.variants[2].reason, HasSubstr("SLURM job 77_1"));
  EXPECT_THAT(st.variants[2].reason, HasSubstr("FAILED (killed by signal 9)"));
  EXPECT_THAT(st.variants[2].reason, HasSubstr("checkpoint kept"));
  EXPECT_EQ(st.variants[3].state, VariantState::failed);  // its task died before reaching it
  EXPECT_EQ(st.variants[4].state, VariantState::failed);
  EXPECT_EQ(st.variants[4].slurm_state, "TIMEOUT");
  EXPECT_THAT(st.variants[4].kind, HasSubstr("stopped: SLURM TIMEOUT, checkpoint kept"));
  EXPECT_EQ(st.variants[5].state, VariantState::done);
  EXPECT_EQ(st.variants[6].state, VariantState::failed);
  EXPECT_EQ(st.variants[6].task, 3u);
  EXPECT_THAT(st.variants[6].reason, HasSubstr("SLURM job 77_3 CANCELLED before it started"));
  EXPECT_EQ(st.variants[8].state, VariantState::running);
  EXPECT_EQ(st.variants[9].state, VariantState::missing);  // a task run by hand is not known as running for v9
  EXPECT_EQ(st.counts[std::size_t(VariantState::done)], 3u);
  EXPECT_EQ(st.counts[std::size_t(VariantState::running)], 1u);
  EXPECT_EQ(st.counts[std::size_t(VariantState::failed)], 5u);
  EXPECT_EQ(st.counts[std::size_t(VariantState::missing)], 1u);
  // Task 4 is busy (v8 runs in it), so only tasks 1, 2, 3 go out again.
  EXPECT_EQ(st.resubmit_tasks, (std::vector<std::size_t>{1, 2, 3}));
  EXPECT_EQ(array_ranges(st.resubmit_tasks), "1-3");
  EXPECT_FALSE(st.all_done());
}

TEST(SweepStatus, QueuedAndRunningAsSlurmSaysEvenWithoutMarks) {
  TempDir tmp("status_queue");
  const SweepFolder f = plan_sweep(tmp.path, kGrid).folder;
  SlurmSource slurm;
  const std::string submit = (f.dir / "submit.sbatch").string();
  slurm.queue = [&] {
    std::vector<SlurmJob> q{job("90", 0, "RUNNING"), job("90", 1, "PENDING"), job("91", 2, "PENDING")};
    q[0].command = q[1].command = submit;
    q[2].command = "/elsewhere/submit.sbatch";  // another sweep's job
    q[1].reason = "Resources";
    return std::optional<std::vector<SlurmJob>>(q);
  };
  const SweepStatus st = sweep_status(f, slurm);
  EXPECT_EQ(st.variants[0].state, VariantState::running);
  EXPECT_EQ(st.variants[1].state, VariantState::queued);
  EXPECT_THAT(st.variants[1].reason, HasSubstr("SLURM job 90_1 PENDING (Resources)"));
  EXPECT_EQ(st.variants[2].state, VariantState::missing);
  EXPECT_EQ(st.resubmit_tasks.size(), 8u);
  EXPECT_EQ(array_ranges(st.resubmit_tasks), "2-9");
}

TEST(SweepStatus, WithoutSlurmAKilledLocalProcessIsFailedNotRunning) {
  TempDir tmp("status_local");
  const SweepFolder f = plan_sweep(tmp.path, kGrid).folder;
  fs::create_directories(variant_dir(f, 3));
  write_run_mark(variant_dir(f, 3) / "started", mark(dead_pid()));
  write_file_atomically(variant_dir(f, 3) / "checkpoint.json", "{}");  // fresh: the old rule said "running"
  for (std::size_t v = 0; v < 10; ++v)
    if (v != 3) fake_done(f, v);
  const SweepStatus st = sweep_status(f);
  EXPECT_FALSE(st.slurm_answered);
  EXPECT_EQ(st.variants[3].state, VariantState::failed);
  EXPECT_THAT(st.variants[3].reason, HasSubstr("ended while tracing it"));
  EXPECT_EQ(st.resubmit_tasks, std::vector<std::size_t>{3});
  fake_done(f, 3);
  EXPECT_TRUE(sweep_status(f).all_done());
}

TEST(SweepStatus, ListsStayShortForTenThousandVariants) {
  // The issue: 9 980 missing variants printed 9 980 lines.
  SweepFolder f;
  f.dir = "/scratch/k7";
  f.variant_count = 10000;
  f.per_task = 10;
  std::vector<VariantStatus> st(10000);
  for (std::size_t v = 0; v < 10000; ++v) {
    st[v].task = v / 10;
    st[v].state = v < 20 ? VariantState::done : VariantState::missing;
    st[v].kind = st[v].reason = "never started";
  }
  st[5].state = VariantState::failed;
  st[5].kind = "killed while tracing";
  st[5].reason = "process 1 on n1 ended while tracing it";
  const auto groups = group_not_done(f, st);
  ASSERT_EQ(groups.size(), 2u);
  const auto lines = status_lines(f, groups);
  ASSERT_EQ(lines.size(), 2u);
  EXPECT_EQ(lines[0], "v0005 (array index 0) failed: process 1 on n1 ended while tracing it");
  EXPECT_EQ(lines[1], "v0020-v9999 (9980 variants, array indices 2-999) missing: never started");
  // Alternating states: many groups, cut at the line limit.
  for (std::size_t v = 20; v < 10000; v += 2) st[v].state = VariantState::failed;
  const auto many = status_lines(f, group_not_done(f, st), 20);
  ASSERT_EQ(many.size(), 20u);
  EXPECT_THAT(many.back(), HasSubstr("more groups (--json lists every variant)"));
}

TEST(SweepStatus, ArrayRanges) {
  EXPECT_EQ(array_ranges({}), "");
  EXPECT_EQ(array_ranges({7}), "7");
  EXPECT_EQ(array_ranges({3, 17, 40, 41, 42}), "3,17,40-42");
  EXPECT_EQ(array_ranges({0, 1, 2, 3, 5, 6}), "0-3,5-6");
}
