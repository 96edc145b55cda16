#include "trace/tallies.hpp"

#include <cmath>
#include <stdexcept>

namespace lumtrap {

TallyLayout make_tally_layout(int front_films, int rear_films, double max_depth_um) {
  TallyLayout layout;
  layout.front_films = front_films;
  layout.rear_films = rear_films;
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
    : A_front(layout.front_films, 0),
      A_rear(layout.rear_films, 0),
      depth(layout.depth_edges_um.empty() ? 0 : layout.depth_edges_um.size() - 1, 0),
      escape_angle(std::size_t(layout.polar_bins) * layout.azimuth_bins, 0),
      rear_angle(std::size_t(layout.polar_bins) * layout.azimuth_bins, 0),
      passes_absorbed(layout.pass_bins, 0),
      R_front_hits(layout.hit_bins, 0) {}

namespace {
void add_vector(std::vector<std::uint64_t>& a, const std::vector<std::uint64_t>& b) {
  if (a.size() != b.size()) throw std::logic_error("tallies of different layouts cannot be added");
  for (std::size_t i = 0; i < a.size(); ++i) a[i] += b[i];
}
}  // namespace

WavelengthTally& WavelengthTally::operator+=(const WavelengthTally& o) {
  R_front += o.R_front;
  R_escape += o.R_escape;
  A_si += o.A_si;
  add_vector(A_front, o.A_front);
  add_vector(A_rear, o.A_rear);
  A_rear_medium += o.A_rear_medium;
  T += o.T;
  unresolved += o.unresolved;
  lost += o.lost;
  photons += o.photons;
  interactions += o.interactions;
  bulk_passes += o.bulk_passes;
  add_vector(depth, o.depth);
  add_vector(escape_angle, o.escape_angle);
  add_vector(rear_angle, o.rear_angle);
  add_vector(passes_absorbed, o.passes_absorbed);
  add_vector(R_front_hits, o.R_front_hits);
  return *this;
}

std::uint64_t WavelengthTally::ended() const {
  std::uint64_t n = R_front + R_escape + A_si + A_rear_medium + T + unresolved + lost;
  for (auto c : A_front) n += c;
  for (auto c : A_rear) n += c;
  return n;
}

}  // namespace lumtrap
