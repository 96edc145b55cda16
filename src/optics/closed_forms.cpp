#include "optics/closed_forms.hpp"

#include <cmath>

namespace lumtrap {

double normal_incidence_reflectance(cplx n1, cplx n2) { return std::norm((n1 - n2) / (n1 + n2)); }

double quarter_wave_reflectance(double n0, double n1, double ns) {
  const double r = (n0 * ns - n1 * n1) / (n0 * ns + n1 * n1);
  return r * r;
}

SlabPowers incoherent_slab(double R1, double R2, double tau) {
  SlabPowers p;
  const double round_trip = 1.0 - R1 * R2 * tau * tau;
  p.R = R1 + (1.0 - R1) * (1.0 - R1) * R2 * tau * tau / round_trip;
  p.T = (1.0 - R1) * (1.0 - R2) * tau / round_trip;
  p.A = 1.0 - p.R - p.T;
  return p;
}

double exponential_integral_E3(double x) {
  if (x == 0) return 0.5;
  const double e1 = -std::expint(-x);
  const double e2 = std::exp(-x) - x * e1;
  return 0.5 * (std::exp(-x) - x * e2);
}

double lambertian_absorptance(double alpha_W, double n) {
  const double t = 2.0 * exponential_integral_E3(alpha_W);
  const double n2 = n * n;
  return 1.0 - (t * t / n2) / (1.0 - (1.0 - 1.0 / n2) * t * t);
}

}  // namespace lumtrap
