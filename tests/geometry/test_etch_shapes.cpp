// Shapes an etch leaves: rounded tips and valleys, a spread of facet angles,
// random inverted pyramids. Radius 0 is the sharp texture bit for bit; the
// rounded pyramid against a brute-force ball opening; every mesh watertight
// and seamless; triangle normals within the stated angular error; the
// facet-angle histogram peaking at the given angle.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <random>

#include "geometry/facet_angle_spread.hpp"
#include "geometry/pyramid_envelope.hpp"
#include "geometry/random_pyramid_layout.hpp"
#include "geometry/rounded_envelope.hpp"
#include "geometry/rounded_pyramid.hpp"
#include "geometry/texture_descriptor.hpp"
#include "geometry/texture_statistics.hpp"
#include "geometry/textures.hpp"
#include "geometry/valley_fillet.hpp"
#include "mesh_checks.hpp"

namespace lumtrap::geometry {
namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

void expect_same_mesh(const TileMesh& a, const TileMesh& b) {
  EXPECT_EQ(a.period, b.period);
  ASSERT_EQ(a.vertices.size(), b.vertices.size());
  ASSERT_EQ(a.triangles.size(), b.triangles.size());
  for (std::size_t i = 0; i < a.vertices.size(); ++i) ASSERT_EQ(a.vertices[i], b.vertices[i]) << i;
  for (std::size_t i = 0; i < a.triangles.size(); ++i) ASSERT_EQ(a.triangles[i], b.triangles[i]) << i;
}

// Every point of the tile in exactly one triangle, the boundary edges
// twinned exactly, projected area = tile², no normal pointing down.
void expect_watertight(const TileMesh& m, int samples) {
  const double P = m.period;
  EXPECT_NEAR(m.projected_area(), P * P, 1e-9 * P * P);
  const auto cov = testing::check_coverage(m, samples, 11, [](double, double, double) {});
  EXPECT_EQ(cov.uncovered, 0);
  EXPECT_EQ(cov.overlapped, 0);
  EXPECT_EQ(cov.undecided, 0);
  for (int axis = 0; axis < 2; ++axis) {
    const auto seam = testing::check_seam(m, axis, 0.0);
    EXPECT_TRUE(seam.chains_ok) << "axis " << axis << " worst " << seam.worst;
    EXPECT_TRUE(seam.twins_ok) << "axis " << axis << " worst " << seam.worst;
  }
  std::size_t down = 0;
  for (std::size_t i = 0; i < m.triangles.size(); ++i) down += !(m.normal(i).z() > 0);
  EXPECT_EQ(down, 0u);
}

TextureParams params(std::string_view kind, std::map<std::string, double, std::less<>> numbers,
                     std::map<std::string, std::string, std::less<>> words = {}) {
  TextureParams p = default_texture(kind);
  for (auto& [k, v] : words) p.words[k] = v;
  // defaults of keys that apply only after the words are set
  for (const ParamSpec& s : texture_of(p).params)
    if (param_applies(s, p) && !p.has(s.key) && !s.required) {
      if (s.kind == ParamKind::word) p.words[std::string(s.key)] = std::string(s.fallback_word);
      else p.numbers[std::string(s.key)] = s.fallback;
    }
  for (auto& [k, v] : numbers) p.numbers[k] = v;
  return p;
}

TEST(EtchShapes, RadiusZeroIsTheSharpTextureBitForBit) {
  for (bool inverted : {false, true}) {
    const auto kind = inverted ? "inverted_pyramids" : "upright_pyramids";
    const TileMesh built = build_texture(params(kind, {{"base", 4.0}, {"gap", 0.5}, {"tip_radius", 0.0}, {"valley_radius", 0.0}}));
    expect_same_mesh(built, regular_pyramids_tile(4.0, kFacet111Deg, 0.5, inverted));
  }
  // random upright: the exact envelope of the layout; random inverted: its mirror
  const TextureParams rp = params("random_pyramids", {{"tile", 16.0}, {"seed", 4}, {"tip_radius", 0.0}});
  const RandomPyramidLayout layout = random_pyramids_layout(random_pyramids_spec(rp));
  TileMesh sharp = pyramid_envelope_mesh(layout, kFacet111Deg);
  expect_same_mesh(build_texture(rp), sharp);
  TextureParams rip = rp;
  rip.kind = "random_inverted_pyramids";
  const double top = sharp.max_z();
  for (auto& v : sharp.vertices) v.z() = top - v.z();
  expect_same_mesh(build_texture(rip), sharp);
}

// The opening of the pyramid by a ball of radius R, brute force: the highest
// point of any ball of radius R whose centre lies on the shrunk pyramid
// (facets lowered by R/cos(facet)), centres sampled on a fine grid.
double brute_force_opening(double u, double v, double a, double t, double R) {
  const double apex = t * a - R * std::sqrt(1 + t * t);
  const int n = 600;
  double best = -1e300;
  for (int j = 0; j <= n; ++j)
    for (int i = 0; i <= n; ++i) {
      const double du = R * (2.0 * i / n - 1), dv = R * (2.0 * j / n - 1);
      const double r2 = R * R - du * du - dv * dv;
      if (r2 < 0) continue;
      const double qz = apex - t * std::max(std::abs(u + du), std::abs(v + dv));
      best = std::max(best, qz + std::sqrt(r2));
    }
  return best;
}

TEST(EtchShapes, RoundedPyramidIsTheBallOpening) {
  // Closed form at the apex: the sphere's top, t·a - R/cos(facet) + R
  // (elementary geometry, common practice).
  const double a = 2.0, R = 0.4;
  for (double deg : {kFacet111Deg, 45.0, 30.0}) {
    const double t = std::tan(deg * kDeg);
    EXPECT_NEAR(rounded_pyramid_point(0, 0, a, t, R).z, t * a - R / std::cos(deg * kDeg) + R, 1e-12);
    std::mt19937_64 rng(3);
    std::uniform_real_distribution<double> U(-0.8, 0.8);
    double worst = 0;
    for (int k = 0; k < 60; ++k) {
      const double u = U(rng), v = U(rng);
      worst = std::max(worst, std::abs(rounded_pyramid_point(u, v, a, t, R).z - brute_force_opening(u, v, a, t, R)));
    }
    // grid of R/300 at slopes up to t: the brute force is low by at most ~t·R/300·√2
    EXPECT_LT(worst, 2 * t * R / 300) << deg;
    // far from the apex and ridges: the facet plane itself
    EXPECT_EQ(rounded_pyramid_point(1.5, 0.1, a, t, R).z, t * (a - 1.5));
  }
}

TEST(EtchShapes, ValleyFilletIsTheArcOfRadiusR) {
  // A facet z = -tan(θ)·x (rising towards -x) meeting flat ground at x = 0:
  // the arc of radius R tangent to both has its centre at (R·tan(θ/2), R)
  // and meets the facet at x = R·tan(θ/2) - R·sin θ (elementary geometry,
  // common practice).
  const double R = 0.3;
  for (double deg : {kFacet111Deg, 40.0}) {
    const double th = deg * kDeg, t = std::tan(th), xc = R * std::tan(0.5 * th);
    for (double x : {-0.3, -0.2, -0.1, 0.0, 0.05, 0.1, 0.15, 0.2}) {
      const SurfacePoint facet{-t * x, -t, 0, 1}, ground{0, 0, 0, -1};
      const bool facet_on_top = facet.z >= 0;
      const double z = valley_fillet(facet_on_top ? facet : ground, facet_on_top ? ground : facet, R);
      const double dx = x - xc;
      const double expect = x >= xc - R * std::sin(th) && x <= xc ? R - std::sqrt(R * R - dx * dx) : std::max(0.0, -t * x);
      EXPECT_NEAR(z, expect, 1e-12) << deg << " deg, x = " << x;
    }
  }
}

TEST(EtchShapes, RoundedRegularPyramidsAreWatertightAndWithinTheAngularError) {
  const double base = 6.0, R = 0.5, err = 5.0;
  for (double gap : {0.0, 1.0}) {
    const TileMesh m = shaped_regular_pyramids_tile(base, kFacet111Deg, gap, false, {R, 0.0, err});
    expect_watertight(m, 300);
    // Normals of the triangles around the apex (away from the base edges,
    // which stay sharp here) against the rounded pyramid's normal at their
    // centroid.
    const double c = 0.5 * (base + gap), a = 0.5 * base, t = std::tan(kFacet111Deg * kDeg);
    double worst = 0;
    std::size_t rounded = 0;
    for (std::size_t i = 0; i < m.triangles.size(); ++i) {
      Eigen::Vector3d g = Eigen::Vector3d::Zero();
      for (auto k : m.triangles[i]) g += m.vertices[k] / 3.0;
      if (std::max(std::abs(g.x() - c), std::abs(g.y() - c)) > 0.7 * a) continue;
      const SurfacePoint s = rounded_pyramid_point(g.x() - c, g.y() - c, a, t, R);
      if (s.facet >= 0) continue;
      ++rounded;
      const Eigen::Vector3d n = Eigen::Vector3d(-s.gx, -s.gy, 1).normalized();
      worst = std::max(worst, std::acos(std::min(1.0, n.dot(m.normal(i)))));
    }
    EXPECT_GT(rounded, 100u);
    EXPECT_LE(worst, err * kDeg) << "worst normal error " << worst / kDeg << " deg";
    // the apex is the sphere's top
    EXPECT_NEAR(m.max_z(), t * a - R / std::cos(kFacet111Deg * kDeg) + R, 1e-9);
  }
}

TEST(EtchShapes, EveryShapedTextureIsWatertight) {
  expect_watertight(shaped_regular_pyramids_tile(5.0, 50.0, 0.0, false, {0.3, 0.2, 8}), 250);
  expect_watertight(shaped_regular_pyramids_tile(5.0, kFacet111Deg, 0.8, true, {0.2, 0.3, 8}), 250);
  RandomPyramidsSpec s;
  s.size_a_um = 2.0;
  s.size_b_um = 3.0;
  s.tile_um = 10.0;
  s.seed = 5;
  s.shape = {0.25, 0.15, 10};
  expect_watertight(random_pyramids_tile(s), 250);
  s.flat_fraction = 0.1;
  expect_watertight(random_inverted_pyramids_tile(s), 250);
  s.shape = {0.0, 0.0, 8};
  s.facet_spread = {AngleDistribution::uniform, 50.0, 56.0};
  expect_watertight(random_pyramids_tile(s), 250);
}

TEST(EtchShapes, InvertedIsTheUprightMirroredWithRadiiSwapped) {
  RandomPyramidsSpec s;
  s.size_a_um = 2.0;
  s.size_b_um = 4.0;
  s.tile_um = 10.0;
  s.seed = 2;
  s.shape = {0.3, 0.1, 10};
  TileMesh up = random_pyramids_tile([&] {
    RandomPyramidsSpec u = s;
    std::swap(u.shape.tip_radius_um, u.shape.valley_radius_um);
    return u;
  }());
  const double top = up.max_z();
  for (auto& v : up.vertices) v.z() = top - v.z();
  expect_same_mesh(random_inverted_pyramids_tile(s), up);
}

TEST(EtchShapes, FacetAngleDrawsFollowTheirDistribution) {
  // Truncated normal at ± 3 sd: mean unchanged (symmetry), variance
  // 1 - 6·φ(3)/(Φ(3) - Φ(-3)) times sd² (moments of the truncated normal,
  // common practice); uniform: mean (lo+hi)/2, variance (hi-lo)²/12.
  const std::size_t n = 40000;
  const auto moments = [](const std::vector<double>& v) {
    double m = 0, m2 = 0;
    for (double x : v) m += x / v.size();
    for (double x : v) m2 += (x - m) * (x - m) / (v.size() - 1);
    return std::pair{m, std::sqrt(m2)};
  };
  const double phi3 = std::exp(-4.5) / std::sqrt(2 * std::numbers::pi), within = std::erf(3 / std::numbers::sqrt2);
  const double sd_factor = std::sqrt(1 - 6 * phi3 / within);
  const auto normal = draw_facet_angles({AngleDistribution::normal, 52.0, 2.0}, n, 9);
  const auto [mn, sn] = moments(normal);
  EXPECT_NEAR(mn, 52.0, 4 * 2.0 * sd_factor / std::sqrt(double(n)));
  // standard error of a standard deviation ≈ sd/√(2n) (common practice)
  EXPECT_NEAR(sn, 2.0 * sd_factor, 4 * 2.0 / std::sqrt(2.0 * n));
  for (double x : normal) ASSERT_LE(std::abs(x - 52.0), 6.0);
  const auto uniform = draw_facet_angles({AngleDistribution::uniform, 50.0, 56.0}, n, 9);
  const auto [mu, su] = moments(uniform);
  EXPECT_NEAR(mu, 53.0, 4 * 6.0 / std::sqrt(12.0 * n));
  for (double x : uniform) ASSERT_TRUE(x >= 50.0 && x < 56.0);
  // the layout does not depend on the facet angles
  RandomPyramidsSpec s;
  s.tile_um = 20;
  const auto a = random_pyramids_layout(s);
  s.facet_spread = {AngleDistribution::normal, 52.0, 2.0};
  const auto b = random_pyramids_layout(s);
  ASSERT_EQ(a.pyramids.size(), b.pyramids.size());
  for (std::size_t i = 0; i < a.pyramids.size(); ++i) EXPECT_EQ(a.pyramids[i].base, b.pyramids[i].base);
  EXPECT_THROW(draw_facet_angles({AngleDistribution::normal, 80.0, 4.0}, 1, 1), std::invalid_argument);
  EXPECT_THROW(draw_facet_angles({AngleDistribution::uniform, 56.0, 50.0}, 1, 1), std::invalid_argument);
}

std::size_t peak_bin(const TextureStatistics& s) {
  std::size_t k = 0;
  for (std::size_t i = 0; i < s.facet_angles.size(); ++i)
    if (s.facet_angles[i].surface_fraction > s.facet_angles[k].surface_fraction) k = i;
  return k;
}

TEST(EtchShapes, StatisticsShowTheFacetAnglePeakAtTheGivenAngle) {
  // The area-weighted facet-angle histogram of a rounded random texture
  // peaks in the 1° bin holding the facet angle (the facets keep their
  // planes; the rounded parts spread over lower tilts).
  RandomPyramidsSpec s;
  s.size_a_um = 1.5;
  s.size_b_um = 2.5;
  s.tile_um = 8.0;
  s.seed = 8;
  s.facet_deg = 50.0;
  s.facet_spread = {AngleDistribution::fixed, 50.0, 0.0};
  s.shape = {0.15, 0.1, 10};
  TextureStatistics st = texture_statistics(random_pyramids_tile(s));
  EXPECT_EQ(peak_bin(st), 50u);
  EXPECT_GT(st.facet_angles[50].surface_fraction, 0.3);
  // a normal spread of facet angles around 53°: the histogram's peak lies
  // within one sd of the mean
  s.facet_deg = 53.0;
  s.facet_spread = {AngleDistribution::normal, 53.0, 1.0};
  st = texture_statistics(random_pyramids_tile(s));
  EXPECT_NEAR(double(peak_bin(st)) + 0.5, 53.0, 1.0);
  st = texture_statistics(random_inverted_pyramids_tile(s));
  EXPECT_NEAR(double(peak_bin(st)) + 0.5, 53.0, 1.0);
}

}  // namespace
}  // namespace lumtrap::geometry
