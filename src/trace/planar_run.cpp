#include "trace/planar_run.hpp"

#include <cmath>
#include <stdexcept>

#include "optics/planar_wafer.hpp"
#include "io/scene_words.hpp"
#include "optics/spectrum.hpp"
#include "trace/optical_tables.hpp"
#include "trace/run.hpp"

namespace lumtrap {

std::optional<std::string> planar_solver_problem(const Scene& sc) {
  if (sc.front.texture.kind != "planar" || sc.rear.texture.kind != "planar")
    return "the planar solver needs front.texture and rear.texture = \"planar\"";
  if (sc.front.scattering != SurfaceScattering::specular || sc.rear.scattering != SurfaceScattering::specular)
    return "the planar solver needs specular surfaces (scattering = \"specular\")";
  if (sc.front.interface_model != InterfaceModel::films || sc.rear.interface_model != InterfaceModel::films)
    return "the planar solver needs interface = \"films\" on both surfaces";
  if (sc.rear_reflector) return "the planar solver has no measured rear reflectance (rear.medium = { reflectance = ... })";
  if (sc.front_grid) return "the planar solver has no front grid ([front.grid])";
  if (sc.rear_pattern) return "the planar solver has no patterned rear ([rear.pattern]); solve each region alone";
  if (sc.rear_perfect_mirror) return "the planar solver has no perfect mirror (rear.medium = \"perfect_mirror\")";
  if (sc.illumination.kind != IlluminationKind::collimated)
    return "the planar solver needs collimated illumination";
  return std::nullopt;
}

Results planar_results(const Scene& sc) {
  if (auto problem = planar_solver_problem(sc)) throw std::invalid_argument(*problem);
  const SceneMaterials mats = load_scene_materials(sc);
  check_optics_finite(sc, mats, {1.0}, {1.0});
  const Polarization pol = sc.illumination.polarization == PolarizationKind::s   ? Polarization::s
                           : sc.illumination.polarization == PolarizationKind::p ? Polarization::p
                                                                                 : Polarization::unpolarized;
  const double cos_inc = std::cos(sc.illumination.polar_rad);
  Results r;
  r.method = "planar (exact)";
  r.wavelength_nm = sc.illumination.wavelengths_nm;
  const std::size_t nw = r.wavelength_nm.size();
  const std::size_t nf = sc.front.films.size(), nr = sc.rear.films.size();
  const EndBinLayout layout = end_bin_layout(sc);
  r.bins = result_bins(layout, nw);
  const auto set = [&](EndState s, int k, std::size_t i, double value) { r.bins[layout.slot(s, k)].fraction[i] = value; };
  for (std::size_t i = 0; i < nw; ++i) {
    const double lam = r.wavelength_nm[i];
    const cplx n_si = mats.bulk.index_at(lam);
    PlanarWafer w;
    w.front.n_a = mats.ambient.index_at(lam);
    w.front.n_b = n_si;
    for (std::size_t k = 0; k < nf; ++k)
      w.front.layers.push_back({mats.front_films[k].index_at(lam), sc.front.films[k].thickness_nm});
    w.thickness_nm = sc.wafer.thickness_um * 1e3;
    w.rear.n_a = n_si;
    w.rear.n_b = mats.rear_medium.index_at(lam);
    for (std::size_t k = 0; k < nr; ++k)
      w.rear.layers.push_back({mats.rear_films[k].index_at(lam), sc.rear.films[k].thickness_nm});
    const PlanarResult p = solve_planar_wafer(w, lam, cos_inc, pol);
    // First-surface reflection alone; the rest of R is escape after entering.
    const StackResponse first = solve_stack(w.front, lam, cos_inc, Incidence::from_a);
    const double R_first = pol == Polarization::s   ? first.s.R
                           : pol == Polarization::p ? first.p.R
                                                    : 0.5 * (first.s.R + first.p.R);
    set(EndState::absorbed_silicon, 0, i, p.absorbed_silicon);
    set(EndState::reflected_front, 0, i, R_first);
    set(EndState::escaped_front, 0, i, p.R - R_first);
    for (std::size_t k = 0; k < nf; ++k) set(EndState::absorbed_front_film, int(k), i, p.absorbed_front_films[k]);
    for (std::size_t k = 0; k < nr; ++k) set(EndState::absorbed_rear_film, int(k), i, p.absorbed_rear_films[k]);
    set(EndState::absorbed_rear_medium, 0, i, p.absorbed_rear_medium);
    set(EndState::transmitted_rear, 0, i, p.T);
  }

  const Spectrum spec = scene_spectrum(sc.illumination);
  r.spectrum = spec.name;
  r.band_weight = band_photon_weights(spec, r.wavelength_nm);
  r.photons.assign(nw, 0);
  r.summary.scene_name = sc.name;
  r.summary.thickness_convention = thickness_convention_word(sc.wafer.thickness_convention);
  r.summary.thickness_um = sc.wafer.thickness_um;
  compute_currents(r);
  return r;
}

}  // namespace lumtrap
