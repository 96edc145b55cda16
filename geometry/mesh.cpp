#include "geometry/mesh.hpp"

#include <algorithm>
#include <limits>

namespace lumtrap::geometry {

namespace {

// Twice the signed area of triangle t projected on xy (> 0 when wound
// counter-clockwise seen from +z).
double twice_projected_area(const TileMesh& m, const std::array<std::uint32_t, 3>& t) {
  const Eigen::Vector3d& a = m.vertices[t[0]];
  const Eigen::Vector3d& b = m.vertices[t[1]];
  const Eigen::Vector3d& c = m.vertices[t[2]];
  return (b.x() - a.x()) * (c.y() - a.y()) - (b.y() - a.y()) * (c.x() - a.x());
}

}  // namespace

double TileMesh::min_z() const {
  double z = std::numeric_limits<double>::infinity();
  for (const auto& v : vertices) z = std::min(z, v.z());
  return vertices.empty() ? 0.0 : z;
}

double TileMesh::max_z() const {
  double z = -std::numeric_limits<double>::infinity();
  for (const auto& v : vertices) z = std::max(z, v.z());
  return vertices.empty() ? 0.0 : z;
}

double TileMesh::mean_z() const {
  // Volume of the prism under each triangle down to min_z: projected area times
  // the mean height of its three corners (exact for a planar triangle).
  const double z0 = min_z();
  double twice_volume = 0.0;
  for (const auto& t : triangles) {
    const double zc = (vertices[t[0]].z() + vertices[t[1]].z() + vertices[t[2]].z()) / 3.0 - z0;
    twice_volume += twice_projected_area(*this, t) * zc;
  }
  const double area = period > 0 ? period * period : projected_area();
  return area > 0 ? 0.5 * twice_volume / area : 0.0;
}

double TileMesh::projected_area() const {
  double twice = 0.0;
  for (const auto& t : triangles) twice += twice_projected_area(*this, t);
  return 0.5 * twice;
}

double TileMesh::surface_area() const {
  double twice = 0.0;
  for (const auto& t : triangles) {
    const Eigen::Vector3d& a = vertices[t[0]];
    twice += (vertices[t[1]] - a).cross(vertices[t[2]] - a).norm();
  }
  return 0.5 * twice;
}

Eigen::Vector3d TileMesh::normal(std::size_t i) const {
  const auto& t = triangles.at(i);
  const Eigen::Vector3d& a = vertices[t[0]];
  return (vertices[t[1]] - a).cross(vertices[t[2]] - a).normalized();
}

}  // namespace lumtrap::geometry
