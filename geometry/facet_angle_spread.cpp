#include "geometry/facet_angle_spread.hpp"

#include <cmath>
#include <random>
#include <stdexcept>
#include <string>

#include "geometry/random_draws.hpp"

namespace lumtrap::geometry {

namespace {

void check(bool ok, const std::string& what) {
  if (!ok) throw std::invalid_argument("geometry/facet_angle_spread.cpp: facet angles: " + what);
}

constexpr std::uint64_t kStreamKey = 0x9e3779b97f4a7c15ULL;  // separates this stream from the layout's

}  // namespace

void check_facet_angle_spread(const FacetAngleSpread& s) {
  switch (s.distribution) {
    case AngleDistribution::fixed:
      check(s.a_deg > 0 && s.a_deg < 90, "angle = " + std::to_string(s.a_deg) + " deg (allowed: 0 < angle < 90)");
      break;
    case AngleDistribution::uniform:
      check(s.a_deg > 0 && s.b_deg < 90 && s.a_deg < s.b_deg,
            "from " + std::to_string(s.a_deg) + " to " + std::to_string(s.b_deg) +
                " deg (allowed: 0 < lowest < highest < 90)");
      break;
    case AngleDistribution::normal:
      check(s.b_deg >= 0 && s.a_deg - 3 * s.b_deg > 0 && s.a_deg + 3 * s.b_deg < 90,
            "mean " + std::to_string(s.a_deg) + " deg, sd " + std::to_string(s.b_deg) +
                " deg (allowed: sd >= 0 and mean ± 3 sd inside (0, 90) deg)");
      break;
  }
}

double steepest_facet_angle(const FacetAngleSpread& s) {
  switch (s.distribution) {
    case AngleDistribution::fixed: return s.a_deg;
    case AngleDistribution::uniform: return s.b_deg;
    case AngleDistribution::normal: return s.a_deg + 3 * s.b_deg;
  }
  return s.a_deg;
}

std::vector<double> draw_facet_angles(const FacetAngleSpread& s, std::size_t count, std::uint64_t seed) {
  check_facet_angle_spread(s);
  std::vector<double> out(count, s.a_deg);
  if (s.distribution == AngleDistribution::fixed) return out;
  std::mt19937_64 rng(seed ^ kStreamKey);
  for (double& v : out) {
    if (s.distribution == AngleDistribution::uniform) {
      v = s.a_deg + (s.b_deg - s.a_deg) * uniform01(rng);
    } else {
      do v = s.a_deg + s.b_deg * standard_normal(rng);
      while (std::abs(v - s.a_deg) > 3 * s.b_deg);
    }
  }
  return out;
}

}  // namespace lumtrap::geometry
