#pragma once
// Portable random variates from std::mt19937_64 (whose output sequence the
// C++ standard fixes). The standard library's distributions are not
// reproducible across implementations, so these are written out here.
#include <random>

namespace lumtrap::geometry {

/// Uniform in [0, 1): the top 53 bits of one draw times 2^-53.
double uniform01(std::mt19937_64& rng);

/// Standard normal by the Box–Muller transform (two uniform draws per value,
/// the second value of the pair is not kept). Box & Muller, "A note on the
/// generation of random normal deviates", Ann. Math. Stat. 29, 610 (1958).
double standard_normal(std::mt19937_64& rng);

}  // namespace lumtrap::geometry
