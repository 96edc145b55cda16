// A sweep against the cluster's limits: the array must stay below
// MaxArraySize (SLURM accepts indices 0 .. MaxArraySize-1, slurm.conf(5),
// SchedMD), --per-task is chosen or refused with the numbers, and the
// resources are checked against the partition as sinfo reports it.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "sweep/array_limits.hpp"

using namespace lumtrap;
using ::testing::HasSubstr;

namespace {
std::string error_of(std::size_t units, std::size_t per_task, std::optional<std::size_t> max) {
  try {
    fit_array(units, per_task, max);
  } catch (const std::runtime_error& e) {
    return e.what();
  }
  return "no error";
}
std::string error_of(const SlurmRequests& r, const std::vector<PartitionLimits>& p) {
  try {
    check_requests(r, p);
  } catch (const std::runtime_error& e) {
    return e.what();
  }
  return "no error";
}
}  // namespace

TEST(ArrayLimits, ChoosesTheSmallestPerTaskThatFits) {
  // The case: 10 000 variants, --per-task 1 made indices up to 9999 > 1000.
  const ArrayFit a = fit_array(10000, 0, 1001);
  EXPECT_EQ(a.per_task, 10u);
  EXPECT_EQ(a.tasks, 1000u);
  EXPECT_TRUE(a.from_cluster);
  const ArrayFit b = fit_array(240, 0, std::nullopt);
  EXPECT_EQ(b.per_task, 1u);
  EXPECT_EQ(b.tasks, 240u);
  EXPECT_FALSE(b.from_cluster);
  EXPECT_EQ(b.max_array_size, 1001u);
  EXPECT_EQ(fit_array(1001, 0, 1001).per_task, 1u);  // indices 0-1000: the highest allowed
  EXPECT_EQ(fit_array(1002, 0, 1001).per_task, 2u);
  EXPECT_EQ(fit_array(1002, 0, 1001).tasks, 501u);
  EXPECT_EQ(fit_array(5, 0, 1).tasks, 1u);
}

TEST(ArrayLimits, RefusesAGivenPerTaskThatDoesNotFitWithTheNumbers) {
  const std::string e = error_of(10000, 1, 1001);
  EXPECT_THAT(e, HasSubstr("--per-task 1: 10000 work units make 10000 array tasks (indices 0-9999)"));
  EXPECT_THAT(e, HasSubstr("MaxArraySize (scontrol show config) is 1001 (indices 0-1000)"));
  EXPECT_THAT(e, HasSubstr("--per-task 10 or more (then 1000 tasks)"));
  EXPECT_THAT(error_of(1200, 1, std::nullopt), HasSubstr("SLURM's default MaxArraySize"));
  EXPECT_EQ(error_of(10000, 10, 1001), "no error");
  EXPECT_EQ(error_of(1001, 1, 1001), "no error");
}

TEST(ArrayLimits, ResourcesAgainstThePartition) {
  const std::vector<PartitionLimits> parts{{"ci", true, 1000, 2, std::nullopt}, {"short", false, 64000, 32, 60.0}};
  SlurmRequests r;  // defaults: 1 CPU, 04:00:00, 1G
  EXPECT_THAT(error_of(r, parts), HasSubstr("--mem 1G: 1024 MB per task, but the largest node of partition ci (the "
                                            "default) has 1000 MB"));
  r.mem = "500M";
  EXPECT_EQ(error_of(r, parts), "no error");
  r.cpus_per_task = 4;
  EXPECT_THAT(error_of(r, parts), HasSubstr("--cpus-per-task 4: the largest node of partition ci"));
  r.partition = "short";
  EXPECT_THAT(error_of(r, parts), HasSubstr("--time 04:00:00: 240 minutes, but partition short allows at most 60"));
  r.time = "00:59:00";
  EXPECT_EQ(error_of(r, parts), "no error");
  r.partition = "gpu";
  EXPECT_THAT(error_of(r, parts), HasSubstr("--partition gpu: sinfo lists no such partition; allowed: ci (default), "
                                            "short"));
  EXPECT_EQ(error_of(SlurmRequests{}, {}), "no error");  // no sinfo: nothing checked
}
