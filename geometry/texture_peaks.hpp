#pragma once
// Pyramids found on any tile mesh (mesh.hpp), as a scanning-probe or SEM
// analysis counts them: each apex a peak of the surface, each pyramid the
// region draining to its apex.
//
// Method (documented so that it can be compared with an instrument's):
//  1. Vertices at the same (x, y) modulo the period are welded into one
//     node (tolerance 1e-9 × period), so that seam twins and the copies of a
//     vertex in different pieces of a mesh are one point; nodes are joined
//     where a triangle edge joins their vertices.
//  2. Peaks by descending flooding with union-find (topological
//     persistence; H. Edelsbrunner, D. Letscher, A. Zomorodian, "Topological
//     persistence and simplification", Discrete Comput. Geom. 28, 511, 2002):
//     nodes are visited from the highest down (ties by index); a node with
//     no visited neighbour starts a peak; a node whose visited neighbours
//     belong to several peaks is a saddle: every peak but the highest ends
//     there with prominence z(peak) - z(saddle), and is merged into the
//     highest when that prominence is at most `min_prominence_um` (default
//     0: only a strict rise makes a peak, plateaus count once). Each node
//     belongs to the peak of its steepest visited neighbour.
//  3. A triangle belongs to the peak of its highest node. Triangles tilted
//     less than `flat_below_deg` belong to no pyramid (flat ground), and a
//     peak with no tilted triangle is not counted (a bump on flat ground).
//  4. Per pyramid: the apex (x, y, z), its prominence (that of the highest
//     peak: its height above the lowest node of the tile), the projected
//     area of its triangles and their mean tilt (projected-area weighted),
//     the side of a square of that area ("visible side": what a top view
//     shows of it), and the base side a square pyramid with that facet angle
//     and that apex standing on z = 0 would have: 2·z_apex / tan(tilt)
//     ("base from height": the size of a pyramid before its neighbours cut
//     into it, for upright pyramids on a common base plane at z = 0, the
//     lowest level of every tile in lumtrap).
//
// On generated random pyramids (exact envelope) this finds exactly the
// visible pyramids, and "base from height" gives their base sizes (tested
// against the generator's own layout).
#include <cstddef>
#include <vector>

#include "geometry/mesh.hpp"

namespace lumtrap::geometry {

struct FoundPyramid {
  double x_um = 0, y_um = 0, apex_z_um = 0;  ///< apex, in [0, period)², z in the mesh frame
  double prominence_um = 0;
  double projected_area_um2 = 0;             ///< of its tilted triangles
  double facet_deg = 0;                      ///< mean tilt of its tilted triangles
  double visible_side_um = 0;                ///< sqrt(projected area)
  double base_from_height_um = 0;            ///< 2 z_apex / tan(facet)
};

struct PeakOptions {
  double flat_below_deg = 5.0;
  double min_prominence_um = 0.0;
};

/// Pyramids of the tile, ordered by apex height, highest first.
std::vector<FoundPyramid> find_pyramids(const TileMesh& mesh, const PeakOptions& options = {});

}  // namespace lumtrap::geometry
