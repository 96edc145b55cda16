#pragma once
// Direction sampling used by illumination and scattering surfaces.
#include <numbers>
#include <cmath>

#include <Eigen/Core>
#include <Eigen/Geometry>

namespace lumtrap {

/// Two unit vectors completing `a` (unit) to an orthonormal basis.
inline void orthonormal_basis(const Eigen::Vector3d& a, Eigen::Vector3d& b1, Eigen::Vector3d& b2) {
  // Duff et al., "Building an orthonormal basis, revisited", JCGT 6(1), 2017.
  const double sign = std::copysign(1.0, a.z());
  const double p = -1.0 / (sign + a.z());
  const double q = a.x() * a.y() * p;
  b1 = Eigen::Vector3d(1.0 + sign * a.x() * a.x() * p, sign * q, -sign * a.x());
  b2 = Eigen::Vector3d(q, sign + a.y() * a.y() * p, -a.y());
}

/// Cosine-weighted (Lambertian) direction in the hemisphere around unit
/// `axis`, from two uniforms in (0, 1]: pdf = cos θ / π (Malley's method,
/// common practice).
inline Eigen::Vector3d cosine_weighted(const Eigen::Vector3d& axis, double u1, double u2) {
  Eigen::Vector3d b1, b2;
  orthonormal_basis(axis, b1, b2);
  const double r = std::sqrt(u1);
  const double phi = 2.0 * std::numbers::pi * u2;
  const double c = std::sqrt(std::max(0.0, 1.0 - u1));
  return (r * std::cos(phi)) * b1 + (r * std::sin(phi)) * b2 + c * axis;
}

}  // namespace lumtrap
