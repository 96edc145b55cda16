#include "geometry/pyramid_sizes.hpp"

#include <cmath>
#include <stdexcept>
#include <string>

#include "geometry/random_draws.hpp"

namespace lumtrap::geometry {

namespace {

void check(bool ok, const std::string& what) {
  if (!ok) throw std::invalid_argument("geometry/pyramid_sizes.cpp: random pyramids: " + what);
}

std::string num(double v) { return std::to_string(v); }

constexpr int kMaxRedraws = 100000;

}  // namespace

PyramidSizeSampler::PyramidSizeSampler(const RandomPyramidsSpec& spec)
    : kind_(spec.distribution), a_(spec.size_a_um), b_(spec.size_b_um), min_(spec.min_size_um) {
  check(std::isfinite(min_) && min_ > 0, "min_size_um = " + num(min_) + " (allowed: > 0)");
  switch (kind_) {
    case SizeDistribution::fixed:
      check(a_ >= min_, "size_a_um = " + num(a_) + " is the fixed size (allowed: >= min_size_um = " +
                            num(min_) + ")");
      mean_ = a_;
      mean_square_ = a_ * a_;
      break;
    case SizeDistribution::uniform:
      check(a_ > 0, "size_a_um = " + num(a_) + " is the uniform minimum (allowed: > 0)");
      check(b_ >= a_, "size_b_um = " + num(b_) + " is the uniform maximum (allowed: >= size_a_um = " +
                          num(a_) + ")");
      check(b_ > min_, "size_b_um = " + num(b_) + " is the uniform maximum (allowed: > min_size_um = " +
                           num(min_) + ")");
      mean_ = 0.5 * (a_ + b_);
      mean_square_ = mean_ * mean_ + (b_ - a_) * (b_ - a_) / 12.0;
      break;
    case SizeDistribution::normal:
    case SizeDistribution::lognormal:
      check(std::isfinite(a_) && a_ > 0, "size_a_um = " + num(a_) + " is the mean size (allowed: > 0)");
      check(std::isfinite(b_) && b_ >= 0,
            "size_b_um = " + num(b_) + " is the standard deviation of the size (allowed: >= 0)");
      if (kind_ == SizeDistribution::normal || b_ == 0)
        check(b_ > 0 || a_ >= min_, "size_a_um = " + num(a_) + " with size_b_um = 0 (allowed: >= min_size_um = " +
                                        num(min_) + ")");
      mean_ = a_;
      mean_square_ = a_ * a_ + b_ * b_;
      if (kind_ == SizeDistribution::lognormal) {
        // ln(size) ~ N(mu, sigma²) with mean a and standard deviation b:
        // sigma² = ln(1 + b²/a²), mu = ln(a) - sigma²/2 (common practice).
        const double s2 = std::log1p((b_ / a_) * (b_ / a_));
        log_sigma_ = std::sqrt(s2);
        log_mu_ = std::log(a_) - 0.5 * s2;
      }
      break;
  }
}

double PyramidSizeSampler::raw(std::mt19937_64& rng) const {
  switch (kind_) {
    case SizeDistribution::fixed:
      return a_;
    case SizeDistribution::uniform:
      return a_ + (b_ - a_) * uniform01(rng);
    case SizeDistribution::normal:
      return a_ + b_ * standard_normal(rng);
    case SizeDistribution::lognormal:
      return std::exp(log_mu_ + log_sigma_ * standard_normal(rng));
  }
  return a_;
}

double PyramidSizeSampler::draw(std::mt19937_64& rng) const {
  for (int i = 0; i < kMaxRedraws; ++i) {
    const double s = raw(rng);
    if (s >= min_) return s;
  }
  throw std::invalid_argument("geometry/pyramid_sizes.cpp: random pyramids: min_size_um = " + num(min_) +
                              " rejects almost every size drawn from the distribution (size_a_um = " +
                              num(a_) + ", size_b_um = " + num(b_) + "); lower min_size_um");
}

}  // namespace lumtrap::geometry
