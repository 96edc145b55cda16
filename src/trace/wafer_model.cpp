#include "trace/wafer_model.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <stdexcept>

#include "io/scene_reader.hpp"
#include "io/scene_words.hpp"
#include "io/units.hpp"

namespace lumtrap {

namespace {

double reference_level(const TileHeights& h, ThicknessConvention c) {
  switch (c) {
    case ThicknessConvention::mean: return h.mean_z;
    case ThicknessConvention::base: return h.min_z;
    case ThicknessConvention::apex: return h.max_z;
  }
  return h.mean_z;
}

// New ray origins are offset from a surface by a few float ulps of the
// largest coordinate of its tile (the Embree scene is single precision).
double ray_offset(double period, double zmin, double zmax) {
  const double extent = std::max({period, zmax - zmin, 1.0});
  return 64.0 * extent * 1.2e-7;
}

// Fills the z range, zone planes and ray offset of a surface.
void place_surface(SurfaceModel& s) {
  const auto& m = s.mesh;
  s.period = m.period;
  const double zmin = m.min_z(), zmax = m.max_z();
  s.min_z = zmin;
  s.max_z = zmax;
  s.eps = ray_offset(m.period, zmin, zmax);
  s.offset = s.eps / 32.0;
  double margin = 4.0 * s.eps;
  s.zone_lo = zmin - margin;
  s.zone_hi = zmax + margin;
}

// The flat bulk between the two textured zones, from the heights of the two
// tiles in their own frames (the rear one not yet mirrored): the wafer frame
// of wafer_model.hpp, with the zone margins of place_surface.
double bulk_gap(const Scene& scene, const TileHeights& front, const TileHeights& rear) {
  const double W = scene.wafer.thickness_um;
  const double ref_front = reference_level(front, scene.wafer.thickness_convention);
  const double ref_rear = reference_level(rear, scene.wafer.thickness_convention);
  const double front_lo = front.min_z - 4.0 * ray_offset(front.period, front.min_z, front.max_z);
  // mirrored rear: z range [-max_z, -min_z]
  const double rear_hi = -rear.min_z + 4.0 * ray_offset(rear.period, -rear.max_z, -rear.min_z);
  return ((W - ref_front) + front_lo) - (ref_rear + rear_hi);
}

void check_fit(const Scene& scene, const TileHeights& front, const TileHeights& rear) {
  if (bulk_gap(scene, front, rear) > 0) return;
  const double W = scene.wafer.thickness_um;
  throw SceneError(fmt::format(
      "{}: key 'wafer.thickness': value \"{}\": too thin for its textures (front texture {:.3f} um high, rear "
      "{:.3f} um, thickness convention \"{}\"): the textured zones overlap; allowed: a thickness that leaves flat "
      "silicon between the front and the rear texture",
      scene.where("wafer.thickness"), format_length_um(W), front.max_z - front.min_z, rear.max_z - rear.min_z,
      thickness_convention_word(scene.wafer.thickness_convention)));
}

// Fills normals and facet classes. `up` = outward normal points to +z.
void add_triangle_normals(SurfaceModel& s, bool up, bool classes_by_tilt) {
  const auto& m = s.mesh;
  s.outward.resize(m.triangles.size());
  s.facet_class.resize(m.triangles.size());
  s.tilt_cos.clear();
  for (std::size_t i = 0; i < m.triangles.size(); ++i) {
    Eigen::Vector3d n = m.normal(i);
    if ((n.z() < 0) == up) n = -n;
    s.outward[i] = n;
    double c = std::abs(n.z());
    std::size_t k = 0;
    if (classes_by_tilt) {
      for (; k < s.tilt_cos.size(); ++k)
        if (std::abs(s.tilt_cos[k] - c) < 1e-9) break;
      if (k == s.tilt_cos.size()) s.tilt_cos.push_back(c);
    } else if (s.tilt_cos.empty()) {
      s.tilt_cos.push_back(1.0);
    }
    s.facet_class[i] = static_cast<std::uint16_t>(k);
  }
  if (s.tilt_cos.size() > 65535) throw std::invalid_argument("too many distinct facet tilts");
}

}  // namespace

TileHeights tile_heights(const geometry::TileMesh& m) { return {m.period, m.min_z(), m.max_z(), m.mean_z()}; }

void check_wafer_geometry(const Scene& scene, TileHeightCache* cache) {
  const auto heights = [&](const Texture& t) {
    if (!cache) return tile_heights(geometry::build_texture(t));
    for (const auto& [texture, h] : cache->entries)
      if (texture == t) return h;
    cache->entries.push_back({t, tile_heights(geometry::build_texture(t))});
    return cache->entries.back().second;
  };
  check_fit(scene, heights(scene.front.texture), heights(scene.rear.texture));
}

WaferModel build_wafer_geometry(const Scene& scene) {
  WaferModel w;
  w.front.mesh = geometry::build_texture(scene.front.texture);
  geometry::TileMesh rear = geometry::build_texture(scene.rear.texture);
  const TileHeights front_heights = tile_heights(w.front.mesh), rear_heights = tile_heights(rear);
  check_fit(scene, front_heights, rear_heights);
  const double ref_front = reference_level(front_heights, scene.wafer.thickness_convention);
  const double ref_rear = reference_level(rear_heights, scene.wafer.thickness_convention);
  // The rear texture points out of the wafer: mirror z. Normals are oriented
  // explicitly (add_triangle_normals), the winding swap keeps the mesh consistent.
  for (auto& v : rear.vertices) v.z() = -v.z();
  for (auto& t : rear.triangles) std::swap(t[1], t[2]);
  w.rear.mesh = std::move(rear);

  place_surface(w.front);
  place_surface(w.rear);

  const double W = scene.wafer.thickness_um;
  w.front_origin_z = W - ref_front;   // front local z = ref_front sits at wafer z = W
  w.rear_origin_z = ref_rear;         // rear local z = -ref_rear sits at wafer z = 0
  w.front_surface_min_z = w.front_origin_z + w.front.mesh.min_z();
  w.bulk_gap = (w.front_origin_z + w.front.zone_lo) - (w.rear_origin_z + w.rear.zone_hi);
  return w;
}

void add_facet_normals(WaferModel& w, const Scene& scene) {
  add_triangle_normals(w.front, true, scene.front.conformality == Conformality::directional);
  add_triangle_normals(w.rear, false, scene.rear.conformality == Conformality::directional);
}

WaferModel build_wafer_model(const Scene& scene) {
  WaferModel w = build_wafer_geometry(scene);
  add_facet_normals(w, scene);
  return w;
}

}  // namespace lumtrap
