#pragma once
// The checks of a result folder path made before any work starts (so that
// a run never traces for hours and then cannot write): the path names a new
// folder of its own (not ".", "..", the working folder or a parent of it,
// not the scene file or a folder holding it), the folder above it is a folder
// that can be written (not a file, not on a read-only file system), the name
// leaves room for the temporary names beside it, and an existing folder is
// refused unless --overwrite is given and it is a result folder lumtrap wrote.
#include <filesystem>

namespace lumtrap::cli {

/// Throws std::runtime_error with a message that names the path, what is
/// wrong and what to do instead.
void check_output_folder(const std::filesystem::path& out, const std::filesystem::path& scene_file, bool overwrite);

}  // namespace lumtrap::cli
