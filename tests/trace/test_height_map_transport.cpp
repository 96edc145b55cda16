// texture = "height_map" through the whole tracer, against two references
// outside the height-map code:
//  - a map of a flat (tilted, then levelled) plane against the exact planar
//    solver (optics/planar_wafer.hpp, checked against closed forms in
//    tests/optics);
//  - a map sampled from regular upright pyramids, their apexes between
//    samples, against the tracer on the analytic pyramid mesh
//    (texture = "upright_pyramids", itself checked against analytic facet
//    tracing in test_transport_pyramids.cpp).
// Tolerance: |Δ| <= 4σ + 1e-4 per wavelength and bin, σ the run's own
// standard error (of the difference of two independent runs for the
// second check).
#include <fmt/format.h>

#include <cmath>
#include <fstream>
#include <iostream>
#include <numbers>

#include "geometry/textures.hpp"
#include "trace/planar_run.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

const char* kStack = R"(
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[[rear.films]]
material = "sio2_malitson1965"
thickness = "100 nm"
[illumination]
wavelengths = ["500 nm", "800 nm", "1000 nm", "1100 nm"]
[run]
photons = 1
seed = 17
)";

void write_csv_map(const std::filesystem::path& file, std::size_t n, double pitch,
                   const std::function<double(double, double)>& z_nm) {
  std::ofstream out(file);
  out << "# demo map, line K7 (computed, not measured)\n";
  for (std::size_t j = 0; j < n; ++j) {
    for (std::size_t i = 0; i < n; ++i) out << (i ? "," : "") << fmt::format("{:.17g}", z_nm(i * pitch, j * pitch));
    out << "\n";
  }
}

TEST(HeightMapTransport, FlatMapGivesThePlanarSolversNumbers) {
  // 40 × 40 samples of a plane tilted by 2° and 1° (heights in nm), levelled.
  write_csv_map(test::temp_dir() / "tilted_plane.csv", 40, 0.5, [](double x, double y) {
    return 1e3 * (std::tan(2 * kDeg) * x - std::tan(1 * kDeg) * y + 3.0);
  });
  const Scene mapped = test::scene_from_text(
      "[wafer]\nthickness = \"180 um\"\n[front]\ntexture = \"height_map\"\n[front.height_map]\n"
      "file = \"tilted_plane.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\npixel_size = \"0.5 um\"\n" +
          std::string(kStack),
      "mapped");
  const Scene planar = test::scene_from_text("[wafer]\nthickness = \"180 um\"\n" + std::string(kStack), "planar");
  const Results exact = planar_results(planar);
  const std::uint64_t N = 20000;
  auto run = prepare_run(mapped);
  EXPECT_EQ(run->model.front.mesh.triangles.size(), 2u * 78 * 78);  // mirrored: 2 (40 - 1) samples per side
  const Results traced = results_from_tallies(*run, test::trace_all(*run, N));
  for (const auto& b : exact.bins) {
    const ResultBin& t = traced.bin(b.bin.name);
    for (std::size_t i = 0; i < b.fraction.size(); ++i) {
      const double p = std::clamp(b.fraction[i], 0.0, 1.0);
      const double tol = 4.0 * std::max(t.sigma[i], std::sqrt(p * (1 - p) / double(N))) + 1e-4;
      EXPECT_NEAR(t.fraction[i], b.fraction[i], tol) << b.bin.name << " at " << exact.wavelength_nm[i] << " nm";
    }
  }
}

TEST(HeightMapTransport, SampledRegularPyramidsReproduceTheAnalyticMesh) {
  // Upright {111} pyramids of 10 µm sampled every 0.05 µm (200 samples per
  // pyramid), with the lattice shifted by 0.37 of a sample so that no apex,
  // edge or base corner lies on a sample; 2 × 2 pyramids, wrap. Cells cut
  // by a ridge or a valley are meshed off the facet planes; the error they
  // make grows with the pitch (study in README, "Measured surfaces": escape
  // at 1100 nm off by about 1.5 × pitch/base), and base/200 is the pitch
  // at which it stays well inside 4σ at 20 000 photons per wavelength.
  const double b = 10.0, pitch = 0.05, shift = 0.37 * pitch;
  const double t = std::tan(geometry::kFacet111Deg * kDeg);
  const auto field = [&](double x, double y) {
    const auto d = [&](double u) {
      const double r = std::fmod(u - shift, b);
      return std::abs((r < 0 ? r + b : r) - 0.5 * b);
    };
    return 1e3 * t * (0.5 * b - std::max(d(x), d(y)));  // nm
  };
  write_csv_map(test::temp_dir() / "pyramids.csv", 400, pitch, field);
  const Scene mapped = test::scene_from_text(
      "[wafer]\nthickness = \"180 um\"\n[front]\ntexture = \"height_map\"\n[front.height_map]\n"
      "file = \"pyramids.csv\"\nformat = \"csv_grid\"\nheight_unit = \"nm\"\npixel_size = \"0.05 um\"\n"
      "level = \"none\"\ntiling = \"wrap\"\n" + std::string(kStack),
      "mapped");
  const Scene analytic = test::scene_from_text(
      "[wafer]\nthickness = \"180 um\"\n[front]\ntexture = \"upright_pyramids\"\n[front.pyramids]\nbase = \"10 um\"\n" +
          std::string(kStack),
      "analytic");
  const std::uint64_t N = 20000;
  auto run_a = prepare_run(analytic);
  auto run_m = prepare_run(mapped);
  const Results ra = results_from_tallies(*run_a, test::trace_all(*run_a, N));
  const Results rm = results_from_tallies(*run_m, test::trace_all(*run_m, N));
  for (const auto& ba : ra.bins) {
    const ResultBin& bm = rm.bin(ba.bin.name);
    for (std::size_t i = 0; i < ba.fraction.size(); ++i) {
      const double s = std::hypot(ba.sigma[i], bm.sigma[i]);
      const double d = bm.fraction[i] - ba.fraction[i];
      if (ba.fraction[i] > 0 || bm.fraction[i] > 0)
        std::cout << fmt::format("{:>20} {:>5} nm: analytic {:.5f} map {:.5f}  Δ {:+.5f} = {:+.2f} σ\n", ba.bin.name,
                                 ra.wavelength_nm[i], ba.fraction[i], bm.fraction[i], d, s > 0 ? d / s : 0.0);
      EXPECT_NEAR(bm.fraction[i], ba.fraction[i], 4.0 * s + 1e-4) << ba.bin.name << " at " << ra.wavelength_nm[i];
    }
  }
}

}  // namespace
}  // namespace lumtrap
