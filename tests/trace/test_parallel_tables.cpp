// The optical tables of a wavelength are solved in parallel (one task per
// table) and the driver builds several wavelengths' tables at once: the
// tables and the driven tallies are bit-identical with 1 and 2 threads, and
// each table equals a direct tabulate_stack of its film stack.
#include <tbb/global_control.h>

#include "trace/driver.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

const char* kScene = R"(
[wafer]
thickness = "160 um"
[front]
texture = "upright_pyramids"
conformality = "directional"
[front.pyramids]
base = "4 um"
gap = "1 um"
[[front.films]]
material = "al2o3_malitson1962"
thickness = "10 nm"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[[rear.films]]
material = "sio2_malitson1965"
thickness = "100 nm"
[illumination]
wavelengths = { from = "400 nm", to = "1150 nm", step = "50 nm" }
[run]
photons = 20000
target_jg_error = "0.25 mA/cm2"
)";

bool same_table(const StackTable& a, const StackTable& b) {
  auto same_responses = [](const std::vector<InterfaceResponse>& x, const std::vector<InterfaceResponse>& y) {
    if (x.size() != y.size()) return false;
    for (std::size_t k = 0; k < x.size(); ++k)
      if (x[k].rs != y[k].rs || x[k].rp != y[k].rp || x[k].ts != y[k].ts || x[k].tp != y[k].tp ||
          x[k].Rs != y[k].Rs || x[k].Rp != y[k].Rp || x[k].Ts != y[k].Ts || x[k].Tp != y[k].Tp)
        return false;
    return true;
  };
  return a.samples == b.samples && a.layers == b.layers && same_responses(a.response, b.response) &&
         a.layer_As == b.layer_As && a.layer_Ap == b.layer_Ap && a.cos_critical == b.cos_critical &&
         a.critical_intervals == b.critical_intervals &&
         same_responses(a.critical_response, b.critical_response) && a.critical_As == b.critical_As &&
         a.critical_Ap == b.critical_Ap;
}

bool same_optics(const WavelengthOptics& a, const WavelengthOptics& b) {
  auto same_list = [](const std::vector<StackTable>& x, const std::vector<StackTable>& y) {
    if (x.size() != y.size()) return false;
    for (std::size_t k = 0; k < x.size(); ++k)
      if (!same_table(x[k], y[k])) return false;
    return true;
  };
  return same_list(a.front.from_outside, b.front.from_outside) && same_list(a.front.from_inside, b.front.from_inside) &&
         same_list(a.rear.from_outside, b.rear.from_outside) && same_list(a.rear.from_inside, b.rear.from_inside);
}

TEST(ParallelTables, TablesDoNotDependOnThreads) {
  auto run = prepare_run(test::scene_from_text(kScene));
  ASSERT_GE(run->model.front.tilt_cos.size(), 2u);  // flat gaps and facets: two classes, 6 tables
  for (std::size_t i : {std::size_t(0), std::size_t(9), std::size_t(15)}) {
    WavelengthOptics one, two;
    {
      tbb::global_control limit(tbb::global_control::max_allowed_parallelism, 1);
      one = wavelength_optics(*run, i);
    }
    {
      tbb::global_control limit(tbb::global_control::max_allowed_parallelism, 2);
      two = wavelength_optics(*run, i);
    }
    EXPECT_TRUE(same_optics(one, two)) << "wavelength " << i;
  }
}

TEST(ParallelTables, EachTableIsItsStackTabulated) {
  auto run = prepare_run(test::scene_from_text(kScene));
  const std::size_t i = 7;
  const double lambda = run->scene.illumination.wavelengths_nm[i];
  const WavelengthOptics o = wavelength_optics(*run, i);
  const auto& m = run->materials;
  const auto& films = run->scene.front.films;
  for (std::size_t k = 0; k < run->model.front.tilt_cos.size(); ++k) {
    const double c = run->model.front.tilt_cos[k];  // directional films: thickness × tilt cosine
    FilmStack st{m.ambient.index_at(lambda),
                 {{m.front_films[0].index_at(lambda), films[0].thickness_nm * c},
                  {m.front_films[1].index_at(lambda), films[1].thickness_nm * c}},
                 m.bulk.index_at(lambda)};
    EXPECT_TRUE(same_table(o.front.from_outside[k], tabulate_stack(st, lambda, Incidence::from_a))) << k;
    EXPECT_TRUE(same_table(o.front.from_inside[k], tabulate_stack(st, lambda, Incidence::from_b))) << k;
  }
}

TEST(ParallelTables, PrecisionRunDoesNotDependOnThreads) {
  auto run = prepare_run(test::scene_from_text(kScene));
  auto drive = [&](int threads) {
    tbb::global_control limit(tbb::global_control::max_allowed_parallelism, std::size_t(threads));
    return drive_run(*run, DriveOptions{});
  };
  const DriveResult one = drive(1), two = drive(2);
  ASSERT_TRUE(one.complete && two.complete);
  EXPECT_LE(one.jg_sigma_mA_cm2, 0.25);
  ASSERT_EQ(one.tallies.size(), two.tallies.size());
  for (std::size_t i = 0; i < one.tallies.size(); ++i) EXPECT_TRUE(one.tallies[i] == two.tallies[i]) << i;
  EXPECT_EQ(one.jg_sigma_mA_cm2, two.jg_sigma_mA_cm2);
}

}  // namespace
}  // namespace lumtrap
