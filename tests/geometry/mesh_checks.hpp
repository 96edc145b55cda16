#pragma once
// Independent checks of a tile mesh used by the geometry tests: which
// triangles contain a point in projection, the height there, the facet
// angles, and the periodic twins of the boundary edges.
#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <random>
#include <vector>

#include "geometry/mesh.hpp"

namespace lumtrap::geometry::testing {

/// Finds the triangles whose xy projection contains a point (a bin grid over
/// the triangles' bounding boxes).
class PointLocator {
 public:
  explicit PointLocator(const TileMesh& m, int bins = 0) : m_(m) {
    n_ = bins > 0 ? bins : std::max(1, static_cast<int>(std::sqrt(m.triangles.size() / 4.0)));
    cell_ = m.period / n_;
    bins_.resize(static_cast<std::size_t>(n_) * n_);
    for (std::uint32_t t = 0; t < m.triangles.size(); ++t) {
      double x0 = 1e300, x1 = -1e300, y0 = 1e300, y1 = -1e300;
      for (auto v : m.triangles[t]) {
        x0 = std::min(x0, m.vertices[v].x());
        x1 = std::max(x1, m.vertices[v].x());
        y0 = std::min(y0, m.vertices[v].y());
        y1 = std::max(y1, m.vertices[v].y());
      }
      for (int j = clampi(y0 / cell_ - 1e-9); j <= clampi(y1 / cell_ + 1e-9); ++j)
        for (int i = clampi(x0 / cell_ - 1e-9); i <= clampi(x1 / cell_ + 1e-9); ++i)
          bins_[static_cast<std::size_t>(j) * n_ + i].push_back(t);
    }
  }

  /// Number of triangles containing (x, y) in projection; `z` gets the
  /// height of the last one, `near_edge` is set if the point lies within
  /// `edge_tol` (µm) of an edge of a triangle near it (the caller jitters).
  int count(double x, double y, double edge_tol, double& z, bool& near_edge) const {
    near_edge = false;
    int hits = 0;
    for (std::uint32_t t : bins_[static_cast<std::size_t>(clampi(y / cell_)) * n_ + clampi(x / cell_)]) {
      const auto& tri = m_.triangles[t];
      const Eigen::Vector3d& a = m_.vertices[tri[0]];
      const Eigen::Vector3d& b = m_.vertices[tri[1]];
      const Eigen::Vector3d& c = m_.vertices[tri[2]];
      // signed distances of (x, y) from the three edges (> 0 inside for CCW)
      const double d0 = edge_distance(a, b, x, y), d1 = edge_distance(b, c, x, y), d2 = edge_distance(c, a, x, y);
      const double dmin = std::min({d0, d1, d2});
      if (std::abs(dmin) < edge_tol) {
        near_edge = true;
        continue;
      }
      if (dmin > 0) {
        ++hits;
        const double area = (b.x() - a.x()) * (c.y() - a.y()) - (b.y() - a.y()) * (c.x() - a.x());
        const double wa = ((b.x() - x) * (c.y() - y) - (b.y() - y) * (c.x() - x)) / area;
        const double wb = ((c.x() - x) * (a.y() - y) - (c.y() - y) * (a.x() - x)) / area;
        z = wa * a.z() + wb * b.z() + (1 - wa - wb) * c.z();
      }
    }
    return hits;
  }

 private:
  int clampi(double v) const { return std::clamp(static_cast<int>(std::floor(v)), 0, n_ - 1); }
  static double edge_distance(const Eigen::Vector3d& p, const Eigen::Vector3d& q, double x, double y) {
    const double ex = q.x() - p.x(), ey = q.y() - p.y();
    const double len = std::hypot(ex, ey);
    return (ex * (y - p.y()) - ey * (x - p.x())) / len;
  }

  const TileMesh& m_;
  int n_ = 1;
  double cell_ = 1;
  std::vector<std::vector<std::uint32_t>> bins_;
};

struct CoverageResult {
  int samples = 0;
  int uncovered = 0;   ///< points in no triangle
  int overlapped = 0;  ///< points in more than one triangle
  int undecided = 0;   ///< points still on an edge after jittering
};

/// Samples an n x n jittered grid over the tile; each point must lie in
/// exactly one triangle. Points within 1e-9 µm of an edge are moved by a
/// random jitter and tried again. `at` is called with (x, y, z_mesh) for every
/// point found in exactly one triangle.
template <class F>
CoverageResult check_coverage(const TileMesh& m, int n, std::uint64_t seed, F&& at) {
  PointLocator loc(m);
  std::mt19937_64 rng(seed);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  CoverageResult r;
  const double cell = m.period / n;
  for (int j = 0; j < n; ++j)
    for (int i = 0; i < n; ++i) {
      ++r.samples;
      bool done = false;
      for (int attempt = 0; attempt < 20 && !done; ++attempt) {
        const double x = (i + u(rng)) * cell, y = (j + u(rng)) * cell;
        double z = 0;
        bool near = false;
        const int hits = loc.count(x, y, 1e-9, z, near);
        if (near) continue;
        done = true;
        if (hits == 0) ++r.uncovered;
        if (hits > 1) ++r.overlapped;
        if (hits == 1) at(x, y, z);
      }
      if (!done) ++r.undecided;
    }
  return r;
}

struct Segment {
  double s0, s1;  ///< positions along the tile edge, s0 < s1
  double z0, z1;  ///< heights at s0 and s1
};

/// The triangle edges lying on the line x = c (axis 0) or y = c (axis 1),
/// sorted along the line.
inline std::vector<Segment> edges_on_line(const TileMesh& m, int axis, double c) {
  std::vector<Segment> out;
  const int along = 1 - axis;
  for (const auto& t : m.triangles)
    for (int e = 0; e < 3; ++e) {
      const Eigen::Vector3d& p = m.vertices[t[e]];
      const Eigen::Vector3d& q = m.vertices[t[(e + 1) % 3]];
      if (p[axis] != c || q[axis] != c) continue;
      Segment s{p[along], q[along], p.z(), q.z()};
      if (s.s0 > s.s1) {
        std::swap(s.s0, s.s1);
        std::swap(s.z0, s.z1);
      }
      out.push_back(s);
    }
  std::sort(out.begin(), out.end(), [](const Segment& a, const Segment& b) { return a.s0 < b.s0; });
  return out;
}

struct SeamResult {
  bool chains_ok = true;  ///< both sides covered from 0 to period, no gap, no overlap
  bool twins_ok = true;   ///< same number of segments, equal ends and heights
  std::size_t segments = 0;
  double worst = 0;       ///< largest mismatch found, µm
};

/// Boundary edges on x = 0 vs x = period (axis 0) or y = 0 vs y = period
/// (axis 1): every edge must have its periodic twin.
inline SeamResult check_seam(const TileMesh& m, int axis, double tol) {
  const double P = m.period;
  const auto lo = edges_on_line(m, axis, 0.0), hi = edges_on_line(m, axis, P);
  SeamResult r;
  r.segments = lo.size();
  for (const auto* side : {&lo, &hi}) {
    double at = 0.0;
    for (const Segment& s : *side) {
      r.worst = std::max(r.worst, std::abs(s.s0 - at));
      if (std::abs(s.s0 - at) > tol) r.chains_ok = false;
      at = s.s1;
    }
    r.worst = std::max(r.worst, std::abs(at - P));
    if (std::abs(at - P) > tol) r.chains_ok = false;
  }
  if (lo.size() != hi.size()) {
    r.twins_ok = false;
    return r;
  }
  for (std::size_t k = 0; k < lo.size(); ++k) {
    const double d = std::max({std::abs(lo[k].s0 - hi[k].s0), std::abs(lo[k].s1 - hi[k].s1),
                               std::abs(lo[k].z0 - hi[k].z0), std::abs(lo[k].z1 - hi[k].z1)});
    r.worst = std::max(r.worst, d);
    if (d > tol) r.twins_ok = false;
  }
  return r;
}

struct FacetAngleResult {
  std::size_t facets = 0;      ///< non-flat triangles
  std::size_t flat = 0;        ///< triangles with an upward normal
  std::size_t bad_angle = 0;   ///< tilt off the facet angle by more than tol
  std::size_t bad_azimuth = 0; ///< horizontal normal not along ±x or ±y
  std::size_t downward = 0;    ///< normal with z <= 0
  double worst_angle = 0;      ///< largest tilt error, rad
};

/// Every triangle must be flat (normal +z) or tilted by exactly facet_rad with
/// its normal's horizontal part along ±x or ±y.
inline FacetAngleResult check_facet_angles(const TileMesh& m, double facet_rad, double tol) {
  FacetAngleResult r;
  for (std::size_t i = 0; i < m.triangles.size(); ++i) {
    const Eigen::Vector3d n = m.normal(i);
    if (!(n.z() > 0)) {
      ++r.downward;
      continue;
    }
    const double horiz = std::hypot(n.x(), n.y());
    if (horiz < tol) {
      ++r.flat;
      continue;
    }
    ++r.facets;
    const double tilt = std::atan2(horiz, n.z());
    r.worst_angle = std::max(r.worst_angle, std::abs(tilt - facet_rad));
    if (std::abs(tilt - facet_rad) > tol) ++r.bad_angle;
    if (std::min(std::abs(n.x()), std::abs(n.y())) > tol * horiz) ++r.bad_azimuth;
  }
  return r;
}

}  // namespace lumtrap::geometry::testing
