#include "trace/optical_tables.hpp"

#include <tbb/parallel_for.h>

namespace lumtrap {

Material material_from_ref(const MaterialRef& ref, const Scene& scene) {
  if (ref.constant) return constant_material(ref.n, ref.k);
  return find_material(ref.id_or_path, scene.file.parent_path());
}

SceneMaterials load_scene_materials(const Scene& scene) {
  SceneMaterials m{material_from_ref(scene.ambient, scene), material_from_ref(scene.wafer.material, scene),
                   material_from_ref(scene.rear_medium, scene), {}, {}};
  for (const auto& f : scene.front.films) m.front_films.push_back(material_from_ref(f.material, scene));
  for (const auto& f : scene.rear.films) m.rear_films.push_back(material_from_ref(f.material, scene));
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
  return o;
}

}  // namespace lumtrap
