#pragma once
// Exact optics of a planar wafer (no rays): ambient | front films | silicon
// slab (incoherent, Beer-Lambert, α = 4πk/λ) | rear films | rear medium.
// The films are coherent (thin_film_stack.hpp); the slab is incoherent, all
// multiple passes summed as a geometric series. s and p are separate
// incoherent channels (a planar wafer does not mix them) and averaged for
// unpolarized light.
#include <vector>

#include "optics/thin_film_stack.hpp"

namespace lumtrap {

struct PlanarWafer {
  FilmStack front;       ///< a = ambient, layers outside → silicon, b = silicon
  double thickness_nm;   ///< silicon thickness
  FilmStack rear;        ///< a = silicon, layers silicon → outside, b = rear medium
};

/// Where every incident photon ends; all fields are fractions of the
/// incident power and add up to 1.
struct PlanarResult {
  double R = 0;                 ///< reflected or escaped through the front (ambient side)
  double absorbed_silicon = 0;              ///< absorbed in the silicon slab
  std::vector<double> absorbed_front_films;  ///< per front film (FilmStack order)
  std::vector<double> absorbed_rear_films;   ///< per rear film (FilmStack order)
  double absorbed_rear_medium = 0;     ///< entered an absorbing rear medium (k > 0, e.g. a metal)
  double T = 0;                 ///< entered a non-absorbing rear medium (k == 0)
};

enum class Polarization { s, p, unpolarized };

/// cos_incident: cosine of the angle of incidence in the ambient (0 < c <= 1).
PlanarResult solve_planar_wafer(const PlanarWafer& wafer, double wavelength_nm, double cos_incident,
                                Polarization polarization);

}  // namespace lumtrap
