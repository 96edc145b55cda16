#include "geometry/rounded_pyramid.hpp"

#include <algorithm>
#include <cmath>

namespace lumtrap::geometry {

namespace {

// Folded coordinates: p = the larger of |u|, |v| (distance across the facet
// that holds the point), q = the smaller.
struct Folded {
  double p, q;
  bool x_major;  // the facet is ±x
};

Folded fold(double u, double v) {
  const double U = std::abs(u), V = std::abs(v);
  return U >= V ? Folded{U, V, true} : Folded{V, U, false};
}

}  // namespace

bool in_facet_region(double u, double v, int facet, double tan_facet, double radius) {
  // p: distance from the apex along the facet's outward normal; q: across.
  const double p = facet == 0 ? u : facet == 1 ? -u : facet == 2 ? v : -v;
  const double q = facet < 2 ? std::abs(v) : std::abs(u);
  const double sin_facet = tan_facet / std::sqrt(1.0 + tan_facet * tan_facet);
  return p - radius * sin_facet >= q;
}

SurfacePoint rounded_pyramid_point(double u, double v, double a, double t, double R) {
  const Folded f = fold(u, v);
  const double su = u >= 0 ? 1.0 : -1.0, sv = v >= 0 ? 1.0 : -1.0;
  SurfacePoint s;
  // dz/dp, dz/dq in folded coordinates, unfolded at the end
  double dp = 0, dq = 0;
  const double sec = std::sqrt(1.0 + t * t);
  if (R <= 0 || f.p - f.q >= R * t / sec) {
    // facet plane: the contact point of the ball lies inside the facet
    s.z = t * (a - f.p);
    dp = -t;
    s.facet = f.x_major ? (su > 0 ? 0 : 1) : (sv > 0 ? 2 : 3);
  } else {
    const double apex = t * a - R * sec;  // apex of the shrunk cone
    const double w = 0.5 * (f.p + f.q);   // along the ridge (per unit of each coordinate)
    const double e = f.p - f.q;
    const double rho2 = R * R - 0.5 * e * e;
    const double rho = std::sqrt(std::max(0.0, rho2));
    const double k = std::sqrt(1.0 + 0.5 * t * t);  // 1/cos of the ridge slope
    // contact point on the ridge at s* = w - t·rho/sqrt(4 + 2t²) (>= 0: on the ridge)
    const double s_star = w - t * rho / std::sqrt(4.0 + 2.0 * t * t);
    if (s_star >= 0 && rho > 0) {
      s.z = apex - t * w + rho * k;
      dp = -0.5 * t - k * e / (2.0 * rho);
      dq = -0.5 * t + k * e / (2.0 * rho);
    } else {
      const double r2 = std::max(R * R - f.p * f.p - f.q * f.q, 1e-30 * R * R);
      const double h = std::sqrt(r2);
      s.z = apex + h;
      dp = -f.p / h;
      dq = -f.q / h;
    }
  }
  if (f.x_major) {
    s.gx = su * dp;
    s.gy = sv * dq;
  } else {
    s.gx = su * dq;
    s.gy = sv * dp;
  }
  return s;
}

}  // namespace lumtrap::geometry
