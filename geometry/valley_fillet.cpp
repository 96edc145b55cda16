#include "geometry/valley_fillet.hpp"

#include <cmath>

namespace lumtrap::geometry {

double valley_fillet(const SurfacePoint& a, const SurfacePoint& b, double R) {
  if (R <= 0) return a.z;
  const double dx = a.gx - b.gx, dy = a.gy - b.gy;
  const double G = std::hypot(dx, dy);
  if (!(G > 1e-12)) return a.z;  // parallel planes: no crease
  const double nx = dx / G, ny = dy / G;
  const double sa = a.gx * nx + a.gy * ny, sb = b.gx * nx + b.gy * ny;  // sa - sb = G
  const double seca = std::sqrt(1.0 + sa * sa), secb = std::sqrt(1.0 + sb * sb);
  const double s = (a.z - b.z) / G;          // horizontal distance from the crease, on a's side
  const double sc = R * (secb - seca) / G;   // arc centre, from the crease
  const double s_end = sc + R * sa / seca;   // where the arc meets line a
  if (s >= s_end) return a.z;
  const double d = s - sc;
  // line a: z = a.z + sa·(x - s); centre height above the crease line: sa·sc + R·seca
  return a.z - sa * s + sa * sc + R * seca - std::sqrt(std::max(0.0, R * R - d * d));
}

double fillet_depth(const SurfacePoint& a, const SurfacePoint& b, double R) {
  if (R <= 0) return 0.0;
  const double dx = a.gx - b.gx, dy = a.gy - b.gy;
  const double G = std::hypot(dx, dy);
  if (!(G > 1e-12)) return 0.0;
  const double sa = (a.gx * dx + a.gy * dy) / G, sb = (b.gx * dx + b.gy * dy) / G;
  const double seca = std::sqrt(1.0 + sa * sa), secb = std::sqrt(1.0 + sb * sb);
  return R * (secb - seca) + G * R * sa / seca;  // G · (arc end on a's side)
}

double fillet_reach(double tan_max) { return std::sqrt(1.0 + tan_max * tan_max) - 1.0 + 2.0 * tan_max; }

}  // namespace lumtrap::geometry
