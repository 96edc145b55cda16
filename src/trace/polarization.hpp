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

/// The field on the s, p frame of the incident wave at a surface with normal
/// m on the incident side: s = s_vector(d, m, E), p = d × s.
struct SPComponents {
  Eigen::Vector3d s, p;
  std::complex<double> Es, Ep;
};

inline SPComponents decompose(const Field& E, const Eigen::Vector3d& d, const Eigen::Vector3d& m) {
  SPComponents c;
  c.s = s_vector(d, m, E);
  c.p = d.cross(c.s);
  c.Es = component(E, c.s);
  c.Ep = component(E, c.p);
  return c;
}

/// Unnormalised outgoing field a_s·E_s s + a_p·E_p (d_out × s), for amplitude
/// coefficients (a_s, a_p) = (r_s, r_p) or (t_s, t_p) of fresnel.hpp.
inline Field outgoing_field(const SPComponents& c, std::complex<double> as, std::complex<double> ap,
                            const Eigen::Vector3d& d_out) {
  const Eigen::Vector3d p_out = d_out.cross(c.s);
  return (as * c.Es) * c.s.cast<std::complex<double>>() + (ap * c.Ep) * p_out.cast<std::complex<double>>();
}

}  // namespace lumtrap
