#pragma once
// Where a ray in the ambient first meets the front grid (io/front_grid.hpp).
//
// Inputs: the grid, a ray origin o (macro-frame x, y and height z above the
// cell plane, µm; o outside every body) and a unit direction d. Output: the
// first hit (its point and the outward unit normal of the metal there), or
// none. Fingers are traced in their cross-section (x, z), busbars in (y, z):
// both are straight and infinitely long in the macro frame, so the problem
// is two-dimensional; only the copies the ray passes over while it is below
// the grid's top are tested.
#include <Eigen/Core>

#include "io/front_grid.hpp"

namespace lumtrap {

struct GridHit {
  bool hit = false;
  double t = 0;               ///< distance along d
  Eigen::Vector3d point{0, 0, 0};
  Eigen::Vector3d normal{0, 0, 1};  ///< outward, unit
};

/// Height of the grid's highest point above the cell plane, µm.
double grid_top(const FrontGridGeometry& g);

GridHit first_grid_hit(const FrontGridGeometry& g, const Eigen::Vector3d& o, const Eigen::Vector3d& d);

}  // namespace lumtrap
