#pragma once
// Base sizes of random pyramids drawn from the distribution of a
// RandomPyramidsSpec (fixed, uniform, normal or lognormal), sizes below the
// spec's minimum being redrawn.
#include <random>

#include "geometry/textures.hpp"

namespace lumtrap::geometry {

class PyramidSizeSampler {
 public:
  /// Validates the size fields of `spec`; throws std::invalid_argument naming
  /// the field, its value and what is allowed.
  explicit PyramidSizeSampler(const RandomPyramidsSpec& spec);

  /// One base size, µm (>= the spec's min_size_um).
  double draw(std::mt19937_64& rng) const;

  /// Mean and mean square of the size before redrawing (µm, µm²): used to
  /// size grids and safety caps only.
  double mean() const { return mean_; }
  double mean_square() const { return mean_square_; }

 private:
  double raw(std::mt19937_64& rng) const;

  SizeDistribution kind_;
  double a_, b_, min_;
  double log_mu_ = 0, log_sigma_ = 0;  // lognormal: parameters of ln(size)
  double mean_ = 0, mean_square_ = 0;
};

}  // namespace lumtrap::geometry
