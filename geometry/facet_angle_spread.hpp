#pragma once
// Facet angles of random pyramids drawn one per pyramid, as an etch leaves
// them spread around the crystal's angle: fixed (every pyramid at the mean),
// uniform between a lowest and a highest angle, or normal with a mean and a
// standard deviation, truncated at mean ± 3 sd (draws outside are drawn
// again). Angles in degrees, to the wafer plane.
//
// The draws come from their own random stream (std::mt19937_64 seeded with
// the layout seed XOR a fixed constant), so a spread of facet angles leaves
// the positions and base sizes of the pyramids as they are without it.
#include <cstdint>
#include <vector>

namespace lumtrap::geometry {

enum class AngleDistribution { fixed, uniform, normal };

struct FacetAngleSpread {
  AngleDistribution distribution = AngleDistribution::fixed;
  double a_deg = 54.735610317245346;  ///< fixed / normal: the mean; uniform: the lowest angle
  double b_deg = 0;                   ///< normal: standard deviation; uniform: the highest angle
};

/// Throws std::invalid_argument naming the field when the spread allows
/// angles outside (0, 90) degrees or is malformed.
void check_facet_angle_spread(const FacetAngleSpread& spread);

/// One angle per pyramid (count of them), reproducible for a seed.
std::vector<double> draw_facet_angles(const FacetAngleSpread& spread, std::size_t count, std::uint64_t seed);

/// The largest angle the spread can give, degrees.
double steepest_facet_angle(const FacetAngleSpread& spread);

}  // namespace lumtrap::geometry
