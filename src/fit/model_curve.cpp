#include "fit/model_curve.hpp"

#include <cmath>

#include "trace/driver.hpp"
#include "trace/planar_run.hpp"
#include "trace/run.hpp"

namespace lumtrap {

ModelCurve model_curve(const Scene& scene, CompareQuantity compare) {
  ModelCurve c;
  Results r;
  if (!planar_solver_problem(scene)) {
    r = planar_results(scene);
    c.exact = true;
  } else {
    const auto run = prepare_run(scene, 0);
    const DriveResult d = drive_run(*run, DriveOptions{});
    r = results_from_tallies(*run, d.tallies);
  }
  const std::size_t n = r.wavelength_nm.size();
  const ResultBin& refl = r.bin(EndState::reflected_front);
  const ResultBin& esc = r.bin(EndState::escaped_front);
  const ResultBin& trans = r.bin(EndState::transmitted_rear);
  c.reflectance.resize(n);
  c.reflectance_sigma.resize(n);
  c.transmittance = trans.fraction;
  c.transmittance_sigma = trans.sigma;
  for (std::size_t i = 0; i < n; ++i) {
    const double p = compare == CompareQuantity::total_reflectance ? refl.fraction[i] + esc.fraction[i]
                                                                   : refl.fraction[i];
    c.reflectance[i] = p;
    const double photons = c.exact || r.photons.empty() ? 0.0 : double(r.photons[i]);
    c.reflectance_sigma[i] = photons > 0 ? std::sqrt(std::max(p * (1 - p), 0.0) / photons) : 0.0;
  }
  return c;
}

}  // namespace lumtrap
