#pragma once
// Complex refractive index convention used everywhere in lumtrap:
//   n_complex = n + i k, k >= 0 for an absorbing medium,
//   fields vary as exp(i (k·r - ω t)), absorption coefficient α = 4π k / λ.
// (Born & Wolf, Principles of Optics, 7th ed., 1999, §14.1; common practice.)
#include <numbers>
#include <complex>

namespace lumtrap {

using cplx = std::complex<double>;

/// Absorption coefficient α = 4πk/λ, in 1/nm for λ in nm.
inline double absorption_coefficient_per_nm(cplx n, double wavelength_nm) {
  return 4.0 * std::numbers::pi * n.imag() / wavelength_nm;
}

}  // namespace lumtrap
