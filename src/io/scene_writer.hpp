#pragma once
// A validated Scene back to TOML: the resolved scene, with every value
// explicit and with units.
#include <functional>
#include <string>

#include "io/scene.hpp"

namespace lumtrap {

/// The scene as TOML with every value explicit and with units: materials
/// as ids, absolute paths or inline constants; lengths in nm / um, angles in
/// deg (or rad where deg would not read back exactly), numbers in their
/// shortest exact form. Reading it back (scene_reader.hpp) gives a Scene
/// equal to `s` field by field. The text starts with comment lines naming
/// the file the scene was read from.
std::string resolved_scene_toml(const Scene& s);

/// How a file path (a material table, a spectrum) is written.
using PathText = std::function<std::string(const std::string& path)>;

/// The same TOML without comments, without the scene's name and without
/// run.threads, paths written by `path_text`: the text whose hash
/// identifies a scene's physics (scene_identity.hpp).
std::string scene_physics_toml(const Scene& s, const PathText& path_text);

}  // namespace lumtrap
