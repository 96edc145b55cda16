// See front_grid.hpp.
#include "io/front_grid.hpp"

#include <cmath>

namespace lumtrap {

namespace {
double wrapped_distance(double x, double P) {
  double u = std::fmod(x, P);
  if (u < 0) u += P;
  return std::min(u, P - u);
}
}  // namespace

double grid_coverage(const FrontGridGeometry& g) {
  const double f = g.finger_width_um / g.finger_pitch_um;
  const double b = g.busbar_pitch_um > 0 ? g.busbar_width_um / g.busbar_pitch_um : 0.0;
  return f + b - f * b;
}

double contact_fraction(const FrontGridGeometry& g) {
  const double f = g.shape == FingerShape::round_wire ? 0.0 : g.finger_width_um / g.finger_pitch_um;
  const double b = g.busbar_pitch_um > 0 ? g.busbar_width_um / g.busbar_pitch_um : 0.0;
  return f + b - f * b;
}

bool on_contact(const FrontGridGeometry& g, double x, double y) {
  if (g.shape != FingerShape::round_wire && wrapped_distance(x, g.finger_pitch_um) < 0.5 * g.finger_width_um)
    return true;
  return g.busbar_pitch_um > 0 && wrapped_distance(y, g.busbar_pitch_um) < 0.5 * g.busbar_width_um;
}

}  // namespace lumtrap
