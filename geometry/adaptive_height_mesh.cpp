#include "geometry/adaptive_height_mesh.hpp"

#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <stdexcept>
#include <string>
#include <unordered_map>
#include <vector>

namespace lumtrap::geometry {

namespace {

struct Leaf {
  std::int64_t i, j, s;  // corner and side in finest units
};

}  // namespace

TileMesh quadtree_height_mesh(const QuadtreeGrid& grid, const std::function<bool(const QuadtreeCell&)>& accept,
                              const std::function<double(double, double)>& height, QuadtreeStats* stats) {
  if (!(grid.period > 0) || grid.coarse < 1 || grid.levels < 0 || grid.levels > 24 ||
      static_cast<double>(grid.coarse) * (1 << grid.levels) > 1e9)
    throw std::invalid_argument("geometry/adaptive_height_mesh.cpp: grid of " + std::to_string(grid.coarse) +
                                " cells per side and " + std::to_string(grid.levels) +
                                " levels (allowed: period > 0, coarse >= 1, 0..24 levels, at most 1e9 finest cells "
                                "per side)");
  const std::int64_t top = std::int64_t{1} << grid.levels;
  const std::int64_t W = grid.coarse * top;  // finest cells per side
  const double P = grid.period;
  auto coord = [&](std::int64_t k) { return k == W ? P : P * static_cast<double>(k) / static_cast<double>(W); };

  // --- leaves -----------------------------------------------------------------
  std::vector<Leaf> leaves;
  std::vector<Leaf> stack;
  for (std::int64_t cj = 0; cj < grid.coarse; ++cj)
    for (std::int64_t ci = 0; ci < grid.coarse; ++ci) {
      stack.push_back({ci * top, cj * top, top});
      while (!stack.empty()) {
        const Leaf c = stack.back();
        stack.pop_back();
        int level = 0;
        for (std::int64_t s = top; s > c.s; s >>= 1) ++level;
        if (c.s == 1 || accept(QuadtreeCell{coord(c.i), coord(c.j), coord(c.i + c.s) - coord(c.i), level})) {
          leaves.push_back(c);
          continue;
        }
        const std::int64_t h = c.s / 2;
        // pushed in reverse so that the children are visited in order
        stack.push_back({c.i + h, c.j + h, h});
        stack.push_back({c.i, c.j + h, h});
        stack.push_back({c.i + h, c.j, h});
        stack.push_back({c.i, c.j, h});
      }
    }

  // --- which leaf covers each finest cell (its side, as a power of two) ------
  if (static_cast<double>(W) * static_cast<double>(W) > 1.6e9)
    throw std::invalid_argument("geometry/adaptive_height_mesh.cpp: " + std::to_string(W) +
                                " finest cells per side (allowed: at most 40000)");
  std::vector<std::uint8_t> log_side(static_cast<std::size_t>(W) * static_cast<std::size_t>(W));
  for (const Leaf& l : leaves) {
    std::uint8_t e = 0;
    while ((std::int64_t{1} << e) < l.s) ++e;
    for (std::int64_t j = l.j; j < l.j + l.s; ++j)
      std::fill_n(log_side.begin() + static_cast<std::ptrdiff_t>(j * W + l.i), l.s, e);
  }
  auto side_at = [&](std::int64_t i, std::int64_t j) {
    i = (i % W + W) % W;
    j = (j % W + W) % W;
    return std::int64_t{1} << log_side[static_cast<std::size_t>(j * W + i)];
  };

  // --- vertices and triangles ---------------------------------------------------
  // A leaf's edge carries the corners of the finer leaves across it: walking
  // along the edge over the neighbouring leaves (wrapped around the tile, so
  // the edges on x = 0 and x = period see each other's corners) gives them.
  TileMesh mesh;
  mesh.period = P;
  std::unordered_map<std::int64_t, std::uint32_t> ids;
  ids.reserve(leaves.size() + leaves.size() / 2);
  auto vid = [&](std::int64_t i, std::int64_t j) {
    const std::int64_t key = i * (W + 1) + j;
    auto [it, fresh] = ids.try_emplace(key, static_cast<std::uint32_t>(mesh.vertices.size()));
    if (fresh) mesh.vertices.emplace_back(coord(i), coord(j), height(coord(i % W), coord(j % W)));
    return it->second;
  };
  std::vector<std::uint32_t> ring;
  std::vector<std::int64_t> run;
  std::size_t finest = 0;
  for (const Leaf& l : leaves) {
    finest += l.s == 1;
    const std::int64_t i0 = l.i, i1 = l.i + l.s, j0 = l.j, j1 = l.j + l.s;
    ring.clear();
    // edge from corner (a) along direction (dx, dy), the neighbour cells at
    // offset (ox, oy) from the cells along the edge
    auto edge = [&](std::int64_t ai, std::int64_t aj, int dx, int dy, int ox, int oy) {
      ring.push_back(vid(ai, aj));
      if (l.s == 1) return;
      run.clear();
      // positions along the edge measured from its lower end
      const bool along_x = dx != 0;
      const std::int64_t lo = along_x ? i0 : j0;
      for (std::int64_t t = 0; t < l.s;) {
        const std::int64_t ci = along_x ? lo + t : i0 + (ox > 0 ? l.s : -1);
        const std::int64_t cj = along_x ? j0 + (oy > 0 ? l.s : -1) : lo + t;
        const std::int64_t n = side_at(ci, cj);
        if (n >= l.s) break;  // a neighbour as large or larger: no break points
        t += n;
        if (t < l.s) run.push_back(t);
      }
      const bool forward = (along_x ? dx : dy) > 0;
      if (forward)
        for (std::int64_t t : run) ring.push_back(along_x ? vid(lo + t, aj) : vid(ai, lo + t));
      else
        for (auto it = run.rbegin(); it != run.rend(); ++it) ring.push_back(along_x ? vid(lo + *it, aj) : vid(ai, lo + *it));
    };
    edge(i0, j0, 1, 0, 0, -1);   // bottom, neighbours below
    edge(i1, j0, 0, 1, 1, 0);    // right, neighbours to the right
    edge(i1, j1, -1, 0, 0, 1);   // top, neighbours above
    edge(i0, j1, 0, -1, -1, 0);  // left, neighbours to the left
    if (ring.size() == 4) {
      mesh.triangles.push_back({ring[0], ring[1], ring[2]});
      mesh.triangles.push_back({ring[0], ring[2], ring[3]});
    } else {
      const double cx = 0.5 * (coord(i0) + coord(i1)), cy = 0.5 * (coord(j0) + coord(j1));
      const std::uint32_t c = static_cast<std::uint32_t>(mesh.vertices.size());
      mesh.vertices.emplace_back(cx, cy, height(cx, cy));
      for (std::size_t k = 0; k < ring.size(); ++k) mesh.triangles.push_back({c, ring[k], ring[(k + 1) % ring.size()]});
    }
  }
  if (stats) {
    stats->leaves = leaves.size();
    stats->finest_leaves = finest;
    stats->finest_side_um = P / static_cast<double>(W);
  }
  return mesh;
}

}  // namespace lumtrap::geometry
