#pragma once
// The photon's polarization: a complex unit field vector E ⟂ direction.
// At an interface the field is split on the local s, p frame of fresnel.hpp
// (s = d × m / |d × m| with m the normal on the incident side, p = k × s for
// every wave), the amplitude coefficients act on each component, and the
// new field is rebuilt on the outgoing wave's frame. Unpolarized light is an
// equal mixture of random linear states.
#include <complex>

#include <Eigen/Core>
#include <Eigen/Geometry>

#include "trace/sampling.hpp"

namespace lumtrap {

using Field = Eigen::Vector3cd;

/// Unit s vector for direction d and incident-side normal m; at normal
/// incidence (d ∥ m) any unit vector ⟂ d serves (the s and p coefficients
/// then describe the same physics), taken from the field itself.
inline Eigen::Vector3d s_vector(const Eigen::Vector3d& d, const Eigen::Vector3d& m, const Field& E) {
  Eigen::Vector3d s = d.cross(m);
  double n2 = s.squaredNorm();
  if (n2 > 1e-20) return s / std::sqrt(n2);
  Eigen::Vector3d e = E.real();
  if (e.squaredNorm() < 1e-20) e = E.imag();
  e -= e.dot(d) * d;
  if (e.squaredNorm() > 1e-20) return e.normalized();
  Eigen::Vector3d b1, b2;
  orthonormal_basis(d, b1, b2);
  return b1;
}

/// Component of E along a real unit vector.
inline std::complex<double> component(const Field& E, const Eigen::Vector3d& u) {
  return E.x() * u.x() + E.y() * u.y() + E.z() * u.z();
}

/// Linear polarization at angle psi from s (in the s, p = d × s frame).
inline Field linear_field(const Eigen::Vector3d& s, const Eigen::Vector3d& p, double psi) {
  return (std::cos(psi) * s + std::sin(psi) * p).cast<std::complex<double>>();
}

/// E' = a_s s + a_p p, normalised; returns false when both vanish.
inline bool rebuild_field(Field& E, std::complex<double> as, const Eigen::Vector3d& s,
                          std::complex<double> ap, const Eigen::Vector3d& p) {
  double norm2 = std::norm(as) + std::norm(ap);
  if (!(norm2 > 1e-300)) return false;
  double inv = 1.0 / std::sqrt(norm2);
  E = (as * inv) * s.cast<std::complex<double>>() + (ap * inv) * p.cast<std::complex<double>>();
  return true;
}

}  // namespace lumtrap
