#include "trace/build_estimate.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "io/scene_reader.hpp"

namespace lumtrap {

namespace {

// Calibration: `lumtrap run` of a planar-rear wafer with random pyramids
// 1-5 um (uniform) on the front, one wavelength, one photon, 2 threads, on
// the 2-core development machine (23.5 GiB, shared with other builds);
// peak resident memory (GNU time) and setup time (summary.json):
//
//   tile     triangles built / estimated   peak memory measured / estimated   setup time measured / estimated
//   200 um     359 604 /    358 797          66.6 MiB /   70.8 MiB             1.7 s /  1.8 s
//   400 um   1 504 712 /  1 530 086           242 MiB /    255 MiB             5.7 s /  7.7 s
//   700 um   5 156 500 /  4 910 000           809 MiB /    787 MiB            28.9 s / 25 s
//   1 mm    10 295 167 / 10 300 000          1590 MiB /   1636 MiB            61.2 s / 52 s
//
// A measured height map (1000 × 1000 samples at 0.1 um, mirrored): 7 984 008
// triangles built / 7 984 008 estimated, 921 MiB / 1270 MiB, 12.6 s / 40 s:
// the constants below, fitted to random pyramids, are on the safe side
// there (a grid mesh has half a vertex per triangle against about 1.35 for
// the pyramid envelope, and no envelope to compute).
//
// (Refusals: 1-5 um pyramids in a 10 mm tile, estimated 1.18e9 triangles
// and 181 GiB, and 1 nm pyramids in a 50 um tile, 2.9e9 triangles and
// 446 GiB, are refused by `check` and `run` in 0.02-0.05 s.)
//
// A straight line through them: 12 MB + 161 bytes per triangle (within
// 1 % at every tile). The mesh (double vertices, index triples), the
// Embree scene (float vertices, the BVH of a high-quality build), the
// normals and facet classes and the build's working memory are all
// proportional to the triangles; 165 bytes leaves a little room.
constexpr double kBytesPerTriangle = 165.0;
// Whatever a run holds besides the tiles (libraries, materials, tallies).
constexpr double kBaseBytes = 15e6;
// Setup time per triangle: 3.8-5.9 us measured above on a loaded machine
// (mesh generation dominates; it grows a little faster than the triangles).
// Machine-dependent: the estimate only sets the expectations of the
// progress line and the message of a refused tile.
constexpr double kSecondsPerTriangle = 5e-6;

// A length for messages, with 3 significant digits: "10 mm", "186 um", "1 nm".
std::string readable_length(double um) {
  if (um >= 1000) return fmt::format("{:.3g} mm", um / 1000);
  if (um >= 0.1) return fmt::format("{:.3g} um", um);
  return fmt::format("{:.3g} nm", um * 1000);
}

SurfaceBuildCost surface_cost(const Texture& texture) {
  const geometry::TextureDescriptor& d = geometry::texture_of(texture);
  SurfaceBuildCost c;
  c.triangles = d.estimate_triangles ? d.estimate_triangles(texture) : 2.0;
  c.bytes = kBytesPerTriangle * c.triangles;
  c.seconds = kSecondsPerTriangle * c.triangles;
  return c;
}

// The largest value of the length key `key` of the front (or rear) texture
// whose estimate fits `max_bytes` (bisection in log scale below `value`,
// which does not fit); 0 when none does or the estimate refuses the values.
double largest_that_fits(const Scene& scene, bool front, std::string_view key, double value, double max_bytes) {
  Scene probe = scene;
  Texture& t = front ? probe.front.texture : probe.rear.texture;
  const auto fits = [&](double v) {
    t.numbers[std::string(key)] = v;
    return estimate_build(probe).bytes <= max_bytes;
  };
  try {
    double lo = value * 1e-6, hi = value;
    if (!fits(lo)) return 0.0;
    for (int i = 0; i < 50; ++i) {
      const double mid = std::sqrt(lo * hi);
      (fits(mid) ? lo : hi) = mid;
    }
    return lo;
  } catch (const std::exception&) {
    return 0.0;
  }
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
        value = readable_length(v);
        if (const double fits = largest_that_fits(scene, front_larger, d.size_key, v, max_bytes); fits > 0)
          advice += fmt::format("; {} = {} would fit", d.size_key, readable_length(fits));
      } else {
        value = fmt::format("{:g}", v);
      }
    }
  }
  throw SceneError(fmt::format(
      "{}: key '{}': value \"{}\": the {} texture would need about {:.3g} triangles, about {} of memory and about "
      "{} to build (the whole run about {}), above the limit of {} ({}); allowed: a texture that fits the limit: {}; "
      "or a higher --max-memory on a machine that has the memory",
      scene.where(key), key, value, side, sc.triangles, format_bytes(sc.bytes), format_seconds(sc.seconds),
      format_bytes(cost.bytes), format_bytes(max_bytes), limit_origin, advice));
}

}  // namespace lumtrap
