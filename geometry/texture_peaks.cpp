// Pyramids of a tile mesh by welding, descending flooding and regions. See
// texture_peaks.hpp.
#include "geometry/texture_peaks.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <numbers>
#include <numeric>
#include <unordered_map>

namespace lumtrap::geometry {

namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

struct Nodes {
  std::vector<std::uint32_t> of_vertex;  ///< node of each mesh vertex
  std::vector<double> x, y, z;           ///< per node (x, y in [0, period))
};

// Welds vertices with the same (x, y) modulo the period: quantized keys,
// looking in the neighbouring cells too so that values straddling a cell
// edge still meet.
Nodes weld(const TileMesh& m) {
  const double P = m.period;
  const double tol = 1e-9 * std::max(P, 1.0);
  const auto wrap = [P](double v) {
    double w = std::fmod(v, P);
    if (w < 0) w += P;
    return w;
  };
  const auto key = [](std::int64_t a, std::int64_t b) { return (std::uint64_t(a) * 0x9E3779B97F4A7C15ull) ^ std::uint64_t(b); };
  std::unordered_map<std::uint64_t, std::vector<std::uint32_t>> cells;
  cells.reserve(m.vertices.size());
  Nodes n;
  n.of_vertex.resize(m.vertices.size());
  const std::int64_t q = std::llround(P / tol);  // cells per period: x near P meets x near 0
  for (std::size_t v = 0; v < m.vertices.size(); ++v) {
    double x = wrap(m.vertices[v].x()), y = wrap(m.vertices[v].y());
    if (P - x <= tol) x = 0;
    if (P - y <= tol) y = 0;
    const std::int64_t cx = std::llround(x / tol), cy = std::llround(y / tol);
    std::uint32_t found = std::numeric_limits<std::uint32_t>::max();
    for (std::int64_t dx = -1; dx <= 1 && found == std::numeric_limits<std::uint32_t>::max(); ++dx)
      for (std::int64_t dy = -1; dy <= 1; ++dy) {
        auto it = cells.find(key(((cx + dx) % q + q) % q, ((cy + dy) % q + q) % q));
        if (it == cells.end()) continue;
        for (std::uint32_t c : it->second) {
          double ddx = std::abs(n.x[c] - x), ddy = std::abs(n.y[c] - y);
          ddx = std::min(ddx, P - ddx);
          ddy = std::min(ddy, P - ddy);
          if (ddx <= tol && ddy <= tol) {
            found = c;
            break;
          }
        }
        if (found != std::numeric_limits<std::uint32_t>::max()) break;
      }
    if (found == std::numeric_limits<std::uint32_t>::max()) {
      found = static_cast<std::uint32_t>(n.x.size());
      n.x.push_back(x);
      n.y.push_back(y);
      n.z.push_back(m.vertices[v].z());
      cells[key(((cx % q) + q) % q, ((cy % q) + q) % q)].push_back(found);
    } else {
      n.z[found] = std::max(n.z[found], m.vertices[v].z());
    }
    n.of_vertex[v] = found;
  }
  return n;
}

// Node adjacency (compressed rows) from the triangles' edges.
void adjacency(const TileMesh& m, const Nodes& n, std::vector<std::size_t>& start, std::vector<std::uint32_t>& list) {
  std::vector<std::pair<std::uint32_t, std::uint32_t>> edges;
  edges.reserve(m.triangles.size() * 6);
  for (const auto& t : m.triangles)
    for (int e = 0; e < 3; ++e) {
      const std::uint32_t a = n.of_vertex[t[e]], b = n.of_vertex[t[(e + 1) % 3]];
      if (a == b) continue;
      edges.push_back({a, b});
      edges.push_back({b, a});
    }
  std::sort(edges.begin(), edges.end());
  edges.erase(std::unique(edges.begin(), edges.end()), edges.end());
  start.assign(n.x.size() + 1, 0);
  for (const auto& e : edges) ++start[e.first + 1];
  for (std::size_t i = 0; i < n.x.size(); ++i) start[i + 1] += start[i];
  list.resize(edges.size());
  for (std::size_t i = 0; i < edges.size(); ++i) list[i] = edges[i].second;
}

struct UnionFind {
  std::vector<std::uint32_t> parent;
  std::uint32_t find(std::uint32_t a) {
    while (parent[a] != a) {
      parent[a] = parent[parent[a]];
      a = parent[a];
    }
    return a;
  }
};

}  // namespace

std::vector<FoundPyramid> find_pyramids(const TileMesh& m, const PeakOptions& o) {
  if (m.triangles.empty()) return {};
  const Nodes n = weld(m);
  std::vector<std::size_t> start;
  std::vector<std::uint32_t> adj;
  adjacency(m, n, start, adj);
  const std::size_t N = n.x.size();
  const double P = m.period;

  std::vector<std::uint32_t> order(N);
  std::iota(order.begin(), order.end(), 0u);
  std::sort(order.begin(), order.end(), [&](std::uint32_t a, std::uint32_t b) {
    return n.z[a] > n.z[b] || (n.z[a] == n.z[b] && a < b);
  });

  constexpr std::uint32_t kNone = std::numeric_limits<std::uint32_t>::max();
  UnionFind uf;
  uf.parent.resize(N);
  std::iota(uf.parent.begin(), uf.parent.end(), 0u);
  std::vector<std::uint32_t> peak_of_root(N, kNone);  // the peak node of a component (by its root)
  std::vector<std::uint32_t> label(N, kNone);         // component a node joined (resolve with find)
  std::vector<double> prominence(N, std::numeric_limits<double>::infinity());  // by peak node
  std::vector<std::uint32_t> roots;
  const double zlow = *std::min_element(n.z.begin(), n.z.end());

  for (std::uint32_t v : order) {
    roots.clear();
    std::uint32_t steepest = kNone;
    double best_slope = -std::numeric_limits<double>::infinity();
    for (std::size_t k = start[v]; k < start[v + 1]; ++k) {
      const std::uint32_t w = adj[k];
      if (label[w] == kNone) continue;  // not visited yet
      const std::uint32_t r = uf.find(label[w]);
      if (std::find(roots.begin(), roots.end(), r) == roots.end()) roots.push_back(r);
      double dx = std::abs(n.x[w] - n.x[v]), dy = std::abs(n.y[w] - n.y[v]);
      dx = std::min(dx, P - dx);
      dy = std::min(dy, P - dy);
      const double slope = (n.z[w] - n.z[v]) / std::max(std::hypot(dx, dy), 1e-300);
      if (slope > best_slope) {
        best_slope = slope;
        steepest = w;
      }
    }
    if (roots.empty()) {  // a new peak
      label[v] = v;
      peak_of_root[v] = v;
      continue;
    }
    // The highest peak among the components met survives; the others end here.
    std::uint32_t main = roots[0];
    for (std::uint32_t r : roots) {
      const std::uint32_t pr = peak_of_root[r], pm = peak_of_root[main];
      if (n.z[pr] > n.z[pm] || (n.z[pr] == n.z[pm] && pr < pm)) main = r;
    }
    for (std::uint32_t r : roots) {
      if (r == main) continue;
      const std::uint32_t pr = peak_of_root[r];
      const double prom = n.z[pr] - n.z[v];
      if (prominence[pr] == std::numeric_limits<double>::infinity()) {
        if (prom <= o.min_prominence_um) {
          uf.parent[r] = main;  // the lower peak is not a peak
          prominence[pr] = -1;
        } else {
          prominence[pr] = prom;  // ends here, stays a separate pyramid
        }
      }
    }
    label[v] = uf.find(label[steepest]);
  }

  // Regions: tilted triangles, by the peak of their highest node.
  const double flat_cos = std::cos(o.flat_below_deg * kDeg);
  std::vector<double> area(N, 0.0), tilt_area(N, 0.0);
  for (std::size_t i = 0; i < m.triangles.size(); ++i) {
    const auto& t = m.triangles[i];
    const Eigen::Vector3d& a = m.vertices[t[0]];
    const Eigen::Vector3d cr = (m.vertices[t[1]] - a).cross(m.vertices[t[2]] - a);
    const double len = cr.norm();
    if (!(len > 0) || cr.z() / len > flat_cos) continue;  // flat (or degenerate)
    std::uint32_t top = n.of_vertex[t[0]];
    for (int e = 1; e < 3; ++e) {
      const std::uint32_t c = n.of_vertex[t[e]];
      if (n.z[c] > n.z[top] || (n.z[c] == n.z[top] && c < top)) top = c;
    }
    const std::uint32_t peak = peak_of_root[uf.find(label[top])];
    const double proj = 0.5 * std::abs(cr.z());
    area[peak] += proj;
    tilt_area[peak] += proj * std::atan2(std::hypot(cr.x(), cr.y()), std::abs(cr.z()));
  }

  std::vector<FoundPyramid> out;
  for (std::uint32_t v = 0; v < N; ++v) {
    if (peak_of_root[v] != v || prominence[v] < 0 || !(area[v] > 0)) continue;
    FoundPyramid p;
    p.x_um = n.x[v];
    p.y_um = n.y[v];
    p.apex_z_um = n.z[v];
    p.prominence_um = std::isinf(prominence[v]) ? n.z[v] - zlow : prominence[v];
    p.projected_area_um2 = area[v];
    const double tilt = tilt_area[v] / area[v];
    p.facet_deg = tilt / kDeg;
    p.visible_side_um = std::sqrt(area[v]);
    p.base_from_height_um = 2.0 * p.apex_z_um / std::tan(tilt);
    out.push_back(p);
  }
  std::sort(out.begin(), out.end(), [](const FoundPyramid& a, const FoundPyramid& b) {
    return a.apex_z_um > b.apex_z_um || (a.apex_z_um == b.apex_z_um && (a.x_um < b.x_um || (a.x_um == b.x_um && a.y_um < b.y_um)));
  });
  return out;
}

}  // namespace lumtrap::geometry
