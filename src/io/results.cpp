#include "io/results.hpp"

#include <cmath>
#include <stdexcept>

#include "optics/spectrum.hpp"

namespace lumtrap {

const ResultBin& Results::bin(EndState state, int instance) const {
  for (const auto& b : bins)
    if (b.bin.state == state && b.bin.instance == instance) return b;
  throw std::out_of_range("no result bin " + std::string(end_state_info(state).name));
}

const ResultBin& Results::bin(const std::string& name) const {
  for (const auto& b : bins)
    if (b.bin.name == name) return b;
  throw std::out_of_range("no result bin named '" + name + "'");
}

std::vector<ResultBin> result_bins(const EndBinLayout& layout, std::size_t wavelengths) {
  std::vector<ResultBin> out;
  for (const EndBin& b : layout.bins)
    out.push_back({b, std::vector<double>(wavelengths, 0.0), std::vector<double>(wavelengths, 0.0), 0, 0});
  return out;
}

void compute_currents(Results& r) {
  double total = 0;
  for (double w : r.band_weight) total += w;
  r.J_max_mA_cm2 = current_mA_per_cm2(total);
  for (auto& b : r.bins) {
    double j = 0, var = 0;
    for (std::size_t i = 0; i < r.wavelength_nm.size(); ++i) {
      j += r.band_weight[i] * b.fraction[i];
      var += r.band_weight[i] * r.band_weight[i] * b.sigma[i] * b.sigma[i];
    }
    b.current_mA_cm2 = current_mA_per_cm2(j);
    b.current_sigma_mA_cm2 = current_mA_per_cm2(std::sqrt(var));
  }

  Summary& s = r.summary;
  s.method = r.method;
  s.spectrum = r.spectrum;
  s.wavelength_range_nm = {r.wavelength_nm.front(), r.wavelength_nm.back()};
  s.wavelengths = r.wavelength_nm.size();
  s.J_max_mA_cm2 = r.J_max_mA_cm2;
  s.losses.clear();
  double sum = 0;
  for (const auto& b : r.bins) {
    sum += b.current_mA_cm2;
    if (b.bin.state == EndState::absorbed_silicon) {
      s.J_G_mA_cm2 = b.current_mA_cm2;
      s.J_G_sigma_mA_cm2 = b.current_sigma_mA_cm2;
    } else {
      s.losses.push_back({b.bin.name, b.current_mA_cm2, b.current_sigma_mA_cm2, std::string(group_name(b.bin.group)),
                          b.bin.meaning});
    }
  }
  s.closure_mA_cm2 = sum - r.J_max_mA_cm2;
}

}  // namespace lumtrap
