#pragma once
// Embree objects with explicit ownership: one device per run, one scene per
// texture tile (front, rear). The scene owns a single-precision copy of the
// tile's vertices and reads the triangle indices from the mesh itself, so the
// mesh must outlive the scene (PreparedRun keeps both); the transport keeps
// double-precision normals.
#include <embree3/rtcore.h>

#include <string>

#include "geometry/mesh.hpp"

namespace lumtrap {

/// Owns an RTCDevice. Errors from Embree are turned into exceptions that
/// carry Embree's own message (kept by the device's error callback).
class EmbreeDevice {
 public:
  EmbreeDevice();
  ~EmbreeDevice();
  EmbreeDevice(const EmbreeDevice&) = delete;
  EmbreeDevice& operator=(const EmbreeDevice&) = delete;
  RTCDevice get() const { return device_; }
  /// Throws std::runtime_error with Embree's message and `what` when the
  /// device reports an error since the last check.
  void throw_if_error(const char* what) const;

 private:
  RTCDevice device_ = nullptr;
  mutable std::string last_error_;  ///< set by the error callback
};

/// Owns an RTCScene holding one triangle geometry: the mesh of one tile.
/// Triangle primID i is mesh.triangles[i]. `mesh` must outlive the scene and
/// keep its triangles unchanged (they are shared, not copied). Nothing leaks
/// when the constructor throws.
class TileScene {
 public:
  TileScene(const EmbreeDevice& device, const geometry::TileMesh& mesh);
  ~TileScene();
  TileScene(const TileScene&) = delete;
  TileScene& operator=(const TileScene&) = delete;
  RTCScene get() const { return scene_; }

 private:
  RTCScene scene_ = nullptr;
};

}  // namespace lumtrap
