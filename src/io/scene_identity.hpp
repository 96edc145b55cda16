#pragma once
// The identity of a scene's physics: one hash used by runs, checkpoints,
// result folders and sweeps. Two scenes with the same identity give the
// same tallies. It covers every value that can change a number (resolved,
// so defaults count) and nothing else: not the scene's name, not the file
// it was read from or how its path was spelt, not run.threads, and a
// material table, spectrum or height map given by path counts by its content, not by
// where it lies.
#include <string>

#include "io/scene.hpp"

namespace lumtrap {

/// 16 hex digits. Reads the user's material and spectrum files to hash
/// their content (std::runtime_error naming a file it cannot read).
std::string scene_identity(const Scene& scene);

}  // namespace lumtrap
