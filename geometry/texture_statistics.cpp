// Facet angles, heights, flat fraction, area ratio and pyramids of a tile
// mesh. See texture_statistics.hpp.
#include "geometry/texture_statistics.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <numbers>

namespace lumtrap::geometry {

namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

// The height z(x, y) of a plane triangle over its projected area, heights
// sorted z0 <= z1 <= z2: F(h) = fraction of the area with z <= h, and
// G(h) = ∫_{-∞}^{h} F(t) dt (so that E[(h - z)+] = G(h)).
struct TriangleHeights {
  double z0, z1, z2;

  double F(double h) const {
    if (h <= z0) return 0.0;
    if (h >= z2) return 1.0;
    const double span = z2 - z0;
    if (h <= z1) return (h - z0) * (h - z0) / (span * (z1 - z0));
    return 1.0 - (z2 - h) * (z2 - h) / (span * (z2 - z1));
  }
  double G(double h) const {
    if (h <= z0) return 0.0;
    const double span = z2 - z0;
    if (!(span > 0)) return h - z0;
    if (h >= z2) return G_top() + (h - z2);
    if (h <= z1) return (h - z0) * (h - z0) * (h - z0) / (3.0 * span * (z1 - z0));
    const double a = z2 - z1, b = z2 - h;
    return (z1 - z0) * (z1 - z0) / (3.0 * span) + (h - z1) - (a * a * a - b * b * b) / (3.0 * span * a);
  }
  double G_top() const {  // G(z2) = z2 - mean
    return z2 - (z0 + z1 + z2) / 3.0;
  }
};

// Bin width for pyramid sizes: a round number giving about 20 bins up to `largest`.
double size_bin_width(double largest) {
  if (!(largest > 0)) return 1.0;
  const double raw = largest / 20.0;
  const double decade = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 2.5, 5.0, 10.0})
    if (m * decade >= raw) return m * decade;
  return 10.0 * decade;
}

}  // namespace

TextureStatistics texture_statistics(const TileMesh& m, const StatisticsOptions& o) {
  TextureStatistics s;
  s.period_um = m.period;
  s.triangles = m.triangles.size();
  s.flat_below_deg = o.flat_below_deg;
  s.min_z_um = m.min_z();
  s.max_z_um = m.max_z();
  s.sz_um = s.max_z_um - s.min_z_um;

  const std::size_t angle_bins = std::max<std::size_t>(1, std::size_t(std::ceil(90.0 / o.angle_bin_deg - 1e-9)));
  s.facet_angles.resize(angle_bins);
  for (std::size_t k = 0; k < angle_bins; ++k)
    s.facet_angles[k] = {double(k) * o.angle_bin_deg, std::min(90.0, double(k + 1) * o.angle_bin_deg), 0, 0};
  const std::size_t hb = std::max<std::size_t>(1, o.height_bins);
  s.heights.resize(hb);
  const double hw = (s.max_z_um - s.min_z_um) / double(hb);
  for (std::size_t k = 0; k < hb; ++k)
    s.heights[k] = {s.min_z_um + double(k) * hw, k + 1 == hb ? s.max_z_um : s.min_z_um + double(k + 1) * hw, 0};

  // Heights are taken relative to min_z for round-off.
  const double z0 = s.min_z_um;
  double proj = 0, surf = 0, flat = 0, tilted = 0, tilted_angle = 0, zsum = 0, z2sum = 0;
  std::vector<TriangleHeights> th(m.triangles.size());
  std::vector<double> tri_proj(m.triangles.size());
  for (std::size_t i = 0; i < m.triangles.size(); ++i) {
    const auto& t = m.triangles[i];
    const Eigen::Vector3d& a = m.vertices[t[0]];
    const Eigen::Vector3d cr = (m.vertices[t[1]] - a).cross(m.vertices[t[2]] - a);
    const double area = 0.5 * cr.norm(), pa = 0.5 * std::abs(cr.z());
    const double tilt = std::atan2(std::hypot(cr.x(), cr.y()), std::abs(cr.z())) / kDeg;
    proj += pa;
    surf += area;
    const std::size_t k = std::min(angle_bins - 1, std::size_t(tilt / o.angle_bin_deg));
    s.facet_angles[k].surface_fraction += area;
    s.facet_angles[k].projected_fraction += pa;
    if (tilt < o.flat_below_deg) {
      flat += pa;
    } else {
      tilted += pa;
      tilted_angle += pa * tilt;
    }
    std::array<double, 3> z = {a.z() - z0, m.vertices[t[1]].z() - z0, m.vertices[t[2]].z() - z0};
    std::sort(z.begin(), z.end());
    th[i] = {z[0], z[1], z[2]};
    tri_proj[i] = pa;
    zsum += pa * (z[0] + z[1] + z[2]) / 3.0;
    // ∫ z² over a triangle = area/6 · (z0² + z1² + z2² + z0 z1 + z1 z2 + z0 z2)
    z2sum += pa / 6.0 * (z[0] * z[0] + z[1] * z[1] + z[2] * z[2] + z[0] * z[1] + z[1] * z[2] + z[0] * z[2]);
    // the triangle's share of each height bin it spans
    if (!(hw > 0)) {
      s.heights[0].projected_fraction += pa;
      continue;
    }
    const std::size_t lo = std::min(hb - 1, std::size_t(z[0] / hw)), hi = std::min(hb - 1, std::size_t(z[2] / hw));
    double below = 0;
    for (std::size_t b = lo; b <= hi; ++b) {
      const double top = b + 1 == hb ? z[2] + 1.0 : double(b + 1) * hw;
      const double f = th[i].F(top);
      s.heights[b].projected_fraction += pa * (f - below);
      below = f;
    }
  }
  s.projected_area_um2 = proj;
  s.surface_area_um2 = surf;
  s.surface_area_ratio = proj > 0 ? surf / proj : 0;
  s.flat_fraction = proj > 0 ? flat / proj : 0;
  s.mean_facet_deg = tilted > 0 ? tilted_angle / tilted : 0;
  for (auto& b : s.facet_angles) {
    b.surface_fraction = surf > 0 ? b.surface_fraction / surf : 0;
    b.projected_fraction = proj > 0 ? b.projected_fraction / proj : 0;
  }
  for (auto& b : s.heights) b.projected_fraction = proj > 0 ? b.projected_fraction / proj : 0;
  const double mean = proj > 0 ? zsum / proj : 0;
  s.mean_z_um = z0 + mean;
  s.sq_um = proj > 0 ? std::sqrt(std::max(0.0, z2sum / proj - mean * mean)) : 0;
  // Sa: E|z - mean| = E[z - mean] + 2 E[(mean - z)+] = 2 Σ area·G(mean) / Σ area.
  double sa = 0;
  for (std::size_t i = 0; i < th.size(); ++i) sa += tri_proj[i] * th[i].G(mean);
  s.sa_um = proj > 0 ? 2.0 * sa / proj : 0;

  s.pyramids = find_pyramids(m, {o.flat_below_deg, o.min_prominence_um});
  s.pyramids_per_mm2 = proj > 0 ? double(s.pyramids.size()) / proj * 1e6 : 0;
  double largest = 0;
  for (const auto& p : s.pyramids) largest = std::max({largest, p.base_from_height_um, p.visible_side_um});
  const double w = o.size_bin_um > 0 ? o.size_bin_um : size_bin_width(largest);
  if (!s.pyramids.empty()) {
    const std::size_t nb = std::size_t(std::floor(largest / w)) + 1;
    s.pyramid_sizes.resize(nb);
    for (std::size_t k = 0; k < nb; ++k) s.pyramid_sizes[k] = {double(k) * w, double(k + 1) * w, 0, 0};
    for (const auto& p : s.pyramids) {
      ++s.pyramid_sizes[std::min(nb - 1, std::size_t(p.base_from_height_um / w))].by_base_from_height;
      ++s.pyramid_sizes[std::min(nb - 1, std::size_t(p.visible_side_um / w))].by_visible_side;
    }
  }
  return s;
}

}  // namespace lumtrap::geometry
