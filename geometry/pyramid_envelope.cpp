#include "geometry/pyramid_envelope.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <exception>
#include <limits>
#include <numbers>
#include <stdexcept>
#include <string>
#include <thread>
#include <vector>

#include "geometry/convex_polygon.hpp"
#include "geometry/facet_horizon.hpp"
#include "geometry/tile_grid.hpp"

namespace lumtrap::geometry {

namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

// One periodic image of a pyramid that reaches into the tile.
struct Instance {
  double cx = 0, cy = 0, a = 0;          // centre (image coordinates), half base, µm
  double x0 = 0, x1 = 0, y0 = 0, y1 = 0;  // base square, µm
  std::uint32_t pid = 0;                 // index of the pyramid in the layout
  int mx = 0, my = 0;                    // image shift in periods
};

// Tie-break where two facet planes coincide: the lower pyramid index, then the
// lower image shift, keeps the area. Shifts are compared only with each
// other, so the rule is the same in every periodic copy of the tile.
bool has_priority(const Instance& k, const Instance& i) {
  if (k.pid != i.pid) return k.pid < i.pid;
  if (k.mx != i.mx) return k.mx < i.mx;
  return k.my < i.my;
}

// Facet directions d = +x, -x, +y, -y: outward horizontal normal n =
// (kNx[d], kNy[d]); m = n turned +90° is direction kM[d]; -d is d ^ 1. The
// facet plane of a pyramid centred at c with half base a is
// z = tan(facet)·(a - n·(p - c)).
constexpr int kNx[4] = {1, -1, 0, 0};
constexpr int kNy[4] = {0, 0, 1, -1};
constexpr int kM[4] = {2, 3, 1, 0};

// The plane a mesh piece lies in.
struct Plane {
  double cx = 0, cy = 0, a = 0;
  int nx = 0, ny = 0;
  bool flat = true;
};

// Items listed per bin of a grid (compressed rows).
struct BinIndex {
  std::vector<std::uint32_t> start;
  std::vector<std::uint32_t> items;

  // ranges(k, put) calls put(bin) for every bin item k goes in.
  template <class Ranges>
  void build(std::size_t nbins, std::size_t nitems, Ranges ranges) {
    start.assign(nbins + 1, 0);
    for (std::size_t k = 0; k < nitems; ++k) ranges(k, [&](std::size_t b) { ++start[b + 1]; });
    for (std::size_t b = 0; b < nbins; ++b) start[b + 1] += start[b];
    items.resize(start[nbins]);
    std::vector<std::uint32_t> fill(start.begin(), start.end() - 1);
    for (std::size_t k = 0; k < nitems; ++k)
      ranges(k, [&](std::size_t b) { items[fill[b]++] = static_cast<std::uint32_t>(k); });
  }
};

class MeshWriter {
 public:
  MeshWriter(TileMesh& mesh, double tan_facet, double thin) : m_(mesh), t_(tan_facet), thin_(thin) {}

  double z(const Plane& pl, Point2 p) const {
    if (pl.flat) return 0.0;
    const double zz = t_ * (pl.a - (pl.nx * (p.x - pl.cx) + pl.ny * (p.y - pl.cy)));
    return zz > 0.0 ? zz : 0.0;
  }

  std::uint32_t vertex(double x, double y, double z) {
    m_.vertices.emplace_back(x, y, z);
    return static_cast<std::uint32_t>(m_.vertices.size() - 1);
  }

  // Adds triangle (i, j, k) if it is counter-clockwise and its height over
  // its longest edge is at least `thin` (µm; default: the cut tolerance).
  void triangle(std::uint32_t i, std::uint32_t j, std::uint32_t k) { triangle(i, j, k, thin_); }
  void triangle(std::uint32_t i, std::uint32_t j, std::uint32_t k, double thin) {
    const auto &a = m_.vertices[i], &b = m_.vertices[j], &c = m_.vertices[k];
    const double twice = (b.x() - a.x()) * (c.y() - a.y()) - (b.y() - a.y()) * (c.x() - a.x());
    if (!(twice > 0)) return;
    const double e2 = std::max({(b - a).head<2>().squaredNorm(), (c - b).head<2>().squaredNorm(),
                                (a - c).head<2>().squaredNorm()});
    if (twice * twice >= thin * thin * e2) m_.triangles.push_back({i, j, k});
  }

  // Fans a convex polygon (global coordinates) from its first vertex, or from
  // its centroid when it has collinear boundary vertices.
  void fan(const Point2* v, int n, const Plane& pl, bool from_centroid) {
    if (n < 3) return;
    const std::uint32_t base = static_cast<std::uint32_t>(m_.vertices.size());
    for (int i = 0; i < n; ++i) vertex(v[i].x, v[i].y, z(pl, v[i]));
    if (from_centroid) {
      Point2 c{0, 0};
      for (int i = 0; i < n; ++i) {
        c.x += v[i].x / n;
        c.y += v[i].y / n;
      }
      const std::uint32_t ci = vertex(c.x, c.y, z(pl, c));
      for (int i = 0; i < n; ++i) triangle(ci, base + i, base + (i + 1) % n);
    } else {
      for (int i = 1; i + 1 < n; ++i) triangle(base, base + i, base + i + 1);
    }
  }

 private:
  TileMesh& m_;
  double t_;
  double thin_;
};

// Convex pieces touching the tile boundary, kept until all boundary
// vertices are known.
struct Held {
  std::uint32_t first, count;
  Plane plane;
};

// What meshing a range of pyramid images produces.
struct Part {
  TileMesh mesh;
  std::vector<Held> held;
  std::vector<Point2> held_pts;
  std::vector<std::uint32_t> visible;  // pids with a visible facet
  std::size_t facets = 0;
};

struct Context {
  double P = 0, tan_facet = 0, eps = 0, eps_tile = 0;
  double sliver = 0;  // fan triangles from an apex thinner than this are dropped, µm
  TileGrid grid;
  std::vector<Instance> inst;
  BinIndex index;  // instances per bin of grid

  double snap_tile(double v) const {
    if (std::abs(v) <= eps_tile) return 0.0;
    if (std::abs(v - P) <= eps_tile) return P;
    return v;
  }
  bool on_boundary(Point2 q) const { return q.x == 0.0 || q.x == P || q.y == 0.0 || q.y == P; }
};

// Emits a convex piece in global coordinates: fanned now, or held if it
// touches the tile boundary.
void emit(const Context& cx, const std::vector<Point2>& g, const Plane& pl, MeshWriter& writer, Part& out) {
  bool on_edge = false;
  for (const Point2& q : g) on_edge = on_edge || cx.on_boundary(q);
  if (on_edge) {
    out.held.push_back({static_cast<std::uint32_t>(out.held_pts.size()), static_cast<std::uint32_t>(g.size()), pl});
    out.held_pts.insert(out.held_pts.end(), g.begin(), g.end());
  } else {
    writer.fan(g.data(), static_cast<int>(g.size()), pl, false);
  }
}

// Meshes the visible facets of instances [begin, end).
//
// Neighbour K against facet d of pyramid I: plane j of K (outward normal n_j)
// minus I's facet plane f, over tan(facet), in the facet frame (u along n, w
// along m, v = w/u, s = 1/u; see facet_horizon.hpp), times s, is
//   (1 - n_j·n) - v·(n_j·m) + C_j·s,   C_j = (a_K - a_I) - n_j·(c_I - c_K),
// C_j being how far K's base square reaches past I's in direction n_j. For
// j = n it is a constant (K's facet parallel to f): K can rise above f only
// if C_n >= 0. For j = -n, m, -m it bounds s from above when C_j < 0:
// kappa = 2/(-C_-n), alpha = 1/(-C_m), beta = 1/(-C_-m).
void mesh_facets(const Context& cx, std::size_t begin, std::size_t end, std::size_t reserve_for, Part& out) {
  const double P = cx.P, eps = cx.eps, t = cx.tan_facet;
  const TileGrid& grid = cx.grid;
  const std::vector<Instance>& inst = cx.inst;
  out.mesh.period = P;
  // Room for about as many triangles as dense random textures need (pages
  // reserved but never written cost no memory).
  out.mesh.vertices.reserve(20 * reserve_for + 64);
  out.mesh.triangles.reserve(16 * reserve_for + 64);
  MeshWriter writer(out.mesh, t, eps);
  struct Near {
    double a;
    std::uint32_t k;
    double C[4];  // reach past I in directions +x, -x, +y, -y
  };
  std::vector<Near> near;
  std::vector<std::uint32_t> stamp(inst.size(), 0), cands;
  std::uint32_t stamp_now = 0;
  FacetHorizon horizon[4];
  std::vector<Point2> outlines[4], gpts;

  for (std::size_t ii = begin; ii < end; ++ii) {
    const Instance& I = inst[ii];
    ++stamp_now;
    cands.clear();
    const int bi0 = grid.first(std::max(I.x0, 0.0)), bi1 = grid.last(std::min(I.x1, P));
    const int bj0 = grid.first(std::max(I.y0, 0.0)), bj1 = grid.last(std::min(I.y1, P));
    for (int j = bj0; j <= bj1; ++j)
      for (int i = bi0; i <= bi1; ++i) {
        const std::size_t b = static_cast<std::size_t>(j) * grid.n + i;
        for (std::uint32_t s = cx.index.start[b]; s < cx.index.start[b + 1]; ++s) {
          const std::uint32_t k = cx.index.items[s];
          if (k != ii && stamp[k] != stamp_now) {
            stamp[k] = stamp_now;
            cands.push_back(k);
          }
        }
      }
    // Neighbours whose square meets I's, larger ones first: they set most of
    // the outlines, so the smaller ones are mostly rejected at once.
    const double reach = -2.0 * I.a - eps;  // C_j below this: K's square misses I's
    near.clear();
    for (std::uint32_t k : cands) {
      const Instance& K = inst[k];
      const double wx = I.cx - K.cx, wy = I.cy - K.cy, da = K.a - I.a;
      const Near q{K.a, k, {da - wx, da + wx, da - wy, da + wy}};
      if (q.C[0] >= reach && q.C[1] >= reach && q.C[2] >= reach && q.C[3] >= reach) near.push_back(q);
    }
    std::sort(near.begin(), near.end(),
              [](const Near& p, const Near& q) { return p.a > q.a || (p.a == q.a && p.k < q.k); });

    bool buried[4] = {false, false, false, false};
    int open = 4;
    for (auto& h : horizon) h.reset(I.a);
    for (const Near& q : near) {
      for (int d = 0; d < 4; ++d) {
        if (buried[d]) continue;
        const double same = q.C[d], back = q.C[d ^ 1], cm = q.C[kM[d]], cmm = q.C[kM[d] ^ 1];
        if (same < -eps) continue;
        if (same <= eps && !has_priority(inst[q.k], I)) continue;  // coincident planes: tie-break
        // (K hides part of the facet only if its square overlaps the facet's
        // base edge; add() drops the others: their h_K stays below 1/a.)
        const FacetOccluder occ{back < -eps ? 2.0 / -back : kInf, cm < -eps ? 1.0 / -cm : kInf,
                                cmm < -eps ? 1.0 / -cmm : kInf};
        if (!horizon[d].add(occ)) {
          buried[d] = true;
          --open;
        }
      }
      if (open == 0) break;
    }

    const bool inside = I.x0 >= 0 && I.x1 <= P && I.y0 >= 0 && I.y1 <= P;
    // The tile [0, P]² in coordinates relative to the apex.
    const HalfPlane tile[4] = {{1, 0, I.cx}, {-1, 0, P - I.cx}, {0, 1, I.cy}, {0, -1, P - I.cy}};
    std::uint32_t apex = UINT32_MAX;
    // Diagonal rays from the apex toward the base corners (1,-1), (1,1),
    // (-1,1), (-1,-1): facet d runs from ray kStart[d] to ray kEnd[d]. Two
    // neighbouring facets share their outline point on the common ray when
    // they agree on it (the planes meet there at the same height t·(a - u));
    // with coincident planes of a neighbour they may not (the ray then lies
    // where the neighbour and this pyramid are equally high), and rounding of
    // the stored point may put it off the ray.
    constexpr int kStart[4] = {0, 2, 1, 3}, kEnd[4] = {1, 3, 2, 0};
    for (int d = 0; d < 4; ++d)
      if (!buried[d]) horizon[d].outline(outlines[d]);
    std::uint32_t diag[4] = {UINT32_MAX, UINT32_MAX, UINT32_MAX, UINT32_MAX};
    double diag_u[4] = {-1, -1, -1, -1};
    const double same_u = 1e-12 * I.a;
    for (int d : {0, 2, 1, 3}) {
      if (buried[d]) continue;
      const int nx = kNx[d], ny = kNy[d], mx = -ny, my = nx;
      const std::vector<Point2>& outline = outlines[d];
      ++out.facets;
      if (out.visible.empty() || out.visible.back() != I.pid) out.visible.push_back(I.pid);
      if (inside) {
        // Fan from the apex; z from the facet plane at the stored x, y (so the
        // three corners of a thin triangle still lie in the plane to rounding).
        if (apex == UINT32_MAX) apex = writer.vertex(I.cx, I.cy, t * I.a);
        const Plane pl{I.cx, I.cy, I.a, nx, ny, false};
        auto point = [&](const Point2& q) {
          const Point2 g{I.cx + (q.x * nx + q.y * mx), I.cy + (q.x * ny + q.y * my)};
          return writer.vertex(g.x, g.y, writer.z(pl, g));
        };
        auto shared = [&](int ray, const Point2& q) {
          const std::uint32_t k = diag[ray];
          if (k != UINT32_MAX && std::abs(diag_u[ray] - q.x) <= same_u) return k;
          const std::uint32_t v = point(q);
          // Share it only if it lies exactly on the diagonal as stored, so
          // that it is in both facet planes to rounding of z.
          const auto& g = out.mesh.vertices[v];
          if (std::abs(g.x() - I.cx) == std::abs(g.y() - I.cy)) {
            diag[ray] = v;
            diag_u[ray] = q.x;
          }
          return v;
        };
        std::uint32_t prev = shared(kStart[d], outline.front());
        for (std::size_t j = 1; j + 1 < outline.size(); ++j) {
          const std::uint32_t cur = point(outline[j]);
          writer.triangle(apex, prev, cur, cx.sliver);
          prev = cur;
        }
        writer.triangle(apex, prev, shared(kEnd[d], outline.back()), cx.sliver);
      } else {
        // Fan triangles clipped to the tile, relative to the apex.
        const Plane pl{I.cx, I.cy, I.a, nx, ny, false};
        for (std::size_t j = 0; j + 1 < outline.size(); ++j) {
          ConvexPolygon tri;
          tri.n = 3;
          tri.v[0] = {0, 0};
          tri.v[1] = {outline[j].x * nx + outline[j].y * mx, outline[j].x * ny + outline[j].y * my};
          tri.v[2] = {outline[j + 1].x * nx + outline[j + 1].y * mx, outline[j + 1].x * ny + outline[j + 1].y * my};
          for (int e = 0; e < 4 && !tri.empty(); ++e) tri = clip(tri, tile[e], eps);
          if (tri.empty() || thickness(tri) < eps) continue;
          gpts.clear();
          for (int v = 0; v < tri.n; ++v) {
            const Point2 g{cx.snap_tile(I.cx + tri.v[v].x), cx.snap_tile(I.cy + tri.v[v].y)};
            if (gpts.empty() || g.x != gpts.back().x || g.y != gpts.back().y) gpts.push_back(g);
          }
          while (gpts.size() > 1 && gpts.back().x == gpts.front().x && gpts.back().y == gpts.front().y)
            gpts.pop_back();
          if (gpts.size() >= 3) emit(cx, gpts, pl, writer, out);
        }
      }
    }
  }
}

// Collapses sorted values closer than tol into one canonical value each (0 and
// period kept exact).
std::vector<double> canonical_breaks(std::vector<double> v, double period, double tol) {
  std::sort(v.begin(), v.end());
  std::vector<double> out;
  std::size_t g = 0;
  while (g < v.size()) {
    std::size_t e = g + 1;
    while (e < v.size() && v[e] - v[e - 1] <= tol) ++e;
    double c = v[g];
    for (std::size_t k = g; k < e; ++k)
      if (v[k] == 0.0 || v[k] == period) c = v[k];
    out.push_back(c);
    g = e;
  }
  return out;
}

double snap_to(const std::vector<double>& canon, double v) {
  auto it = std::lower_bound(canon.begin(), canon.end(), v);
  double best = it != canon.end() ? *it : canon.back();
  if (it != canon.begin() && std::abs(*(it - 1) - v) < std::abs(best - v)) best = *(it - 1);
  return best;
}

// Meshes the held pieces so that both sides of each tile edge get the same
// vertices: boundary coordinates closer than the snapping tolerance are made
// equal, and every boundary edge gets the break points of its opposite side.
void close_boundary(const Context& cx, std::vector<Held>& held, std::vector<Point2>& pts, MeshWriter& writer) {
  const double P = cx.P;
  std::vector<double> ys{0.0, P}, xs{0.0, P};
  for (const Point2& q : pts) {
    if (q.x == 0.0 || q.x == P) ys.push_back(q.y);
    if (q.y == 0.0 || q.y == P) xs.push_back(q.x);
  }
  const std::vector<double> cy = canonical_breaks(std::move(ys), P, cx.eps_tile);
  const std::vector<double> cxs = canonical_breaks(std::move(xs), P, cx.eps_tile);
  std::vector<Point2> poly, clean;
  for (const Held& h : held) {
    Point2* v = pts.data() + h.first;
    for (std::uint32_t k = 0; k < h.count; ++k) {
      if (v[k].x == 0.0 || v[k].x == P) v[k].y = snap_to(cy, v[k].y);
      if (v[k].y == 0.0 || v[k].y == P) v[k].x = snap_to(cxs, v[k].x);
    }
    poly.clear();
    bool inserted = false;
    for (std::uint32_t k = 0; k < h.count; ++k) {
      const Point2 p = v[k], q = v[(k + 1) % h.count];
      poly.push_back(p);
      const bool along_y = p.x == q.x && (p.x == 0.0 || p.x == P) && p.y != q.y;
      const bool along_x = p.y == q.y && (p.y == 0.0 || p.y == P) && p.x != q.x;
      if (!along_y && !along_x) continue;
      const std::vector<double>& c = along_y ? cy : cxs;
      const double from = along_y ? p.y : p.x, to = along_y ? q.y : q.x;
      auto b = std::upper_bound(c.begin(), c.end(), std::min(from, to));
      auto e = std::lower_bound(c.begin(), c.end(), std::max(from, to));
      if (b >= e) continue;
      inserted = true;
      auto put = [&](double s) { poly.push_back(along_y ? Point2{p.x, s} : Point2{s, p.y}); };
      if (to > from)
        for (auto it = b; it != e; ++it) put(*it);
      else
        for (auto it = e; it != b; --it) put(*(it - 1));
    }
    // Snapping may have merged neighbouring vertices.
    clean.clear();
    for (const Point2& q : poly)
      if (clean.empty() || q.x != clean.back().x || q.y != clean.back().y) clean.push_back(q);
    while (clean.size() > 1 && clean.back().x == clean.front().x && clean.back().y == clean.front().y)
      clean.pop_back();
    writer.fan(clean.data(), static_cast<int>(clean.size()), h.plane, inserted);
  }
}

}  // namespace

TileMesh pyramid_envelope_mesh(const RandomPyramidLayout& layout, double facet_deg, EnvelopeStats* stats) {
  const double P = layout.period;
  if (!(P > 0))
    throw std::invalid_argument("geometry/pyramid_envelope.cpp: layout period = " + std::to_string(P) +
                                " (allowed: > 0)");
  if (!(facet_deg > 0 && facet_deg < 90))
    throw std::invalid_argument("geometry/pyramid_envelope.cpp: facet_deg = " + std::to_string(facet_deg) +
                                " (allowed: 0 < facet_deg < 90)");
  const auto& pyr = layout.pyramids;
  double mean_base = 0.0;
  for (const auto& p : pyr) mean_base += p.base / pyr.size();

  Context cx;
  cx.P = P;
  cx.tan_facet = std::tan(facet_deg * std::numbers::pi / 180.0);
  // Cut tolerance (relative to an apex, where coordinates are a few sizes)
  // and snapping tolerance for tile coordinates (up to the period), µm.
  cx.eps = 1e-12 * std::max(1.0, mean_base);
  cx.eps_tile = 2.0 * cx.eps + 1e-14 * P;
  // A fan triangle thinner than 1e-7 µm (per µm of pyramid size) would have a
  // normal that double rounding of its corners tilts by more than ~1e-9 rad;
  // dropping it leaves a crack narrower than 1 Å, far below anything a ray
  // tracer in single precision resolves.
  cx.sliver = 1e-7 * std::max(1.0, mean_base);
  cx.grid = TileGrid(P, pyr.empty() ? P : mean_base, 2048);
  const TileGrid& grid = cx.grid;
  const std::size_t nbins = static_cast<std::size_t>(grid.n) * grid.n;

  // Pyramids in the order of the grid bin holding their apex, so that
  // neighbours are near each other in memory; pid keeps the layout index.
  struct Sorted {
    double cx, cy, a;
    std::uint32_t pid;
  };
  std::vector<Sorted> sp(pyr.size());
  {
    std::vector<std::uint32_t> bin_of(pyr.size()), count(nbins + 1, 0);
    for (std::size_t i = 0; i < pyr.size(); ++i) {
      bin_of[i] = static_cast<std::uint32_t>(static_cast<std::size_t>(grid.first(pyr[i].cy)) * grid.n +
                                             grid.first(pyr[i].cx));
      ++count[bin_of[i] + 1];
    }
    for (std::size_t b = 0; b < nbins; ++b) count[b + 1] += count[b];
    for (std::size_t i = 0; i < pyr.size(); ++i)
      sp[count[bin_of[i]]++] = {pyr[i].cx, pyr[i].cy, 0.5 * pyr[i].base, static_cast<std::uint32_t>(i)};
  }

  // --- drop pyramids hidden whole under one other pyramid -----------------
  // p_k >= p_i everywhere exactly when pyramid i's apex is not above p_k
  // (cones of the same slope in the max-norm): a_k - |c_i - c_k|inf >= a_i,
  // with the nearest periodic image of c_k; of two equal pyramids the lower
  // index stays. Every other pyramid shows its apex: if the apex were under
  // some p_k, p_k would cover the whole pyramid. (A hidden pyramid missed here
  // only costs time: its facets come out empty.)
  std::vector<char> hidden(sp.size(), 0);
  {
    const double w = P / grid.n;
    const long n = grid.n;
    auto cell = [&](double x) { return static_cast<long>(std::floor(x / w)); };
    auto wrap_cell = [&](long i) { return static_cast<std::size_t>(((i % n) + n) % n); };
    BinIndex wrap;  // each pyramid in every bin its base square reaches, wrapped around the tile
    wrap.build(nbins, sp.size(), [&](std::size_t k, auto&& put) {
      const Sorted& q = sp[k];
      const long i0 = cell(q.cx - q.a), i1 = std::min(cell(q.cx + q.a), i0 + n - 1);
      const long j0 = cell(q.cy - q.a), j1 = std::min(cell(q.cy + q.a), j0 + n - 1);
      for (long j = j0; j <= j1; ++j)
        for (long i = i0; i <= i1; ++i) put(wrap_cell(j) * grid.n + wrap_cell(i));
    });
    for (std::size_t i = 0; i < sp.size(); ++i) {
      const Sorted& p = sp[i];
      const std::size_t b = wrap_cell(cell(p.cy)) * grid.n + wrap_cell(cell(p.cx));
      for (std::uint32_t s = wrap.start[b]; s < wrap.start[b + 1]; ++s) {
        const std::uint32_t k = wrap.items[s];
        const Sorted& q = sp[k];
        if (k == i || q.a < p.a) continue;
        double dx = std::abs(p.cx - q.cx), dy = std::abs(p.cy - q.cy);
        dx = std::min(dx, P - dx);
        dy = std::min(dy, P - dy);
        const double margin = q.a - std::max(dx, dy) - p.a;
        if (margin > 0 || (margin == 0 && q.pid < p.pid)) {
          hidden[i] = 1;
          break;
        }
      }
    }
  }

  // --- images of the pyramids left that reach into the tile ---------------
  for (std::size_t i = 0; i < sp.size(); ++i)
    if (!hidden[i])
      for_each_image(pyr[sp[i].pid], P, [&](const PyramidImage& s) {
        cx.inst.push_back({s.cx, s.cy, s.half, s.x0, s.x1, s.y0, s.y1, sp[i].pid, s.mx, s.my});
      });
  cx.index.build(nbins, cx.inst.size(), [&](std::size_t k, auto&& put) {
    const Instance& s = cx.inst[k];
    const int i0 = grid.first(std::max(s.x0, 0.0)), i1 = grid.last(std::min(s.x1, P));
    const int j0 = grid.first(std::max(s.y0, 0.0)), j1 = grid.last(std::min(s.y1, P));
    for (int j = j0; j <= j1; ++j)
      for (int i = i0; i <= i1; ++i) put(static_cast<std::size_t>(j) * grid.n + i);
  });

  // --- facets, in contiguous ranges of instances on up to 8 threads --------
  // The parts are joined in range order, so the mesh does not depend on the
  // number of threads.
  const std::size_t ni = cx.inst.size();
  const unsigned hw = std::max(1u, std::thread::hardware_concurrency());
  const std::size_t nparts = std::max<std::size_t>(1, std::min<std::size_t>({hw, 8, ni / 2000 + 1}));
  std::vector<Part> parts(nparts);
  {
    std::vector<std::exception_ptr> errors(nparts);
    auto run = [&](std::size_t p) {
      try {
        // Part 0 also makes room for the others, which are appended to it.
        const std::size_t b = ni * p / nparts, e = ni * (p + 1) / nparts;
        mesh_facets(cx, b, e, p == 0 ? ni + layout.flat_regions.size() / 4 : e - b, parts[p]);
      } catch (...) {
        errors[p] = std::current_exception();
      }
    };
    std::vector<std::thread> threads;
    for (std::size_t p = 1; p < nparts; ++p) threads.emplace_back(run, p);
    run(0);
    for (auto& th : threads) th.join();
    for (auto& e : errors)
      if (e) std::rethrow_exception(e);
  }

  EnvelopeStats st;
  TileMesh mesh = std::move(parts[0].mesh);
  std::vector<Held> held = std::move(parts[0].held);
  std::vector<Point2> held_pts = std::move(parts[0].held_pts);
  std::vector<char> visible(pyr.size(), 0);
  for (std::size_t p = 0; p < nparts; ++p) {
    Part& part = parts[p];
    st.facet_pieces += part.facets;
    for (std::uint32_t pid : part.visible) visible[pid] = 1;
    if (p == 0) continue;
    const std::uint32_t off = static_cast<std::uint32_t>(mesh.vertices.size());
    mesh.vertices.insert(mesh.vertices.end(), part.mesh.vertices.begin(), part.mesh.vertices.end());
    for (const auto& t : part.mesh.triangles) mesh.triangles.push_back({t[0] + off, t[1] + off, t[2] + off});
    const std::uint32_t hoff = static_cast<std::uint32_t>(held_pts.size());
    for (Held h : part.held) {
      h.first += hoff;
      held.push_back(h);
    }
    held_pts.insert(held_pts.end(), part.held_pts.begin(), part.held_pts.end());
    part = Part{};
  }
  mesh.period = P;
  MeshWriter writer(mesh, cx.tan_facet, cx.eps);

  // --- flat region ------------------------------------------------------------
  {
    Part flat;  // only its held list is used
    std::vector<Point2> g;
    for (const FlatRect& r : layout.flat_regions) {
      g = {{r.x0, r.y0}, {r.x1, r.y0}, {r.x1, r.y1}, {r.x0, r.y1}};
      emit(cx, g, Plane{}, writer, flat);
      ++st.flat_pieces;
    }
    const std::uint32_t hoff = static_cast<std::uint32_t>(held_pts.size());
    for (Held h : flat.held) {
      h.first += hoff;
      held.push_back(h);
    }
    held_pts.insert(held_pts.end(), flat.held_pts.begin(), flat.held_pts.end());
  }

  close_boundary(cx, held, held_pts, writer);

  for (char v : visible) st.visible_pyramids += v != 0;
  if (stats) *stats = st;
  return mesh;
}

}  // namespace lumtrap::geometry
