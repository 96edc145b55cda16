#pragma once
// The scene keys of random pyramids (texture_descriptor.hpp), shared by
// random upright pyramids (random_pyramids.cpp, which defines them) and
// random inverted pyramids (random_inverted_pyramids.cpp): the same size
// distributions, overlap rule, flat fraction, facet angles and etch shape.
#include <optional>
#include <string_view>
#include <vector>

#include "geometry/texture_descriptor.hpp"

namespace lumtrap::geometry {

std::vector<ParamSpec> random_pyramid_params();
std::optional<ParamProblem> check_random_pyramids(const TextureParams& params);
/// The smallest typical base size, µm.
double random_pyramids_feature(const TextureParams& params);
/// Triangles of the tile (random_pyramid_count.hpp); inverted pits mirror
/// the upright layout, so they have the same count.
double random_pyramids_triangles(const TextureParams& params);
/// What makes the tile large, for the memory refusal (TextureDescriptor::size_advice).
inline constexpr std::string_view kRandomPyramidsSizeAdvice =
    "a smaller tile, or larger pyramids (the triangles grow as (tile / mean size)²)";

}  // namespace lumtrap::geometry
