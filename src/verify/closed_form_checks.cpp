// The optics code (Fresnel amplitudes, the film-stack solver, the planar
// wafer solver) against closed forms: exact comparisons.
#include <fmt/format.h>

#include <cmath>
#include <numbers>

#include "optics/closed_forms.hpp"
#include "optics/fresnel.hpp"
#include "optics/planar_wafer.hpp"
#include "optics/thin_film_stack.hpp"
#include "verify/self_check.hpp"

namespace lumtrap::verify {

void closed_form_checks(const std::function<void(CheckOutcome)>& add) {
  // One interface, air to n = 4.3 at normal incidence: R = (n - 1)²/(n + 1)².
  {
    const double n = 4.3;
    const double R = std::pow((n - 1) / (n + 1), 2);
    const FresnelAmplitudes f = fresnel_amplitudes(1.0, n, 1.0);
    add(exact("Fresnel reflectance, n = 4.3, normal incidence (s)", "(n-1)^2/(n+1)^2, common practice", R,
              std::norm(f.rs)));
    add(exact("Fresnel reflectance, n = 4.3, normal incidence (p)", "(n-1)^2/(n+1)^2, common practice", R,
              std::norm(f.rp)));
  }
  // A quarter-wave film n1 = 1.8 on n = 4.3 at its design wavelength.
  {
    const double n0 = 1.0, n1 = 1.8, ns = 4.3, lambda = 1000.0;
    const FilmStack stack{n0, {{n1, lambda / (4 * n1)}}, ns};
    const StackResponse r = solve_stack(stack, lambda, 1.0, Incidence::from_a);
    add(exact("quarter-wave film n = 1.8 on n = 4.3, film solver", "Macleod, Thin-Film Optical Filters, 2010",
              quarter_wave_reflectance(n0, n1, ns), 0.5 * (r.s.R + r.p.R), 1e-10));
  }
  // An absorbing incoherent slab in air, n = 4.3 + 0.0008i, 100 um, 1000 nm.
  {
    const cplx n(4.3, 8e-4);
    const double lambda = 1000.0, W = 100e3;  // nm
    const PlanarWafer wafer{FilmStack{1.0, {}, n}, W, FilmStack{n, {}, 1.0}};
    const PlanarResult r = solve_planar_wafer(wafer, lambda, 1.0, Polarization::unpolarized);
    const double R1 = normal_incidence_reflectance(1.0, n);
    const double tau = std::exp(-absorption_coefficient_per_nm(n, lambda) * W);
    const SlabPowers s = incoherent_slab(R1, R1, tau);
    const std::string ref = "incoherent multiple reflections in a slab, common practice";
    // The closed form lets 1 - R through each interface; with k = 0.0008 the
    // power flux across an interface into or out of an absorbing medium
    // differs from that by terms of order (k/n)² = 3.5e-8 (from memory;
    // measured here: 2.1e-8 at most), hence the relative tolerance 1e-7.
    add(exact("incoherent slab, planar solver: reflectance", ref, s.R, r.R, 1e-7));
    add(exact("incoherent slab, planar solver: transmittance", ref, s.T, r.T, 1e-7));
    add(exact("incoherent slab, planar solver: absorptance", ref, s.A, r.absorbed_silicon, 1e-7));
  }
}

}  // namespace lumtrap::verify
