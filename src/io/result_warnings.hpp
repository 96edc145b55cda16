#pragma once
// Facts of a finished result that the user must see on stderr, not only in
// summary.json: photons left unresolved at run.max_bounces in numbers that
// matter, and a run.target_jg_error that was not reached.
#include <string>
#include <vector>

#include "io/results.hpp"

namespace lumtrap {

/// One line per problem (without the "warning:" prefix); empty when none.
std::vector<std::string> result_warnings(const Results& r);

}  // namespace lumtrap
