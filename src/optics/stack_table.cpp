// Tabulated film-stack response (see stack_table.hpp): a uniform grid in
// cos θ with linear interpolation, refined next to the exit medium's
// critical angle by a grid uniform in w = sign(c - c_crit) sqrt(|c² - c_crit²|).
// The complex amplitudes are interpolated component by component (real and
// imaginary parts separately).
#include "optics/stack_table.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

namespace lumtrap {
namespace {

// Half-width in cos θ of the refinement window and intervals per side. Just
// outside ±0.05 the square-root curvature leaves a linear-in-cos error of
// about 1e-4 with 1025 samples (measured in test_stack_table.cpp).
constexpr double kWindowHalfWidth = 0.05;
constexpr int kCriticalIntervals = 256;

// Where cos_incident falls: which grid (uniform in cos or the critical
// refinement), the left node and the weight of the right node.
struct Bracket {
  bool critical;
  int i;
  double f;
};

double signed_w(double c, double cc) {
  return c >= cc ? std::sqrt((c - cc) * (c + cc)) : -std::sqrt((cc - c) * (cc + c));
}

double cos_of_w(double w, double cc) {
  const double c = w >= 0.0 ? std::sqrt(cc * cc + w * w) : std::sqrt((cc - (-w)) * (cc + (-w)));
  return std::clamp(c, 0.0, 1.0);
}

[[gnu::always_inline]] inline Bracket locate(const StackTable& t, double cos_incident) {
  double c = cos_incident;
  if (!(c > 0.0)) c = 0.0;  // also maps NaN to the grazing end
  if (c > 1.0) c = 1.0;

  if (t.critical_intervals > 0 && c >= t.window_lo && c <= t.window_hi) {
    const int m = t.critical_intervals;
    const double w = signed_w(c, t.cos_critical);
    double x;
    if (w <= 0.0) {
      const double w_lo = signed_w(t.window_lo, t.cos_critical);  // < 0
      x = m * (1.0 - w / w_lo);                                  // 0 at w_lo, m at w = 0
      x = std::clamp(x, 0.0, static_cast<double>(m));
    } else {
      const double w_hi = signed_w(t.window_hi, t.cos_critical);  // > 0
      x = m * (1.0 + w / w_hi);
      x = std::clamp(x, static_cast<double>(m), 2.0 * m);
    }
    int i = static_cast<int>(x);
    if (i > 2 * m - 1) i = 2 * m - 1;
    return {true, i, x - i};
  }

  const double x = c * (t.samples - 1);
  int i = static_cast<int>(x);
  if (i > t.samples - 2) i = t.samples - 2;
  return {false, i, x - i};
}

double lerp(double a, double b, double f) { return a + f * (b - a); }
cplx lerp(cplx a, cplx b, double f) {
  return {lerp(a.real(), b.real(), f), lerp(a.imag(), b.imag(), f)};
}

void store(const StackResponse& r, std::vector<InterfaceResponse>& response,
           std::vector<double>& As, std::vector<double>& Ap, int k, int layers) {
  response[k] = {r.s.r, r.p.r, r.s.t, r.p.t, r.s.R, r.p.R, r.s.T, r.p.T};
  for (int j = 0; j < layers; ++j) {
    As[static_cast<std::size_t>(k) * layers + j] = r.s.A[j];
    Ap[static_cast<std::size_t>(k) * layers + j] = r.p.A[j];
  }
}

}  // namespace

InterfaceResponse StackTable::at(double cos_incident) const {
  const Bracket br = locate(*this, cos_incident);
  const std::vector<InterfaceResponse>& grid = br.critical ? critical_response : response;
  const InterfaceResponse& a = grid[br.i];
  const InterfaceResponse& b = grid[br.i + 1];
  const double f = br.f;
  return {lerp(a.rs, b.rs, f), lerp(a.rp, b.rp, f), lerp(a.ts, b.ts, f), lerp(a.tp, b.tp, f),
          lerp(a.Rs, b.Rs, f), lerp(a.Rp, b.Rp, f), lerp(a.Ts, b.Ts, f), lerp(a.Tp, b.Tp, f)};
}

void StackTable::layer_absorptance(double cos_incident, double* As, double* Ap) const {
  const Bracket br = locate(*this, cos_incident);
  const std::vector<double>& gs = br.critical ? critical_As : layer_As;
  const std::vector<double>& gp = br.critical ? critical_Ap : layer_Ap;
  const std::size_t lo = static_cast<std::size_t>(br.i) * layers;
  const std::size_t hi = lo + layers;
  for (int j = 0; j < layers; ++j) {
    As[j] = lerp(gs[lo + j], gs[hi + j], br.f);
    Ap[j] = lerp(gp[lo + j], gp[hi + j], br.f);
  }
}

int StackTable::pick_absorbing_layer(double cos_incident, double ws, double wp, double xi) const {
  if (layers == 0) return -1;
  const Bracket br = locate(*this, cos_incident);
  const std::vector<double>& As = br.critical ? critical_As : layer_As;
  const std::vector<double>& Ap = br.critical ? critical_Ap : layer_Ap;
  const std::size_t lo = static_cast<std::size_t>(br.i) * layers;
  const std::size_t hi = lo + layers;
  auto share = [&](int j) {
    const double as = lerp(As[lo + j], As[hi + j], br.f);
    const double ap = lerp(Ap[lo + j], Ap[hi + j], br.f);
    return std::max(0.0, ws * as + wp * ap);  // clip round-off negatives of lossless layers
  };
  double total = 0.0;
  for (int j = 0; j < layers; ++j) total += share(j);
  if (!(total > 0.0)) return 0;  // only round-off absorption: no layer absorbs
  const double target = xi * total;
  double cumulative = 0.0;
  int last_absorbing = 0;
  for (int j = 0; j < layers; ++j) {
    const double a = share(j);
    if (a > 0.0) last_absorbing = j;
    cumulative += a;
    if (target < cumulative) return j;
  }
  return last_absorbing;  // xi * total rounded up to the full sum
}

StackTable tabulate_stack(const FilmStack& stack, double wavelength_nm, Incidence side,
                          int samples) {
  if (samples < 2)
    throw std::invalid_argument("stack_table.cpp: samples = " + std::to_string(samples) +
                                ": must be >= 2");
  StackTable table;
  table.samples = samples;
  table.layers = static_cast<int>(stack.layers.size());
  const int L = table.layers;
  table.response.resize(samples);
  table.layer_As.resize(static_cast<std::size_t>(samples) * L);
  table.layer_Ap.resize(static_cast<std::size_t>(samples) * L);
  for (int k = 0; k < samples; ++k) {
    // cos θ_k = k / (samples - 1); k = 0 is the grazing limit of solve_stack.
    const double c = k == samples - 1 ? 1.0 : static_cast<double>(k) / (samples - 1);
    store(solve_stack(stack, wavelength_nm, c, side), table.response, table.layer_As,
          table.layer_Ap, k, L);
  }

  // Critical angle of the exit medium: only a lossless exit medium has a
  // branch point on the real axis (an absorbing one rounds it off).
  const double n_in = side == Incidence::from_a ? stack.n_a.real() : stack.n_b.real();
  const cplx n_out = side == Incidence::from_a ? stack.n_b : stack.n_a;
  if (n_out.imag() == 0.0 && n_out.real() < n_in) {
    const double ratio = n_out.real() / n_in;
    const double cc = std::sqrt((1.0 - ratio) * (1.0 + ratio));
    table.cos_critical = cc;
    table.window_lo = std::max(0.0, cc - kWindowHalfWidth);
    table.window_hi = std::min(1.0, cc + kWindowHalfWidth);
    const double w_lo = signed_w(table.window_lo, cc), w_hi = signed_w(table.window_hi, cc);
    if (w_lo < 0.0 && w_hi > 0.0) {
      const int m = kCriticalIntervals;
      table.critical_intervals = m;
      table.critical_response.resize(2 * m + 1);
      table.critical_As.resize(static_cast<std::size_t>(2 * m + 1) * L);
      table.critical_Ap.resize(static_cast<std::size_t>(2 * m + 1) * L);
      for (int k = 0; k <= 2 * m; ++k) {
        const double w = k <= m ? w_lo * (m - k) / m : w_hi * (k - m) / m;
        double c = cos_of_w(w, cc);
        if (k == 0) c = table.window_lo;  // the window's ends exactly
        if (k == 2 * m) c = table.window_hi;
        store(solve_stack(stack, wavelength_nm, c, side), table.critical_response,
              table.critical_As, table.critical_Ap, k, L);
      }
    }
  }
  return table;
}

}  // namespace lumtrap
