#pragma once
// The wafer's geometry as the transport sees it: two textured zones (front
// and rear tiles, each in its own local frame) joined by a flat bulk slab
// that rays cross analytically.
//
// Frames: front local z = height of the front texture mesh (z = 0 its lowest
// level); rear local z = minus the rear texture's height (the rear texture
// points out of the wafer, downward), silicon above. Wafer frame: z = 0 at
// the rear reference level, z = thickness at the front reference level,
// where "reference level" follows Wafer::thickness_convention (mean height,
// base = lowest level, or apex = highest point of each texture).
#include <cstdint>
#include <utility>
#include <vector>

#include <Eigen/Core>

#include "geometry/mesh.hpp"
#include "io/scene.hpp"

namespace lumtrap {

struct SurfaceModel {
  geometry::TileMesh mesh;               ///< in the zone's local frame
  std::vector<Eigen::Vector3d> outward;  ///< per triangle, unit normal from the silicon to the outside
  std::vector<std::uint16_t> facet_class;  ///< per triangle: index into tilt_cos
  std::vector<double> tilt_cos;          ///< cos of the facet tilt of each class (1 = flat)
  double min_z = 0, max_z = 0;           ///< the mesh's z range (local frame)
  double zone_lo = 0, zone_hi = 0;       ///< clip planes just outside the mesh's z range
  double period = 0;
  /// Rounding window, µm (64 float ulps of the tile's extent): a hit closer
  /// than this on the triangle a ray just left, or on any triangle from its
  /// wrong side, is an artefact of single-precision intersection and is skipped.
  double eps = 1e-6;
  /// Offset of a new ray origin from the surface it leaves, µm (2 float ulps
  /// of the extent, eps / 32): small, so that near a concave edge the origin
  /// does not cross the neighbouring facet's plane.
  double offset = 1e-6 / 32;
};

struct WaferModel {
  SurfaceModel front, rear;
  double front_origin_z = 0;  ///< wafer z of front local z = 0
  double rear_origin_z = 0;   ///< wafer z of rear local z = 0
  double bulk_gap = 0;        ///< wafer-z distance from the rear zone's top to the front zone's bottom
  double front_surface_min_z = 0;  ///< wafer z of the lowest front point
};

/// Builds the meshes of the scene's textures and places them. Throws
/// SceneError naming wafer.thickness when the wafer is too thin for its
/// textures.
/// A surface with conformal films has one facet class (film thickness does
/// not depend on tilt); with directional films, one class per distinct tilt.
WaferModel build_wafer_model(const Scene& scene);

/// build_wafer_model in two steps, so that a caller can build its ray-tracing
/// scenes from the meshes before the per-triangle data exists (peak memory
/// of very large tiles): build_wafer_geometry places the meshes (everything
/// but SurfaceModel::outward, facet_class and tilt_cos; same exceptions),
/// add_facet_normals fills those.
WaferModel build_wafer_geometry(const Scene& scene);
void add_facet_normals(WaferModel& model, const Scene& scene);

/// The heights of a texture tile that place it in the wafer (its own frame).
struct TileHeights {
  double period = 0, min_z = 0, max_z = 0, mean_z = 0;
};
TileHeights tile_heights(const geometry::TileMesh& mesh);

/// Meshes of equal textures, built once (e.g. for the variants of a sweep).
struct TileHeightCache {
  std::vector<std::pair<Texture, TileHeights>> entries;
};

/// What build_wafer_geometry would refuse, found without building a ray
/// tracing scene: builds the texture meshes (or takes their heights from
/// `cache`) and throws SceneError when the wafer is too thin for them.
void check_wafer_geometry(const Scene& scene, TileHeightCache* cache = nullptr);

}  // namespace lumtrap
