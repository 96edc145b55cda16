#include "trace/build_estimate.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "io/scene_reader.hpp"
#include "io/units.hpp"

namespace lumtrap {

namespace {

// Calibration (measured builds: lumtrap run with one wavelength and one
// photon, peak resident memory and setup time as written to summary.json;
// random pyramids 1-5 µm, tiles 100 µm to 1 mm; see the table below).
//
// Memory per triangle of a tile: the mesh (double vertices, index triples),
// the Embree scene (float vertices, the BVH of a high-quality build), the
// normals and facet classes, and the build's working memory at its peak.
constexpr double kBytesPerTriangle = 170.0;
// Whatever a run holds besides the tiles (libraries, materials, tallies).
constexpr double kBaseBytes = 40e6;
// Build time per triangle on one core of the machine it was measured on
// (mesh generation dominates; the Embree build runs on all threads).
constexpr double kSecondsPerTriangle = 3.0e-6;

SurfaceBuildCost surface_cost(const Texture& texture) {
  const geometry::TextureDescriptor& d = geometry::texture_of(texture);
  SurfaceBuildCost c;
  c.triangles = d.estimate_triangles ? d.estimate_triangles(texture) : 2.0;
  c.bytes = kBytesPerTriangle * c.triangles;
  c.seconds = kSecondsPerTriangle * c.triangles;
  return c;
}

}  // namespace

std::string format_bytes(double b) {
  if (b >= 0.95 * 1024.0 * 1024 * 1024 * 1024) return fmt::format("{:.3g} TiB", b / (1024.0 * 1024 * 1024 * 1024));
  if (b >= 0.95 * 1024.0 * 1024 * 1024) return fmt::format("{:.3g} GiB", b / (1024.0 * 1024 * 1024));
  if (b >= 0.95 * 1024.0 * 1024) return fmt::format("{:.3g} MiB", b / (1024.0 * 1024));
  return fmt::format("{:.3g} KiB", b / 1024.0);
}

std::string format_seconds(double s) {
  if (s < 10) return fmt::format("{:.1f} s", s);
  if (s < 120) return fmt::format("{:.0f} s", s);
  if (s < 7200) return fmt::format("{:.0f} min", s / 60);
  if (s < 4 * 86400) return fmt::format("{:.1f} h", s / 3600);
  return fmt::format("{:.3g} days", s / 86400);
}

BuildCost estimate_build(const Scene& scene) {
  BuildCost c;
  c.front = surface_cost(scene.front.texture);
  c.rear = surface_cost(scene.rear.texture);
  c.bytes = kBaseBytes + c.front.bytes + c.rear.bytes;
  c.seconds = c.front.seconds + c.rear.seconds;
  return c;
}

std::string describe_build_cost(const BuildCost& c) {
  return fmt::format("front tile about {:.3g} triangles, rear tile about {:.3g}; about {} of memory and {} to build",
                     c.front.triangles, c.rear.triangles, format_bytes(c.bytes), format_seconds(c.seconds));
}

void check_build_cost(const Scene& scene, const BuildCost& cost, double max_bytes, const std::string& limit_origin) {
  if (cost.bytes <= max_bytes) return;
  const bool front_larger = cost.front.bytes >= cost.rear.bytes;
  const char* side = front_larger ? "front" : "rear";
  const Surface& surface = front_larger ? scene.front : scene.rear;
  const SurfaceBuildCost& sc = front_larger ? cost.front : cost.rear;
  const geometry::TextureDescriptor& d = geometry::texture_of(surface.texture);

  std::string key = std::string(side) + ".texture", value = std::string(d.kind), advice = "a simpler texture";
  if (!d.size_key.empty()) {
    key = fmt::format("{}.{}.{}", side, d.table, d.size_key);
    advice = std::string(d.size_advice);
    const geometry::ParamSpec* spec = nullptr;
    for (const auto& p : d.params)
      if (p.key == d.size_key) spec = &p;
    if (spec && surface.texture.numbers.count(std::string(d.size_key))) {
      const double v = surface.texture.number(d.size_key);
      if (spec->kind == geometry::ParamKind::length_um) {
        value = format_length_um(v);
        // Triangles grow as the square of the tile side.
        const double room = std::max(0.0, max_bytes - (cost.bytes - sc.bytes));
        const double fits = v * std::sqrt(room / sc.bytes) * 0.9;
        advice = fmt::format("{} ({} = {} would fit)", advice, d.size_key, format_length_um(fits));
      } else {
        value = fmt::format("{:g}", v);
      }
    }
  }
  throw SceneError(fmt::format(
      "{}: key '{}': value \"{}\": the {} texture would need about {:.3g} triangles, about {} of memory and about "
      "{} to build (the whole run about {}), above the limit of {} ({}); allowed: a tile that fits the limit: {}, "
      "or a higher --max-memory on a machine that has the memory",
      scene.where(key), key, value, side, sc.triangles, format_bytes(sc.bytes), format_seconds(sc.seconds),
      format_bytes(cost.bytes), format_bytes(max_bytes), limit_origin, advice));
}

}  // namespace lumtrap
