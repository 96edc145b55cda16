#pragma once
// A watertight, periodic triangle mesh (mesh.hpp) of a height field on a
// quadtree: the tile [0, period)² is split into n × n coarse square cells,
// each split into four until the caller accepts it or it reaches the finest
// level (side period / (n·2^levels)).
//
// Leaves meet without cracks: a leaf whose edges carry corners of finer
// neighbours is fanned from its centre through all of them; others are two
// triangles. Vertices on x = period (y = period) are the twins of those on
// x = 0 (y = 0): both sides get the union of their break points, and heights
// are evaluated at the wrapped position, so the seams match bit for bit.
#include <cstddef>
#include <functional>

#include "geometry/mesh.hpp"

namespace lumtrap::geometry {

struct QuadtreeCell {
  double x0 = 0, y0 = 0, side = 0;  ///< µm
  int level = 0;                    ///< 0: coarse cell
};

struct QuadtreeGrid {
  double period = 0;  ///< µm
  int coarse = 1;     ///< coarse cells per side
  int levels = 0;     ///< splits allowed below a coarse cell
};

struct QuadtreeStats {
  std::size_t leaves = 0;
  std::size_t finest_leaves = 0;  ///< leaves at the finest level
  double finest_side_um = 0;
};

/// `accept(cell)`: the cell needs no further split (asked for every cell
/// above the finest level). `height(x, y)`: z at a point of [0, period)².
TileMesh quadtree_height_mesh(const QuadtreeGrid& grid, const std::function<bool(const QuadtreeCell&)>& accept,
                              const std::function<double(double, double)>& height, QuadtreeStats* stats = nullptr);

}  // namespace lumtrap::geometry
