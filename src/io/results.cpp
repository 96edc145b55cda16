#include "io/results.hpp"

#include <cmath>
#include <stdexcept>

#include "optics/spectrum.hpp"

namespace lumtrap {

const ResultBin& Results::bin(const std::string& name) const {
  for (const auto& b : bins)
    if (b.name == name) return b;
  throw std::out_of_range("no result bin named '" + name + "'");
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
}

}  // namespace lumtrap
