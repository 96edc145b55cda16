#pragma once
// Pictures of a tile mesh (mesh.hpp) to set beside a microscope image:
// the height raster, and shaded relief seen from above and obliquely.
//
// Image conventions: row r, column c of an image; the top view puts column
// c at x = c·s and row r at y = r·s (s = period / pixels): the rows run
// along +y as the rows of a height-map file do, so a map read from a file
// looks as the instrument's own display shows it. Heights in µm.
//
// Shading (Lambert's cosine law, common practice of relief maps):
// grey = 0.2 + 0.8·max(0, n·L) with n the triangle's unit normal and L the
// direction to the light: towards the image's left (-x), turned 30° towards
// its top (-y), 50° above the wafer plane, so that the four facets of an
// alkaline-etched pyramid show four different greys.
// The oblique view is an orthographic projection seen from the +y side
// (the image's bottom edge) at `elevation_deg` above the wafer plane: the
// far edge of the tile (y = 0) is at the top of the image; a z-buffer keeps
// the nearest triangle; triangles facing away from the viewer are skipped.
// Pixels that see nothing are 0 (black).
#include <vector>

#include "geometry/mesh.hpp"

namespace lumtrap::geometry {

/// Heights of the surface at the nodes x = c·s, y = r·s (c, r = 0 …
/// pixels - 1, s = period / pixels), so that the raster of a height-map
/// tile at its own pitch holds exactly its samples.
struct HeightRaster {
  int pixels = 0;          ///< per side
  double pixel_um = 0;     ///< s
  std::vector<float> z;    ///< row by row, µm in the mesh frame
};
HeightRaster height_raster(const TileMesh& mesh, int pixels);

/// A grey image, values in [0, 1], row by row.
struct GreyImage {
  int width = 0, height = 0;
  std::vector<float> value;
};

/// Shaded relief from above: `pixels` per tile side, `tiles` × `tiles` tiles.
GreyImage relief_from_above(const TileMesh& mesh, int pixels, int tiles = 1);

/// Shaded relief seen at `elevation_deg` (0 < e <= 90), `pixels` across one
/// tile, `tiles` × `tiles` tiles; the image is as tall as the view needs.
GreyImage relief_oblique(const TileMesh& mesh, int pixels, int tiles = 1, double elevation_deg = 45.0);

}  // namespace lumtrap::geometry
