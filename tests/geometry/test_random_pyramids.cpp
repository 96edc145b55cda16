// Random upright pyramids: exact envelope mesh, coverage, seams, size
// distributions and reproducibility.
#include <gtest/gtest.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <numbers>

#include "geometry/pyramid_envelope.hpp"
#include "geometry/pyramid_sizes.hpp"
#include "geometry/random_pyramid_layout.hpp"
#include "geometry/textures.hpp"
#include "mesh_checks.hpp"

namespace lumtrap::geometry {
namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

RandomPyramidsSpec uniform_spec(double tile, double flat_fraction, std::uint64_t seed) {
  RandomPyramidsSpec s;
  s.distribution = SizeDistribution::uniform;
  s.size_a_um = 1.0;
  s.size_b_um = 5.0;
  s.tile_um = tile;
  s.flat_fraction = flat_fraction;
  s.seed = seed;
  return s;
}

// The upper envelope max(0, max_i p_i(x, y)) straight from the layout, with
// p_i = tan(facet)·(base_i/2 - max(|dx|, |dy|)) and dx, dy the distances to
// the nearest periodic image of the centre (the max over images of p_i is
// reached at the smallest |dx| and the smallest |dy|). Pyramids are looked up
// in square cells (each listed in every cell its base reaches, wrapped).
class Envelope {
 public:
  Envelope(const RandomPyramidLayout& layout, double facet_deg)
      : l_(layout), t_(std::tan(facet_deg * kDeg)), n_(std::max(1, static_cast<int>(layout.period / 2.0))) {
    const double P = l_.period, w = P / n_;
    cells_.resize(static_cast<std::size_t>(n_) * n_);
    for (std::size_t k = 0; k < l_.pyramids.size(); ++k) {
      const auto& p = l_.pyramids[k];
      const int i0 = static_cast<int>(std::floor((p.cx - p.base / 2) / w)) - 1;
      const int i1 = static_cast<int>(std::floor((p.cx + p.base / 2) / w)) + 1;
      const int j0 = static_cast<int>(std::floor((p.cy - p.base / 2) / w)) - 1;
      const int j1 = static_cast<int>(std::floor((p.cy + p.base / 2) / w)) + 1;
      for (int j = j0; j <= std::min(j1, j0 + n_ - 1); ++j)
        for (int i = i0; i <= std::min(i1, i0 + n_ - 1); ++i) cells_[wrap(j) * n_ + wrap(i)].push_back(k);
    }
  }
  double operator()(double x, double y) const {
    const double P = l_.period, w = P / n_;
    double z = 0.0;
    for (std::size_t k : cells_[wrap(static_cast<int>(y / w)) * n_ + wrap(static_cast<int>(x / w))]) {
      const PlacedPyramid& p = l_.pyramids[k];
      double dx = std::abs(x - p.cx), dy = std::abs(y - p.cy);
      dx = std::abs(dx - P * std::round(dx / P));
      dy = std::abs(dy - P * std::round(dy / P));
      z = std::max(z, t_ * (0.5 * p.base - std::max(dx, dy)));
    }
    return z;
  }

 private:
  std::size_t wrap(int i) const { return static_cast<std::size_t>(((i % n_) + n_) % n_); }
  const RandomPyramidLayout& l_;
  double t_;
  int n_;
  std::vector<std::vector<std::size_t>> cells_;
};

// Flat fraction of a mesh: projected area of its horizontal triangles at z = 0.
double mesh_flat_fraction(const TileMesh& m) {
  double twice = 0.0;
  for (const auto& t : m.triangles) {
    const auto &a = m.vertices[t[0]], &b = m.vertices[t[1]], &c = m.vertices[t[2]];
    if (a.z() != 0.0 || b.z() != 0.0 || c.z() != 0.0) continue;
    twice += (b.x() - a.x()) * (c.y() - a.y()) - (b.y() - a.y()) * (c.x() - a.x());
  }
  return 0.5 * twice / (m.period * m.period);
}

// Checks shared by all meshes: projected area = tile², every sample point in
// exactly one triangle, the mesh height = the analytic envelope, the
// boundary edges twinned, facet normals at the facet angle.
void check_envelope_mesh(const TileMesh& m, const RandomPyramidLayout& layout, double facet_deg, int samples) {
  const double P = layout.period;
  EXPECT_NEAR(m.projected_area(), P * P, 1e-9 * P * P);
  double worst_z = 0.0;
  const Envelope envelope(layout, facet_deg);
  const auto cov = testing::check_coverage(m, samples, 7, [&](double x, double y, double z) {
    worst_z = std::max(worst_z, std::abs(z - envelope(x, y)));
  });
  EXPECT_EQ(cov.uncovered, 0);
  EXPECT_EQ(cov.overlapped, 0);
  EXPECT_EQ(cov.undecided, 0);
  EXPECT_LT(worst_z, 1e-9) << "mesh height vs analytic envelope";
  for (int axis = 0; axis < 2; ++axis) {
    const auto seam = testing::check_seam(m, axis, 1e-9);
    EXPECT_TRUE(seam.chains_ok) << "axis " << axis << " worst " << seam.worst;
    EXPECT_TRUE(seam.twins_ok) << "axis " << axis << " worst " << seam.worst;
    EXPECT_GT(seam.segments, 0u);
  }
  // {111} facets of a (100) wafer at atan(√2) = 54.74° to the surface, their
  // normals' horizontal parts along <100> (common practice: crystallography
  // of alkaline-textured (100) silicon).
  const auto fa = testing::check_facet_angles(m, facet_deg * kDeg, 1e-9);
  EXPECT_EQ(fa.downward, 0u);
  EXPECT_EQ(fa.bad_angle, 0u) << "worst tilt error " << fa.worst_angle << " rad";
  EXPECT_EQ(fa.bad_azimuth, 0u);
  EXPECT_GT(fa.facets, 0u);
}

TEST(RandomPyramids, FullCoverageMeshIsTheExactEnvelope) {
  const RandomPyramidsSpec spec = uniform_spec(50.0, 0.0, 11);
  const RandomPyramidLayout layout = random_pyramids_layout(spec);
  RandomPyramidsReport rep;
  const TileMesh m = random_pyramids_tile(spec, &rep);
  EXPECT_EQ(rep.pyramids_placed, layout.pyramids.size());
  EXPECT_GT(rep.pyramids_visible, 0u);
  EXPECT_LE(rep.pyramids_visible, rep.pyramids_placed);
  EXPECT_EQ(layout.flat_fraction, 0.0);
  EXPECT_LT(mesh_flat_fraction(m), 1e-6);
  EXPECT_GE(m.min_z(), 0.0);
  check_envelope_mesh(m, layout, spec.facet_deg, 400);
  std::printf("50 um tile, full coverage: %zu pyramids placed, %zu visible, %zu triangles\n", rep.pyramids_placed,
              rep.pyramids_visible, m.triangles.size());
}

TEST(RandomPyramids, PartialCoverageLeavesTheTargetFlatFraction) {
  const RandomPyramidsSpec spec = uniform_spec(50.0, 0.3, 5);
  const RandomPyramidLayout layout = random_pyramids_layout(spec);
  const TileMesh m = random_pyramids_tile(spec);
  const double flat = mesh_flat_fraction(m);
  EXPECT_LE(flat, 0.3);
  EXPECT_GT(flat, 0.25);
  EXPECT_NEAR(flat, layout.flat_fraction, 1e-12);
  check_envelope_mesh(m, layout, spec.facet_deg, 300);
}

TEST(RandomPyramids, LognormalSizesAndOtherFacetAngle) {
  RandomPyramidsSpec spec;
  spec.distribution = SizeDistribution::lognormal;
  spec.size_a_um = 3.0;
  spec.size_b_um = 1.0;
  spec.facet_deg = 50.0;
  spec.tile_um = 40.0;
  spec.seed = 3;
  const RandomPyramidLayout layout = random_pyramids_layout(spec);
  const TileMesh m = random_pyramids_tile(spec);
  check_envelope_mesh(m, layout, spec.facet_deg, 250);
}

TEST(RandomPyramids, NormalSizesHalfCovered) {
  RandomPyramidsSpec spec;
  spec.distribution = SizeDistribution::normal;
  spec.size_a_um = 2.0;
  spec.size_b_um = 0.7;
  spec.flat_fraction = 0.5;
  spec.tile_um = 40.0;
  spec.seed = 8;
  const RandomPyramidLayout layout = random_pyramids_layout(spec);
  const TileMesh m = random_pyramids_tile(spec);
  EXPECT_LE(mesh_flat_fraction(m), 0.5);
  EXPECT_GT(mesh_flat_fraction(m), 0.45);
  check_envelope_mesh(m, layout, spec.facet_deg, 250);
}

TEST(RandomPyramids, FlatFractionOneIsAFlatTile) {
  const RandomPyramidsSpec spec = uniform_spec(20.0, 1.0, 1);
  RandomPyramidsReport rep;
  const TileMesh m = random_pyramids_tile(spec, &rep);
  EXPECT_EQ(rep.pyramids_placed, 0u);
  EXPECT_NEAR(rep.flat_fraction, 1.0, 1e-14);
  EXPECT_EQ(m.max_z(), 0.0);
  EXPECT_NEAR(m.projected_area(), 400.0, 1e-9);
  for (int axis = 0; axis < 2; ++axis) EXPECT_TRUE(testing::check_seam(m, axis, 0.0).twins_ok);
}

TEST(RandomPyramids, SmallTileWithPyramidsWiderThanTheTile) {
  // Pyramids overlap their own periodic images: exact ties of coincident
  // facet planes between a pyramid and its image shifted along the facet.
  RandomPyramidsSpec spec = uniform_spec(4.0, 0.0, 2);
  spec.size_a_um = 3.0;
  spec.size_b_um = 9.0;
  const RandomPyramidLayout layout = random_pyramids_layout(spec);
  const TileMesh m = random_pyramids_tile(spec);
  check_envelope_mesh(m, layout, spec.facet_deg, 200);
}

TEST(RandomPyramids, CoincidentFacetPlanesAreOwnedOnce) {
  // Hand-made layouts with exact ties: equal pyramids in line (shared facet
  // planes), an exact duplicate, pyramids on the tile corner and edge, and
  // pyramids wider than the tile, whose images share facet planes with them.
  struct Case {
    double period;
    std::vector<PlacedPyramid> pyramids;
  };
  const std::vector<Case> cases = {
      {10.0, {{2.0, 2.0, 2.0}, {2.0, 3.0, 2.0}, {2.0, 4.5, 2.0}}},
      {10.0, {{5.0, 5.0, 3.0}, {5.0, 5.0, 3.0}, {6.0, 5.0, 3.0}}},
      {10.0, {{0.0, 0.0, 4.0}, {0.0, 5.0, 4.0}, {5.0, 0.0, 4.0}, {5.0, 5.0, 4.0}}},  // regular, touching
      {10.0, {{0.0, 0.0, 3.0}, {9.0, 0.0, 3.0}, {0.0, 9.5, 3.0}, {4.0, 4.0, 2.0}}},
      {4.0, {{1.0, 1.0, 6.0}}},
      {4.0, {{1.0, 3.0, 5.0}, {3.5, 1.0, 9.0}}},
      {3.0, {{0.5, 0.5, 7.0}, {2.0, 2.5, 7.0}}},
  };
  for (std::size_t c = 0; c < cases.size(); ++c) {
    SCOPED_TRACE("case " + std::to_string(c));
    const RandomPyramidLayout layout = layout_from_pyramids(cases[c].period, cases[c].pyramids);
    const TileMesh m = pyramid_envelope_mesh(layout, kFacet111Deg);
    check_envelope_mesh(m, layout, kFacet111Deg, 200);
  }
}

TEST(RandomPyramids, RegularLayoutGivesTheRegularTexture) {
  // Equal touching pyramids on a grid: the envelope is the regular texture.
  std::vector<PlacedPyramid> p;
  for (int j = 0; j < 4; ++j)
    for (int i = 0; i < 4; ++i) p.push_back({1.5 + 3.0 * i, 1.5 + 3.0 * j, 3.0});
  const RandomPyramidLayout layout = layout_from_pyramids(12.0, p);
  EXPECT_EQ(layout.flat_fraction, 0.0);
  const TileMesh m = pyramid_envelope_mesh(layout, kFacet111Deg);
  const TileMesh r = regular_pyramids_tile(3.0, kFacet111Deg, 0.0, false);
  EXPECT_NEAR(m.mean_z(), r.mean_z(), 1e-12);
  EXPECT_NEAR(m.surface_area() / (12.0 * 12.0), r.surface_area() / 9.0, 1e-12);
  check_envelope_mesh(m, layout, kFacet111Deg, 200);
}

TEST(RandomPyramids, SameSeedSameMeshOtherSeedOtherMesh) {
  const TileMesh a = random_pyramids_tile(uniform_spec(30.0, 0.0, 42));
  const TileMesh b = random_pyramids_tile(uniform_spec(30.0, 0.0, 42));
  const TileMesh c = random_pyramids_tile(uniform_spec(30.0, 0.0, 43));
  ASSERT_EQ(a.vertices.size(), b.vertices.size());
  ASSERT_EQ(a.triangles, b.triangles);
  for (std::size_t i = 0; i < a.vertices.size(); ++i) ASSERT_EQ(a.vertices[i], b.vertices[i]);
  const bool same = a.vertices.size() == c.vertices.size() && a.triangles == c.triangles &&
                    std::equal(a.vertices.begin(), a.vertices.end(), c.vertices.begin());
  EXPECT_FALSE(same);
}

TEST(RandomPyramids, FirstDrawsAreFixedByTheSeed) {
  // std::mt19937_64 output is fixed by the C++ standard (ISO/IEC 14882,
  // [rand.predef]: the 10000th output of the default-seeded engine is
  // 9981545732273789042), so the layout is the same with every standard library.
  std::mt19937_64 e;
  e.discard(9999);
  EXPECT_EQ(e(), 9981545732273789042ull);
  const RandomPyramidLayout a = random_pyramids_layout(uniform_spec(30.0, 0.5, 1));
  std::mt19937_64 rng(1);
  const double x = 30.0 * static_cast<double>(rng() >> 11) * 0x1.0p-53;
  const double y = 30.0 * static_cast<double>(rng() >> 11) * 0x1.0p-53;
  const double s = 1.0 + 4.0 * static_cast<double>(rng() >> 11) * 0x1.0p-53;
  EXPECT_EQ(a.pyramids.at(0).cx, x);
  EXPECT_EQ(a.pyramids.at(0).cy, y);
  EXPECT_EQ(a.pyramids.at(0).base, s);
}

struct Moments {
  double mean, sd, se_mean, se_sd, min;
};
Moments moments(const std::vector<double>& v) {
  const double n = static_cast<double>(v.size());
  double m = 0, lo = 1e300;
  for (double x : v) {
    m += x / n;
    lo = std::min(lo, x);
  }
  double m2 = 0, m4 = 0;
  for (double x : v) {
    m2 += (x - m) * (x - m) / n;
    m4 += std::pow(x - m, 4) / n;
  }
  const double sd = std::sqrt(m2);
  // standard error of the sample sd from the fourth central moment (delta method)
  return {m, sd, sd / std::sqrt(n), std::sqrt((m4 - m2 * m2) / n) / (2 * sd), lo};
}

TEST(RandomPyramids, SizeDistributionsMatchTheirMeanAndSpread) {
  struct Case {
    SizeDistribution kind;
    double a, b, mean, sd;
  };
  // uniform [1, 5]: mean 3, sd 4/√12; normal and lognormal: the spec gives
  // mean and sd of the size itself.
  const Case cases[] = {{SizeDistribution::uniform, 1.0, 5.0, 3.0, 4.0 / std::sqrt(12.0)},
                        {SizeDistribution::normal, 3.0, 0.5, 3.0, 0.5},
                        {SizeDistribution::lognormal, 3.0, 1.0, 3.0, 1.0},
                        {SizeDistribution::lognormal, 2.0, 1.5, 2.0, 1.5}};
  for (const Case& c : cases) {
    RandomPyramidsSpec spec;
    spec.distribution = c.kind;
    spec.size_a_um = c.a;
    spec.size_b_um = c.b;
    spec.min_size_um = 0.01;
    const PyramidSizeSampler sampler(spec);
    std::mt19937_64 rng(99);
    std::vector<double> v(200000);
    for (double& x : v) x = sampler.draw(rng);
    const Moments m = moments(v);
    EXPECT_NEAR(m.mean, c.mean, 4 * m.se_mean) << static_cast<int>(c.kind);
    EXPECT_NEAR(m.sd, c.sd, 4 * m.se_sd) << static_cast<int>(c.kind);
  }
  // The sizes of a real layout (lognormal mean 3 sd 1).
  RandomPyramidsSpec spec;
  spec.distribution = SizeDistribution::lognormal;
  spec.size_a_um = 3.0;
  spec.size_b_um = 1.0;
  spec.tile_um = 60.0;
  const RandomPyramidLayout layout = random_pyramids_layout(spec);
  std::vector<double> sizes;
  for (const auto& p : layout.pyramids) sizes.push_back(p.base);
  ASSERT_GT(sizes.size(), 1000u);
  const Moments m = moments(sizes);
  EXPECT_NEAR(m.mean, 3.0, 4 * m.se_mean);
  EXPECT_NEAR(m.sd, 1.0, 4 * m.se_sd);
}

TEST(RandomPyramids, SizesBelowTheMinimumAreRedrawn) {
  RandomPyramidsSpec spec;
  spec.distribution = SizeDistribution::normal;
  spec.size_a_um = 1.0;
  spec.size_b_um = 1.0;
  spec.min_size_um = 0.5;
  const PyramidSizeSampler sampler(spec);
  std::mt19937_64 rng(5);
  std::vector<double> v(100000);
  for (double& x : v) x = sampler.draw(rng);
  const Moments m = moments(v);
  EXPECT_GE(m.min, 0.5);
  // mean of N(1, 1) truncated below 0.5: 1 + φ(-0.5)/(1 - Φ(-0.5))
  // (mean of a truncated normal distribution, common practice)
  const double phi = std::exp(-0.125) / std::sqrt(2 * std::numbers::pi);
  const double upper = 0.5 * std::erfc(-0.5 / std::sqrt(2.0));
  EXPECT_NEAR(m.mean, 1.0 + phi / upper, 4 * m.se_mean);
}

TEST(RandomPyramids, BadSpecsAreRejected) {
  RandomPyramidsSpec s = uniform_spec(50, 0, 1);
  s.size_b_um = 0.5;  // max < min
  EXPECT_THROW(random_pyramids_tile(s), std::invalid_argument);
  s = uniform_spec(-1, 0, 1);
  EXPECT_THROW(random_pyramids_tile(s), std::invalid_argument);
  s = uniform_spec(50, 1.5, 1);
  EXPECT_THROW(random_pyramids_tile(s), std::invalid_argument);
  s = uniform_spec(50, 0, 1);
  s.facet_deg = 90;
  EXPECT_THROW(random_pyramids_tile(s), std::invalid_argument);
  s = uniform_spec(50, 0, 1);
  s.distribution = SizeDistribution::fixed;
  s.size_a_um = 0.1;  // below min_size_um
  EXPECT_THROW(random_pyramids_tile(s), std::invalid_argument);
  try {
    s.size_a_um = -2;
    random_pyramids_tile(s);
  } catch (const std::invalid_argument& e) {
    EXPECT_NE(std::string(e.what()).find("size_a_um"), std::string::npos) << e.what();
  }
}

TEST(RandomPyramids, BuildOf200umTile) {
  const RandomPyramidsSpec spec = uniform_spec(200.0, 0.0, 1);
  const auto t0 = std::chrono::steady_clock::now();
  RandomPyramidsReport rep;
  const TileMesh m = random_pyramids_tile(spec, &rep);
  const double s = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  std::printf("200 um tile, sizes uniform 1-5 um, full coverage: %zu pyramids placed, %zu visible, "
              "%zu triangles, %zu vertices, built in %.3f s\n",
              rep.pyramids_placed, rep.pyramids_visible, m.triangles.size(), m.vertices.size(), s);
  EXPECT_EQ(rep.flat_fraction, 0.0);
  // Large enough to be meshed in parts on several threads: check it all.
  check_envelope_mesh(m, random_pyramids_layout(spec), spec.facet_deg, 600);
}

}  // namespace
}  // namespace lumtrap::geometry
