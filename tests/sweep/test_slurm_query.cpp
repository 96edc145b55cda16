// Reading SLURM's answers: MaxArraySize, partitions, times and memory
// sizes, the queue and job states. The texts below were captured from
// slurm-wlm 22.05.8 (Debian 12) on the one-node test cluster
// (scripts/slurm-ci.sh) unless marked otherwise; the formats are those of
// scontrol(1), sinfo(1), squeue(1) and sacct(1) (SchedMD).
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "sweep/slurm_query.hpp"

using namespace lumtrap;
using ::testing::HasSubstr;

TEST(SlurmQuery, MaxArraySizeFromScontrolShowConfig) {
  const std::string config =
      "Configuration data as of 2026-12-04T18:30:01\n"
      "MaxArraySize            = 1001\n"
      "MaxJobCount             = 10000\n"
      "MinJobAge               = 300 sec\n";
  EXPECT_EQ(parse_max_array_size(config), std::optional<std::size_t>(1001));
  EXPECT_EQ(parse_max_array_size("MaxArraySize = 40001\n"), std::optional<std::size_t>(40001));
  EXPECT_EQ(parse_max_array_size("MaxJobCount = 10000\n"), std::nullopt);
  EXPECT_EQ(kDefaultMaxArraySize, 1001u);  // slurm.conf(5): default MaxArraySize (from memory)
}

TEST(SlurmQuery, PartitionsFromSinfoNodes) {
  // captured: `sinfo -h -N -o '%P|%m|%c|%l'`; second part made up in the same format
  const auto p = parse_sinfo_nodes("ci*|1000|2|infinite\n"
                                   "short|64000|32|1:00:00\n"
                                   "short|256000|64|1:00:00\n"
                                   "long|128000+|48|7-00:00:00\n");
  ASSERT_EQ(p.size(), 3u);
  EXPECT_EQ(p[0].name, "ci");
  EXPECT_TRUE(p[0].is_default);
  EXPECT_EQ(p[0].max_node_memory_MB, 1000);
  EXPECT_EQ(p[0].max_node_cpus, 2);
  EXPECT_FALSE(p[0].max_minutes.has_value());
  EXPECT_EQ(p[1].name, "short");
  EXPECT_EQ(p[1].max_node_memory_MB, 256000);
  EXPECT_EQ(p[1].max_node_cpus, 64);
  EXPECT_EQ(p[1].max_minutes, std::optional<double>(60));
  EXPECT_EQ(p[2].max_minutes, std::optional<double>(7 * 24 * 60));
  EXPECT_EQ(p[2].max_node_memory_MB, 128000);
}

TEST(SlurmQuery, TimesInTheFormatsOfSbatch) {
  // sbatch(1), --time: "minutes", "minutes:seconds", "hours:minutes:seconds",
  // "days-hours", "days-hours:minutes" and "days-hours:minutes:seconds".
  EXPECT_EQ(slurm_minutes("30"), std::optional<double>(30));
  EXPECT_EQ(slurm_minutes("30:15"), std::optional<double>(30.25));
  EXPECT_EQ(slurm_minutes("04:00:00"), std::optional<double>(240));
  EXPECT_EQ(slurm_minutes("1-12"), std::optional<double>(36 * 60));
  EXPECT_EQ(slurm_minutes("1-12:30"), std::optional<double>(36 * 60 + 30));
  EXPECT_EQ(slurm_minutes("2-00:00:30"), std::optional<double>(2 * 1440 + 0.5));
  EXPECT_EQ(slurm_minutes("infinite"), std::nullopt);
  EXPECT_EQ(slurm_minutes("UNLIMITED"), std::nullopt);
  EXPECT_THROW(slurm_minutes("4h"), std::invalid_argument);
  EXPECT_THROW(slurm_minutes("1:2:3:4"), std::invalid_argument);
}

TEST(SlurmQuery, MemorySizesInMegabytes) {
  // sbatch(1), --mem: default unit megabytes; suffixes K, M, G, T.
  EXPECT_EQ(slurm_megabytes("500M"), 500);
  EXPECT_EQ(slurm_megabytes("2G"), 2048);
  EXPECT_EQ(slurm_megabytes("1024"), 1024);
  EXPECT_EQ(slurm_megabytes("1T"), 1024.0 * 1024);
  EXPECT_EQ(slurm_megabytes("512K"), 0.5);
  EXPECT_THROW(slurm_megabytes("2GB"), std::invalid_argument);
  EXPECT_THROW(slurm_megabytes("lots"), std::invalid_argument);
}

TEST(SlurmQuery, QueueOneLinePerArrayElement) {
  // captured: `squeue -r -h -o '%A|%F|%K|%T|%r|%o|%Z'` while an array of 6 ran on 2 CPUs
  const auto q = parse_squeue("46|46|2|PENDING|Resources|/tmp/sq/t.sh|/tmp/sq\n"
                              "47|46|0|RUNNING|None|/tmp/sq/t.sh|/tmp/sq\n"
                              "51|51|N/A|PENDING|Dependency|merge.sbatch|/tmp/sq\n");
  ASSERT_EQ(q.size(), 3u);
  EXPECT_EQ(q[0].job, "46_2");
  EXPECT_EQ(q[0].array_job, "46");
  EXPECT_EQ(q[0].array_task, 2);
  EXPECT_EQ(q[0].state, "PENDING");
  EXPECT_EQ(q[0].reason, "Resources");
  EXPECT_EQ(q[0].command, "/tmp/sq/t.sh");
  EXPECT_EQ(q[1].job, "46_0");
  EXPECT_EQ(q[1].reason, "");
  EXPECT_EQ(q[2].job, "51");
  EXPECT_EQ(q[2].array_task, -1);
  EXPECT_EQ(q[2].command, "/tmp/sq/merge.sbatch");  // relative command made absolute with the work dir
}

TEST(SlurmQuery, FinishedJobsFromScontrolAndSacct) {
  // captured and shortened (`scontrol show job -o 46`; the exit code of job 50 set to a signal by hand);
  // the pending range "3-4" is for squeue to report
  const auto s = parse_scontrol_jobs(
      "JobId=46 ArrayJobId=46 ArrayTaskId=3-4 JobName=t.sh JobState=PENDING Reason=Resources ExitCode=0:0\n"
      "JobId=48 ArrayJobId=46 ArrayTaskId=1 JobName=t.sh JobState=COMPLETED Reason=None ExitCode=0:0\n"
      "JobId=50 ArrayJobId=46 ArrayTaskId=4 JobName=t.sh JobState=CANCELLED Reason=None ExitCode=0:15\n"
      "JobId=52 JobName=merge JobState=COMPLETED Reason=None ExitCode=0:0\n");
  ASSERT_EQ(s.size(), 3u);
  EXPECT_EQ(s[0].job, "46_1");
  EXPECT_EQ(s[0].state, "COMPLETED");
  EXPECT_EQ(s[1].job, "46_4");
  EXPECT_EQ(describe_job_end(s[1]), "CANCELLED (killed by signal 15)");
  EXPECT_EQ(s[2].job, "52");
  // sacct(1) -P output (made up in its documented format): job steps are left out
  const auto a = parse_sacct("1234_7|CANCELLED by 1000|0:0\n1234_8|FAILED|0:9\n1234_8.batch|FAILED|0:9\n"
                             "1234_9|TIMEOUT|0:0\n1235|FAILED|1:0\n");
  ASSERT_EQ(a.size(), 4u);
  EXPECT_EQ(a[0].state, "CANCELLED");
  EXPECT_EQ(a[0].array_task, 7);
  EXPECT_EQ(describe_job_end(a[1]), "FAILED (killed by signal 9)");
  EXPECT_EQ(describe_job_end(a[2]), "TIMEOUT");
  EXPECT_EQ(describe_job_end(a[3]), "FAILED (exit code 1)");
}

TEST(SlurmQuery, CommandsWithATimeLimit) {
  const CommandOutput echo = run_command({"sh", "-c", "echo 'MaxArraySize = 77'"});
  EXPECT_TRUE(echo.ran);
  EXPECT_EQ(parse_max_array_size(echo.out), std::optional<std::size_t>(77));
  EXPECT_FALSE(run_command({"lumtrap-no-such-command-here"}).ran);
  EXPECT_FALSE(run_command({"sh", "-c", "exit 3"}).ran);
  EXPECT_EQ(run_command({"sh", "-c", "exit 3"}).exit_code, 3);
  EXPECT_FALSE(run_command({"sleep", "30"}, 0.2).ran);  // killed at its limit
}
