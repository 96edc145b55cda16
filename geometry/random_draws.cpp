#include "geometry/random_draws.hpp"

#include <cmath>
#include <numbers>

namespace lumtrap::geometry {

double uniform01(std::mt19937_64& rng) {
  return static_cast<double>(rng() >> 11) * 0x1.0p-53;
}

double standard_normal(std::mt19937_64& rng) {
  const double u1 = 1.0 - uniform01(rng);  // (0, 1]: log is finite
  const double u2 = uniform01(rng);
  return std::sqrt(-2.0 * std::log(u1)) * std::cos(2.0 * std::numbers::pi * u2);
}

}  // namespace lumtrap::geometry
