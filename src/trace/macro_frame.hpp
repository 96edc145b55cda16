#pragma once
// The macro frame: a photon's lateral position on the scale of the cell's
// patterns (rear openings; the front grid), next to its position in the
// texture tile (the micro frame of transport.cpp).
//
// Inputs: the periods of the frame in x and y (µm, the texture tile's axes;
// one period of every pattern of the scene, periodic in both axes); outputs:
// a position in [0, period_x) × [0, period_y).
//
// The position follows the photon's real lateral displacement (path length ×
// the direction's x, y components) on every segment it travels, in the
// textured zones and across the bulk; lateral randomization, which moves the
// photon only within the texture tile, never changes it. The texture and the
// patterns are independent: which facet a photon meets does not depend on its
// macro position, and which pattern region it meets does not depend on the
// facet (valid when the pattern's features are much larger than the tile).
#include <cmath>

namespace lumtrap {

struct MacroFrame {
  double period_x = 0, period_y = 0;  ///< µm; 0: the scene has no pattern (the frame is off)
  /// false when the patterns' periods along that axis have no common period
  /// (within 10 000 of the shorter): positions are then not wrapped, and
  /// start positions are drawn over period_x (period_y) = 1000 × the longest
  /// period, where the pairs of pattern phases are uniform to about 1e-3.
  bool wrap_x = true, wrap_y = true;
  bool active() const { return period_x > 0 && period_y > 0; }
};

struct MacroPosition {
  double x = 0, y = 0;  ///< µm, in [0, period)
};

/// x wrapped into [0, L).
inline double wrap_macro(double x, double L) {
  double r = std::fmod(x, L);
  if (r < 0) r += L;
  return r < L ? r : 0.0;
}

/// Moves a position by (dx, dy) µm, periodically.
inline void move_macro(const MacroFrame& f, MacroPosition& m, double dx, double dy) {
  m.x = f.wrap_x ? wrap_macro(m.x + dx, f.period_x) : m.x + dx;
  m.y = f.wrap_y ? wrap_macro(m.y + dy, f.period_y) : m.y + dy;
}

/// A uniformly distributed start position from two uniform numbers in (0, 1].
inline MacroPosition macro_start(const MacroFrame& f, double u1, double u2) {
  return {wrap_macro(u1 * f.period_x, f.period_x), wrap_macro(u2 * f.period_y, f.period_y)};
}

struct Scene;  // io/scene.hpp

/// The macro frame of a scene: one common period of its rear pattern and its
/// front grid along each axis; off when it has neither.
MacroFrame scene_macro_frame(const Scene& scene);

/// The shortest common multiple of two periods a, b > 0 (µm) within 10 000
/// multiples of the shorter, relative tolerance 1e-9; 0 when there is none.
/// A period <= 0 counts as absent (the other is returned).
double common_period(double a, double b);

}  // namespace lumtrap
