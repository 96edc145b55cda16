// Every photon accounted for (energy closure) and results independent of
// the number of threads, on a textured scene with films, a metal rear and
// mixed scattering.
#include <fmt/format.h>
#include <tbb/task_arena.h>

#include <algorithm>
#include <cmath>

#include "io/end_states.hpp"
#include "verify/scene_text.hpp"
#include "verify/self_check.hpp"

namespace lumtrap::verify {

namespace {

// Line K7, recipe B-like front (random pyramids 1-5 um with 75 nm SiNx) on
// an oxide-passivated aluminium rear with a partly diffuse reflection.
const char* kTexturedScene = R"(
[wafer]
thickness = "160 um"
[front]
texture = "random_pyramids"
[front.random_pyramids]
tile = "25 um"
seed = 7
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
scattering = "mixed"
diffuse_fraction = 0.4
[[rear.films]]
material = "sio2_malitson1965"
thickness = "100 nm"
[illumination]
polar_angle = "30 deg"
wavelengths = ["400 nm", "800 nm", "1100 nm"]
[run]
seed = 11
)";

}  // namespace

void accounting_checks(const std::function<void(CheckOutcome)>& add) {
  const std::uint64_t N = 20000;
  const Scene scene = scene_of_text("textured", kTexturedScene);
  const auto run = prepare_run(scene);

  std::vector<WavelengthTally> one, two;
  tbb::task_arena(1).execute([&] { one = trace_all(*run, N); });
  tbb::task_arena(2).execute([&] { two = trace_all(*run, N); });

  // Energy closure: the end states of every wavelength add up to 1, and
  // their currents to the current of all incident photons.
  const Results r = results_from_tallies(*run, two);
  double worst_sum = 1.0, current = 0.0;
  for (std::size_t i = 0; i < r.wavelength_nm.size(); ++i) {
    double sum = 0;
    for (const ResultBin& b : r.bins) sum += b.fraction[i];
    if (std::abs(sum - 1.0) >= std::abs(worst_sum - 1.0)) worst_sum = sum;
  }
  for (const ResultBin& b : r.bins) current += b.current_mA_cm2;
  add(exact("energy closure: sum of end-state fractions (textured scene, worst wavelength)",
            "every photon ends in exactly one state, common practice", 1.0, worst_sum, 1e-12));
  add(exact("energy closure: sum of end-state currents / J_max (textured scene)",
            "every photon ends in exactly one state, common practice", 1.0, current / r.J_max_mA_cm2, 1e-12));
  double lost = 0;
  for (std::size_t i = 0; i < r.wavelength_nm.size(); ++i) lost = std::max(lost, r.bin(EndState::lost).fraction[i]);
  add(statistical("lost photons (textured scene, worst wavelength)", "none expected: a closed mesh", 0.0, lost, N));

  // Thread invariance: counters that differ between 1 and 2 threads.
  double differing = 0;
  for (std::size_t i = 0; i < one.size(); ++i) {
    differing += one[i].photons != two[i].photons;
    differing += one[i].interactions != two[i].interactions;
    differing += one[i].bulk_passes != two[i].bulk_passes;
    for (const auto& [name, member] : kTallyVectors) {
      const auto& a = one[i].*member;
      const auto& b = two[i].*member;
      if (a.size() != b.size()) differing += 1;
      for (std::size_t k = 0; k < std::min(a.size(), b.size()); ++k) differing += a[k] != b[k];
    }
  }
  add(exact("thread invariance: counters differing between 1 and 2 threads",
            "counter-based random numbers per photon (bit-identical tallies)", 0.0, differing, 0.0));
}

}  // namespace lumtrap::verify
