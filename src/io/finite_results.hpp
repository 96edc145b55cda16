#pragma once
// The last check before a result folder is written: every number of the
// Results is finite. No result file may hold NaN, Inf or a JSON null; a run
// whose numbers are not all finite ends with an error and writes nothing.
#include "io/results.hpp"

namespace lumtrap {

/// Throws std::runtime_error naming the first non-finite quantity (and its
/// wavelength or bin) when there is one.
void require_finite_results(const Results& r);

}  // namespace lumtrap
