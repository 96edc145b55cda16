#pragma once
// Counter-based random numbers for one photon (Random123 Philox4x64-10;
// J. K. Salmon, M. A. Moraes, R. O. Dror, D. E. Shaw, "Parallel random
// numbers: as easy as 1, 2, 3", SC'11, 2011). The stream of a photon is a
// pure function of (seed, variant, wavelength index, photon index), so tallies
// do not depend on how photons are split over threads, processes or jobs.
#include <cstdint>

#include <Random123/philox.h>
#include <Random123/uniform.hpp>

namespace lumtrap {

class PhotonRng {
 public:
  /// `stream` selects an independent stream of the same photon (0: the
  /// transport's; 1: the macro-frame start position), so that a feature that
  /// needs numbers of its own leaves the main stream unchanged.
  PhotonRng(std::uint64_t seed, std::uint64_t variant, std::uint64_t wavelength_index,
            std::uint64_t photon_index, std::uint64_t stream = 0)
      : key_{{seed, variant}}, ctr_{{wavelength_index, photon_index, 0, stream}} {}

  /// Uniform double in (0, 1] (never 0: safe for -log(u)).
  double uniform() {
    if (next_ == 4) refill();
    return r123::u01<double>(block_[next_++]);
  }

 private:
  void refill() {
    block_ = r123::Philox4x64()(ctr_, key_);
    ++ctr_[2];
    next_ = 0;
  }
  r123::Philox4x64::key_type key_;
  r123::Philox4x64::ctr_type ctr_;
  r123::Philox4x64::ctr_type block_{};
  int next_ = 4;
};

}  // namespace lumtrap
