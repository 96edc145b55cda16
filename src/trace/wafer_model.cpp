#include "trace/wafer_model.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <stdexcept>

namespace lumtrap {

geometry::TileMesh texture_mesh(const Texture& t) {
  switch (t.kind) {
    case TextureKind::planar:
      return geometry::planar_tile(10.0);
    case TextureKind::upright_pyramids:
      return geometry::regular_pyramids_tile(t.base_um, t.facet_deg, t.gap_um, false);
    case TextureKind::inverted_pyramids:
      return geometry::regular_pyramids_tile(t.base_um, t.facet_deg, t.gap_um, true);
    case TextureKind::random_pyramids:
      return geometry::random_pyramids_tile(t.random);
  }
  throw std::logic_error("unknown texture kind");
}

namespace {

double reference_level(const geometry::TileMesh& m, ThicknessConvention c) {
  switch (c) {
    case ThicknessConvention::mean: return m.mean_z();
    case ThicknessConvention::base: return m.min_z();
    case ThicknessConvention::apex: return m.max_z();
  }
  return m.mean_z();
}

// Fills the z range, zone planes and ray offset of a surface.
void place_surface(SurfaceModel& s) {
  const auto& m = s.mesh;
  s.period = m.period;
  const double zmin = m.min_z(), zmax = m.max_z();
  s.min_z = zmin;
  s.max_z = zmax;
  double extent = std::max({m.period, zmax - zmin, 1.0});
  // New ray origins are offset from the surface by a few float ulps of the
  // largest coordinate (the Embree scene is single precision).
  s.eps = 64.0 * extent * 1.2e-7;
  double margin = 4.0 * s.eps;
  s.zone_lo = zmin - margin;
  s.zone_hi = zmax + margin;
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

WaferModel build_wafer_geometry(const Scene& scene) {
  WaferModel w;
  w.front.mesh = texture_mesh(scene.front.texture);
  geometry::TileMesh rear = texture_mesh(scene.rear.texture);
  const double ref_front = reference_level(w.front.mesh, scene.wafer.thickness_convention);
  const double ref_rear = reference_level(rear, scene.wafer.thickness_convention);
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
  if (w.bulk_gap <= 0)
    throw std::invalid_argument(fmt::format(
        "wafer.thickness {:.3f} um is too thin for its textures (front texture {:.3f} um "
        "high, rear {:.3f} um): the textured zones overlap",
        W, w.front.mesh.max_z() - w.front.mesh.min_z(),
        w.rear.mesh.max_z() - w.rear.mesh.min_z()));
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
