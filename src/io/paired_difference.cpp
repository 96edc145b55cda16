// Batch-means errors and paired differences. See paired_difference.hpp.
#include "io/paired_difference.hpp"

#include <cmath>
#include <stdexcept>

namespace lumtrap {

double batch_means_sigma(const std::vector<double>& x) {
  const std::size_t n = x.size();
  if (n < 2) return 0;
  double mean = 0;
  for (double v : x) mean += v;
  mean /= double(n);
  double ss = 0;
  for (double v : x) ss += (v - mean) * (v - mean);
  return std::sqrt(ss / double(n - 1) / double(n));
}

Difference paired_difference(double a_total, const std::vector<double>& a_groups, double b_total,
                             const std::vector<double>& b_groups) {
  if (a_groups.size() != b_groups.size() || a_groups.size() < 2)
    throw std::invalid_argument("paired groups of different or too small counts");
  std::vector<double> d(a_groups.size());
  for (std::size_t g = 0; g < d.size(); ++g) d[g] = a_groups[g] - b_groups[g];
  return {a_total - b_total, batch_means_sigma(d)};
}

}  // namespace lumtrap
