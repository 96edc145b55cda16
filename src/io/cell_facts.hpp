#pragma once
// The geometric facts of a scene's cell features for summary.json
// (Summary::cell): grid_coverage (area fraction the front grid shades at
// normal incidence), grid_contact_fraction (area where its metal touches the
// silicon) and rear_opening_fraction (area of the rear openings); exact, from
// the closed forms of io/front_grid.hpp and io/rear_pattern.hpp. Empty for
// scenes without them.
#include "io/scene.hpp"
#include "io/summary.hpp"

namespace lumtrap {

CellFacts cell_facts(const Scene& scene);

}  // namespace lumtrap
