#pragma once
// Writes a result folder (its files: result_files.hpp, plus the mark of
// result_folder_marker.hpp).
// The folder appears whole or not at all: files are written into a
// temporary sibling folder `.NAME.partial-PID` that then takes the place of
// the folder in one step; an old result stays in place until the new one is
// complete. An existing folder is replaced only when `overwrite` is set and
// it is a result folder lumtrap wrote (why_not_replaceable).
#include <filesystem>
#include <string>
#include <vector>

#include "io/result_files.hpp"
#include "io/text_file.hpp"

namespace lumtrap {

/// Throws std::runtime_error (naming the folder) if it exists and
/// `overwrite` is false, if it may not be replaced, or on any I/O error
/// (naming the reason, e.g. a full disk); then nothing is left behind.
void write_result_folder(const std::filesystem::path& dir, const std::vector<OutputFile>& files,
                         bool overwrite);

/// The temporary folder a process `pid` writes `dir` into.
std::filesystem::path partial_folder(const std::filesystem::path& dir, long pid);

}  // namespace lumtrap
