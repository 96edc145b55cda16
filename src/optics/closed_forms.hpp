#pragma once
// Closed-form results of textbook cases, written out independently of the
// general solvers (fresnel, thin_film_stack, planar_wafer, the transport)
// so that those can be checked against them: by the tests and by
// `lumtrap verify` (src/verify). Indices follow complex_index.hpp.
#include "optics/complex_index.hpp"

namespace lumtrap {

/// Reflectance of one interface at normal incidence,
/// |(n1 - n2)/(n1 + n2)|²; (n - 1)²/(n + 1)² from air onto a lossless n
/// (common practice; Born & Wolf, Principles of Optics, 7th ed., 1999).
double normal_incidence_reflectance(cplx n1, cplx n2);

/// Reflectance at normal incidence of a lossless quarter-wave layer n1
/// (optical thickness λ/4) between lossless media n0 (incidence) and ns, at
/// its design wavelength: R = ((n0 ns - n1²)/(n0 ns + n1²))² (H. A. Macleod,
/// Thin-Film Optical Filters, 4th ed., 2010).
double quarter_wave_reflectance(double n0, double n1, double ns);

/// Where the light ends in an incoherent slab: reflectance R1 of its front
/// surface (the same from both sides), R2 of its rear surface (seen from
/// inside), and single-pass internal transmission tau = exp(-αW/cos θ).
/// Summing the geometric series of the passes:
///   R = R1 + (1 - R1)² R2 tau² / (1 - R1 R2 tau²)
///   T = (1 - R1)(1 - R2) tau / (1 - R1 R2 tau²),  A = 1 - R - T
/// (common practice: incoherent multiple reflections in a plate).
struct SlabPowers {
  double R = 0, T = 0, A = 0;
};
SlabPowers incoherent_slab(double R1, double R2, double tau);

/// Exponential integral E3(x) = ∫_1^∞ e^{-xt} / t³ dt, x >= 0, from E1 by
/// the recurrence E_{n+1}(x) = (e^{-x} - x E_n(x)) / n (Abramowitz & Stegun,
/// Handbook of Mathematical Functions, 1964, 5.1.14); E3(0) = 1/2.
double exponential_integral_E3(double x);

/// Absorptance of the ideal Lambertian wafer (all light enters, Lambertian
/// light inside, a perfect Lambertian rear reflector, front escape 1/n²) of
/// thickness W and absorption coefficient α (M. A. Green, "Lambertian light
/// trapping in textured solar cells and light-emitting diodes: analytical
/// solutions", Prog. Photovolt. 10, 235-241, 2002):
///   A = 1 - (t²/n²) / (1 - (1 - 1/n²) t²),  t = 2 E3(αW).
double lambertian_absorptance(double alpha_W, double n);

}  // namespace lumtrap
