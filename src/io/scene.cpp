// Small helpers of the scene structs (scene.hpp).
#include "io/scene.hpp"

#include "io/units.hpp"

namespace lumtrap {

std::string MaterialRef::describe() const {
  if (constant) return "n=" + format_number(n) + ", k=" + format_number(k);
  return id_or_path;
}

std::string Scene::where(const std::string& key) const {
  auto it = positions.find(key);
  return it != positions.end() ? it->second : file.string();
}

}  // namespace lumtrap
