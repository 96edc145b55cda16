#pragma once
// The mesh of one period of a sampled surface (height_map_periodic.hpp),
// exactly as the samples say: no simplification.
//
// Input: a periodic grid of M × M samples (heights in µm) and the pitch in
// µm. Output: a TileMesh (mesh.hpp) with period M·pitch, vertices at every
// sample (x = i·pitch, y = j·pitch, i, j = 0 … M, the row and column at M
// repeating 0 so that every boundary edge has its periodic twin), heights
// shifted so that the lowest sample is at z = 0, and two triangles per cell
// between four neighbouring samples: 2M² triangles, (M + 1)² vertices.
//
// Which diagonal splits a cell: the one across which the heights differ
// more (|z(i,j) - z(i+1,j+1)| against |z(i+1,j) - z(i,j+1)|; ties: the
// diagonal from (i, j) to (i+1, j+1)). A ridge or valley that runs
// diagonally through a cell rises or falls along itself, so this keeps the
// crease as a mesh edge: sampled pyramids whose edges run through the
// samples are meshed with every triangle on a facet plane (tested), where a
// fixed diagonal would cut half of the ridge cells across. Where the
// surface is a plane within the cell both diagonals give the same plane.
#include <cstddef>

#include "geometry/height_map_periodic.hpp"
#include "geometry/mesh.hpp"

namespace lumtrap::geometry {

TileMesh periodic_grid_mesh(const PeriodicGrid& grid, double pitch_um);

/// Bytes the mesh of an M × M periodic grid takes in memory (vertices and
/// triangles as TileMesh stores them).
double periodic_grid_mesh_bytes(std::size_t samples);

}  // namespace lumtrap::geometry
