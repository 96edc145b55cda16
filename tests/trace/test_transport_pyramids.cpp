// Regular upright pyramids, bare silicon, normal incidence, a wafer thick
// enough that nothing comes back from the bulk: the tracer's front
// reflectance, and the part of it leaving after exactly 2 and 3 facet hits,
// against an independent calculation written here: analytic facet planes of
// the pyramid lattice (no Embree, no mesh), the Fresnel amplitude equations
// for an absorbing medium (Born & Wolf, Principles of Optics, 7th ed., 1999,
// §1.5.2 and §14.2) and the field carried through every reflection.
// Tolerance: 4σ of the tracer's binomial standard error + 1e-4.
#include <numbers>
#include <Eigen/Geometry>
#include <complex>
#include <fmt/format.h>
#include <iostream>

#include "optics/material.hpp"
#include "trace_test_util.hpp"

namespace lumtrap {
namespace {

using C = std::complex<double>;
using V = Eigen::Vector3d;
using CV = Eigen::Vector3cd;

struct PathResult {
  int hits = 0;
  double reflectance = 0;  // |E_out|^2 for |E_in| = 1
};

// One ray through the pyramid lattice (period P, facet angle a), from
// (x0, y0) above the apices straight down, for the incident field e0.
PathResult analytic_path(double P, double a_rad, C n_si, double x0, double y0, const V& e0) {
  const double t = std::tan(a_rad), h = 0.5 * P * t;
  V o(x0, y0, h + 1.0), d(0, 0, -1);
  CV E = e0.cast<C>();
  PathResult res;
  for (int bounce = 0; bounce < 20; ++bounce) {
    // nearest facet hit among the cells around the ray
    const int ci = int(std::floor(o.x() / P)), cj = int(std::floor(o.y() / P));
    double best = 1e300;
    V best_n;
    for (int i = ci - 3; i <= ci + 3; ++i)
      for (int j = cj - 3; j <= cj + 3; ++j) {
        const double cx = (i + 0.5) * P, cy = (j + 0.5) * P;
        // facets: z = h - t * (s_x (x - cx)) for +-x, likewise for +-y
        for (int f = 0; f < 4; ++f) {
          const int axis = f / 2;            // 0: x-facing, 1: y-facing
          const double sg = f % 2 ? -1 : 1;  // facing +axis or -axis
          const double oc = axis == 0 ? o.x() - cx : o.y() - cy;
          const double dc = axis == 0 ? d.x() : d.y();
          const double denom = d.z() + t * sg * dc;
          if (std::abs(denom) < 1e-15) continue;
          const double s = (h - t * sg * oc - o.z()) / denom;
          if (s <= 1e-9 || s >= best) continue;
          const V q = o + s * d;
          const double u = sg * (axis == 0 ? q.x() - cx : q.y() - cy);   // along the facet's axis
          const double w = axis == 0 ? q.y() - cy : q.x() - cx;          // across
          if (u < -1e-12 || u > 0.5 * P + 1e-12 || std::abs(w) > u + 1e-12) continue;
          best = s;
          V n = axis == 0 ? V(sg * t, 0, 1) : V(0, sg * t, 1);
          best_n = n.normalized();
        }
      }
    if (best == 1e300) break;  // leaves upwards
    o += best * d;
    ++res.hits;
    // Fresnel reflection from air (n = 1) on silicon (n_si), s/p frame of
    // the incident and reflected waves, p = k x s.
    const V m = best_n;  // normal on the incident (air) side
    const double c1 = -d.dot(m);
    const C c2 = std::sqrt(C(1.0) - (1.0 - c1 * c1) / (n_si * n_si));
    const C rs = (c1 - n_si * c2) / (c1 + n_si * c2);
    const C rp = (n_si * c1 - c2) / (n_si * c1 + c2);
    V s = d.cross(m);
    s = s.norm() > 1e-12 ? s.normalized() : V(1, 0, 0).cross(d).normalized();
    const V p_in = d.cross(s);
    const V dr = d + 2 * c1 * m;
    const V p_out = dr.cross(s);
    const C Es = E.cwiseProduct(s.cast<C>()).sum(), Ep = E.cwiseProduct(p_in.cast<C>()).sum();
    E = rs * Es * s.cast<C>() + rp * Ep * p_out.cast<C>();
    d = dr;
    o += 1e-9 * m;
  }
  res.reflectance = E.squaredNorm();
  return res;
}

struct Expected {
  double R = 0, R2 = 0, R3 = 0, geometric3 = 0;
};

Expected analytic(double P, double a_rad, C n_si, int grid) {
  Expected e;
  for (int ix = 0; ix < grid; ++ix)
    for (int iy = 0; iy < grid; ++iy) {
      const double x = (ix + 0.5) / grid * P, y = (iy + 0.5) / grid * P;
      for (const V& pol : {V(1, 0, 0), V(0, 1, 0)}) {  // unpolarized = mean of two orthogonal states
        const PathResult r = analytic_path(P, a_rad, n_si, x, y, pol);
        const double w = 0.5 / (double(grid) * grid);
        e.R += w * r.reflectance;
        if (r.hits == 2) e.R2 += w * r.reflectance;
        if (r.hits == 3) {
          e.R3 += w * r.reflectance;
          e.geometric3 += w;
        }
      }
    }
  return e;
}

TEST(TransportPyramids, RegularUprightPyramidsMatchAnalyticFacetTracing) {
  const Scene scene = test::scene_from_text(R"(
[wafer]
thickness = "1000 um"
[front]
texture = "upright_pyramids"
[front.pyramids]
base = "10 um"
gap = "0 um"
[rear]
medium = "air"
[illumination]
wavelengths = ["500 nm", "700 nm", "900 nm"]
[run]
photons = 1
seed = 5
)");
  const std::uint64_t N = 40000;
  auto run = prepare_run(scene);
  const auto tallies = test::trace_all(*run, N);
  const Material si = find_material("si_green2008");
  const double a = scene.front.texture.number("facet_angle") * std::numbers::pi / 180.0;
  for (std::size_t i = 0; i < tallies.size(); ++i) {
    const double lam = scene.illumination.wavelengths_nm[i];
    const Expected e = analytic(10.0, a, si.index_at(lam), 300);
    const auto& t = tallies[i];
    const double R = double(ended_in(run->layout, t, EndState::reflected_front)) / N, R2 = double(t.front_hits[2]) / N, R3 = double(t.front_hits[3]) / N;
    std::cout << fmt::format("{} nm: R traced {:.5f} analytic {:.5f}; after 2 hits {:.5f} / {:.5f}; after 3 hits "
                             "{:.5f} / {:.5f}; rays with 3 hits (geometric) {:.4f}\n",
                             lam, R, e.R, R2, e.R2, R3, e.R3, e.geometric3);
    EXPECT_NEAR(R, e.R, 4 * test::sigma_of(ended_in(run->layout, t, EndState::reflected_front), N) + 1e-4) << lam;
    EXPECT_NEAR(R2, e.R2, 4 * test::sigma_of(t.front_hits[2], N) + 1e-4) << lam;
    EXPECT_NEAR(R3, e.R3, 4 * test::sigma_of(t.front_hits[3], N) + 1e-4) << lam;
    EXPECT_EQ(t.front_hits[0] + t.front_hits[1], 0u);  // normal incidence: at least two hits
    EXPECT_LE(double(ended_in(run->layout, t, EndState::escaped_front)) / N, 1e-4);               // nothing returns from 1 mm of silicon
    EXPECT_EQ(ended_in(run->layout, t, EndState::lost), 0u);
  }
}

// The part of the light taking three facet hits instead of two depends on the
// facet angle: at normal incidence a ray reflected by one facet leaves at
// 180° - 2θ from the downward vertical towards the facing facet of the next
// pyramid, and whether its second reflection clears the pyramids or meets a
// third facet follows from the facet planes alone. The tracer's counts after 2 and 3 front hits against
// the analytic facet tracing above (Fresnel-weighted), for two facet angles,
// and the geometric fraction of rays with three hits moving the same way.
TEST(TransportPyramids, ThreeHitFractionFollowsTheFacetAngle) {
  const std::uint64_t N = 40000;
  const Material si = find_material("si_green2008");
  double traced3[2] = {0, 0}, analytic3[2] = {0, 0}, sigma3[2] = {0, 0};
  const double angles[2] = {50.0, 54.7356103172};
  for (int k = 0; k < 2; ++k) {
    const Scene scene = test::scene_from_text(fmt::format(R"(
[wafer]
thickness = "1000 um"
[front]
texture = "upright_pyramids"
[front.pyramids]
base = "10 um"
facet_angle = "{} deg"
[rear]
medium = "air"
[illumination]
wavelengths = ["800 nm"]
[run]
photons = 1
seed = 11
)", angles[k]), fmt::format("facet_{}", k));
    auto run = prepare_run(scene);
    const auto t = test::trace_all(*run, N)[0];
    const Expected e = analytic(10.0, angles[k] * std::numbers::pi / 180.0, si.index_at(800.0), 300);
    const double R2 = double(t.front_hits[2]) / N, R3 = double(t.front_hits[3]) / N;
    std::cout << fmt::format("facet {:.2f} deg: after 2 hits traced {:.5f} analytic {:.5f}; after 3 hits traced {:.5f} "
                             "analytic {:.5f}; rays with 3 hits (geometric) {:.4f}\n",
                             angles[k], R2, e.R2, R3, e.R3, e.geometric3);
    EXPECT_NEAR(R2, e.R2, 4 * test::sigma_of(t.front_hits[2], N) + 1e-4);
    EXPECT_NEAR(R3, e.R3, 4 * test::sigma_of(t.front_hits[3], N) + 1e-4);
    traced3[k] = R3;
    analytic3[k] = e.geometric3;
    sigma3[k] = test::sigma_of(t.front_hits[3], N);
  }
  // the analytic geometry tells which way the three-hit share moves
  ASSERT_GT(std::abs(analytic3[1] - analytic3[0]), 0.01);
  const double moved = (traced3[1] - traced3[0]) * (analytic3[1] - analytic3[0]);
  EXPECT_GT(moved, 0) << "three-hit share moves against the facet-plane calculation";
  EXPECT_GT(std::abs(traced3[1] - traced3[0]), 4 * std::hypot(sigma3[0], sigma3[1]));
}

}  // namespace
}  // namespace lumtrap
