#include "geometry/facet_horizon.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace lumtrap::geometry {

namespace {
constexpr double kInf = std::numeric_limits<double>::infinity();
}

void FacetHorizon::reset(double a) {
  a_ = a;
  tol_ = 1e-13 / a;
  next_src_ = 1;
  env_.clear();
  env_.push_back({-1.0, 1.0 / a, 0.0, 0});
}

void FacetHorizon::push(Piece* out, std::size_t& n, double v0, double c0, double c1, int src) {
  if (n > 0) {
    if (out[n - 1].src == src) return;  // the same line goes on
    if (v0 <= out[n - 1].v0) {         // the last piece has no length: replace it
      --n;
      if (n > 0 && out[n - 1].src == src) return;
      if (n == 0) v0 = -1.0;
    }
  }
  out[n++] = {v0, c0, c1, src};
}

void FacetHorizon::insert(double lo, double hi, double c0, double c1, int src) {
  const std::size_t n = env_.size();
  // Most lines pass below the envelope: check that before rebuilding it.
  bool above = false;
  for (std::size_t j = 0; j < n && !above; ++j) {
    const Piece& p = env_[j];
    const double p0 = p.v0, p1 = j + 1 < n ? env_[j + 1].v0 : 1.0;
    if (p1 <= lo || p0 >= hi) continue;
    const double start = std::max(p0, lo), end = std::min(p1, hi);
    const double e0 = p.c0 + p.c1 * start, e1 = p.c0 + p.c1 * end;
    const double tol = tol_ + 1e-13 * std::max(std::abs(e0), std::abs(e1));
    above = (c0 + c1 * start) - e0 > tol || (c0 + c1 * end) - e1 > tol;
  }
  if (!above) return;
  // Each piece splits in at most three (the ends of [lo, hi] and a crossing).
  scratch_.resize(3 * n + 2);
  Piece* out = scratch_.data();
  std::size_t m = 0;
  for (std::size_t j = 0; j < n; ++j) {
    const Piece& p = env_[j];
    const double p0 = p.v0, p1 = j + 1 < n ? env_[j + 1].v0 : 1.0;
    if (p1 <= lo || p0 >= hi) {
      push(out, m, p0, p.c0, p.c1, p.src);
      continue;
    }
    double start = p0;
    if (p0 < lo) {
      push(out, m, p0, p.c0, p.c1, p.src);
      start = lo;
    }
    const double end = std::min(p1, hi);
    const double e0 = p.c0 + p.c1 * start, e1 = p.c0 + p.c1 * end;
    const double d0 = (c0 + c1 * start) - e0, d1 = (c0 + c1 * end) - e1;
    const double tol = tol_ + 1e-13 * std::max(std::abs(e0), std::abs(e1));
    if (d0 <= tol && d1 <= tol) {
      push(out, m, start, p.c0, p.c1, p.src);
    } else if (d0 >= -tol && d1 >= -tol) {
      push(out, m, start, c0, c1, src);
    } else {
      const double vc = start + (end - start) * (d0 / (d0 - d1));
      if (d0 > 0) {
        push(out, m, start, c0, c1, src);
        push(out, m, vc, p.c0, p.c1, p.src);
      } else {
        push(out, m, start, p.c0, p.c1, p.src);
        push(out, m, vc, c0, c1, src);
      }
    }
    if (p1 > hi) push(out, m, hi, p.c0, p.c1, p.src);
  }
  scratch_.resize(m);
  env_.swap(scratch_);
}

bool FacetHorizon::add(const FacetOccluder& occ) {
  const bool hk = occ.kappa < kInf, ha = occ.alpha < kInf, hb = occ.beta < kInf;
  if (!hk && !ha && !hb) return false;
  // Highest value of h_k, to skip neighbours that hide nothing.
  double peak = kInf;
  if (ha && hb) peak = 2.0 * occ.alpha * occ.beta / (occ.alpha + occ.beta);
  else if (ha) peak = 2.0 * occ.alpha;
  else if (hb) peak = 2.0 * occ.beta;
  if (hk) peak = std::min(peak, occ.kappa);
  if (peak <= 1.0 / a_ + tol_) return true;

  // Pieces of h_k: rising beta·(1 + v), flat kappa, falling alpha·(1 - v).
  double r_end = 1.0, f_start = -1.0;  // rising piece ends, falling piece starts
  if (hb && hk) r_end = std::min(r_end, occ.kappa / occ.beta - 1.0);
  if (ha && hk) f_start = std::max(f_start, 1.0 - occ.kappa / occ.alpha);
  if (ha && hb && r_end >= f_start) {  // no flat top: rising meets falling
    r_end = f_start = (occ.alpha - occ.beta) / (occ.alpha + occ.beta);
  }

  // Does h_k rise above g anywhere? h_k - g is concave on each piece of g
  // between the breaks of h_k, so checking all breaks of both suffices.
  auto h = [&](double v) {
    double r = hk ? occ.kappa : kInf;
    if (hb) r = std::min(r, occ.beta * (1.0 + v));
    if (ha) r = std::min(r, occ.alpha * (1.0 - v));
    return r;
  };
  bool above = false;
  const std::size_t n = env_.size();
  for (std::size_t j = 0; j < n && !above; ++j) {
    const Piece& p = env_[j];
    const double p0 = p.v0, p1 = j + 1 < n ? env_[j + 1].v0 : 1.0;
    auto over = [&](double v) {
      const double e = p.c0 + p.c1 * v;
      return h(v) - e > tol_ + 1e-13 * std::abs(e);
    };
    above = over(p0) || over(p1) || (r_end > p0 && r_end < p1 && over(r_end)) ||
            (f_start > p0 && f_start < p1 && over(f_start));
  }
  if (!above) return true;

  const int src = next_src_;
  next_src_ += 3;
  if (hb && r_end > -1.0) insert(-1.0, r_end, occ.beta, occ.beta, src);
  const double k_lo = hb ? std::max(r_end, -1.0) : -1.0;
  const double k_hi = ha ? std::min(f_start, 1.0) : 1.0;
  if (hk && k_hi > k_lo) insert(k_lo, k_hi, occ.kappa, 0.0, src + 1);
  if (ha && f_start < 1.0) insert(std::max(f_start, -1.0), 1.0, occ.alpha, -occ.alpha, src + 2);
  return true;
}

void FacetHorizon::outline(std::vector<Point2>& out) const {
  out.clear();
  const std::size_t n = env_.size();
  for (std::size_t j = 0; j <= n; ++j) {
    const double v = j < n ? env_[j].v0 : 1.0;
    const bool base = (j < n && env_[j].src == 0) || (j > 0 && env_[j - 1].src == 0);
    double u;
    if (base) {
      u = a_;
    } else {
      const Piece& p = env_[j < n ? j : n - 1];
      u = std::min(a_, 1.0 / (p.c0 + p.c1 * v));  // g >= 1/a up to rounding
    }
    const double w = v == 1.0 ? u : v == -1.0 ? -u : v * u;
    out.push_back({u, w});
  }
}

}  // namespace lumtrap::geometry
