#include "trace/planar_run.hpp"

#include <cmath>
#include <stdexcept>

#include "optics/planar_wafer.hpp"
#include "optics/spectrum.hpp"
#include "trace/optical_tables.hpp"
#include "trace/run.hpp"

namespace lumtrap {

Results planar_results(const Scene& sc) {
  if (sc.front.texture.kind != TextureKind::planar || sc.rear.texture.kind != TextureKind::planar)
    throw std::invalid_argument("the planar solver needs front.texture and rear.texture = \"planar\"");
  if (sc.front.scattering != SurfaceScattering::specular || sc.rear.scattering != SurfaceScattering::specular)
    throw std::invalid_argument("the planar solver needs specular surfaces (scattering = \"specular\")");
  if (sc.illumination.kind != IlluminationKind::collimated)
    throw std::invalid_argument("the planar solver needs collimated illumination");

  const SceneMaterials mats = load_scene_materials(sc);
  const Polarization pol = sc.illumination.polarization == PolarizationKind::s   ? Polarization::s
                           : sc.illumination.polarization == PolarizationKind::p ? Polarization::p
                                                                                 : Polarization::unpolarized;
  const double cos_inc = std::cos(sc.illumination.polar_rad);
  Results r;
  r.method = "planar (exact)";
  r.wavelength_nm = sc.illumination.wavelengths_nm;
  const std::size_t nw = r.wavelength_nm.size();
  const std::size_t nf = sc.front.films.size(), nr = sc.rear.films.size();
  // bins: A_si, R_front, R_escape, A_front_k..., A_rear_k..., A_rear_medium, T
  std::vector<std::vector<double>> f(5 + nf + nr, std::vector<double>(nw));
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
    f[0][i] = p.A_si;
    f[1][i] = R_first;
    f[2][i] = p.R - R_first;
    for (std::size_t k = 0; k < nf; ++k) f[3 + k][i] = p.A_front[k];
    for (std::size_t k = 0; k < nr; ++k) f[3 + nf + k][i] = p.A_rear[k];
    f[3 + nf + nr][i] = p.A_rear_medium;
    f[4 + nf + nr][i] = p.T;
  }
  auto add = [&](std::string name, std::string meaning, bool loss, std::vector<double> v) {
    r.bins.push_back({std::move(name), std::move(meaning), loss, std::move(v), std::vector<double>(nw, 0.0), 0, 0});
  };
  add("A_si", "absorbed in the silicon bulk (J_G)", false, f[0]);
  add("R_front", "reflected at the front without entering the silicon", true, f[1]);
  add("R_escape", "entered the silicon, then escaped through the front", true, f[2]);
  for (std::size_t k = 0; k < nf; ++k)
    add(film_bin_name("front", k, sc.front.films[k]), film_bin_meaning("front", k, sc.front.films[k]), true, f[3 + k]);
  for (std::size_t k = 0; k < nr; ++k)
    add(film_bin_name("rear", k, sc.rear.films[k]), film_bin_meaning("rear", k, sc.rear.films[k]), true,
        f[3 + nf + k]);
  add("A_rear_medium", "absorbed in the rear medium (" + sc.rear_medium.describe() + ")", true, f[3 + nf + nr]);
  add("T", "transmitted through the rear", true, f[4 + nf + nr]);

  const Spectrum spec = scene_spectrum(sc.illumination);
  r.spectrum = spec.name;
  r.band_weight = band_photon_weights(spec, r.wavelength_nm);
  r.photons.assign(nw, 0);
  compute_currents(r);
  return r;
}

}  // namespace lumtrap
