#pragma once
// Checks of command-line option values with readable bounds: CLI11's own
// NonNegativeNumber / PositiveNumber print the largest double in full (309
// digits), and a number too large for its type would otherwise be saturated
// or refused with a conversion error. Values are echoed shortened.
#include <cstdint>
#include <string>

#include <CLI/CLI.hpp>

namespace lumtrap::cli {

/// An integer from `lo` to `hi` (inclusive); `note` is added to the allowed
/// range in the message, e.g. "0 = all cores".
CLI::Validator whole_number_in(std::int64_t lo, std::int64_t hi, const std::string& note = "");

/// A finite number >= `lo`.
CLI::Validator number_at_least(double lo);

}  // namespace lumtrap::cli
