// The ray tracer against closed forms on scenes written here: a bare
// interface, a quarter-wave film, an incoherent slab and the ideal
// Lambertian wafer. Monte Carlo comparisons with the run's own standard error.
#include <fmt/format.h>

#include <cmath>
#include <numbers>

#include "io/scene_reader.hpp"
#include "optics/closed_forms.hpp"
#include "trace/run.hpp"
#include "verify/scene_text.hpp"
#include "verify/self_check.hpp"

namespace lumtrap::verify {

namespace {

// A bare planar wafer of constant index in air, one wavelength, normal incidence.
std::string slab_scene(const std::string& wafer_material, const std::string& thickness,
                       const std::string& front_films = "") {
  return fmt::format(R"(
[wafer]
material = {}
thickness = "{}"
{}
[rear]
medium = "air"
[illumination]
wavelengths = ["1000 nm"]
)",
                     wafer_material, thickness, front_films);
}

}  // namespace

void traced_checks(const std::function<void(CheckOutcome)>& add) {
  const std::uint64_t N = 1000000;
  // Lossless slab n = 4.3: first-surface reflectance and the incoherent sum.
  {
    const TracedScene t = trace_scene("lossless_slab", slab_scene("{ n = 4.3, k = 0 }", "180 um"), N);
    const double n = 4.3;
    const double R = std::pow((n - 1) / (n + 1), 2);
    add(statistical("Fresnel reflectance, n = 4.3, normal incidence (traced)", "(n-1)^2/(n+1)^2, common practice",
                    R, t.fraction("reflected_front"), N));
    const SlabPowers s = incoherent_slab(R, R, 1.0);
    const std::string ref = "incoherent multiple reflections in a slab, common practice";
    add(statistical("lossless slab n = 4.3 (traced): reflectance", ref, s.R,
                    t.fraction("reflected_front") + t.fraction("escaped_front"), N));
    add(statistical("lossless slab n = 4.3 (traced): transmittance", ref, s.T, t.fraction("transmitted_rear"), N));
  }
  // Absorbing slab n = 4.3 + 0.0008i, 100 um: alpha W = 1.005 at 1000 nm.
  {
    const cplx n(4.3, 8e-4);
    const TracedScene t = trace_scene("absorbing_slab", slab_scene("{ n = 4.3, k = 0.0008 }", "100 um"), N);
    const double R1 = normal_incidence_reflectance(1.0, n);
    const double tau = std::exp(-absorption_coefficient_per_nm(n, 1000.0) * 100e3);
    const SlabPowers s = incoherent_slab(R1, R1, tau);
    const std::string ref = "incoherent multiple reflections in a slab, common practice";
    add(statistical("absorbing slab, alpha W = 1 (traced): reflectance", ref, s.R,
                    t.fraction("reflected_front") + t.fraction("escaped_front"), N));
    add(statistical("absorbing slab, alpha W = 1 (traced): transmittance", ref, s.T, t.fraction("transmitted_rear"),
                    N));
    add(statistical("absorbing slab, alpha W = 1 (traced): absorptance", ref, s.A, t.fraction("absorbed_silicon"),
                    N));
  }
  // Quarter-wave film n = 1.8 (138.9 nm) on n = 4.3 at 1000 nm: the light
  // reflected before entering the wafer.
  {
    const TracedScene t = trace_scene(
        "quarter_wave",
        slab_scene("{ n = 4.3, k = 0 }", "180 um",
                   "[[front.films]]\nmaterial = { n = 1.8, k = 0 }\nthickness = \"138.88888888888889 nm\"\n"),
        N);
    add(statistical("quarter-wave film n = 1.8 on n = 4.3 (traced)", "Macleod, Thin-Film Optical Filters, 2010",
                    quarter_wave_reflectance(1.0, 1.8, 4.3), t.fraction("reflected_front"), N));
  }
  // The ideal Lambertian wafer, n = 3.6, 100 um, alpha W = 1 and 0.05.
  for (const double aW : {1.0, 0.05}) {
    const double n = 3.6, W_um = 100.0, lambda_nm = 1000.0;
    const double k = aW / (W_um * 1e3) * lambda_nm / (4 * std::numbers::pi);
    const std::string text = fmt::format(R"(
[wafer]
material = {{ n = {}, k = {:.17g} }}
thickness = "{} um"
[front]
interface = "ideal"
scattering = "lambertian"
[rear]
medium = "perfect_mirror"
scattering = "lambertian"
[illumination]
wavelengths = ["{} nm"]
)",
                                         n, k, W_um, lambda_nm);
    const std::uint64_t photons = 400000;
    const TracedScene t = trace_scene("lambertian", text, photons);
    add(statistical(fmt::format("ideal Lambertian wafer, alpha W = {:g} (traced): absorptance", aW),
                    "Green, Prog. Photovolt. 10, 235, 2002", lambertian_absorptance(aW, n),
                    t.fraction("absorbed_silicon"), photons));
  }
}

}  // namespace lumtrap::verify
