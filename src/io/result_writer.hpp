#pragma once
// Writes a result folder (its files: result_files.hpp).
// The folder appears whole or not at all: files are written into a
// temporary sibling folder that is renamed at the end. An existing folder is
// replaced only when `overwrite` is set.
#include <filesystem>
#include <string>
#include <vector>

#include "io/result_files.hpp"
#include "io/text_file.hpp"

namespace lumtrap {

/// Throws std::runtime_error (naming the folder) if it exists and
/// `overwrite` is false, or on any I/O error; then nothing is left behind.
void write_result_folder(const std::filesystem::path& dir, const std::vector<OutputFile>& files,
                         bool overwrite);

}  // namespace lumtrap
