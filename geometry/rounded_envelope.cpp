#include "geometry/rounded_envelope.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <numbers>
#include <stdexcept>
#include <string>

#include "geometry/rounded_pyramid.hpp"
#include "geometry/tile_grid.hpp"
#include "geometry/valley_fillet.hpp"

namespace lumtrap::geometry {

namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

// One periodic image of a pyramid whose footprint (base square grown by the
// fillet's reach) meets the closed tile.
struct Image {
  double cx, cy, a, t;
  double x0, x1, y0, y1;  // footprint
};

// What the surface is at one point.
struct Sample {
  double z = 0;
  int top = -1;             // image on top, -1: flat ground
  int facet = -1;           // its facet, -1: rounded part
  bool curved = false;      // on a rounded part or in a fillet
  double need = std::numeric_limits<double>::infinity();  // finest cell side its curvature asks for, µm
  double clearance = std::numeric_limits<double>::infinity();  // lowest (top - other - fillet reach)
};

class ShapedSurface {
 public:
  ShapedSurface(double P, const std::vector<ShapedPyramid>& pyramids, const EtchShape& shape) : P_(P), shape_(shape) {
    double mean = 0;
    tan_max_ = 0;
    for (const ShapedPyramid& p : pyramids) {
      mean += p.base / pyramids.size();
      tan_max_ = std::max(tan_max_, std::tan(p.facet_deg * kDeg));
    }
    reach_ = shape.valley_radius_um * fillet_reach(tan_max_);
    for (const ShapedPyramid& p : pyramids) {
      const double t = std::tan(p.facet_deg * kDeg), a = 0.5 * p.base;
      // below -reach_ (outside the base by reach_/t) a pyramid is too low to matter
      const double e = a + reach_ / t + 1e-9 * std::max(1.0, a);
      const int m_lo = static_cast<int>(std::floor((-e - p.cx) / P));
      const int m_hi = static_cast<int>(std::ceil((P + e - p.cx) / P));
      const int n_lo = static_cast<int>(std::floor((-e - p.cy) / P));
      const int n_hi = static_cast<int>(std::ceil((P + e - p.cy) / P));
      for (int mx = m_lo; mx <= m_hi; ++mx)
        for (int my = n_lo; my <= n_hi; ++my) {
          const double cx = p.cx + mx * P, cy = p.cy + my * P;
          if (cx - e > P || cx + e < 0 || cy - e > P || cy + e < 0) continue;
          images_.push_back({cx, cy, a, t, cx - e, cx + e, cy - e, cy + e});
        }
    }
    grid_ = TileGrid(P, pyramids.empty() ? P : 0.5 * mean, 1024);
    const std::size_t nb = static_cast<std::size_t>(grid_.n) * grid_.n;
    start_.assign(nb + 1, 0);
    auto each_bin = [&](const Image& im, auto&& put) {
      const int i0 = grid_.first(std::max(im.x0, 0.0)), i1 = grid_.last(std::min(im.x1, P));
      const int j0 = grid_.first(std::max(im.y0, 0.0)), j1 = grid_.last(std::min(im.y1, P));
      for (int j = j0; j <= j1; ++j)
        for (int i = i0; i <= i1; ++i) put(static_cast<std::size_t>(j) * grid_.n + i);
    };
    for (const Image& im : images_) each_bin(im, [&](std::size_t b) { ++start_[b + 1]; });
    for (std::size_t b = 0; b < nb; ++b) start_[b + 1] += start_[b];
    items_.resize(start_[nb]);
    std::vector<std::uint32_t> fill(start_.begin(), start_.end() - 1);
    for (std::uint32_t k = 0; k < images_.size(); ++k)
      each_bin(images_[k], [&](std::size_t b) { items_[fill[b]++] = k; });
    stamp_.assign(images_.size(), 0);
  }

  double tan_max() const { return tan_max_; }

  // Images whose footprint meets the closed box, in increasing index.
  void candidates(double x0, double y0, double x1, double y1, std::vector<std::uint32_t>& out) {
    out.clear();
    ++now_;
    const int i0 = grid_.first(std::max(x0, 0.0)), i1 = grid_.last(std::min(x1, P_));
    const int j0 = grid_.first(std::max(y0, 0.0)), j1 = grid_.last(std::min(y1, P_));
    for (int j = j0; j <= j1; ++j)
      for (int i = i0; i <= i1; ++i) {
        const std::size_t b = static_cast<std::size_t>(j) * grid_.n + i;
        for (std::uint32_t s = start_[b]; s < start_[b + 1]; ++s) {
          const std::uint32_t k = items_[s];
          if (stamp_[k] == now_) continue;
          stamp_[k] = now_;
          const Image& im = images_[k];
          if (im.x0 <= x1 && im.x1 >= x0 && im.y0 <= y1 && im.y1 >= y0) out.push_back(k);
        }
      }
    std::sort(out.begin(), out.end());
  }

  Sample at(double x, double y, const std::vector<std::uint32_t>& cands) {
    pts_.clear();
    SurfacePoint top;  // flat ground
    top.facet = -1;
    int top_k = -1;
    for (std::uint32_t k : cands) {
      const Image& im = images_[k];
      const SurfacePoint s = rounded_pyramid_point(x - im.cx, y - im.cy, im.a, im.t, shape_.tip_radius_um);
      pts_.push_back(s);
      if (s.z > top.z) {
        top = s;
        top_k = static_cast<int>(pts_.size()) - 1;
      }
    }
    Sample out;
    out.z = top.z;
    out.top = top_k < 0 ? -1 : static_cast<int>(cands[top_k]);
    out.facet = top.facet;
    out.curved = top_k >= 0 && top.facet < 0;
    if (out.curved) out.need = h_tip_;
    auto other = [&](const SurfacePoint& b) {
      // the fillet's exact depth where b is a plane here, its bound where b is rounded
      const double depth = (b.facet >= 0 || (b.gx == 0 && b.gy == 0)) ? fillet_depth(top, b, shape_.valley_radius_um) : reach_;
      out.clearance = std::min(out.clearance, top.z - b.z - depth);
      if (reach_ > 0) out.z = std::max(out.z, valley_fillet(top, b, shape_.valley_radius_um));
    };
    if (top_k >= 0) other(SurfacePoint{0, 0, 0, -1});
    for (std::size_t i = 0; i < pts_.size(); ++i)
      if (static_cast<int>(i) != top_k) other(pts_[i]);
    if (out.z > top.z) {
      out.curved = true;
      out.need = std::min(out.need, h_valley_);
    }
    return out;
  }

  double height(double x, double y) {
    candidates(x, y, x, y, point_cands_);
    return at(x, y, point_cands_).z;
  }

  // Finest cell sides asked for by the tip rounding and the valley fillets.
  void set_finest(double h_tip, double h_valley) {
    h_tip_ = h_tip;
    h_valley_ = h_valley;
  }

  // The cell needs no split: it is one facet plane (or flat ground)
  // throughout, or a rounded part already as fine as its radius asks.
  bool accept(const QuadtreeCell& c) {
    candidates(c.x0, c.y0, c.x0 + c.side, c.y0 + c.side, cell_cands_);
    const double margin = 2.0 * tan_max_ * c.side * std::numbers::sqrt2 / 4.0;
    int top = -2, facet = -2;
    bool plane = true;
    double need = std::numeric_limits<double>::infinity();
    for (int l = 0; l < 3; ++l)
      for (int k = 0; k < 3; ++k) {
        const Sample s = at(c.x0 + 0.5 * k * c.side, c.y0 + 0.5 * l * c.side, cell_cands_);
        if (s.curved) {
          need = std::min(need, s.need);
          plane = false;
          continue;
        }
        if (!plane) continue;
        if (!(s.clearance > margin)) {
          plane = false;
          continue;
        }
        if (top == -2) {
          top = s.top;
          facet = s.facet;
        } else if (s.top != top || s.facet != facet) {
          plane = false;
        }
      }
    // a rounded part: as fine as the radius asks (a crease between samples
    // that show no rounding is refined to the finest level)
    if (!plane) return std::isfinite(need) && c.side <= need;
    if (top < 0) return true;
    const Image& im = images_[top];
    for (int l = 0; l < 2; ++l)
      for (int k = 0; k < 2; ++k)
        if (!in_facet_region(c.x0 + k * c.side - im.cx, c.y0 + l * c.side - im.cy, facet, im.t, shape_.tip_radius_um))
          return false;
    return true;
  }

 private:
  double P_;
  EtchShape shape_;
  double tan_max_ = 0, reach_ = 0;
  double h_tip_ = 0, h_valley_ = 0;
  std::vector<Image> images_;
  TileGrid grid_;
  std::vector<std::uint32_t> start_, items_, stamp_;
  std::uint32_t now_ = 0;
  std::vector<SurfacePoint> pts_;
  std::vector<std::uint32_t> point_cands_, cell_cands_;
};

void check(bool ok, const std::string& what) {
  if (!ok) throw std::invalid_argument("geometry/rounded_envelope.cpp: " + what);
}

}  // namespace

double rounded_envelope_finest_cell(const std::vector<ShapedPyramid>& pyramids, const EtchShape& shape) {
  double tan_max = 0, base_min = std::numeric_limits<double>::infinity();
  for (const ShapedPyramid& p : pyramids) {
    tan_max = std::max(tan_max, std::tan(p.facet_deg * kDeg));
    base_min = std::min(base_min, p.base);
  }
  const double cos_max = 1.0 / std::sqrt(1.0 + tan_max * tan_max);
  const double d = shape.angular_error_deg * kDeg;
  double h = std::numeric_limits<double>::infinity();
  for (double R : {shape.tip_radius_um, shape.valley_radius_um})
    if (R > 0) h = std::min(h, std::numbers::sqrt2 * d * R * cos_max);
    else h = std::min(h, 0.25 * d * base_min * cos_max);
  return h;
}

TileMesh rounded_envelope_mesh(double P, const std::vector<ShapedPyramid>& pyramids, const EtchShape& shape,
                               RoundedEnvelopeStats* stats) {
  check(std::isfinite(P) && P > 0, "period = " + std::to_string(P) + " (allowed: > 0)");
  check(shape.tip_radius_um >= 0 && shape.valley_radius_um >= 0,
        "tip/valley radius " + std::to_string(shape.tip_radius_um) + " / " + std::to_string(shape.valley_radius_um) +
            " um (allowed: >= 0)");
  check(shape.angular_error_deg > 0 && shape.angular_error_deg <= 45,
        "angular_error = " + std::to_string(shape.angular_error_deg) + " deg (allowed: 0 < angular_error <= 45)");
  double mean = 0;
  for (const ShapedPyramid& p : pyramids) {
    check(p.base > 0, "pyramid base = " + std::to_string(p.base) + " (allowed: > 0)");
    check(p.facet_deg > 0 && p.facet_deg < 90,
          "facet angle = " + std::to_string(p.facet_deg) + " deg (allowed: 0 < facet angle < 90)");
    mean += p.base / pyramids.size();
  }
  ShapedSurface surface(P, pyramids, shape);
  {
    EtchShape tip = shape, valley = shape;
    tip.valley_radius_um = shape.tip_radius_um;
    valley.tip_radius_um = shape.valley_radius_um;
    surface.set_finest(rounded_envelope_finest_cell(pyramids, tip), rounded_envelope_finest_cell(pyramids, valley));
  }
  QuadtreeGrid grid;
  grid.period = P;
  // Coarse cells of about half a mean base, split `levels` times down to a
  // finest side just below h.
  const double h = pyramids.empty() ? P : std::min(P, rounded_envelope_finest_cell(pyramids, shape));
  grid.levels = pyramids.empty() ? 0 : static_cast<int>(std::max(0.0, std::floor(std::log2(0.5 * mean / h))));
  grid.coarse = static_cast<int>(std::max(1.0, std::ceil(P / (h * std::ldexp(1.0, grid.levels)))));
  QuadtreeStats qs;
  TileMesh mesh = quadtree_height_mesh(
      grid, [&](const QuadtreeCell& c) { return surface.accept(c); },
      [&](double x, double y) { return surface.height(x, y); }, &qs);
  if (stats) stats->cells = qs;
  return mesh;
}

void mirror_to_pits(TileMesh& mesh) {
  const double top = mesh.max_z();
  for (auto& v : mesh.vertices) v.z() = top - v.z();
}

}  // namespace lumtrap::geometry
