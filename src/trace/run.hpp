#pragma once
// A prepared ray-tracing run: the scene's materials, spectrum, geometry and
// Embree scenes built once; wavelengths are then traced independently, in
// photon ranges that may be split over threads, processes or cluster jobs
// (the tallies add).
#include <cstdint>
#include <memory>
#include <vector>

#include "io/results.hpp"
#include "io/scene.hpp"
#include "optics/spectrum.hpp"
#include "trace/embree_tile.hpp"
#include "trace/optical_tables.hpp"
#include "trace/tallies.hpp"
#include "trace/wafer_model.hpp"

namespace lumtrap {

struct PreparedRun {
  Scene scene;
  SceneMaterials materials;
  WaferModel model;
  TallyLayout layout;
  Spectrum spectrum;
  std::vector<double> band_weight;  ///< photons m^-2 s^-1 per run wavelength
  std::unique_ptr<EmbreeDevice> device;
  std::unique_ptr<TileScene> front_scene, rear_scene;
  std::uint64_t variant = 0;        ///< keys the random numbers of a sweep variant
};

/// The spectrum the scene's illumination names.
Spectrum scene_spectrum(const Illumination& illumination);

std::unique_ptr<PreparedRun> prepare_run(const Scene& scene, std::uint64_t variant = 0);

/// Optical tables of run wavelength i.
WavelengthOptics wavelength_optics(const PreparedRun& run, std::size_t i);

/// Traces photons [begin, end) of wavelength i on all threads of the current
/// TBB arena. The result does not depend on the number of threads.
WavelengthTally trace_wavelength(const PreparedRun& run, const WavelengthOptics& optics, std::size_t i,
                                 std::uint64_t begin, std::uint64_t end);

/// Fractions, standard errors and currents of the tallies (one per run
/// wavelength), their histograms (generation profile, angle maps, passes)
/// and the summary facts that the tallies and the scene give.
Results results_from_tallies(const PreparedRun& run, const std::vector<WavelengthTally>& tallies);

}  // namespace lumtrap
