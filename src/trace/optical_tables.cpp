#include "trace/optical_tables.hpp"

#include <fmt/format.h>
#include <tbb/parallel_for.h>

#include <cmath>
#include <stdexcept>

#include "io/formula_material_file.hpp"

namespace lumtrap {

Material material_from_ref(const MaterialRef& ref, const Scene& scene) {
  install_formula_file_reader();  // a scene made in code may name a formula file too
  if (ref.constant) return constant_material(ref.n, ref.k);
  return find_material(ref.id_or_path, scene.file.parent_path());
}

SceneMaterials load_scene_materials(const Scene& scene) {
  SceneMaterials m;
  m.ambient = material_from_ref(scene.ambient, scene);
  m.bulk = material_from_ref(scene.wafer.material, scene);
  m.rear_medium = material_from_ref(scene.rear_medium, scene);
  for (const auto& f : scene.front.films) m.front_films.push_back(material_from_ref(f.material, scene));
  for (const auto& f : scene.rear.films) m.rear_films.push_back(material_from_ref(f.material, scene));
  if (scene.front_grid) m.grid_metal = material_from_ref(scene.front_grid->metal, scene);
  if (scene.rear_pattern) {
    m.opening_medium = material_from_ref(scene.rear_pattern->medium, scene);
    for (const auto& f : scene.rear_pattern->films) m.opening_films.push_back(material_from_ref(f.material, scene));
  }
  return m;
}

namespace {

std::vector<ThinLayer> layers_at(const std::vector<Film>& films, const std::vector<Material>& mats,
                                 double wavelength_nm, double thickness_scale) {
  std::vector<ThinLayer> layers;
  for (std::size_t i = 0; i < films.size(); ++i)
    layers.push_back({mats[i].index_at(wavelength_nm), films[i].thickness_nm * thickness_scale});
  return layers;
}

/// The scene keys and values of the media of a surface's stack, for messages.
std::string stack_media(const Scene& scene, bool front) {
  const auto item = [&](const std::string& key, const MaterialRef& m) {
    return fmt::format("{} = {} ({})", key, m.describe(), scene.where(key));
  };
  std::string s = front ? item("ambient.material", scene.ambient) : item("wafer.material", scene.wafer.material);
  const auto& films = front ? scene.front.films : scene.rear.films;
  for (std::size_t i = 0; i < films.size(); ++i)
    s += "; " + item(fmt::format("{}.films[{}].material", front ? "front" : "rear", i), films[i].material);
  s += "; " + (front ? item("wafer.material", scene.wafer.material) : item("rear.medium", scene.rear_medium));
  return s;
}

/// Throws when a table holds a non-finite number.
void require_finite_table(const StackTable& t, const Scene& scene, bool front, double lambda) {
  const auto power_ok = [](double p) { return std::isfinite(p); };
  const auto amp_ok = [](cplx a) { return std::isfinite(a.real()) && std::isfinite(a.imag()); };
  const auto bad = [&](const InterfaceResponse& r) {
    return !(power_ok(r.Rs) && power_ok(r.Rp) && power_ok(r.Ts) && power_ok(r.Tp) && amp_ok(r.rs) &&
             amp_ok(r.rp) && amp_ok(r.ts) && amp_ok(r.tp));
  };
  bool ok = true;
  for (const auto& r : t.response) ok = ok && !bad(r);
  for (const auto& r : t.critical_response) ok = ok && !bad(r);
  for (const auto* v : {&t.layer_As, &t.layer_Ap, &t.critical_As, &t.critical_Ap})
    for (double a : *v) ok = ok && power_ok(a);
  if (ok) return;
  throw std::runtime_error(fmt::format(
      "the {} film stack gives no finite reflectance and transmittance at {} nm (optical constants or thicknesses "
      "far beyond physical values overflow the Fresnel and thin-film formulas); its media: {}; allowed: optical "
      "constants n, k and thicknesses of real materials",
      front ? "front" : "rear", fmt::format("{:g}", lambda), stack_media(scene, front)));
}

double thickness_scale(Conformality c, double tilt_cos) {
  return c == Conformality::directional ? tilt_cos : 1.0;
}

}  // namespace

StackTable perfect_mirror_table(int samples) {
  StackTable t;
  t.samples = samples;
  t.layers = 0;
  t.response.assign(std::size_t(samples), InterfaceResponse{cplx(-1, 0), cplx(1, 0), cplx(0, 0), cplx(0, 0),
                                                            1.0, 1.0, 0.0, 0.0});
  return t;
}

WavelengthOptics make_wavelength_optics(const Scene& scene, const SceneMaterials& mats,
                                        const std::vector<double>& front_tilt_cos,
                                        const std::vector<double>& rear_tilt_cos,
                                        double lambda, int samples) {
  WavelengthOptics o;
  o.wavelength_nm = lambda;
  const cplx n_amb = mats.ambient.index_at(lambda);
  const cplx n_si = mats.bulk.index_at(lambda);
  const cplx n_rear = mats.rear_medium.index_at(lambda);
  o.alpha_per_um = absorption_coefficient_per_nm(n_si, lambda) * 1e3;
  o.n_bulk = n_si.real();

  // Front: a = ambient, layers ambient → silicon, b = silicon.
  o.front.n_outside = n_amb.real();
  o.front.n_inside = n_si.real();
  o.front.outside_absorbs = false;
  o.front.ideal = scene.front.interface_model == InterfaceModel::ideal;
  // The tables are independent: list them, then solve them in parallel
  // (each is written to its own slot, so the result does not depend on the
  // number of threads).
  struct Job {
    StackTable* table;
    FilmStack stack;
    Incidence side;
  };
  std::vector<Job> jobs;
  o.front.from_outside.resize(front_tilt_cos.size());
  o.front.from_inside.resize(front_tilt_cos.size());
  for (std::size_t k = 0; k < front_tilt_cos.size(); ++k) {
    FilmStack st{n_amb, layers_at(scene.front.films, mats.front_films, lambda,
                                  thickness_scale(scene.front.conformality, front_tilt_cos[k])),
                 n_si};
    jobs.push_back({&o.front.from_outside[k], st, Incidence::from_a});
    jobs.push_back({&o.front.from_inside[k], st, Incidence::from_b});
  }
  // Rear: a = silicon, layers silicon → outside, b = rear medium.
  o.rear.n_outside = n_rear.real();
  o.rear.n_inside = n_si.real();
  o.rear.outside_absorbs = n_rear.imag() > 0;
  o.rear.ideal = scene.rear.interface_model == InterfaceModel::ideal;
  if (scene.rear_reflector) {
    o.rear.reflector = true;
    o.rear.reflector_R = scene.rear_reflector->reflectance_at(lambda);
    o.rear.reflector_diffuse = scene.rear_reflector->diffuse_fraction;
    o.rear.outside_absorbs = false;
  }
  o.rear.from_inside.resize(rear_tilt_cos.size());
  o.rear.from_outside.resize(rear_tilt_cos.size());
  for (std::size_t k = 0; k < rear_tilt_cos.size(); ++k) {
    if (scene.rear_perfect_mirror || scene.rear_reflector) {  // the reflector's tables are never read
      o.rear.from_inside[k] = perfect_mirror_table(samples);
      o.rear.from_outside[k] = perfect_mirror_table(samples);
      continue;
    }
    FilmStack st{n_si, layers_at(scene.rear.films, mats.rear_films, lambda,
                                 thickness_scale(scene.rear.conformality, rear_tilt_cos[k])),
                 n_rear};
    jobs.push_back({&o.rear.from_inside[k], st, Incidence::from_a});
    jobs.push_back({&o.rear.from_outside[k], st, Incidence::from_b});
  }
  tbb::parallel_for(std::size_t(0), jobs.size(), [&](std::size_t j) {
    *jobs[j].table = tabulate_stack(jobs[j].stack, lambda, jobs[j].side, samples);
  });
  const std::size_t front_jobs = 2 * front_tilt_cos.size();
  for (std::size_t j = 0; j < jobs.size(); ++j) require_finite_table(*jobs[j].table, scene, j < front_jobs, lambda);
  if (!std::isfinite(o.alpha_per_um) || !std::isfinite(o.n_bulk) || !std::isfinite(o.front.n_outside) ||
      !std::isfinite(o.rear.n_outside))
    throw std::runtime_error(fmt::format("the optical constants at {} nm are not finite numbers; media: {}; {}",
                                         fmt::format("{:g}", lambda), stack_media(scene, true),
                                         stack_media(scene, false)));
  if (scene.front_grid) {
    const cplx n_metal = mats.grid_metal.index_at(lambda);
    o.grid_from_ambient = tabulate_stack(FilmStack{n_amb, {}, n_metal}, lambda, Incidence::from_a, samples);
    o.front_contact = tabulate_stack(FilmStack{n_si, {}, n_metal}, lambda, Incidence::from_a, samples);
    require_finite_table(o.grid_from_ambient, scene, true, lambda);
    require_finite_table(o.front_contact, scene, true, lambda);
  }
  if (scene.rear_pattern) {
    // The openings: the same rear with the openings' films and medium.
    Scene opening = scene;
    opening.rear.films = scene.rear_pattern->films;
    opening.rear_medium = scene.rear_pattern->medium;
    opening.rear_reflector = scene.rear_pattern->reflector;
    opening.rear_perfect_mirror = false;
    opening.rear_pattern.reset();
    SceneMaterials om = mats;
    om.rear_films = mats.opening_films;
    om.rear_medium = mats.opening_medium;
    o.rear_opening = make_wavelength_optics(opening, om, {}, rear_tilt_cos, lambda, samples).rear;
  }
  return o;
}

void check_optics_finite(const Scene& scene, const SceneMaterials& materials,
                         const std::vector<double>& front_tilt_cos, const std::vector<double>& rear_tilt_cos) {
  const auto& wl = scene.illumination.wavelengths_nm;
  std::vector<std::string> problems(wl.size());
  tbb::parallel_for(std::size_t(0), wl.size(), [&](std::size_t i) {
    try {
      (void)make_wavelength_optics(scene, materials, front_tilt_cos, rear_tilt_cos, wl[i], 9);
    } catch (const std::exception& e) {
      problems[i] = e.what();
    }
  });
  for (const auto& p : problems)  // the first wavelength's problem, whatever the thread order
    if (!p.empty()) throw std::runtime_error(p);
}

}  // namespace lumtrap
