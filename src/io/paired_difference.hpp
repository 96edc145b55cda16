#pragma once
// Errors from paired photon groups (batch means). A traced result also keeps
// J_G for each of G groups of its photons (photon i in group i mod G,
// trace/tallies.hpp). Group estimates are independent of one another, so
// the spread of G of them gives the standard error of their mean; and two
// results drawn with common random numbers (same seed, same streams) pair
// group by group, so the spread of the groups' differences gives the error
// of the difference, including the correlation that makes it small.
//   sigma = sd(x_g) / sqrt(G),  sd with G - 1 in the denominator
// (the batch-means estimator of a Monte Carlo error, common practice; e.g.
// Law and Kelton, Simulation Modeling and Analysis, 3rd ed., 2000, sec. 9.5).
#include <vector>

namespace lumtrap {

/// sd(x) / sqrt(x.size()); 0 for fewer than two values.
double batch_means_sigma(const std::vector<double>& x);

/// A difference of two estimates and its standard error.
struct Difference {
  double value = 0;
  double sigma = 0;
};

/// a_total - b_total with the error from the paired groups a_g - b_g.
/// Throws std::invalid_argument when the group counts differ or are below 2.
Difference paired_difference(double a_total, const std::vector<double>& a_groups, double b_total,
                             const std::vector<double>& b_groups);

}  // namespace lumtrap
