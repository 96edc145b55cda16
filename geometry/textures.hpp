#pragma once
// Texture generators: each returns the mesh of one periodic tile (mesh.hpp).
// Their scene keys are described in each texture's descriptor
// (texture_descriptor.hpp), next to the generator.
// Default facet angle 54.7356° is the angle between {111} and (100) planes,
// atan(√2), of alkaline-etched (100) silicon (common practice).
#include <cstddef>
#include <cstdint>
#include <string>

#include "geometry/facet_angle_spread.hpp"
#include "geometry/mesh.hpp"
#include "geometry/rounded_envelope.hpp"

namespace lumtrap::geometry {

inline constexpr double kFacet111Deg = 54.735610317245346;  // atan(sqrt(2)) in degrees

/// A flat surface at z = 0 (two triangles).
TileMesh planar_tile(double period_um);

/// One square-based pyramid per tile: base `base_um`, facet angle
/// `facet_deg` (to the base plane), a flat border `gap_um` wide between
/// neighbouring pyramids (period = base + gap). Upright: apex up, bases at
/// z = 0, apex at base/2·tan(facet). Inverted: a pit, rims at z = 0, bottom at
/// -base/2·tan(facet) (then shifted so that min_z = 0).
TileMesh regular_pyramids_tile(double base_um, double facet_deg, double gap_um, bool inverted);

/// As above with the etch's rounding (rounded_envelope.hpp): convex
/// features (apex and ridges; for pits the rims) of radius
/// shape.tip_radius_um, concave ones (where a pyramid meets its neighbour or
/// the flat gap; for pits the pit bottom and its edges) of radius
/// shape.valley_radius_um. With both radii 0 this is regular_pyramids_tile
/// itself (the same mesh, bit for bit).
TileMesh shaped_regular_pyramids_tile(double base_um, double facet_deg, double gap_um, bool inverted,
                                      const EtchShape& shape);

enum class SizeDistribution { fixed, uniform, normal, lognormal };

struct RandomPyramidsSpec {
  SizeDistribution distribution = SizeDistribution::uniform;
  double size_a_um = 1.0;   ///< fixed: size; uniform: min; normal/lognormal: mean of the base size
  double size_b_um = 5.0;   ///< uniform: max; normal/lognormal: standard deviation of the base size
  double min_size_um = 0.2; ///< sizes drawn below this are redrawn (normal tails)
  double facet_deg = kFacet111Deg;  ///< the facet angle (fixed), or the mean / middle of facet_spread
  FacetAngleSpread facet_spread;     ///< one facet angle per pyramid (fixed: facet_deg for all)
  EtchShape shape;                   ///< rounding of tips and valleys; mesh angular error
  double flat_fraction = 0.0;  ///< target projected area left flat (0 = fully covered)
  double tile_um = 50.0;       ///< tile side
  std::uint64_t seed = 1;
};

/// Random upright pyramids, square bases aligned with x and y, centres
/// uniform in the tile (periodic images included), the surface being the
/// upper envelope max(0, max_i pyramid_i(x, y)). The mesh is the exact
/// polyhedral surface: each visible facet piece lies in its pyramid's facet
/// plane, cut where it meets its neighbours; flat regions at z = 0.
/// Pyramids are added until the flat fraction is at most the target.
TileMesh random_pyramids_tile(const RandomPyramidsSpec& spec);

/// What random_pyramids_tile built.
struct RandomPyramidsReport {
  std::size_t pyramids_placed = 0;   ///< pyramids drawn and placed, hidden ones included
  std::size_t pyramids_visible = 0;  ///< pyramids with some facet piece on the surface (exact sharp envelope only; 0 otherwise)
  double flat_fraction = 0;          ///< exact projected flat fraction of the tile
};

/// As above, also filling `report` (if not null).
TileMesh random_pyramids_tile(const RandomPyramidsSpec& spec, RandomPyramidsReport* report);

/// Random inverted pyramids (pits): the same layout (sizes, overlap and flat
/// fraction rules) as random_pyramids_tile, the surface mirrored in height
/// (z -> max_z - z): where pits overlap the deeper one is the surface, the
/// flat part is the top level. For pits the tip radius rounds the rims
/// between pits, the valley radius the pit bottoms and their edges.
TileMesh random_inverted_pyramids_tile(const RandomPyramidsSpec& spec, RandomPyramidsReport* report = nullptr);

/// Whether a spec asks for the sharp, single-angle texture (exact envelope).
bool is_sharp_single_angle(const RandomPyramidsSpec& spec);

struct TextureParams;
/// The spec of texture = "random_pyramids" parameters (texture_descriptor.hpp).
RandomPyramidsSpec random_pyramids_spec(const TextureParams& params);

}  // namespace lumtrap::geometry
