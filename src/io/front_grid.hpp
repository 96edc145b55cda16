#pragma once
// The front metallisation ([front.grid]): fingers along the texture's y axis,
// centred on x = 0 (mod finger pitch), and optional busbars along x, centred
// on y = 0 (mod busbar pitch), lengths in µm, in the macro frame
// (trace/macro_frame.hpp). Each finger is a body of its own shape standing on
// the cell plane (the mean plane of the texture):
// - rectangle:    width w, height h (flat top, vertical sides);
// - half_ellipse: half-axes w/2 across, h up (screen-printed fingers);
// - round_wire:   a circle of diameter w touching the cell plane (h = w).
// Busbars are rectangles of width `busbar_width` and the fingers' height.
// The metal's optical constants decide reflection and absorption (Fresnel
// equations at the local angle); `scattering` turns reflection Lambertian.
#include <string>

namespace lumtrap {

enum class FingerShape { rectangle, half_ellipse, round_wire };

struct FrontGridGeometry {
  FingerShape shape = FingerShape::rectangle;
  double finger_width_um = 0;   ///< > 0 (round wire: its diameter)
  double finger_height_um = 0;  ///< > 0 (round wire: = width)
  double finger_pitch_um = 0;   ///< > finger width
  double busbar_pitch_um = 0;   ///< 0: no busbars
  double busbar_width_um = 0;   ///< < busbar pitch
};

/// Area fraction the grid covers seen from above (its shadow at normal
/// incidence): f + b - f b with f = w / finger pitch, b = busbar width /
/// busbar pitch (fingers and busbars overlap at their crossings).
double grid_coverage(const FrontGridGeometry& g);

/// Area fraction where metal touches the silicon (the contact): the
/// footprints of rectangles, half-ellipses and busbars; a round wire touches
/// along a line only (fraction 0 from the fingers).
double contact_fraction(const FrontGridGeometry& g);

/// True when (x, y) of the macro frame lies on a contact footprint.
bool on_contact(const FrontGridGeometry& g, double x, double y);

}  // namespace lumtrap
