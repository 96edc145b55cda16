// See front_grid_hit.hpp.
#include "trace/front_grid_hit.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace lumtrap {

namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kEps = 1e-9;  // µm: hits closer than this to the origin are the origin itself

struct Hit2 {
  double t = kInf;
  double nu = 0, nz = 1;
};

// Smallest root t > kEps of a t² + b t + c = 0 that is an entry (the first root).
double entry_root(double a, double b, double c) {
  if (a <= 0) return kInf;
  const double disc = b * b - 4 * a * c;
  if (disc < 0) return kInf;
  const double s = std::sqrt(disc);
  const double t1 = (-b - s) / (2 * a);
  return t1 > kEps ? t1 : kInf;  // starting outside: the entry is the smaller root
}

// Rectangle [-a, a] × [0, h], ray (u0 + t du, z0 + t dz).
Hit2 rectangle(double a, double h, double u0, double z0, double du, double dz) {
  double tin = -kInf, tout = kInf;
  double nu = 0, nz = 0;
  if (du != 0) {
    double t1 = (-a - u0) / du, t2 = (a - u0) / du;
    if (t1 > t2) std::swap(t1, t2);
    if (t1 > tin) {
      tin = t1;
      nu = du > 0 ? -1 : 1;
      nz = 0;
    }
    tout = std::min(tout, t2);
  } else if (std::abs(u0) > a) {
    return {};
  }
  if (dz != 0) {
    double t1 = (0 - z0) / dz, t2 = (h - z0) / dz;
    if (t1 > t2) std::swap(t1, t2);
    if (t1 > tin) {
      tin = t1;
      nu = 0;
      nz = dz > 0 ? -1 : 1;
    }
    tout = std::min(tout, t2);
  } else if (z0 < 0 || z0 > h) {
    return {};
  }
  if (tin > tout || tin <= kEps) return {};
  return {tin, nu, nz};
}

Hit2 half_ellipse(double a, double h, double u0, double z0, double du, double dz) {
  const double U = u0 / a, Z = z0 / h, dU = du / a, dZ = dz / h;
  const double t = entry_root(dU * dU + dZ * dZ, 2 * (U * dU + Z * dZ), U * U + Z * Z - 1);
  if (!std::isfinite(t)) return {};
  const double u = u0 + t * du, z = z0 + t * dz;
  if (z < 0) return {};  // below the cell plane: the ray reaches the plane first
  const double nu = u / (a * a), nz = z / (h * h), n = std::hypot(nu, nz);
  return {t, nu / n, nz / n};
}

Hit2 circle(double r, double u0, double z0, double du, double dz) {
  const double zc = z0 - r;
  const double t = entry_root(du * du + dz * dz, 2 * (u0 * du + zc * dz), u0 * u0 + zc * zc - r * r);
  if (!std::isfinite(t)) return {};
  const double u = u0 + t * du, z = z0 + t * dz;
  return {t, u / r, (z - r) / r};
}

// The first hit among the copies (pitch P) of one cross-section along the
// coordinate u, for the part of the ray below height `top`.
template <class Shape>
Hit2 first_copy(double P, double half_width, double top, double u0, double z0, double du, double dz, Shape shape) {
  // parameter range where 0 <= z <= top
  double t_lo = 0, t_hi = kInf;
  if (dz < 0) {
    t_lo = std::max(0.0, (top - z0) / dz);
    t_hi = -z0 / dz;
  } else if (dz > 0) {
    if (z0 > top) return {};
    t_hi = (top - z0) / dz;
  } else if (z0 > top || z0 < 0) {
    return {};
  }
  if (!(t_hi >= t_lo)) return {};
  double ua = u0 + t_lo * du, ub = std::isfinite(t_hi) ? u0 + t_hi * du : (du > 0 ? kInf : du < 0 ? -kInf : u0);
  if (ua > ub) std::swap(ua, ub);
  const double k_lo = std::floor((ua - half_width) / P), k_hi = std::ceil((ub + half_width) / P);
  if (!(k_hi - k_lo < 1e6)) return {};  // (nearly) horizontal rays: no meaningful answer; none
  Hit2 best;
  for (double k = k_lo; k <= k_hi; k += 1) {
    const Hit2 h = shape(u0 - k * P, z0, du, dz);
    if (h.t < best.t) best = h;
  }
  return best;
}

}  // namespace

double grid_top(const FrontGridGeometry& g) {
  return g.shape == FingerShape::round_wire ? g.finger_width_um : g.finger_height_um;
}

GridHit first_grid_hit(const FrontGridGeometry& g, const Eigen::Vector3d& o, const Eigen::Vector3d& d) {
  const double a = 0.5 * g.finger_width_um, h = g.finger_height_um, top = grid_top(g);
  Hit2 f;
  switch (g.shape) {
    case FingerShape::rectangle:
      f = first_copy(g.finger_pitch_um, a, top, o.x(), o.z(), d.x(), d.z(),
                     [&](double u, double z, double du, double dz) { return rectangle(a, h, u, z, du, dz); });
      break;
    case FingerShape::half_ellipse:
      f = first_copy(g.finger_pitch_um, a, top, o.x(), o.z(), d.x(), d.z(),
                     [&](double u, double z, double du, double dz) { return half_ellipse(a, h, u, z, du, dz); });
      break;
    case FingerShape::round_wire:
      f = first_copy(g.finger_pitch_um, a, top, o.x(), o.z(), d.x(), d.z(),
                     [&](double u, double z, double du, double dz) { return circle(a, u, z, du, dz); });
      break;
  }
  Hit2 b;
  if (g.busbar_pitch_um > 0) {
    const double ab = 0.5 * g.busbar_width_um;
    b = first_copy(g.busbar_pitch_um, ab, top, o.y(), o.z(), d.y(), d.z(),
                   [&](double u, double z, double du, double dz) { return rectangle(ab, top, u, z, du, dz); });
  }
  GridHit out;
  if (!std::isfinite(f.t) && !std::isfinite(b.t)) return out;
  out.hit = true;
  if (f.t <= b.t) {
    out.t = f.t;
    out.normal = Eigen::Vector3d(f.nu, 0, f.nz);
  } else {
    out.t = b.t;
    out.normal = Eigen::Vector3d(0, b.nu, b.nz);
  }
  out.point = o + out.t * d;
  return out;
}

}  // namespace lumtrap
