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

#include <numbers>
#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

#include "optics/fresnel.hpp"

namespace lumtrap {
namespace {


std::string describe(cplx n) {
  std::string s = "(";
  s += std::to_string(n.real());
  s += " + ";
  s += std::to_string(n.imag());
  s += "i)";
  return s;
}

// Input checks; the message strings are only built on failure (solve_stack
// runs thousands of times per tabulated stack).
[[noreturn]] void fail(const std::string& what) {
  throw std::invalid_argument("thin_film_stack.cpp: " + what);
}

void check_index(cplx n, const char* what, std::size_t layer, bool incident) {
  auto name = [&] { return what ? std::string(what) : "layer " + std::to_string(layer); };
  if (!std::isfinite(n.real()) || !std::isfinite(n.imag()) || n.imag() < 0.0)
    fail(name() + " index " + describe(n) + ": must be finite with k >= 0");
  if (incident && !(n.real() > 0.0))
    fail(name() + " index " + describe(n) + ": the incident medium needs n > 0");
  if (n == cplx(0.0)) fail(name() + " index is 0: not allowed");
}

void check_inputs(const FilmStack& stack, double wavelength_nm, double cos_incident,
                  Incidence side) {
  if (!(wavelength_nm > 0.0) || !std::isfinite(wavelength_nm))
    fail("wavelength_nm = " + std::to_string(wavelength_nm) + ": must be finite and > 0");
  if (!(cos_incident >= 0.0 && cos_incident <= 1.0))
    fail("cos_incident = " + std::to_string(cos_incident) + ": must lie in [0, 1]");
  check_index(stack.n_a, "n_a", 0, side == Incidence::from_a);
  check_index(stack.n_b, "n_b", 0, side == Incidence::from_b);
  for (std::size_t j = 0; j < stack.layers.size(); ++j) {
    const ThinLayer& l = stack.layers[j];
    check_index(l.n, nullptr, j, false);
    if (!(l.thickness_nm >= 0.0) || !std::isfinite(l.thickness_nm))
      fail("layer " + std::to_string(j) + " thickness_nm = " + std::to_string(l.thickness_nm) +
           ": must be finite and >= 0");
  }
}

enum class Pol { s, p };

// γ of the (u, v) pair, see the file comment.
cplx admittance(Pol pol, cplx n, cplx q) { return pol == Pol::s ? q : q / (n * n); }

// The layers in the order the wave meets them: layer(j) = first[j * step].
struct LayerOrder {
  const ThinLayer* first = nullptr;
  std::ptrdiff_t step = 1;
  std::size_t count = 0;
  const ThinLayer& operator()(std::size_t j) const { return first[static_cast<std::ptrdiff_t>(j) * step]; }
};

// Working storage of one polarization: flux at every boundary (see below),
// on the stack for the usual few layers.
struct FluxBuffer {
  static constexpr std::size_t kInline = 16;
  double inline_flux[kInline];
  std::vector<double> heap;
  double* data(std::size_t n) {
    if (n <= kInline) return inline_flux;
    heap.resize(n);
    return heap.data();
  }
};

// Solves both polarizations for media ordered in the direction of travel:
// incident (real index n_in), order(0..N-1), exit n_out. The terms that do
// not depend on the polarization (q, δ, e^{iδ} in every layer) are computed
// once; every polarization-dependent quantity is the same expression as a
// one-polarization solve would evaluate. The absorptance of the j-th layer
// met is written to A[j], or to A[N-1-j] when `report_reversed` (incidence
// from b), so that A is in FilmStack order.
StackResponse solve_ordered(double n_in, const LayerOrder& order, cplx n_out, double wavelength_nm,
                            double cos_incident, bool report_reversed) {
  const std::size_t N = order.count;
  StackResponse res;
  res.s.A.assign(N, 0.0);
  res.p.A.assign(N, 0.0);

  // Grazing limit (cos = 0): no power arrives through the plane; the
  // reflected amplitude tends to -1 for any stack (γ_in → 0 in the formula
  // for r below) and the transmitted amplitude to 0.
  if (cos_incident == 0.0) {
    for (PolarizedResponse* r : {&res.s, &res.p}) {
      r->r = -1.0;
      r->t = 0.0;
      r->R = 1.0;
      r->T = 0.0;
    }
    return res;
  }

  const double k0 = 2.0 * std::numbers::pi / wavelength_nm;                     // vacuum wavenumber, 1/nm
  const cplx xi2 = n_in * n_in * (1.0 - cos_incident * cos_incident);  // (n_in sin θ)²
  const cplx q_in = n_in * cos_incident;
  const cplx q_out = normal_index_component(n_out, xi2);
  const Pol pols[2] = {Pol::s, Pol::p};
  PolarizedResponse* out[2] = {&res.s, &res.p};

  // flux[j] = Re(u v*) at the entrance of layer j (j < N) and at the exit
  // medium (j = N), in the scaled representation; log_scale[j] is the sum of
  // Im δ over the layers from j to N-1 (the true flux is
  // flux[j] * exp(2 log_scale[j])).
  FluxBuffer fb_s, fb_p, fb_log;
  double* flux[2] = {fb_s.data(N + 1), fb_p.data(N + 1)};
  double* log_scale = fb_log.data(N + 1);
  cplx gamma_in[2], u[2], v[2];
  for (int k = 0; k < 2; ++k) {
    gamma_in[k] = admittance(pols[k], n_in, q_in);  // real and > 0
    u[k] = 1.0;
    v[k] = admittance(pols[k], n_out, q_out);  // γ of the exit medium
    flux[k][N] = (u[k] * std::conj(v[k])).real();
  }
  log_scale[N] = 0.0;
  cplx total_phase = 0.0;  // Σ δ_j

  for (std::size_t jj = N; jj-- > 0;) {
    const ThinLayer& layer = order(jj);
    const cplx q = normal_index_component(layer.n, xi2);
    const cplx delta = k0 * q * layer.thickness_nm;
    total_phase += delta;

    // Scaled matrix e^{iδ} M with e2 = e^{2iδ}:
    //   e^{iδ} cos δ = (1 + e2)/2,  e^{iδ} sin δ = i (1 - e2)/2.
    const cplx e = std::exp(cplx(0.0, 1.0) * delta);
    const cplx e2 = e * e;
    const cplx m11 = 0.5 * (1.0 + e2);
    const bool small = std::abs(delta) < 1e-3;
    cplx sinc = 0.0;
    if (small) {
      const cplx d2 = delta * delta;
      sinc = 1.0 - d2 / 6.0 + d2 * d2 / 120.0;
    }
    for (int k = 0; k < 2; ++k) {
      const cplx gamma = admittance(pols[k], layer.n, q);
      const cplx m21 = 0.5 * gamma * (1.0 - e2);  // -i γ e^{iδ} sin δ
      cplx m12;                                    // -i e^{iδ} sin δ / γ
      if (small) {
        // sin δ / γ = (q/γ) k0 d sinc δ stays finite when q → 0 (a lossless
        // layer at its critical angle) and when d = 0; q/γ = 1 (s) or n² (p).
        const cplx q_over_gamma = pols[k] == Pol::s ? cplx(1.0) : layer.n * layer.n;
        m12 = cplx(0.0, -1.0) * q_over_gamma * (k0 * layer.thickness_nm) * sinc * e;
      } else {
        m12 = 0.5 * (1.0 - e2) / gamma;
      }
      const cplx u_left = m11 * u[k] + m12 * v[k];
      const cplx v_left = m21 * u[k] + m11 * v[k];
      u[k] = u_left;
      v[k] = v_left;
      flux[k][jj] = (u[k] * std::conj(v[k])).real();
    }
    log_scale[jj] = log_scale[jj + 1] + delta.imag();
  }

  for (int k = 0; k < 2; ++k) {
    PolarizedResponse& r = *out[k];
    // Incident medium: u = G+ + G-, v = γ_in (G+ - G-).
    const cplx two_g_plus = gamma_in[k] * u[k] + v[k];   // 2 γ_in G+ (scaled)
    const cplx two_g_minus = gamma_in[k] * u[k] - v[k];  // 2 γ_in G- (scaled)
    r.r = two_g_minus / two_g_plus;
    // True G+ = scaled G+ · e^{-iΣδ}; the transmitted G+ is 1.
    const cplx t_g = 2.0 * gamma_in[k] * std::exp(cplx(0.0, 1.0) * total_phase) / two_g_plus;
    r.t = pols[k] == Pol::s ? t_g : (n_in / n_out) * t_g;  // p: E = G / n
    r.R = std::norm(r.r);

    // Incident flux Re(γ_in) |G+|² (scaled); true fluxes relative to it carry
    // exp(-2 (log_scale[0] - log_scale[j])) <= 1.
    const double incident_flux = gamma_in[k].real() * std::norm(two_g_plus / (2.0 * gamma_in[k]));
    const double* f = flux[k];
    auto relative_flux = [&](std::size_t j) {
      return f[j] * std::exp(-2.0 * (log_scale[0] - log_scale[j])) / incident_flux;
    };
    double previous = relative_flux(0);
    for (std::size_t j = 0; j < N; ++j) {
      const double next = relative_flux(j + 1);
      r.A[report_reversed ? N - 1 - j : j] = previous - next;
      previous = next;
    }
    r.T = previous;  // flux entering the exit medium
  }
  return res;
}

}  // namespace

StackResponse solve_stack(const FilmStack& stack, double wavelength_nm, double cos_incident,
                          Incidence side) {
  check_inputs(stack, wavelength_nm, cos_incident, side);
  const std::size_t N = stack.layers.size();

  if (side == Incidence::from_a) {
    const double n_in = stack.n_a.real();  // incident medium's extinction ignored (header)
    return solve_ordered(n_in, LayerOrder{stack.layers.data(), 1, N}, stack.n_b, wavelength_nm,
                         cos_incident, false);
  }

  // From b: the wave meets the layers in reverse order; A is reported back
  // in FilmStack order (a to b).
  const double n_in = stack.n_b.real();
  return solve_ordered(n_in, LayerOrder{N ? stack.layers.data() + (N - 1) : nullptr, -1, N}, stack.n_a,
                       wavelength_nm, cos_incident, true);
}

}  // namespace lumtrap
