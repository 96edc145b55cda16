#include "io/scene_identity.hpp"

#include "io/scene_writer.hpp"
#include "io/text_hash.hpp"

namespace lumtrap {

std::string scene_identity(const Scene& scene) {
  const auto content = [](const std::string& path) { return "content " + file_content_hash(path); };
  return text_hash(scene_physics_toml(scene, content));
}

}  // namespace lumtrap
