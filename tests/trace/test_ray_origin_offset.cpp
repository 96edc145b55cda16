// Photons slipping through the mesh ("lost") on random pyramids. A ray leaves
// a surface from just beside the hit point. With an origin offset of 64 float
// ulps of the tile's extent, a ray leaving a facet within that distance of a
// valley could start beyond the neighbouring facet's plane and so travel on
// the wrong side of the surface: 3–5 in 100 000 photons were lost on the
// shipped random-pyramid scenes (measured with the earlier offset). With the
// offset of 2 ulps (SurfaceModel::offset) it is at most a few in a million.
//
// The bound below is a regression guard on a deterministic run (fixed seeds,
// so no statistical margin is involved): at most 1 lost photon in 100 000
// per wavelength, at normal and at oblique incidence, on a coarse and on a
// fine random texture; the earlier offset lost 3 or more here.
#include "trace_test_util.hpp"

#include <fmt/format.h>

namespace lumtrap {
namespace {

std::uint64_t lost_photons(const std::string& texture, const std::string& angle, std::uint64_t photons) {
  const Scene scene = test::scene_from_text(fmt::format(R"(
[wafer]
thickness = "160 um"
[front]
texture = "random_pyramids"
[front.random_pyramids]
{texture}
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[illumination]
polar_angle = "{angle}"
wavelengths = ["1100 nm"]
)", fmt::arg("texture", texture), fmt::arg("angle", angle)));
  auto run = prepare_run(scene);
  const auto t = test::trace_all(*run, photons)[0];
  EXPECT_EQ(t.ended_total(), t.photons);
  return ended_in(run->layout, t, EndState::lost);
}

TEST(RayOriginOffset, FewPhotonsSlipThroughRandomPyramids) {
  constexpr std::uint64_t kPhotons = 100000;
  const char* coarse = "distribution = \"lognormal\"\nmean = \"6 um\"\nsd = \"2 um\"\ntile = \"60 um\"\nseed = 7";
  const char* fine = "distribution = \"uniform\"\nmin = \"1 um\"\nmax = \"3 um\"\ntile = \"30 um\"\nseed = 3";
  for (const char* texture : {coarse, fine})
    for (const char* angle : {"0 deg", "45 deg"}) {
      const std::uint64_t lost = lost_photons(texture, angle, kPhotons);
      std::cout << fmt::format("{} at {}: {} of {} photons lost\n",
                               texture == coarse ? "coarse" : "fine", angle, lost, kPhotons);
      EXPECT_LE(lost, 1u) << (texture == coarse ? "coarse" : "fine") << " texture at " << angle;
    }
}

}  // namespace
}  // namespace lumtrap
