// See macro_frame.hpp.
#include "trace/macro_frame.hpp"

#include <algorithm>

#include "io/scene.hpp"

namespace lumtrap {

double common_period(double a, double b) {
  if (a <= 0) return b;
  if (b <= 0) return a;
  if (a > b) std::swap(a, b);
  for (int m = 1; m <= 10000; ++m) {  // multiples of the longer, b, tested against the shorter, a
    const double x = m * b, r = x / a;
    if (std::abs(r - std::round(r)) < 1e-9 * r) return x;
  }
  return 0;
}

MacroFrame scene_macro_frame(const Scene& scene) {
  double rx = 0, ry = 0, gx = 0, gy = 0;
  if (scene.rear_pattern) {
    rx = pattern_period_x(scene.rear_pattern->geometry);
    ry = pattern_period_y(scene.rear_pattern->geometry);
  }
  if (scene.front_grid) {
    const FrontGridGeometry& g = scene.front_grid->geometry;
    gx = g.finger_pitch_um;
    gy = g.busbar_pitch_um > 0 ? g.busbar_pitch_um : g.finger_pitch_um;  // fingers: any period along y
  }
  if (rx <= 0 && gx <= 0) return {};
  MacroFrame f;
  f.period_x = common_period(rx, gx);
  f.period_y = common_period(ry, gy);
  if (f.period_x <= 0) {
    f.wrap_x = false;
    f.period_x = 1000 * std::max(rx, gx);
  }
  if (f.period_y <= 0) {
    f.wrap_y = false;
    f.period_y = 1000 * std::max(ry, gy);
  }
  return f;
}

}  // namespace lumtrap
