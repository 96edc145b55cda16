#pragma once
// A film stack's response tabulated, at one wavelength and for one side of
// incidence, on a uniform grid in the cosine of the angle of incidence, so
// that the tracer looks responses up instead of multiplying matrices per hit.
// Linear interpolation in cos θ, except next to the exit medium's critical
// angle (see StackTable::cos_critical); the bound on the interpolation error
// is verified against solve_stack in tests/optics/test_stack_table.cpp.
#include <vector>

#include "optics/thin_film_stack.hpp"

namespace lumtrap {

/// Everything the tracer needs at one angle (no allocation).
struct InterfaceResponse {
  cplx rs, rp, ts, tp;    ///< amplitudes (frame of fresnel.hpp)
  double Rs, Rp, Ts, Tp;  ///< powers; absorptance in films = 1 - R - T per polarization
};

struct StackTable {
  int samples = 0;    ///< grid points, cos θ_k = k / (samples - 1), k = 0..samples-1
  int layers = 0;     ///< number of thin layers
  std::vector<InterfaceResponse> response;  ///< [samples]
  std::vector<double> layer_As, layer_Ap;   ///< [samples * layers], absorptance per layer

  /// Refinement at the critical angle of a lossless exit medium less dense
  /// than the incident one (cos_critical < 0 when there is none). There the
  /// exit medium's n cos θ vanishes and every response has a square-root
  /// branch point in cos θ (T rises from 0 to ~0.7 within Δcos = 1e-3),
  /// which linear interpolation in cos θ cannot follow. Inside
  /// [window_lo, window_hi] (cos_critical ± 0.05, clipped to [0, 1]) the
  /// responses are therefore also tabulated on a grid uniform in
  ///   w = sign(c - c_crit) sqrt(|c² - c_crit²|)  (∝ the exit medium's n cos θ),
  /// in which they are smooth, with `critical_intervals` intervals on each
  /// side of w = 0; at() and pick_absorbing_layer interpolate linearly in w
  /// there. The uniform cos θ grid above is complete and unchanged.
  double cos_critical = -1.0;
  double window_lo = 0.0, window_hi = 0.0;
  int critical_intervals = 0;
  std::vector<InterfaceResponse> critical_response;  ///< [2 critical_intervals + 1], w ascending
  std::vector<double> critical_As, critical_Ap;       ///< [(2 critical_intervals + 1) * layers]

  /// Interpolated response at cos_incident in [0, 1] (clamped).
  InterfaceResponse at(double cos_incident) const;

  /// Interpolated absorptance of every layer at cos_incident (clamped),
  /// written to As[0..layers-1] and Ap[0..layers-1] (no allocation).
  void layer_absorptance(double cos_incident, double* As, double* Ap) const;

  /// Given that the photon was absorbed in the films, picks the layer: the
  /// layer's share of the absorption, weighted by the s and p power
  /// fractions ws, wp (ws + wp = 1), compared with xi in [0, 1).
  /// Returns the layer index (FilmStack order); -1 when the stack has no
  /// layers; layer 0 when every layer's interpolated absorptance is 0 (a
  /// round-off absorption in lossless films).
  int pick_absorbing_layer(double cos_incident, double ws, double wp, double xi) const;
};

/// Tabulates solve_stack(stack, λ, cos, side) at `samples` points (>= 2;
/// std::invalid_argument otherwise), plus the critical-angle refinement.
StackTable tabulate_stack(const FilmStack& stack, double wavelength_nm, Incidence side,
                          int samples = 1025);

}  // namespace lumtrap
