// Small helpers of the scene structs (scene.hpp).
#include "io/scene.hpp"

#include "io/units.hpp"

namespace lumtrap {

std::string MaterialRef::describe() const {
  if (constant) return "n=" + format_number(n) + ", k=" + format_number(k);
  return id_or_path;
}

}  // namespace lumtrap
