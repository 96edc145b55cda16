#pragma once
// A patterned rear: the rear of [rear] (its films and medium: the "base"
// region) with openings of another region (`[rear.pattern]`, its own films
// and medium), e.g. a passivated rear (Al2O3 | SiNx | Al) with line openings
// where the aluminium touches the silicon.
//
// Layout in the macro frame (trace/macro_frame.hpp), lengths in µm, the
// texture's x, y axes:
// - lines: openings of width `width` centred on x = 0 (mod pitch), running
//   along y; opening fraction width / pitch.
// - dots, square lattice: discs of diameter `diameter` centred on (i, j)·pitch;
//   opening fraction π d² / (4 pitch²).
// - dots, hexagonal lattice: discs centred on a triangular lattice of nearest
//   neighbour distance `pitch` (rows along x, rows √3/2·pitch apart); the
//   macro period is pitch × √3·pitch; opening fraction π d² / (2√3 pitch²).
// The pattern and the texture are independent (the pattern does not follow
// the texture's facets): the region is decided by the photon's macro
// position where it meets the rear.
#include <optional>
#include <vector>

#include "io/rear_reflector.hpp"

namespace lumtrap {

enum class RearPatternLayout { lines, dots };
enum class DotLattice { square, hexagonal };

struct RearPatternGeometry {
  RearPatternLayout layout = RearPatternLayout::lines;
  DotLattice lattice = DotLattice::square;  ///< dots only
  double pitch_um = 0;                      ///< > 0
  double size_um = 0;                       ///< line width or dot diameter, in [0, pitch]
};

/// The macro period (x, y) of the pattern, µm.
double pattern_period_x(const RearPatternGeometry& g);
double pattern_period_y(const RearPatternGeometry& g);

/// Exact area fraction of the openings (closed forms above).
double opening_fraction(const RearPatternGeometry& g);

/// True when the point (x, y) of the macro frame, wrapped into
/// [0, period_x) × [0, period_y), lies in an opening.
bool in_opening(const RearPatternGeometry& g, double x, double y);

}  // namespace lumtrap
