#pragma once
// Photon transport at one wavelength: launches photons [begin, end) and
// adds where each one ended to a tally. The hot loop owns no I/O and does
// not allocate (the tally is sized beforehand).
#include <cstdint>

#include "io/scene.hpp"
#include "trace/macro_frame.hpp"
#include "trace/embree_tile.hpp"
#include "trace/optical_tables.hpp"
#include "trace/tallies.hpp"
#include "trace/wafer_model.hpp"

namespace lumtrap {

/// Scattering behaviour of one surface, read from the scene.
struct SurfaceScatter {
  SurfaceScattering kind = SurfaceScattering::specular;
  double diffuse_fraction = 0;
};

/// Everything read-only the transport needs for one wavelength.
struct TraceContext {
  const WaferModel* model = nullptr;
  const TileScene* front_scene = nullptr;
  const TileScene* rear_scene = nullptr;
  const WavelengthOptics* optics = nullptr;
  const TallyLayout* layout = nullptr;
  const Illumination* illumination = nullptr;
  SurfaceScatter front_scatter, rear_scatter;
  int max_bounces = 10000;
  bool randomize_lateral = true;
  bool track_polarization = true;
  std::uint64_t seed = 1, variant = 0, wavelength_index = 0;
  /// The macro frame (off without patterns) and the rear's openings (null: a uniform rear).
  MacroFrame macro;
  const RearPatternGeometry* rear_pattern = nullptr;
  /// The front grid (null: none) and how its metal scatters reflected light.
  const FrontGridGeometry* grid = nullptr;
  SurfaceScatter grid_scatter;
};

TraceContext make_trace_context(const Scene& scene, const WaferModel& model, const TileScene& front,
                                const TileScene& rear, const WavelengthOptics& optics,
                                const TallyLayout& layout, std::uint64_t wavelength_index);

/// Traces photons with indices [begin, end) and adds them to `tally`.
void trace_photons(const TraceContext& ctx, std::uint64_t begin, std::uint64_t end, WavelengthTally& tally);

}  // namespace lumtrap
