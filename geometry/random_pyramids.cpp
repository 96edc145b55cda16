// Random upright pyramids: the layout (random_pyramid_layout) meshed as the
// exact upper envelope of its pyramids (pyramid_envelope).
#include "geometry/pyramid_envelope.hpp"
#include "geometry/random_pyramid_layout.hpp"
#include "geometry/textures.hpp"

namespace lumtrap::geometry {

TileMesh random_pyramids_tile(const RandomPyramidsSpec& spec, RandomPyramidsReport* report) {
  const RandomPyramidLayout layout = random_pyramids_layout(spec);
  EnvelopeStats stats;
  TileMesh mesh = pyramid_envelope_mesh(layout, spec.facet_deg, &stats);
  if (report) {
    report->pyramids_placed = layout.pyramids.size();
    report->pyramids_visible = stats.visible_pyramids;
    report->flat_fraction = layout.flat_fraction;
  }
  return mesh;
}

TileMesh random_pyramids_tile(const RandomPyramidsSpec& spec) { return random_pyramids_tile(spec, nullptr); }

}  // namespace lumtrap::geometry
