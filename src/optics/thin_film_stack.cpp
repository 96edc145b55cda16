// Coherent multilayer by the characteristic-matrix method (H. A. Macleod,
// Thin-Film Optical Filters, 4th ed., 2010, ch. 2), written for the time
// dependence exp(-iωt) and the index n + ik of complex_index.hpp.
//
// Field variables. z runs from the incident medium towards the exit medium.
// In every medium the field is a forward (+) and a backward (-) plane wave
// with amplitudes E± in the frames of fresnel.hpp (s = ŷ, p = k × s). With
// q = n cos θ (fresnel.hpp's normal_index_component) define
//   s: G± = E±,    γ = q,        u = G+ + G- =  E_y,  v = γ (G+ - G-) = -H_x
//   p: G± = n E±,  γ = q / n²,   u = G+ + G- = -H_y,  v = γ (G+ - G-) = -E_x
// (H in units of the vacuum admittance). u and v are the tangential fields,
// continuous across every interface, and for both polarizations the normal
// component of the Poynting vector is S_z = ½ Re(u v*) — exact also in
// absorbing media and for evanescent waves. For p, writing the pair as
// (H, E) with γ = q/n² instead of (E, H) with Macleod's n/cos θ avoids the
// division by cos θ, which vanishes in a lossless layer at its critical angle.
//
// Across a layer of thickness d, with phase thickness δ = 2π q d / λ,
//   [u; v]_left = [[cos δ, -i sin δ / γ], [-i γ sin δ, cos δ]] [u; v]_right,
// Macleod's characteristic matrix with i → -i for exp(-iωt).
//
// The solver starts at the exit medium with the transmitted wave alone
// (G+ = 1, G- = 0, so u = 1, v = γ_exit) and multiplies towards the incident
// medium, recording the flux at every boundary. Each layer matrix is scaled
// by e^{iδ} (|e^{iδ}| <= 1 since Im q >= 0) so that thick absorbing layers
// never overflow; the dropped factors are carried as a real logarithm.
//
// Results: r = G-/G+ in the incident medium (already in fresnel.hpp's
// frame for both polarizations), t = E+(exit) / E+(incident), R = |r|²,
// T = flux entering the exit medium / incident flux, A_j = (flux at the
// layer's entrance - flux at its exit) / incident flux.
#include "optics/thin_film_stack.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

#include "optics/fresnel.hpp"

namespace lumtrap {
namespace {

constexpr double kPi = 3.14159265358979323846;

std::string describe(cplx n) {
  return "(" + std::to_string(n.real()) + " + " + std::to_string(n.imag()) + "i)";
}

void check_inputs(const FilmStack& stack, double wavelength_nm, double cos_incident,
                  Incidence side) {
  const std::string where = "thin_film_stack.cpp: ";
  if (!(wavelength_nm > 0.0) || !std::isfinite(wavelength_nm))
    throw std::invalid_argument(where + "wavelength_nm = " + std::to_string(wavelength_nm) +
                                ": must be finite and > 0");
  if (!(cos_incident >= 0.0 && cos_incident <= 1.0))
    throw std::invalid_argument(where + "cos_incident = " + std::to_string(cos_incident) +
                                ": must lie in [0, 1]");
  auto check_index = [&](cplx n, const std::string& what, bool incident) {
    if (!std::isfinite(n.real()) || !std::isfinite(n.imag()) || n.imag() < 0.0)
      throw std::invalid_argument(where + what + " index " + describe(n) +
                                  ": must be finite with k >= 0");
    if (incident && !(n.real() > 0.0))
      throw std::invalid_argument(where + what + " index " + describe(n) +
                                  ": the incident medium needs n > 0");
    if (n == cplx(0.0))
      throw std::invalid_argument(where + what + " index is 0: not allowed");
  };
  check_index(stack.n_a, "n_a", side == Incidence::from_a);
  check_index(stack.n_b, "n_b", side == Incidence::from_b);
  for (std::size_t j = 0; j < stack.layers.size(); ++j) {
    const ThinLayer& l = stack.layers[j];
    check_index(l.n, "layer " + std::to_string(j), false);
    if (!(l.thickness_nm >= 0.0) || !std::isfinite(l.thickness_nm))
      throw std::invalid_argument(where + "layer " + std::to_string(j) + " thickness_nm = " +
                                  std::to_string(l.thickness_nm) + ": must be finite and >= 0");
  }
}

enum class Pol { s, p };

// γ of the (u, v) pair, see the file comment.
cplx admittance(Pol pol, cplx n, cplx q) { return pol == Pol::s ? q : q / (n * n); }

// Solves one polarization for media ordered in the direction of travel:
// incident (real index n_in), layers[0..N-1], exit n_out. A is returned in
// that same order.
PolarizedResponse solve_ordered(Pol pol, double n_in, const std::vector<ThinLayer>& layers,
                                cplx n_out, double wavelength_nm, double cos_incident) {
  const std::size_t N = layers.size();
  PolarizedResponse res;
  res.A.assign(N, 0.0);

  // Grazing limit (cos = 0): no power arrives through the plane; the
  // reflected amplitude tends to -1 for any stack (γ_in → 0 in the formula
  // for r below) and the transmitted amplitude to 0.
  if (cos_incident == 0.0) {
    res.r = -1.0;
    res.t = 0.0;
    res.R = 1.0;
    res.T = 0.0;
    return res;
  }

  const double k0 = 2.0 * kPi / wavelength_nm;                     // vacuum wavenumber, 1/nm
  const cplx xi2 = n_in * n_in * (1.0 - cos_incident * cos_incident);  // (n_in sin θ)²
  const cplx q_in = n_in * cos_incident;
  const cplx gamma_in = admittance(pol, n_in, q_in);              // real and > 0
  const cplx q_out = normal_index_component(n_out, xi2);
  const cplx gamma_out = admittance(pol, n_out, q_out);

  // flux[j] = Re(u v*) at the entrance of layer j (j < N) and at the exit
  // medium (j = N), in the scaled representation; log_scale[j] is the sum of
  // Im δ over the layers from j to N-1 (the true flux is
  // flux[j] * exp(2 log_scale[j])).
  std::vector<double> flux(N + 1), log_scale(N + 1);
  cplx u = 1.0, v = gamma_out;
  flux[N] = (u * std::conj(v)).real();
  log_scale[N] = 0.0;
  cplx total_phase = 0.0;  // Σ δ_j

  for (std::size_t jj = N; jj-- > 0;) {
    const ThinLayer& layer = layers[jj];
    const cplx q = normal_index_component(layer.n, xi2);
    const cplx gamma = admittance(pol, layer.n, q);
    const cplx delta = k0 * q * layer.thickness_nm;
    total_phase += delta;

    // Scaled matrix e^{iδ} M with e2 = e^{2iδ}:
    //   e^{iδ} cos δ = (1 + e2)/2,  e^{iδ} sin δ = i (1 - e2)/2.
    const cplx e = std::exp(cplx(0.0, 1.0) * delta);
    const cplx e2 = e * e;
    const cplx m11 = 0.5 * (1.0 + e2);
    const cplx m21 = 0.5 * gamma * (1.0 - e2);  // -i γ e^{iδ} sin δ
    cplx m12;                                    // -i e^{iδ} sin δ / γ
    if (std::abs(delta) < 1e-3) {
      // sin δ / γ = (q/γ) k0 d sinc δ stays finite when q → 0 (a lossless
      // layer at its critical angle) and when d = 0; q/γ = 1 (s) or n² (p).
      const cplx q_over_gamma = pol == Pol::s ? cplx(1.0) : layer.n * layer.n;
      const cplx d2 = delta * delta;
      const cplx sinc = 1.0 - d2 / 6.0 + d2 * d2 / 120.0;
      m12 = cplx(0.0, -1.0) * q_over_gamma * (k0 * layer.thickness_nm) * sinc * e;
    } else {
      m12 = 0.5 * (1.0 - e2) / gamma;
    }
    const cplx u_left = m11 * u + m12 * v;
    const cplx v_left = m21 * u + m11 * v;
    u = u_left;
    v = v_left;
    flux[jj] = (u * std::conj(v)).real();
    log_scale[jj] = log_scale[jj + 1] + delta.imag();
  }

  // Incident medium: u = G+ + G-, v = γ_in (G+ - G-).
  const cplx two_g_plus = gamma_in * u + v;   // 2 γ_in G+ (scaled)
  const cplx two_g_minus = gamma_in * u - v;  // 2 γ_in G- (scaled)
  res.r = two_g_minus / two_g_plus;
  // True G+ = scaled G+ · e^{-iΣδ}; the transmitted G+ is 1.
  const cplx t_g = 2.0 * gamma_in * std::exp(cplx(0.0, 1.0) * total_phase) / two_g_plus;
  res.t = pol == Pol::s ? t_g : (n_in / n_out) * t_g;  // p: E = G / n
  res.R = std::norm(res.r);

  // Incident flux Re(γ_in) |G+|² (scaled); true fluxes relative to it carry
  // exp(-2 (log_scale[0] - log_scale[j])) <= 1.
  const double incident_flux = gamma_in.real() * std::norm(two_g_plus / (2.0 * gamma_in));
  auto relative_flux = [&](std::size_t j) {
    return flux[j] * std::exp(-2.0 * (log_scale[0] - log_scale[j])) / incident_flux;
  };
  double previous = relative_flux(0);
  for (std::size_t j = 0; j < N; ++j) {
    const double next = relative_flux(j + 1);
    res.A[j] = previous - next;
    previous = next;
  }
  res.T = previous;  // flux entering the exit medium
  return res;
}

}  // namespace

StackResponse solve_stack(const FilmStack& stack, double wavelength_nm, double cos_incident,
                          Incidence side) {
  check_inputs(stack, wavelength_nm, cos_incident, side);

  if (side == Incidence::from_a) {
    const double n_in = stack.n_a.real();  // incident medium's extinction ignored (header)
    return {solve_ordered(Pol::s, n_in, stack.layers, stack.n_b, wavelength_nm, cos_incident),
            solve_ordered(Pol::p, n_in, stack.layers, stack.n_b, wavelength_nm, cos_incident)};
  }

  // From b: the wave meets the layers in reverse order; A is reported back
  // in FilmStack order (a to b).
  const std::vector<ThinLayer> reversed(stack.layers.rbegin(), stack.layers.rend());
  const double n_in = stack.n_b.real();
  StackResponse res{
      solve_ordered(Pol::s, n_in, reversed, stack.n_a, wavelength_nm, cos_incident),
      solve_ordered(Pol::p, n_in, reversed, stack.n_a, wavelength_nm, cos_incident)};
  std::reverse(res.s.A.begin(), res.s.A.end());
  std::reverse(res.p.A.begin(), res.p.A.end());
  return res;
}

}  // namespace lumtrap
