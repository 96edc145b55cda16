#pragma once
// Optical tables of one wavelength: the indices of the media and, for each
// surface and each facet class, the film-stack response tabulated in the
// cosine of the angle of incidence, from the outside and from the silicon.
#include <vector>

#include "io/scene.hpp"
#include "optics/material.hpp"
#include "optics/stack_table.hpp"

namespace lumtrap {

/// The scene's materials, read once.
struct SceneMaterials {
  Material ambient, bulk, rear_medium;
  std::vector<Material> front_films, rear_films;
  /// [rear.pattern]: the openings' films and medium (empty without a pattern).
  std::vector<Material> opening_films;
  Material opening_medium;
  Material grid_metal;  ///< [front.grid] metal (unset without a grid)
};

SceneMaterials load_scene_materials(const Scene& scene);

/// Resolves a scene's material reference (paths relative to the scene file).
Material material_from_ref(const MaterialRef& ref, const Scene& scene);

struct SurfaceOptics {
  std::vector<StackTable> from_outside;  ///< per facet class
  std::vector<StackTable> from_inside;   ///< per facet class (from the silicon)
  double n_outside = 1, n_inside = 1;    ///< real indices, for Snell's law
  bool outside_absorbs = false;          ///< light entering the outside medium is absorbed there
  bool ideal = false;                    ///< InterfaceModel::ideal: R = 0 unless totally reflected
  /// Rear given by a measured reflectance (io/rear_reflector.hpp): R at this
  /// wavelength and the Lambertian share of the reflected light. reflector =
  /// false: the tables decide.
  bool reflector = false;
  double reflector_R = 0, reflector_diffuse = 0;
};

struct WavelengthOptics {
  double wavelength_nm = 0;
  double alpha_per_um = 0;  ///< absorption coefficient of the bulk, 4πk/λ
  double n_bulk = 1;        ///< real index of the bulk
  SurfaceOptics front, rear;
  /// The rear in the openings of [rear.pattern] (same facet classes as `rear`);
  /// unused without a pattern.
  SurfaceOptics rear_opening;
  /// [front.grid]: ambient | metal (light from the ambient meeting the grid)
  /// and silicon | metal (light from the silicon meeting a contact), no
  /// films; unused without a grid.
  StackTable grid_from_ambient, front_contact;
};

/// Table of a perfect mirror (perfect conductor: r_s = -1, r_p = +1 in the
/// frame of fresnel.hpp, R = 1 at every angle, nothing transmitted or absorbed).
StackTable perfect_mirror_table(int samples);

/// Builds the tables at one wavelength. `front_tilt_cos` / `rear_tilt_cos`
/// are the cosines of the facet classes' tilts (one entry = one class); film
/// thickness on a class is the deposited thickness times the tilt cosine for
/// directional films, unchanged for conformal films.
WavelengthOptics make_wavelength_optics(const Scene& scene, const SceneMaterials& materials,
                                        const std::vector<double>& front_tilt_cos,
                                        const std::vector<double>& rear_tilt_cos,
                                        double wavelength_nm, int table_samples = 1025);

/// Builds small tables (a few angles) at every run wavelength and throws
/// std::runtime_error when a response is not finite (optical constants or thicknesses far beyond physical values,
/// e.g. n = 1e200, overflow the Fresnel and film formulas), naming the
/// surface, the wavelength and the scene keys of its media. Called before
/// any tracing; make_wavelength_optics makes the same check on every table.
void check_optics_finite(const Scene& scene, const SceneMaterials& materials,
                         const std::vector<double>& front_tilt_cos, const std::vector<double>& rear_tilt_cos);

}  // namespace lumtrap
