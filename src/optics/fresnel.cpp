// Fresnel amplitude coefficients of one planar interface; conventions and
// references in fresnel.hpp (Born & Wolf, Principles of Optics, 7th ed.,
// 1999, §1.5.2 and §1.5.4 for total internal reflection).
#include "optics/fresnel.hpp"

namespace lumtrap {

namespace {

// q = sqrt(n² - ξ²) on the physical branch. std::sqrt returns the principal
// root (Re >= 0). The physical wave decays (or, for real q, propagates) away
// from the interface: Im q >= 0. Beyond the critical angle of a lossless
// medium n² - ξ² is negative real and q is purely imaginary (+i|q|).
//
// Round-off: for a passive medium (k >= 0) and a real invariant ξ², as in
// every use here, Im(n² - ξ²) = 2nk >= 0. When ξ² is evaluated from a
// complex n1 and cos1 (e.g. the reverse direction of an absorbing
// interface) it picks up an imaginary part of round-off size; a negative
// Im(n² - ξ²) smaller than `rounding` is therefore set to +0 so that a
// propagating wave is not flipped to Re q < 0.
cplx physical_sqrt(cplx z, double rounding) {
  if (z.imag() < 0.0 && z.imag() > -rounding) z = cplx(z.real(), 0.0);
  cplx q = std::sqrt(z);
  if (q.imag() < 0.0 || (q.imag() == 0.0 && q.real() < 0.0)) q = -q;
  return q;
}

constexpr double kRoundoff = 64.0 * 2.220446049250313e-16;  // 64 ε

// n2 cos θ2 for a wave arriving from n1 with cosine cos1; the round-off
// scale includes |n1|² (1 + |cos1|²), the size of the terms in (n1 sin θ1)².
cplx refracted_normal_index(cplx n1, cplx n2, cplx cos1) {
  const cplx xi_squared = n1 * n1 * (1.0 - cos1 * cos1);  // (n1 sin θ1)²
  const double rounding =
      kRoundoff * (std::norm(n2) + std::norm(n1) * (1.0 + std::norm(cos1)));
  return physical_sqrt(n2 * n2 - xi_squared, rounding);
}

}  // namespace

cplx normal_index_component(cplx n, cplx xi_squared) {
  return physical_sqrt(n * n - xi_squared, kRoundoff * (std::norm(n) + std::abs(xi_squared)));
}

cplx cos_refracted(cplx n1, cplx n2, cplx cos1) {
  return refracted_normal_index(n1, n2, cos1) / n2;
}

FresnelAmplitudes fresnel_amplitudes(cplx n1, cplx n2, cplx cos1) {
  // Identical media: no interface (this also covers grazing incidence on an
  // identical medium, where every denominator below would vanish).
  if (n1 == n2) return {0.0, 0.0, 1.0, 1.0};

  const cplx q1 = n1 * cos1;                             // n1 c1
  const cplx q2 = refracted_normal_index(n1, n2, cos1);  // n2 c2
  const cplx cos2 = q2 / n2;

  FresnelAmplitudes f;
  const cplx ds = q1 + q2;                   // n1 c1 + n2 c2
  f.rs = (q1 - q2) / ds;
  f.ts = 2.0 * q1 / ds;
  const cplx dp = n2 * cos1 + n1 * cos2;     // n2 c1 + n1 c2
  f.rp = (n2 * cos1 - n1 * cos2) / dp;
  f.tp = 2.0 * q1 / dp;
  return f;
}

}  // namespace lumtrap
