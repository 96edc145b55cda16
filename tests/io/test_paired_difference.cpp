// Batch-means errors and paired differences (io/paired_difference.hpp),
// against hand-computed values of the textbook estimator sd/sqrt(n)
// (common practice).
#include <gtest/gtest.h>

#include <cmath>
#include <stdexcept>

#include "io/paired_difference.hpp"

namespace lumtrap {
namespace {

TEST(PairedDifference, BatchMeansSigmaIsSampleSdOverRootN) {
  // {1, 2, 3, 4}: mean 2.5, sum of squares 5, sd^2 = 5/3, sigma = sqrt(5/3/4)
  EXPECT_NEAR(batch_means_sigma({1, 2, 3, 4}), std::sqrt(5.0 / 12.0), 1e-15);
  EXPECT_EQ(batch_means_sigma({7}), 0.0);
  EXPECT_EQ(batch_means_sigma({}), 0.0);
  EXPECT_EQ(batch_means_sigma({3, 3, 3}), 0.0);
}

TEST(PairedDifference, PerfectlyCorrelatedGroupsHaveNoErrorOfTheDifference) {
  // b = a + 0.5 in every group: the difference is known exactly.
  const Difference d = paired_difference(10.5, {10.6, 10.4, 10.9, 10.1}, 10.0, {10.1, 9.9, 10.4, 9.6});
  EXPECT_DOUBLE_EQ(d.value, 0.5);
  EXPECT_NEAR(d.sigma, 0.0, 1e-15);
}

TEST(PairedDifference, IndependentGroupsAddTheirSpreads) {
  // a varies, b is constant: the error of a - b is a's own batch-means error.
  const Difference d = paired_difference(2.5, {1, 2, 3, 4}, 0.0, {0, 0, 0, 0});
  EXPECT_NEAR(d.sigma, std::sqrt(5.0 / 12.0), 1e-15);
}

TEST(PairedDifference, RefusesUnpairedGroups) {
  EXPECT_THROW(paired_difference(0, {1, 2}, 0, {1, 2, 3}), std::invalid_argument);
  EXPECT_THROW(paired_difference(0, {1}, 0, {1}), std::invalid_argument);
}

}  // namespace
}  // namespace lumtrap
