// Doping profiles, free carriers and free-carrier absorption along ray
// segments. See doping_profile.hpp for definitions, units and accuracy.
#include "optics/doping_profile.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>

#include "optics/material.hpp"

namespace lumtrap {
namespace {

constexpr double kSqrtPi = 1.77245385090551602730;
constexpr double kCmPerUm = 1e-4;
/// Accepted |K15 - G7| per interval, relative to the whole column and
/// proportional to the interval's share of the segment.
constexpr double kColumnTolerance = 1e-11;
constexpr int kMaxBisections = 60;
constexpr long kMaxIntervals = 1000000;
/// Share of segment: convergence of successive panel doublings.
constexpr double kShareTolerance = 1e-10;
constexpr int kMaxPanelsLog2 = 14;

template <class... Ts>
struct Overloaded : Ts... {
  using Ts::operator()...;
};
template <class... Ts>
Overloaded(Ts...) -> Overloaded<Ts...>;

// Gauss–Kronrod 7/15 (abscissae and weights as tabulated in R. Piessens et
// al., QUADPACK, Springer 1983; common practice).
constexpr std::array<double, 8> kXgk = {
    0.991455371120812639206854697526329, 0.949107912342758524526189684047851,
    0.864864423359769072789712788640926, 0.741531185599394439863864773280788,
    0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
    0.207784955007898467600689403773245, 0.0};
constexpr std::array<double, 8> kWgk = {
    0.022935322010529224963732008058970, 0.063092092629978553290700663189204,
    0.104790010322250183839876322541518, 0.140653259715525918745189590510238,
    0.169004726639267902826583426598550, 0.190350578064785409913256402421014,
    0.204432940075298892414161999234649, 0.209482141084727828012999174891714};
// Gauss 7-point weights at kXgk[1], [3], [5], [7].
constexpr std::array<double, 4> kWg = {
    0.129484966168869693270611432679082, 0.279705391489276667901467771423780,
    0.381830050505118944950369775488975, 0.417959183673469387755102040816327};

// Gauss–Legendre 8-point on [-1, 1] (common practice).
constexpr std::array<double, 4> kXgl8 = {0.183434642495649804939476142360184,
                                         0.525532409916328985817739049189246,
                                         0.796666477413626739591553936475830,
                                         0.960289856497536231683560868569473};
constexpr std::array<double, 4> kWgl8 = {0.362683783378361982965150449277196,
                                         0.313706645877887287337962201986601,
                                         0.222381034453374470544355994426241,
                                         0.101228536290376259152531354309962};

[[noreturn]] void fail(const std::string& what) { throw DopingProfileError(what); }

bool finite(double x) { return std::isfinite(x); }

double shape_density(const DopantShape& shape, double x) {
  return std::visit(
      Overloaded{
          [x](const UniformDoping& u) { return x <= u.depth_um ? u.density_cm3 : 0.0; },
          [x](const GaussianDoping& g) {
            const double u = x / g.length_um;
            return g.surface_density_cm3 * std::exp(-u * u);
          },
          [x](const ErfcDoping& e) { return e.surface_density_cm3 * std::erfc(x / e.length_um); },
          [x](const TabulatedDoping& t) {
            const auto& d = t.depth_um;
            const auto& N = t.density_cm3;
            if (x <= d.front()) return N.front();
            if (x > d.back()) return 0.0;
            const auto it = std::upper_bound(d.begin(), d.end(), x);
            const std::size_t i = static_cast<std::size_t>(it - d.begin()) - 1;
            if (i + 1 >= d.size()) return N.back();  // x == last depth
            const double t01 = (x - d[i]) / (d[i + 1] - d[i]);
            return N[i] * std::pow(N[i + 1] / N[i], t01);
          },
      },
      shape);
}

/// ∫_a^b N(x) dx of one shape (0 <= a <= b), closed form.
double shape_integral(const DopantShape& shape, double a, double b) {
  return std::visit(
      Overloaded{
          [&](const UniformDoping& u) {
            return u.density_cm3 * std::max(0.0, std::min(b, u.depth_um) - a);
          },
          [&](const GaussianDoping& g) {
            const double d = g.length_um;
            // ∫ exp(-(x/d)²) dx = d sqrt(π)/2 · (erfc(a/d) - erfc(b/d)); erfc keeps
            // precision deep in the tail.
            return g.surface_density_cm3 * d * kSqrtPi / 2.0 *
                   (std::erfc(a / d) - std::erfc(b / d));
          },
          [&](const ErfcDoping& e) {
            const double d = e.length_um;
            const auto G = [](double u) { return u * std::erfc(u) - std::exp(-u * u) / kSqrtPi; };
            return e.surface_density_cm3 * d * (G(b / d) - G(a / d));
          },
          [&](const TabulatedDoping& t) {
            const auto& d = t.depth_um;
            const auto& N = t.density_cm3;
            double sum = 0.0;
            // constant part up to the first row
            if (a < d.front()) sum += N.front() * (std::min(b, d.front()) - a);
            for (std::size_t i = 0; i + 1 < d.size(); ++i) {
              const double lo = std::max(a, d[i]), hi = std::min(b, d[i + 1]);
              if (!(hi > lo)) continue;
              // N(x) = N(lo) exp(c (x - lo)/(hi - lo)), c = ln(N_{i+1}/N_i)(hi - lo)/h
              const double h = d[i + 1] - d[i];
              const double c = std::log(N[i + 1] / N[i]) * (hi - lo) / h;
              const double n_lo = N[i] * std::pow(N[i + 1] / N[i], (lo - d[i]) / h);
              sum += n_lo * (hi - lo) * (c == 0.0 ? 1.0 : std::expm1(c) / c);
            }
            return sum;
          },
      },
      shape);
}

/// Gaussian and erfc layers: N_s >= 0 and d > 0.
void check_diffused(const std::string& which, const char* shape, double surface_density_cm3,
                    double length_um) {
  if (!(finite(surface_density_cm3) && surface_density_cm3 >= 0.0))
    fail(fmt::format("{}: {} surface density {:g} cm^-3; allowed: finite and >= 0", which, shape,
                     surface_density_cm3));
  if (!(finite(length_um) && length_um > 0.0))
    fail(fmt::format("{}: {} length {:g} um; allowed: finite and > 0", which, shape, length_um));
}

void check_layer(const DopantLayer& layer, std::size_t index) {
  const std::string which = fmt::format("doping layer {} ({}-type)", index + 1,
                                        doping_type_name(layer.type));
  std::visit(
      Overloaded{
          [&](const UniformDoping& u) {
            if (!(finite(u.density_cm3) && u.density_cm3 >= 0.0))
              fail(fmt::format("{}: uniform density {:g} cm^-3; allowed: finite and >= 0", which,
                               u.density_cm3));
            if (!(finite(u.depth_um) && u.depth_um >= 0.0))
              fail(fmt::format("{}: uniform depth {:g} um; allowed: finite and >= 0", which,
                               u.depth_um));
          },
          [&](const GaussianDoping& g) {
            check_diffused(which, "Gaussian", g.surface_density_cm3, g.length_um);
          },
          [&](const ErfcDoping& e) { check_diffused(which, "erfc", e.surface_density_cm3, e.length_um); },
          [&](const TabulatedDoping& t) {
            if (t.depth_um.empty() || t.depth_um.size() != t.density_cm3.size())
              fail(fmt::format("{}: a table needs at least one row and as many densities as "
                               "depths ({} depths, {} densities)",
                               which, t.depth_um.size(), t.density_cm3.size()));
            for (std::size_t i = 0; i < t.depth_um.size(); ++i) {
              if (!(finite(t.depth_um[i]) && t.depth_um[i] >= 0.0) ||
                  (i > 0 && !(t.depth_um[i] > t.depth_um[i - 1])))
                fail(fmt::format("{}: row {} depth {:g} um; allowed: finite, >= 0 and strictly "
                                 "increasing",
                                 which, i + 1, t.depth_um[i]));
              if (!(finite(t.density_cm3[i]) && t.density_cm3[i] > 0.0))
                fail(fmt::format("{}: row {} density {:g} cm^-3; allowed: finite and > 0 "
                                 "(log-linear interpolation; end the table instead, N is 0 beyond "
                                 "the last row)",
                                 which, i + 1, t.density_cm3[i]));
            }
          },
      },
      layer.shape);
}

void check_depth(double depth_um, const char* what) {
  if (!(finite(depth_um) && depth_um >= 0.0))
    fail(fmt::format("{} {:g} um is not allowed; depths are finite and >= 0 (measured from the "
                     "doped surface into the wafer)",
                     what, depth_um));
}

void check_segment(const DepthSegment& s) {
  check_depth(s.start_depth_um, "segment start depth");
  check_depth(s.end_depth_um, "segment end depth");
  const double dz = std::abs(s.end_depth_um - s.start_depth_um);
  if (!(finite(s.length_um) && s.length_um >= 0.0 && s.length_um >= dz * (1.0 - 1e-12)))
    fail(fmt::format("segment length {:g} um is not allowed; a straight segment from depth {:g} "
                     "to {:g} um is at least {:g} um long",
                     s.length_um, s.start_depth_um, s.end_depth_um, dz));
}

/// Depths where the integrand is not smooth or changes scale.
std::vector<double> breakpoints(const DopingProfile& profile) {
  std::vector<double> b;
  // Gaussian and erfc layers change scale at multiples of d; beyond 8d they
  // are below e^-64 (Gaussian) or 1e-29 (erfc) of N_s.
  const auto add_scale_points = [&](double d) {
    for (double f : {0.5, 1.0, 2.0, 3.0, 4.0, 6.0, 8.0}) b.push_back(f * d);
  };
  for (const DopantLayer& l : profile.layers) {
    std::visit(Overloaded{
                   [&](const UniformDoping& u) { b.push_back(u.depth_um); },
                   [&](const GaussianDoping& g) { add_scale_points(g.length_um); },
                   [&](const ErfcDoping& e) { add_scale_points(e.length_um); },
                   [&](const TabulatedDoping& t) {
                     b.insert(b.end(), t.depth_um.begin(), t.depth_um.end());
                   },
               },
               l.shape);
  }
  std::sort(b.begin(), b.end());
  return b;
}

/// The pieces [z_i, z_{i+1}] of [lo, hi] split at the breakpoints.
std::vector<double> pieces(const DopingProfile& profile, double lo, double hi) {
  std::vector<double> z{lo};
  for (double b : breakpoints(profile))
    if (b > lo && b < hi && b > z.back()) z.push_back(b);
  z.push_back(hi);
  return z;
}

struct Exponents {
  double n = 1.0, p = 1.0;
};

Exponents exponents(FcaParametrization p) {
  return {fca_power_law(p, DopingType::n).density_exponent,
          fca_power_law(p, DopingType::p).density_exponent};
}

double power(double N, double b) { return N <= 0.0 ? 0.0 : (b == 1.0 ? N : std::pow(N, b)); }

/// (n^b_n, p^b_p) at depth z.
std::array<double, 2> column_integrand(const DopingProfile& profile, const Exponents& e, double z) {
  const FreeCarrierDensity c = free_carriers_cm3(profile, z);
  return {power(c.electrons_cm3, e.n), power(c.holes_cm3, e.p)};
}

struct GkResult {
  std::array<double, 2> value, error;
};

GkResult gauss_kronrod(const DopingProfile& profile, const Exponents& e, double a, double b) {
  const double c = 0.5 * (a + b), h = 0.5 * (b - a);
  std::array<double, 2> k{}, g{};
  for (std::size_t i = 0; i < 8; ++i) {
    const double x = kXgk[i];
    std::array<double, 2> f = column_integrand(profile, e, c + h * x);
    if (x != 0.0) {
      const std::array<double, 2> f2 = column_integrand(profile, e, c - h * x);
      f = {f[0] + f2[0], f[1] + f2[1]};
    }
    for (int j = 0; j < 2; ++j) {
      k[j] += kWgk[i] * f[j];
      if (i % 2 == 1) g[j] += kWg[i / 2] * f[j];
    }
  }
  GkResult r;
  for (int j = 0; j < 2; ++j) {
    r.value[j] = h * k[j];
    r.error[j] = std::abs(h * (k[j] - g[j]));
  }
  return r;
}

/// Adaptive bisection; an interval is accepted when the summed error
/// estimate of both columns is <= tolerance_per_um · its width. `budget`
/// bounds the number of intervals (a guard; never reached by the profiles of
/// this file, whose features are all split at breakpoints).
void adaptive(const DopingProfile& profile, const Exponents& e, double a, double b,
              double tolerance_per_um, int depth, long& budget, std::array<double, 2>& sum) {
  const GkResult r = gauss_kronrod(profile, e, a, b);
  --budget;
  const bool ok = r.error[0] + r.error[1] <= tolerance_per_um * (b - a);
  if (ok || depth >= kMaxBisections || budget <= 0) {
    sum[0] += r.value[0];
    sum[1] += r.value[1];
    return;
  }
  const double m = 0.5 * (a + b);
  adaptive(profile, e, a, m, tolerance_per_um, depth + 1, budget, sum);
  adaptive(profile, e, m, b, tolerance_per_um, depth + 1, budget, sum);
}

/// True when the closed forms apply: b = 1 for the carriers present and a
/// single doping type (no compensation).
bool closed_form_applies(const DopingProfile& profile, const Exponents& e) {
  bool has_n = profile.base_density_cm3 > 0.0 && profile.base_type == DopingType::n;
  bool has_p = profile.base_density_cm3 > 0.0 && profile.base_type == DopingType::p;
  for (const DopantLayer& l : profile.layers) (l.type == DopingType::n ? has_n : has_p) = true;
  if (has_n && has_p) return false;
  return has_n ? e.n == 1.0 : (has_p ? e.p == 1.0 : true);
}

/// ∫_lo^hi (n^b_n, p^b_p) dz, lo <= hi.
std::array<double, 2> depth_column(const DopingProfile& profile, const Exponents& e, double lo,
                                   double hi) {
  if (!(hi > lo)) return {0.0, 0.0};
  if (closed_form_applies(profile, e)) {
    double total = profile.base_density_cm3 * (hi - lo);
    DopingType type = profile.base_type;
    for (const DopantLayer& l : profile.layers) {
      total += shape_integral(l.shape, lo, hi);
      type = l.type;
    }
    return type == DopingType::n ? std::array<double, 2>{total, 0.0}
                                 : std::array<double, 2>{0.0, total};
  }
  const std::vector<double> z = pieces(profile, lo, hi);
  // First estimate of the whole column: one GK15 per piece, refined once
  // (64 parts per piece) if that sees nothing.
  double first = 0.0;
  for (int parts : {1, 64}) {
    for (std::size_t i = 0; i + 1 < z.size(); ++i)
      for (int j = 0; j < parts; ++j) {
        const double w = (z[i + 1] - z[i]) / parts;
        const GkResult r = gauss_kronrod(profile, e, z[i] + j * w, z[i] + (j + 1) * w);
        first += r.value[0] + r.value[1];
      }
    if (first > 0.0) break;
  }
  if (!(first > 0.0)) return {0.0, 0.0};
  const double tol = kColumnTolerance * first / (hi - lo);
  long budget = kMaxIntervals;
  std::array<double, 2> sum{};
  for (std::size_t i = 0; i + 1 < z.size(); ++i)
    adaptive(profile, e, z[i], z[i + 1], tol, 0, budget, sum);
  return sum;
}

/// α_fca in 1/µm at depth z, from the wavelength factors (1/cm per N^b).
double alpha_fca_per_um(const DopingProfile& profile, const Exponents& e, double Kn, double Kp,
                        double z) {
  const std::array<double, 2> f = column_integrand(profile, e, z);
  return (Kn * f[0] + Kp * f[1]) * kCmPerUm;
}

}  // namespace

void check_doping_profile(const DopingProfile& profile) {
  for (std::size_t i = 0; i < profile.layers.size(); ++i) check_layer(profile.layers[i], i);
  if (!(finite(profile.base_density_cm3) && profile.base_density_cm3 >= 0.0))
    fail(fmt::format("base doping {:g} cm^-3 is not allowed; it must be finite and >= 0",
                     profile.base_density_cm3));
}

double dopant_density_cm3(const DopantLayer& layer, double depth_um) {
  check_depth(depth_um, "depth");
  return shape_density(layer.shape, depth_um);
}

FreeCarrierDensity free_carriers_cm3(const DopingProfile& profile, double depth_um) {
  check_depth(depth_um, "depth");
  double donors = profile.base_type == DopingType::n ? profile.base_density_cm3 : 0.0;
  double acceptors = profile.base_type == DopingType::p ? profile.base_density_cm3 : 0.0;
  for (const DopantLayer& l : profile.layers)
    (l.type == DopingType::n ? donors : acceptors) += shape_density(l.shape, depth_um);
  return {std::max(donors - acceptors, 0.0), std::max(acceptors - donors, 0.0)};
}

double free_carrier_absorption_at_depth_per_cm(const DopingProfile& profile,
                                               FcaParametrization p, double wavelength_nm,
                                               double depth_um) {
  const FreeCarrierDensity c = free_carriers_cm3(profile, depth_um);
  return free_carrier_absorption_per_cm(p, DopingType::n, wavelength_nm, c.electrons_cm3) +
         free_carrier_absorption_per_cm(p, DopingType::p, wavelength_nm, c.holes_cm3);
}

FreeCarrierColumn free_carrier_column(const DopingProfile& profile, FcaParametrization p,
                                      const DepthSegment& segment) {
  check_doping_profile(profile);
  check_segment(segment);
  const Exponents e = exponents(p);
  const double z1 = segment.start_depth_um, z2 = segment.end_depth_um;
  const double L = segment.length_um;
  if (L == 0.0) return {};
  if (z1 == z2) {  // along a constant depth
    const std::array<double, 2> f = column_integrand(profile, e, z1);
    return {f[0] * L, f[1] * L};
  }
  const double lo = std::min(z1, z2), hi = std::max(z1, z2);
  const double scale = L / (hi - lo);
  const std::array<double, 2> c = depth_column(profile, e, lo, hi);
  return {c[0] * scale, c[1] * scale};
}

double free_carrier_optical_depth(const FreeCarrierColumn& column, FcaParametrization p,
                                  double wavelength_nm) {
  return kCmPerUm * (fca_wavelength_factor(p, DopingType::n, wavelength_nm) * column.electrons +
                     fca_wavelength_factor(p, DopingType::p, wavelength_nm) * column.holes);
}

double free_carrier_optical_depth(const DopingProfile& profile, FcaParametrization p,
                                  double wavelength_nm, const DepthSegment& segment) {
  return free_carrier_optical_depth(free_carrier_column(profile, p, segment), p, wavelength_nm);
}

double free_carrier_share_of_segment(const DopingProfile& profile, FcaParametrization p,
                                     double wavelength_nm, double alpha_bb_per_cm,
                                     const DepthSegment& segment) {
  if (!(finite(alpha_bb_per_cm) && alpha_bb_per_cm >= 0.0))
    fail(fmt::format("band-to-band absorption coefficient {:g} 1/cm is not allowed; it must be "
                     "finite and >= 0",
                     alpha_bb_per_cm));
  const double tau_fca = free_carrier_optical_depth(profile, p, wavelength_nm, segment);  // checks
  const double L = segment.length_um;
  const double a_bb = alpha_bb_per_cm * kCmPerUm;  // 1/µm
  const double tau_total = a_bb * L + tau_fca;
  if (!(tau_total > 0.0)) return 0.0;
  if (a_bb == 0.0) return 1.0;  // all absorption is by free carriers
  const double absorbed = -std::expm1(-tau_total);

  const Exponents e = exponents(p);
  const double Kn = fca_wavelength_factor(p, DopingType::n, wavelength_nm);
  const double Kp = fca_wavelength_factor(p, DopingType::p, wavelength_nm);
  const double z1 = segment.start_depth_um, z2 = segment.end_depth_um;
  if (z1 == z2) {  // α constant along the path: ∫ a_f e^{-a s} ds / (1 - e^{-aL}) = a_f / a
    const double a_f = alpha_fca_per_um(profile, e, Kn, Kp, z1);
    return a_f / (a_bb + a_f);
  }
  const auto depth_at = [&](double s) { return z1 + (z2 - z1) * (s / L); };
  const auto a_f = [&](double s) { return alpha_fca_per_um(profile, e, Kn, Kp, depth_at(s)); };

  // Pieces in path length s from the depth pieces.
  std::vector<double> s_pieces;
  for (double z : pieces(profile, std::min(z1, z2), std::max(z1, z2)))
    s_pieces.push_back(L * (z - z1) / (z2 - z1));
  std::sort(s_pieces.begin(), s_pieces.end());
  s_pieces.front() = 0.0;
  s_pieces.back() = L;

  // ∫_a^b a_f ds by 8-point Gauss–Legendre.
  const auto gl8 = [&](double a, double b) {
    const double c = 0.5 * (a + b), h = 0.5 * (b - a);
    double sum = 0.0;
    for (std::size_t i = 0; i < 4; ++i)
      sum += kWgl8[i] * (a_f(c + h * kXgl8[i]) + a_f(c - h * kXgl8[i]));
    return h * sum;
  };
  const auto numerator = [&](int panels) {
    double tau = 0.0, sum = 0.0;
    for (std::size_t k = 0; k + 1 < s_pieces.size(); ++k) {
      const double a = s_pieces[k], b = s_pieces[k + 1];
      const double w = (b - a) / panels;
      for (int j = 0; j < panels; ++j) {
        const double p0 = a + j * w, p1 = (j + 1 == panels) ? b : a + (j + 1) * w;
        const double c = 0.5 * (p0 + p1), h = 0.5 * (p1 - p0);
        for (std::size_t i = 0; i < 4; ++i)
          for (double sign : {-1.0, 1.0}) {
            const double s = c + sign * h * kXgl8[i];
            const double tau_s = tau + a_bb * (s - p0) + gl8(p0, s);
            sum += h * kWgl8[i] * a_f(s) * std::exp(-tau_s);
          }
        tau += a_bb * (p1 - p0) + gl8(p0, p1);
      }
    }
    return sum;
  };
  double previous = numerator(1);
  double current = previous;
  for (int level = 1; level <= kMaxPanelsLog2; ++level) {
    current = numerator(1 << level);
    if (std::abs(current - previous) <= kShareTolerance * std::abs(current)) break;
    previous = current;
  }
  return std::clamp(current / absorbed, 0.0, 1.0);
}

double free_carrier_share_at(const DopingProfile& profile, FcaParametrization p,
                             double wavelength_nm, double alpha_bb_per_cm, double depth_um) {
  if (!(finite(alpha_bb_per_cm) && alpha_bb_per_cm >= 0.0))
    fail(fmt::format("band-to-band absorption coefficient {:g} 1/cm is not allowed; it must be "
                     "finite and >= 0",
                     alpha_bb_per_cm));
  check_doping_profile(profile);
  const double a_f = free_carrier_absorption_at_depth_per_cm(profile, p, wavelength_nm, depth_um);
  const double total = alpha_bb_per_cm + a_f;
  return total > 0.0 ? a_f / total : 0.0;
}

TabulatedDoping read_doping_profile_csv(const std::filesystem::path& file) {
  NumericTable t;
  try {
    t = read_numeric_csv(file, {"depth_um", "N_cm3"});
  } catch (const std::runtime_error& e) {
    throw DopingProfileError(e.what());
  }
  for (std::size_t r = 0; r < t.line_of_row.size(); ++r)
    if (!(t.columns[1][r] > 0.0))
      fail(fmt::format("{}:{}: N_cm3 = {:g}; the density must be > 0 (log-linear interpolation); "
                       "end the table instead: N is 0 beyond the last row",
                       file.string(), t.line_of_row[r], t.columns[1][r]));
  TabulatedDoping d;
  d.depth_um = std::move(t.columns[0]);
  d.density_cm3 = std::move(t.columns[1]);
  d.source = t.source;
  d.file = file.string();
  return d;
}

}  // namespace lumtrap
