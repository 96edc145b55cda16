// See rear_pattern.hpp.
#include "io/rear_pattern.hpp"

#include <cmath>
#include <numbers>

namespace lumtrap {

namespace {
constexpr double kSqrt3 = 1.7320508075688772;
double wrap(double x, double L) {
  double r = std::fmod(x, L);
  if (r < 0) r += L;
  return r;
}
}  // namespace

double pattern_period_x(const RearPatternGeometry& g) { return g.pitch_um; }

double pattern_period_y(const RearPatternGeometry& g) {
  return g.layout == RearPatternLayout::dots && g.lattice == DotLattice::hexagonal ? kSqrt3 * g.pitch_um
                                                                                     : g.pitch_um;
}

double opening_fraction(const RearPatternGeometry& g) {
  if (g.layout == RearPatternLayout::lines) return g.size_um / g.pitch_um;
  const double disc = std::numbers::pi * g.size_um * g.size_um / 4.0;
  return g.lattice == DotLattice::square ? disc / (g.pitch_um * g.pitch_um)
                                         : 2.0 * disc / (kSqrt3 * g.pitch_um * g.pitch_um);
}

bool in_opening(const RearPatternGeometry& g, double x, double y) {
  const double P = g.pitch_um, r = 0.5 * g.size_um;
  if (r <= 0) return false;  // no openings (exactly the base region)
  const double u = wrap(x, P);
  if (g.layout == RearPatternLayout::lines) return g.size_um >= P || std::min(u, P - u) < r;
  const double Py = pattern_period_y(g);
  const double v = wrap(y, Py);
  // distance² to the nearest centre of the cell's corners (and, hexagonal, its middle)
  const double du = std::min(u, P - u), dv = std::min(v, Py - v);
  double d2 = du * du + dv * dv;
  if (g.lattice == DotLattice::hexagonal) {
    const double eu = u - 0.5 * P, ev = v - 0.5 * Py;
    d2 = std::min(d2, eu * eu + ev * ev);
  }
  return d2 < r * r;
}

}  // namespace lumtrap
