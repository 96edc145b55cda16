#include "trace/tallies.hpp"

#include <cmath>
#include <stdexcept>

namespace lumtrap {

TallyLayout make_tally_layout(const Scene& scene, double max_depth_um) {
  TallyLayout layout;
  layout.bins = end_bin_layout(scene);
  // Log-spaced depth bins: first edge 1 nm, 20 bins per decade, up to the
  // deepest point of the wafer; plus the bin [0, 1 nm).
  layout.depth_edges_um.push_back(0.0);
  const double first = 1e-3;
  const int per_decade = 20;
  for (int i = 0;; ++i) {
    double edge = first * std::pow(10.0, double(i) / per_decade);
    if (edge >= max_depth_um) {
      layout.depth_edges_um.push_back(max_depth_um);
      break;
    }
    layout.depth_edges_um.push_back(edge);
  }
  return layout;
}

WavelengthTally::WavelengthTally(const TallyLayout& layout)
    : ended(layout.bins.size(), 0),
      depth(layout.depth_edges_um.empty() ? 0 : layout.depth_edges_um.size() - 1, 0),
      escape_angle(std::size_t(layout.polar_bins) * layout.azimuth_bins, 0),
      rear_angle(std::size_t(layout.polar_bins) * layout.azimuth_bins, 0),
      passes_absorbed(layout.pass_bins, 0),
      front_hits(layout.hit_bins, 0),
      ended_by_group(std::size_t(layout.photon_groups) * layout.bins.size(), 0) {}

WavelengthTally& WavelengthTally::operator+=(const WavelengthTally& o) {
  for (const auto& [name, member] : kTallyCounters) this->*member += o.*member;
  for (const auto& [name, member] : kTallyVectors) {
    auto& a = this->*member;
    const auto& b = o.*member;
    if (a.size() != b.size()) throw std::logic_error("tallies of different layouts cannot be added");
    for (std::size_t i = 0; i < a.size(); ++i) a[i] += b[i];
  }
  return *this;
}

std::uint64_t WavelengthTally::ended_total() const {
  std::uint64_t n = 0;
  for (auto c : ended) n += c;
  return n;
}

std::uint64_t ended_in(const TallyLayout& layout, const WavelengthTally& t, EndState s, int k) {
  if (k >= 0) return t.ended[layout.bins.slot(s, k)];
  std::uint64_t n = 0;
  for (std::uint32_t i = 0; i < layout.bins.count[std::size_t(s)]; ++i) n += t.ended[layout.bins.first[std::size_t(s)] + i];
  return n;
}

}  // namespace lumtrap
