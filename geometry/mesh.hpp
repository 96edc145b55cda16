#pragma once
// A triangle mesh of one periodic tile of a textured surface.
// Pure geometry: no ray tracer, no optics.
//
// Conventions (all lengths in micrometres):
//  - the tile is the square [0, period) x [0, period) in x and y;
//  - the surface is a height field z(x, y), single valued, and the mesh is
//    seamless when the tile is repeated with that period (every boundary
//    edge on x = 0 has a twin on x = period, likewise in y);
//  - z = 0 is the lowest level of the texture (pyramid bases, flat regions,
//    bottoms of inverted pyramids sit at z <= 0 ... see each generator);
//  - triangles are wound counter-clockwise seen from +z, so the geometric
//    normal (v1 - v0) x (v2 - v0) points up (+z).
#include <array>
#include <cstdint>
#include <vector>

#include <Eigen/Core>
#include <Eigen/Geometry>

namespace lumtrap::geometry {

struct TileMesh {
  double period = 0;                                  ///< tile side, µm
  std::vector<Eigen::Vector3d> vertices;              ///< µm
  std::vector<std::array<std::uint32_t, 3>> triangles;

  double min_z() const;
  double max_z() const;
  /// Mean height: volume between z = min_z and the surface / tile area.
  double mean_z() const;
  /// Sum of triangle areas projected on the xy plane (= period² for a height field).
  double projected_area() const;
  /// Sum of true triangle areas.
  double surface_area() const;
  /// Unit normal (pointing up) of triangle i.
  Eigen::Vector3d normal(std::size_t i) const;
};

}  // namespace lumtrap::geometry
