#pragma once
// Drives a prepared run over its wavelengths in slices of photons:
// checkpoints between slices every few seconds and when stopped (resuming
// after an interruption, even a SIGKILL, gives the same final numbers: the
// photons after the last checkpoint are traced again, identically), reports
// progress, and in precision mode allocates photons
// over wavelengths until the standard error of J_G meets the target.
//
// A slice is a contiguous photon range [begin, end) of one wavelength, sized
// from the measured speed so that it takes about `slice_seconds` (never more
// than `batch` photons): a stop request is therefore seen within about that
// time whatever the scene, and the tallies always hold whole photon ranges
// counted from the first photon, so a resumed run adds exactly the photons
// that are missing (photon i's random numbers depend on i only).
#include <atomic>
#include <cstdint>
#include <filesystem>
#include <functional>
#include <string>
#include <vector>

#include "trace/run.hpp"

namespace lumtrap {

struct DriveOptions {
  std::filesystem::path checkpoint;      ///< empty: no checkpoints
  std::string scene_hash;                ///< stored in and checked against the checkpoint
  std::uint64_t batch = 50000;           ///< most photons per wavelength in one slice
  double slice_seconds = 0.25;           ///< aimed duration of a slice (how soon a stop request is seen)
  double checkpoint_seconds = 10.0;      ///< write the checkpoint at most this often (and when stopping)
  std::function<void(double done_fraction)> progress;  ///< called between slices (may be empty)
  const std::atomic<bool>* stop = nullptr;  ///< set asynchronously to stop after the current slice
  /// Problems the run survives (a checkpoint that cannot be written, e.g. on
  /// a full disk), one line each; may be empty.
  std::function<void(const std::string& message)> warn;
  /// Photon range of every wavelength, for a run split over processes or
  /// cluster jobs (fixed mode only): photons [first_photon, last_photon),
  /// last_photon = 0 meaning run.photons. The tallies of the parts of a
  /// split add up exactly to those of the whole run (counter-based random
  /// numbers keyed by the photon index).
  std::uint64_t first_photon = 0;
  std::uint64_t last_photon = 0;
};

struct DriveResult {
  std::vector<WavelengthTally> tallies;
  bool complete = false;   ///< false when stopped early (checkpoint holds the work done)
  std::string checkpoint_problem;  ///< why the last checkpoint could not be written; empty when it was
  double jg_sigma_mA_cm2 = 0;
};

/// Fixed mode (run.target_jg_error == 0): run.photons per wavelength (or the
/// range [first_photon, last_photon) of each wavelength; throws
/// std::invalid_argument for a range beyond run.photons, or any range in
/// precision mode).
/// Precision mode (> 0): a pilot (precision_pilot), then Neyman allocation
/// (N_i ∝ w_i sqrt(p_i (1 - p_i)), the allocation that minimises Var(J_G)
/// for a given total; W. G. Cochran, Sampling Techniques, 3rd ed., 1977,
/// §5.5) in rounds until σ(J_G) <= target; run.photons caps each
/// wavelength. The goals of the current round are kept in the checkpoint, so
/// an interrupted precision run resumes to bit-identical tallies.
DriveResult drive_run(const PreparedRun& run, const DriveOptions& options);

/// The pilot of precision mode, photons per wavelength: a quarter
/// (kPilotFraction) of the photons that would meet `target` (σ(J_G) in
/// mA/cm²) whatever the absorptances, N = (Σ w_i / 2)² / σ², shared in
/// proportion to the band weights w_i, and within [kFewestPilotPhotons,
/// kMostPilotPhotons] and run.photons (`cap`) per wavelength. Alone it
/// reaches at best about twice the target unless the absorptances are near
/// 0 or 1, so it does not overshoot a loose target by much (a fixed pilot of
/// 2000 photons per wavelength did); the rounds that follow size the rest.
constexpr double kPilotFraction = 0.25;
constexpr std::uint64_t kFewestPilotPhotons = 100;
constexpr std::uint64_t kMostPilotPhotons = 2000;
std::vector<std::uint64_t> precision_pilot(const PreparedRun& run, std::uint64_t cap, double target);

/// σ(J_G) in mA/cm² of a set of tallies.
double jg_sigma(const PreparedRun& run, const std::vector<WavelengthTally>& tallies);

}  // namespace lumtrap
