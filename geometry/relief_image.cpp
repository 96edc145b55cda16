// Height raster and shaded relief of a tile mesh by z-buffered
// rasterization. See relief_image.hpp.
#include "geometry/relief_image.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <stdexcept>
#include <string>

namespace lumtrap::geometry {

namespace {

struct ScreenVertex {
  double u, v, depth;  // image column, row (continuous), and nearness (larger = nearer)
};

// Calls visit(pixel index, depth, b0, b1, b2) for every sample point
// (c + offset, r + offset) inside the triangle or on its edges
// (barycentric weights >= -1e-9), in an image of width × height.
template <class Visit>
void rasterize(int width, int height, double offset, const ScreenVertex& a, const ScreenVertex& b,
               const ScreenVertex& c, Visit&& visit) {
  const double area = (b.u - a.u) * (c.v - a.v) - (b.v - a.v) * (c.u - a.u);
  if (area == 0) return;
  const double umin = std::min({a.u, b.u, c.u}), umax = std::max({a.u, b.u, c.u});
  const double vmin = std::min({a.v, b.v, c.v}), vmax = std::max({a.v, b.v, c.v});
  const int c0 = std::max(0, int(std::ceil(umin - offset - 1e-9))), c1 = std::min(width - 1, int(std::floor(umax - offset + 1e-9)));
  const int r0 = std::max(0, int(std::ceil(vmin - offset - 1e-9))), r1 = std::min(height - 1, int(std::floor(vmax - offset + 1e-9)));
  const double eps = -1e-9;
  for (int r = r0; r <= r1; ++r) {
    const double y = r + offset;
    for (int col = c0; col <= c1; ++col) {
      const double x = col + offset;
      const double w0 = ((b.u - x) * (c.v - y) - (b.v - y) * (c.u - x)) / area;
      const double w1 = ((c.u - x) * (a.v - y) - (c.v - y) * (a.u - x)) / area;
      const double w2 = 1.0 - w0 - w1;
      if (w0 < eps || w1 < eps || w2 < eps) continue;
      visit(std::size_t(r) * std::size_t(width) + std::size_t(col), w0 * a.depth + w1 * b.depth + w2 * c.depth, w0, w1,
            w2);
    }
  }
}

float shade(const Eigen::Vector3d& n) {
  // towards -x, a little towards -y (30° azimuth from -x), 50° up: the four
  // facets of a pyramid aligned with x and y all get different shades
  const double e = 50.0 * std::numbers::pi / 180.0, a = 30.0 * std::numbers::pi / 180.0;
  static const Eigen::Vector3d light(-std::cos(e) * std::cos(a), -std::cos(e) * std::sin(a), std::sin(e));
  return float(0.2 + 0.8 * std::max(0.0, n.dot(light)));
}

void check_size(int pixels, int tiles) {
  if (pixels < 1 || tiles < 1 || double(pixels) * tiles > 20000)
    throw std::invalid_argument("geometry/relief_image.cpp: " + std::to_string(pixels) + " pixels × " +
                                std::to_string(tiles) + " tiles (allowed: 1 to 20000 pixels across)");
}

}  // namespace

HeightRaster height_raster(const TileMesh& m, int pixels) {
  check_size(pixels, 1);
  HeightRaster out;
  out.pixels = pixels;
  out.pixel_um = m.period / pixels;
  out.z.assign(std::size_t(pixels) * pixels, std::numeric_limits<float>::quiet_NaN());
  std::vector<double> best(out.z.size(), -std::numeric_limits<double>::infinity());
  const double s = out.pixel_um;
  for (const auto& t : m.triangles) {
    const auto sv = [&](std::uint32_t i) {
      const Eigen::Vector3d& v = m.vertices[i];
      return ScreenVertex{v.x() / s, v.y() / s, v.z()};
    };
    rasterize(pixels, pixels, 0.0, sv(t[0]), sv(t[1]), sv(t[2]), [&](std::size_t k, double z, double, double, double) {
      if (z > best[k]) {
        best[k] = z;
        out.z[k] = float(z);
      }
    });
  }
  return out;
}

GreyImage relief_from_above(const TileMesh& m, int pixels, int tiles) {
  check_size(pixels, tiles);
  GreyImage img;
  img.width = img.height = pixels * tiles;
  img.value.assign(std::size_t(img.width) * img.height, 0.0f);
  std::vector<double> best(img.value.size(), -std::numeric_limits<double>::infinity());
  const double s = m.period / pixels;
  for (std::size_t i = 0; i < m.triangles.size(); ++i) {
    const auto& t = m.triangles[i];
    const float g = shade(m.normal(i));
    for (int ty = 0; ty < tiles; ++ty)
      for (int tx = 0; tx < tiles; ++tx) {
        const auto sv = [&](std::uint32_t k) {
          const Eigen::Vector3d& v = m.vertices[k];
          return ScreenVertex{v.x() / s + tx * pixels, v.y() / s + ty * pixels, v.z()};
        };
        rasterize(img.width, img.height, 0.5, sv(t[0]), sv(t[1]), sv(t[2]),
                  [&](std::size_t k, double z, double, double, double) {
                    if (z > best[k]) {
                      best[k] = z;
                      img.value[k] = g;
                    }
                  });
      }
  }
  return img;
}

GreyImage relief_oblique(const TileMesh& m, int pixels, int tiles, double elevation_deg) {
  check_size(pixels, tiles);
  if (!(elevation_deg > 0 && elevation_deg <= 90))
    throw std::invalid_argument("geometry/relief_image.cpp: elevation " + std::to_string(elevation_deg) +
                                " deg (allowed: 0 < elevation <= 90)");
  const double e = elevation_deg * std::numbers::pi / 180.0;
  const double se = std::sin(e), ce = std::cos(e);
  const Eigen::Vector3d toward_viewer(0, ce, se);
  const double s = m.period / pixels;
  const double zmax = m.max_z(), zmin = m.min_z();
  GreyImage img;
  img.width = pixels * tiles;
  img.height = int(std::ceil((tiles * m.period * se + (zmax - zmin) * ce) / s)) + 1;
  img.value.assign(std::size_t(img.width) * img.height, 0.0f);
  std::vector<double> best(img.value.size(), -std::numeric_limits<double>::infinity());
  for (std::size_t i = 0; i < m.triangles.size(); ++i) {
    const Eigen::Vector3d n = m.normal(i);
    if (n.dot(toward_viewer) <= 0) continue;  // faces away
    const float g = shade(n);
    const auto& t = m.triangles[i];
    for (int ty = 0; ty < tiles; ++ty)
      for (int tx = 0; tx < tiles; ++tx) {
        const auto sv = [&](std::uint32_t k) {
          const Eigen::Vector3d& v = m.vertices[k];
          const double x = v.x() + tx * m.period, y = v.y() + ty * m.period;
          // row: along the screen's downward axis (y·sin e - z·cos e), top at the highest far point
          return ScreenVertex{x / s, (y * se - (v.z() - zmax) * ce) / s, y * ce + v.z() * se};
        };
        rasterize(img.width, img.height, 0.5, sv(t[0]), sv(t[1]), sv(t[2]),
                  [&](std::size_t k, double depth, double, double, double) {
                    if (depth > best[k]) {
                      best[k] = depth;
                      img.value[k] = g;
                    }
                  });
      }
  }
  return img;
}

}  // namespace lumtrap::geometry
