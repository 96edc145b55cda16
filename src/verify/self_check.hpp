#pragma once
// Built-in physics checks of an installed lumtrap (`lumtrap verify`): the
// general code (film solver, planar solver, ray tracer) against closed forms
// of textbook cases (src/optics/closed_forms.hpp), the accounting of every
// photon, and the independence of results from the thread count. Each check
// names its reference; Monte Carlo values are compared with the run's own
// standard error, |Δ| <= 4σ + a small floor; exact values with a relative
// tolerance at round-off level. The whole set runs in well under a minute.
#include <functional>
#include <string>
#include <vector>

namespace lumtrap::verify {

struct CheckOutcome {
  std::string name;       ///< what is checked, e.g. "Fresnel reflectance, n = 4.3, normal incidence (traced)"
  std::string reference;  ///< the source of the expected value
  double expected = 0;
  double obtained = 0;
  /// Standard error of `obtained` (Monte Carlo); 0 for an exact comparison.
  double sigma = 0;
  /// |Δ|/σ for Monte Carlo values, |Δ|/|expected| (|Δ| when expected = 0) for exact ones.
  double deviation = 0;
  double allowed = 0;     ///< the largest deviation that passes (same unit as `deviation`)
  bool passed = false;
};

/// A Monte Carlo comparison: passes when |Δ| <= 4σ + floor; σ is the
/// binomial standard error of the traced fraction (of the expected one when
/// the tracer saw nothing).
CheckOutcome statistical(std::string name, std::string reference, double expected, double obtained,
                         std::uint64_t photons, double floor = 1e-4);
/// An exact comparison: passes when |Δ| <= relative_tolerance·|expected| (absolute when expected = 0).
CheckOutcome exact(std::string name, std::string reference, double expected, double obtained,
                   double relative_tolerance = 1e-12);

/// Runs every check in order, calling `report` after each (for printing as
/// they finish), and returns them all.
std::vector<CheckOutcome> run_self_checks(const std::function<void(const CheckOutcome&)>& report = {});

// The groups of checks (one file each).
void closed_form_checks(const std::function<void(CheckOutcome)>& add);   // optics code, exact
void traced_checks(const std::function<void(CheckOutcome)>& add);        // ray tracer vs closed forms
void accounting_checks(const std::function<void(CheckOutcome)>& add);    // energy closure, thread invariance

}  // namespace lumtrap::verify
