#include "io/result_warnings.hpp"

#include <fmt/format.h>

namespace lumtrap {

std::vector<std::string> result_warnings(const Results& r) {
  std::vector<std::string> w;
  const Summary& s = r.summary;
  // Unresolved photons are neither absorbed nor lost: J_G may be short by up
  // to their current. That matters once it exceeds the statistical error of J_G.
  for (const auto& b : r.bins) {
    if (b.bin.state != EndState::unresolved || !(b.current_mA_cm2 > 0)) continue;
    if (b.current_mA_cm2 <= s.J_G_sigma_mA_cm2) continue;
    const double share = s.J_max_mA_cm2 > 0 ? 100.0 * b.current_mA_cm2 / s.J_max_mA_cm2 : 0.0;
    w.push_back(fmt::format("{:.3g} % of the incident photon current ({:.4g} mA/cm2) ended unresolved at the "
                            "run.max_bounces limit of surface interactions, more than the standard error of J_G "
                            "({:.3g} mA/cm2): J_G and the losses are short by up to that much; raise "
                            "run.max_bounces",
                            share, b.current_mA_cm2, s.J_G_sigma_mA_cm2));
  }
  if (s.target_J_G_sigma_mA_cm2 > 0 && !s.target_J_G_sigma_met)
    w.push_back(fmt::format("run.target_jg_error = {:g} mA/cm2 was not reached: sigma(J_G) = {:.3g} mA/cm2 with "
                            "up to {} photons per wavelength (run.photons is the cap); raise run.photons to reach it",
                            s.target_J_G_sigma_mA_cm2, s.J_G_sigma_mA_cm2, s.photons_per_wavelength_max));
  return w;
}

}  // namespace lumtrap
