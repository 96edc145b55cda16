#pragma once
// Coherent multilayer thin-film stack by the characteristic-matrix
// (transfer-matrix) method, s and p, complex indices, incidence from either
// side. Reference: H. A. Macleod, Thin-Film Optical Filters, 4th ed., 2010,
// ch. 2; sign convention of fresnel.hpp (a stack with no layers reproduces
// fresnel_amplitudes exactly).
#include <vector>

#include "optics/complex_index.hpp"

namespace lumtrap {

struct ThinLayer {
  cplx n;               ///< complex index of the layer
  double thickness_nm;  ///< physical thickness (>= 0)
};

/// Semi-infinite medium a | layers (listed from a to b) | semi-infinite medium b.
struct FilmStack {
  cplx n_a;
  std::vector<ThinLayer> layers;
  cplx n_b;
};

enum class Incidence { from_a, from_b };

/// Response of the stack for one polarization.
struct PolarizedResponse {
  cplx r = 0, t = 0;      ///< amplitude coefficients (frame of fresnel.hpp)
  double R = 0, T = 0;    ///< reflected and transmitted power fractions
  std::vector<double> A;  ///< absorptance of each layer, indexed as FilmStack::layers (a to b)
};

struct StackResponse {
  PolarizedResponse s, p;
};

/// Solves the stack at one wavelength for a plane wave arriving from medium a
/// or b with real cosine cos_incident (0 < cos <= 1) in the incident medium;
/// cos_incident = 0 is accepted as the grazing limit (r = -1, t = 0, R = 1,
/// T = A = 0), so that tables on [0, 1] are defined at their end point.
/// Throws std::invalid_argument for a cosine outside [0, 1], a wavelength
/// <= 0, a negative or non-finite thickness, or an index with k < 0.
/// The incident medium's extinction is ignored (its real index is used): a
/// plane wave in an absorbing medium has no well-defined incident power, and
/// the tracer counts absorption in the silicon bulk by Beer-Lambert along the
/// ray. The exit medium may absorb: T is then the power entering it.
/// Guarantees R + T + sum(A) = 1 to round-off for each polarization.
StackResponse solve_stack(const FilmStack& stack, double wavelength_nm, double cos_incident,
                          Incidence side);

}  // namespace lumtrap
