#pragma once
// Writes a result folder: spectral.csv (per wavelength, every bin with its
// standard error), summary.json (currents with standard errors and run
// facts), scene.toml (the resolved scene) and any further files.
// The folder appears whole or not at all: files are written into a
// temporary sibling folder that is renamed at the end. An existing folder is
// replaced only when `overwrite` is set.
#include <filesystem>
#include <string>
#include <vector>

#include "io/results.hpp"

namespace lumtrap {

struct OutputFile {
  std::string name;     ///< file name inside the folder
  std::string content;
};

std::string spectral_csv(const Results& r);
std::string summary_json(const Results& r);

/// Throws std::runtime_error (naming the folder) if it exists and
/// `overwrite` is false, or on any I/O error; then nothing is left behind.
void write_result_folder(const std::filesystem::path& dir, const std::vector<OutputFile>& files,
                         bool overwrite);

/// Writes one file atomically (temporary file + rename).
void write_file_atomically(const std::filesystem::path& file, const std::string& content);

}  // namespace lumtrap
