#pragma once
// Fresnel amplitude coefficients of a single planar interface between two
// homogeneous, isotropic media with complex indices (see complex_index.hpp).
//
// Sign convention (Born & Wolf, Principles of Optics, 7th ed., 1999, §1.5.2):
// every wave (incident, reflected, transmitted) carries its own right-handed
// frame (s, p, k) with s = the common unit vector perpendicular to the plane
// of incidence and p = k × s. With that frame
//   r_s = (n1 c1 - n2 c2) / (n1 c1 + n2 c2),  t_s = 2 n1 c1 / (n1 c1 + n2 c2)
//   r_p = (n2 c1 - n1 c2) / (n2 c1 + n1 c2),  t_p = 2 n1 c1 / (n2 c1 + n1 c2)
// so that at normal incidence r_s = -r_p.
#include "optics/complex_index.hpp"

namespace lumtrap {

struct FresnelAmplitudes {
  cplx rs, rp, ts, tp;
};

/// Cosine of the refraction angle in medium n2 for a wave with cosine cos1
/// in medium n1 (Snell: n1 sin1 = n2 sin2). The branch is chosen so that the
/// transmitted wave decays or propagates away from the interface:
/// Im(n2 c2) >= 0, and Re(n2 c2) >= 0 when the imaginary part vanishes.
/// Beyond the critical angle (lossless media) c2 is purely imaginary.
cplx cos_refracted(cplx n1, cplx n2, cplx cos1);

/// q = n cos θ in a medium of index n for a plane wave whose tangential
/// index ξ = n_inc sin θ_inc (conserved across planar interfaces, Snell) is
/// given as xi_squared = ξ²: q = sqrt(n² - ξ²) on the branch of
/// cos_refracted (Im q >= 0; Re q >= 0 when Im q == 0). Shared by the
/// thin-film solver so that both use one branch rule.
cplx normal_index_component(cplx n, cplx xi_squared);

/// Amplitude coefficients for incidence from n1 onto n2 with cosine cos1.
FresnelAmplitudes fresnel_amplitudes(cplx n1, cplx n2, cplx cos1);

}  // namespace lumtrap
