#pragma once
// What building a scene's wafer model (prepare_run: the texture meshes, the
// Embree scenes, the per-triangle data) will cost, estimated from the scene
// alone before anything is built: the triangles of each texture tile (its
// descriptor's estimate_triangles, geometry/texture_descriptor.hpp), the
// peak memory and the build time. The constants are fitted to measured
// builds (build_estimate.cpp); the estimate is meant to be right within a
// factor of about 1.5, enough to refuse a tile that cannot fit long before
// it exhausts the machine.
#include <string>

#include "io/scene.hpp"

namespace lumtrap {

struct SurfaceBuildCost {
  double triangles = 0;  ///< of the tile mesh
  double bytes = 0;      ///< memory held for this surface while tracing and at the build's peak
  double seconds = 0;    ///< build time (mesh, ray-tracing structure, normals)
};

struct BuildCost {
  SurfaceBuildCost front, rear;
  double bytes = 0;    ///< peak memory of the whole run's setup (both surfaces and a fixed base)
  double seconds = 0;  ///< setup time
};

/// The estimate for `scene` (cheap: no mesh is built).
BuildCost estimate_build(const Scene& scene);

/// Throws SceneError when cost.bytes exceeds `max_bytes`: the message names
/// the texture key that sets the size of the larger tile (file, line), the
/// estimated triangles, memory and time, the limit and `limit_origin` (where
/// the limit comes from, e.g. "50 % of the 23.4 GiB of this machine;
/// --max-memory changes it") and what to change.
void check_build_cost(const Scene& scene, const BuildCost& cost, double max_bytes, const std::string& limit_origin);

/// "1.7 GiB", "350 MiB", "12 KiB"
std::string format_bytes(double bytes);
/// "0.3 s", "29 s", "12 min", "3.4 h"
std::string format_seconds(double seconds);
/// One line: "front 1.03e+07 triangles, rear 2; about 1.7 GiB and 29 s to build"
std::string describe_build_cost(const BuildCost& cost);

}  // namespace lumtrap
