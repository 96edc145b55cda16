// See cell_facts.hpp.
#include "io/cell_facts.hpp"

namespace lumtrap {

CellFacts cell_facts(const Scene& scene) {
  CellFacts c;
  if (scene.front_grid) {
    c.facts["grid_coverage"] = grid_coverage(scene.front_grid->geometry);
    c.facts["grid_contact_fraction"] = contact_fraction(scene.front_grid->geometry);
  }
  if (scene.rear_pattern) c.facts["rear_opening_fraction"] = opening_fraction(scene.rear_pattern->geometry);
  return c;
}

}  // namespace lumtrap
