#include "verify/self_check.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>

namespace lumtrap::verify {

CheckOutcome statistical(std::string name, std::string reference, double expected, double obtained,
                         std::uint64_t photons, double floor) {
  CheckOutcome c{std::move(name), std::move(reference), expected, obtained};
  const double p = obtained > 0 && obtained < 1 ? obtained : std::clamp(expected, 0.0, 1.0);
  c.sigma = std::sqrt(std::max(p * (1 - p), 1.0 / double(photons)) / double(photons));
  const double delta = std::abs(obtained - expected);
  c.deviation = delta / c.sigma;
  c.allowed = 4.0 + floor / c.sigma;  // |Δ| <= 4σ + floor, in units of σ
  c.passed = delta <= 4.0 * c.sigma + floor;
  return c;
}

CheckOutcome exact(std::string name, std::string reference, double expected, double obtained,
                   double relative_tolerance) {
  CheckOutcome c{std::move(name), std::move(reference), expected, obtained};
  const double delta = std::abs(obtained - expected);
  c.deviation = expected != 0 ? delta / std::abs(expected) : delta;
  c.allowed = relative_tolerance;
  c.passed = std::isfinite(obtained) && c.deviation <= relative_tolerance;
  return c;
}

std::vector<CheckOutcome> run_self_checks(const std::function<void(const CheckOutcome&)>& report) {
  std::vector<CheckOutcome> all;
  const auto add = [&](CheckOutcome c) {
    if (report) report(c);
    all.push_back(std::move(c));
  };
  closed_form_checks(add);
  traced_checks(add);
  accounting_checks(add);
  return all;
}

}  // namespace lumtrap::verify
