// Two triangles per cell of a periodic sample grid. See height_map_mesh.hpp.
#include "geometry/height_map_mesh.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

namespace lumtrap::geometry {

double periodic_grid_mesh_bytes(std::size_t m) {
  const double v = double(m + 1) * double(m + 1), t = 2.0 * double(m) * double(m);
  return v * sizeof(Eigen::Vector3d) + t * sizeof(std::array<std::uint32_t, 3>);
}

TileMesh periodic_grid_mesh(const PeriodicGrid& g, double pitch) {
  const std::size_t m = g.samples;
  if (m < 1 || !(pitch > 0))
    throw std::invalid_argument(
        fmt::format("geometry/height_map_mesh.cpp: {} samples per period at pitch {} um", m, pitch));
  const std::size_t side = m + 1;
  if (double(side) * double(side) > double(std::numeric_limits<std::uint32_t>::max()))
    throw std::invalid_argument(
        fmt::format("geometry/height_map_mesh.cpp: {} samples per period: too many vertices for 32-bit indices", m));
  double zmin = std::numeric_limits<double>::infinity();
  for (std::size_t j = 0; j < m; ++j)
    for (std::size_t i = 0; i < m; ++i) zmin = std::min(zmin, g.z(i, j));

  TileMesh mesh;
  mesh.period = double(m) * pitch;
  mesh.vertices.resize(side * side);
  // Coordinates as i·pitch, and exactly the period on the last row and
  // column, so that seam twins match bit for bit.
  const auto coord = [&](std::size_t i) { return i == m ? mesh.period : double(i) * pitch; };
  for (std::size_t j = 0; j < side; ++j)
    for (std::size_t i = 0; i < side; ++i)
      mesh.vertices[j * side + i] = {coord(i), coord(j), g.z(i % m, j % m) - zmin};

  mesh.triangles.resize(2 * m * m);
  std::size_t t = 0;
  for (std::size_t j = 0; j < m; ++j)
    for (std::size_t i = 0; i < m; ++i) {
      // a = (i, j), b = (i+1, j), c = (i+1, j+1), d = (i, j+1): counter-clockwise from +z
      const auto a = static_cast<std::uint32_t>(j * side + i), b = a + 1;
      const auto d = static_cast<std::uint32_t>(a + side), c = d + 1;
      const double zac = std::abs(mesh.vertices[a].z() - mesh.vertices[c].z());
      const double zbd = std::abs(mesh.vertices[b].z() - mesh.vertices[d].z());
      if (zac >= zbd) {
        mesh.triangles[t++] = {a, b, c};
        mesh.triangles[t++] = {a, c, d};
      } else {
        mesh.triangles[t++] = {a, b, d};
        mesh.triangles[t++] = {b, c, d};
      }
    }
  return mesh;
}

}  // namespace lumtrap::geometry
