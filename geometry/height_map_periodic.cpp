// Making a height grid periodic: mirror, wrap or blend. See
// height_map_periodic.hpp.
#include "geometry/height_map_periodic.hpp"

#include <fmt/format.h>

#include <cmath>
#include <numeric>
#include <stdexcept>
#include <utility>

namespace lumtrap::geometry {

std::string_view tiling_word(TilingMethod m) {
  switch (m) {
    case TilingMethod::mirror: return "mirror";
    case TilingMethod::wrap: return "wrap";
    case TilingMethod::blend: return "blend";
  }
  return "mirror";
}

std::size_t period_samples(std::size_t n, TilingMethod method, std::size_t w) {
  switch (method) {
    case TilingMethod::mirror: return n >= 2 ? 2 * (n - 1) : 0;
    case TilingMethod::wrap: return n;
    case TilingMethod::blend: return n > w ? n - w : 0;
  }
  return 0;
}

namespace {

std::vector<std::uint32_t> identity(std::size_t m) {
  std::vector<std::uint32_t> v(m);
  std::iota(v.begin(), v.end(), 0u);
  return v;
}

// Cross-fades the last w samples of each row (axis 0) or column (axis 1)
// into the first w; the result has n - w samples along that axis.
HeightGrid blend_axis(const HeightGrid& g, std::size_t w, int axis) {
  const std::size_t n = axis == 0 ? g.columns : g.rows;
  const std::size_t m = n - w;
  HeightGrid out;
  out.columns = axis == 0 ? m : g.columns;
  out.rows = axis == 0 ? g.rows : m;
  out.pixel_size_um = g.pixel_size_um;
  out.values.resize(out.columns * out.rows);
  const std::size_t lines = axis == 0 ? g.rows : g.columns;
  for (std::size_t l = 0; l < lines; ++l) {
    const auto src = [&](std::size_t k) { return axis == 0 ? g.at(k, l) : g.at(l, k); };
    for (std::size_t k = 0; k < m; ++k) {
      double z = src(k);
      if (k < w) {
        const double s = double(k + 1) / double(w + 1);
        z = s * src(k) + (1.0 - s) * src(m + k);
      }
      (axis == 0 ? out.at(k, l) : out.at(l, k)) = z;
    }
  }
  return out;
}

}  // namespace

PeriodicGrid make_periodic(HeightGrid g, TilingMethod method, std::size_t w, TilingReport* report) {
  const std::size_t n = g.columns;
  if (g.rows != n)
    throw std::invalid_argument(
        fmt::format("geometry/height_map_periodic.cpp: a {} × {} map is not square", g.columns, g.rows));
  if (n < 2) throw std::invalid_argument("geometry/height_map_periodic.cpp: a map needs at least 2 × 2 samples");
  if (method == TilingMethod::blend && (w < 1 || n < 2 * w + 2))
    throw std::invalid_argument(fmt::format(
        "geometry/height_map_periodic.cpp: blend of {} samples in a map of {} (allowed: 1 <= w, 2w + 2 <= n)", w, n));
  TilingReport r;
  r.method = method;
  r.map_samples = n;
  PeriodicGrid p;
  switch (method) {
    case TilingMethod::mirror: {
      const std::size_t m = 2 * (n - 1);
      std::vector<std::uint32_t> idx(m);
      for (std::size_t i = 0; i < m; ++i) idx[i] = static_cast<std::uint32_t>(i < n ? i : m - i);
      p.samples = m;
      p.column_of = idx;
      p.row_of = std::move(idx);
      p.source = std::move(g);
      break;
    }
    case TilingMethod::wrap: {
      // The step across the seam (last column → first, last row → first)
      // against the steps between neighbours inside the map.
      double seam = 0, inner = 0;
      std::size_t n_inner = 0;
      for (std::size_t j = 0; j < n; ++j)
        for (std::size_t i = 0; i < n; ++i) {
          const double z = g.at(i, j);
          const double dx = g.at((i + 1) % n, j) - z, dy = g.at(i, (j + 1) % n) - z;
          if (i + 1 == n) seam += dx * dx; else { inner += dx * dx; ++n_inner; }
          if (j + 1 == n) seam += dy * dy; else { inner += dy * dy; ++n_inner; }
        }
      r.seam_rms_step = std::sqrt(seam / double(2 * n));
      r.interior_rms_step = n_inner ? std::sqrt(inner / double(n_inner)) : 0.0;
      p.samples = n;
      p.column_of = identity(n);
      p.row_of = identity(n);
      p.source = std::move(g);
      break;
    }
    case TilingMethod::blend: {
      p.source = blend_axis(blend_axis(g, w, 0), w, 1);
      p.samples = n - w;
      p.column_of = identity(p.samples);
      p.row_of = identity(p.samples);
      r.blend_samples = w;
      break;
    }
  }
  r.period_samples = p.samples;
  if (report) *report = r;
  return p;
}

}  // namespace lumtrap::geometry
