#pragma once
// The files of a result folder, each written from Results (results.hpp):
//
//   spectral.csv             per wavelength: photons, every end-state bin's fraction and standard error
//   summary.json             currents with standard errors and the run's facts (summary.hpp)
//   scene.toml               the resolved scene (given as text)
//   generation.csv           G(z) (traced runs)
//   escape_angles.csv/.exr   escape after trapping by polar angle and azimuth (traced runs)
//   rear_angles.csv/.exr     arrivals at the rear zone by polar angle and azimuth (traced runs)
//   passes.csv               absorbed photons by bulk crossings (traced runs)
//   depth_by_wavelength.csv  with run.depth_histograms
//
// A new output file is one writer function and one line in result_files().
// CSV headers write units in brackets: "wavelength [nm]".
#include <string>
#include <vector>

#include "io/results.hpp"

namespace lumtrap {

struct OutputFile {
  std::string name;     ///< file name inside the folder
  std::string content;
};

std::string spectral_csv(const Results& r);

/// Every file of the folder; histogram files only where Results holds them.
std::vector<OutputFile> result_files(const Results& r, const std::string& resolved_scene_text);

}  // namespace lumtrap
