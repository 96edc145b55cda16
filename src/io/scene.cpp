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
  if (it != positions.end()) return it->second;
  // A value written as an inline table ({ n = 2, k = 0 }): where its first key stands.
  std::string prefix = key;
  prefix.push_back('.');
  it = positions.lower_bound(prefix);
  if (it != positions.end() && it->first.compare(0, prefix.size(), prefix) == 0) return it->second;
  return file.string();
}

}  // namespace lumtrap
