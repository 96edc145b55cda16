#include "io/finite_results.hpp"

#include <fmt/format.h>

#include <cmath>
#include <stdexcept>
#include <type_traits>

namespace lumtrap {

namespace {

[[noreturn]] void fail(const std::string& what, double v) {
  throw std::runtime_error(fmt::format(
      "the result holds a non-finite number ({} = {}); nothing was written. The inputs give numbers beyond the "
      "range of double precision somewhere (optical constants, spectrum, thicknesses): check them against "
      "physical values",
      what, v));
}

void check(double v, const std::string& what) {
  if (!std::isfinite(v)) fail(what, v);
}

template <class T>
void check_all(const std::vector<T>& values, const std::string& what) {
  for (std::size_t i = 0; i < values.size(); ++i)
    if (!std::isfinite(double(values[i]))) fail(fmt::format("{}[{}]", what, i), double(values[i]));
}

}  // namespace

void require_finite_results(const Results& r) {
  for (std::size_t i = 0; i < r.wavelength_nm.size(); ++i) {
    check(r.wavelength_nm[i], fmt::format("wavelength[{}]", i));
    const std::string at = fmt::format(" at {:g} nm", r.wavelength_nm[i]);
    if (i < r.band_weight.size()) check(r.band_weight[i], "photon flux of the band" + at);
    for (const auto& b : r.bins) {
      if (i < b.fraction.size()) check(b.fraction[i], b.bin.name + " fraction" + at);
      if (i < b.sigma.size()) check(b.sigma[i], b.bin.name + " standard error" + at);
    }
  }
  check(r.J_max_mA_cm2, "J_max");
  for (const auto& b : r.bins) {
    check(b.current_mA_cm2, b.bin.name + " current");
    check(b.current_sigma_mA_cm2, b.bin.name + " current standard error");
  }
  check_all(r.generation.edges_um, "generation depth edge");
  check_all(r.generation.G_cm3_s, "generation rate");
  check_all(r.generation.sigma_cm3_s, "generation rate standard error");
  check_all(r.escape_angles.current_mA_cm2, "escape angle map");
  check_all(r.rear_angles.current_mA_cm2, "rear angle map");
  check_all(r.passes_current_mA_cm2, "current by bulk passes");
  for (std::size_t i = 0; i < r.depth_by_wavelength.size(); ++i)
    check_all(r.depth_by_wavelength[i], fmt::format("depth histogram of wavelength {}", i));
  visit_summary(r.summary, [](const char* key, const auto& value) {
    using V = std::decay_t<decltype(value)>;
    if constexpr (std::is_floating_point_v<V>) {
      check(double(value), std::string("summary ") + key);
    } else if constexpr (std::is_same_v<V, std::array<double, 2>>) {
      check(value[0], std::string("summary ") + key);
      check(value[1], std::string("summary ") + key);
    } else if constexpr (std::is_same_v<V, std::vector<StateCurrent>>) {
      for (const auto& c : value) {
        check(c.mA_cm2, "summary loss " + c.name);
        check(c.sigma_mA_cm2, "summary loss " + c.name + " standard error");
      }
    }
  });
}

}  // namespace lumtrap
