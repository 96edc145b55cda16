#include "io/scene_identity.hpp"

#include <fstream>
#include <sstream>
#include <stdexcept>

#include "io/scene_writer.hpp"
#include "io/text_hash.hpp"

namespace lumtrap {

std::string scene_identity(const Scene& scene) {
  const auto content = [](const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) throw std::runtime_error("cannot read " + path + " (a file the scene uses)");
    std::stringstream ss;
    ss << in.rdbuf();
    return "content " + text_hash(ss.str());
  };
  return text_hash(scene_physics_toml(scene, content));
}

}  // namespace lumtrap
