// texture = "random_inverted_pyramids": random pits (as masked or
// metal-assisted etches make them) with the keys of random upright pyramids
// in [….random_pyramids]; the generator is random_inverted_pyramids_tile
// (random_pyramids.cpp: the upright layout mirrored in height).
#include "geometry/random_pyramid_keys.hpp"
#include "geometry/textures.hpp"

namespace lumtrap::geometry {

extern const TextureDescriptor kRandomInvertedPyramidsTexture;
const TextureDescriptor kRandomInvertedPyramidsTexture{
    .kind = "random_inverted_pyramids",
    .table = "random_pyramids",
    .summary = "random inverted pyramids (pits) of random size placed at random in a periodic square tile; where "
               "pits overlap the deeper one is the surface",
    .params = random_pyramid_params(),
    .regular = false,
    .check = check_random_pyramids,
    .smallest_feature_um = random_pyramids_feature,
    .build = [](const TextureParams& p) { return random_inverted_pyramids_tile(random_pyramids_spec(p)); },
    .estimate_triangles = random_pyramids_triangles,
    .size_key = "tile",
    .size_advice = kRandomPyramidsSizeAdvice,
};

}  // namespace lumtrap::geometry
