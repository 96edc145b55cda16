#pragma once
// The result of a run (ray tracer or planar solver) as plain data, ready to
// be written (io/result_files.hpp): per-wavelength fractions of the incident
// photons in each end state with standard errors, their currents under the
// chosen spectrum, the histograms of a traced run, and the summary facts.
#include <cstdint>
#include <string>
#include <vector>

#include "io/end_states.hpp"
#include "io/summary.hpp"

namespace lumtrap {

/// One end-state bin: fraction per wavelength and its current.
struct ResultBin {
  EndBin bin;                    ///< state, instance, name, meaning, group
  std::vector<double> fraction;  ///< per wavelength
  std::vector<double> sigma;     ///< standard error per wavelength (0 for exact results)
  double current_mA_cm2 = 0;
  double current_sigma_mA_cm2 = 0;
};

/// G(z) under the run's spectrum: photogeneration rate per depth bin.
struct GenerationProfile {
  std::vector<double> edges_um;   ///< depth bin edges below the front surface, from 0
  std::vector<double> G_cm3_s;    ///< per bin, cm^-3 s^-1
  std::vector<double> sigma_cm3_s;
};

/// A polar × azimuth map of photon current, rows = polar bins (from 0° to
/// 90° in equal steps), columns = azimuth bins (0° to 360°).
struct AngleMap {
  int polar_bins = 0, azimuth_bins = 0;
  std::vector<float> current_mA_cm2;  ///< [polar][azimuth]
  std::string title;                  ///< what was counted, for file headers
};

struct Results {
  std::string method;                 ///< "ray tracing" or "planar (exact)"
  std::string spectrum;               ///< "AM1.5G", ...
  std::vector<double> wavelength_nm;
  std::vector<double> band_weight;    ///< photons m^-2 s^-1 of each wavelength's band
  std::vector<std::uint64_t> photons; ///< per wavelength (0 for exact results)
  std::vector<ResultBin> bins;        ///< every end-state bin of the scene, in table order
  double J_max_mA_cm2 = 0;

  // Histograms of a traced run (empty for exact results).
  GenerationProfile generation;
  AngleMap escape_angles, rear_angles;
  std::vector<double> passes_current_mA_cm2;           ///< absorbed photons by bulk crossings (last: that many or more)
  std::vector<std::vector<double>> depth_by_wavelength;  ///< with run.depth_histograms: [wavelength][depth bin]

  Summary summary;                    ///< facts for summary.json (currents filled by compute_currents)

  const ResultBin& bin(EndState state, int instance = 0) const;
  const ResultBin& bin(const std::string& name) const;
};

/// Result bins of a layout with zero fractions for `wavelengths` wavelengths.
std::vector<ResultBin> result_bins(const EndBinLayout& layout, std::size_t wavelengths);

/// Fills every bin's current and its standard error from band weights,
/// J = q Σ_i w_i f_i, σ_J = q sqrt(Σ_i w_i² σ_i²) (wavelengths independent),
/// and the currents, wavelength facts and closure of the summary.
void compute_currents(Results& r);

}  // namespace lumtrap
