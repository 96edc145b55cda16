// Exact optics of a planar wafer (see planar_wafer.hpp): coherent front and
// rear film stacks around an incoherent silicon slab, all passes through the
// slab summed as a geometric series (incoherent multiple reflections,
// common practice; e.g. Born & Wolf, Principles of Optics, 7th ed., 1999).
//
// For one polarization, with
//   R_f, T_f, Af_in   front stack seen from the ambient (Incidence::from_a),
//   R_b, T_b, A_b     rear stack seen from the silicon (Incidence::from_a),
//   R_i, T_i, Af_out  front stack seen from the silicon (Incidence::from_b),
//   τ = exp(-α W / cos θ_Si)  one pass through the slab, α = 4πk/λ,
// the power entering the slab downwards sums over round trips to
//   S = T_f / (1 - τ² R_b R_i),
// and
//   R      = R_f + S τ² R_b T_i
//   absorbed_silicon   = S (1 - τ)(1 + τ R_b)
//   absorbed_rear_films = S τ A_b,  rear medium: S τ T_b
//   absorbed_front_films= Af_in + S τ² R_b Af_out.
// These add up to R_f + T_f + ΣAf_in = 1 identically.
#include "optics/planar_wafer.hpp"

#include <cmath>
#include <stdexcept>
#include <string>

namespace lumtrap {
namespace {

PlanarResult solve_one(const StackResponse& front_out, const StackResponse& rear_in,
                       const StackResponse& front_in, bool p, double tau,
                       bool rear_medium_absorbs) {
  const PolarizedResponse& f = p ? front_out.p : front_out.s;  // from the ambient
  const PolarizedResponse& b = p ? rear_in.p : rear_in.s;      // rear, from the silicon
  const PolarizedResponse& i = p ? front_in.p : front_in.s;    // front, from the silicon

  PlanarResult res;
  const double round_trip = tau * tau * b.R * i.R;
  double S = 0.0;  // total power travelling down into the slab, all passes
  if (f.T > 0.0) {
    if (!(round_trip < 1.0))
      throw std::domain_error(
          "planar_wafer.cpp: light enters the slab but is trapped without loss (tau = 1, rear and "
          "front internal reflectance 1); the incoherent sum diverges");
    S = f.T / (1.0 - round_trip);
  }
  res.R = f.R + S * tau * tau * b.R * i.T;
  res.absorbed_silicon = S * (1.0 - tau) * (1.0 + tau * b.R);
  res.absorbed_front_films.resize(f.A.size());
  for (std::size_t j = 0; j < f.A.size(); ++j)
    res.absorbed_front_films[j] = f.A[j] + S * tau * tau * b.R * i.A[j];
  res.absorbed_rear_films.resize(b.A.size());
  for (std::size_t j = 0; j < b.A.size(); ++j) res.absorbed_rear_films[j] = S * tau * b.A[j];
  const double into_rear_medium = S * tau * b.T;
  if (rear_medium_absorbs)
    res.absorbed_rear_medium = into_rear_medium;
  else
    res.T = into_rear_medium;
  return res;
}

PlanarResult average(const PlanarResult& a, const PlanarResult& b) {
  PlanarResult m;
  m.R = 0.5 * (a.R + b.R);
  m.absorbed_silicon = 0.5 * (a.absorbed_silicon + b.absorbed_silicon);
  m.absorbed_rear_medium = 0.5 * (a.absorbed_rear_medium + b.absorbed_rear_medium);
  m.T = 0.5 * (a.T + b.T);
  m.absorbed_front_films.resize(a.absorbed_front_films.size());
  for (std::size_t j = 0; j < a.absorbed_front_films.size(); ++j)
    m.absorbed_front_films[j] = 0.5 * (a.absorbed_front_films[j] + b.absorbed_front_films[j]);
  m.absorbed_rear_films.resize(a.absorbed_rear_films.size());
  for (std::size_t j = 0; j < a.absorbed_rear_films.size(); ++j) m.absorbed_rear_films[j] = 0.5 * (a.absorbed_rear_films[j] + b.absorbed_rear_films[j]);
  return m;
}

}  // namespace

PlanarResult solve_planar_wafer(const PlanarWafer& wafer, double wavelength_nm, double cos_incident,
                                Polarization polarization) {
  const std::string where = "planar_wafer.cpp: ";
  if (!(cos_incident > 0.0 && cos_incident <= 1.0))
    throw std::invalid_argument(where + "cos_incident = " + std::to_string(cos_incident) +
                                ": must lie in (0, 1]");
  if (!(wafer.thickness_nm >= 0.0) || !std::isfinite(wafer.thickness_nm))
    throw std::invalid_argument(where + "thickness_nm = " + std::to_string(wafer.thickness_nm) +
                                ": must be finite and >= 0");
  if (wafer.front.n_b != wafer.rear.n_a)
    throw std::invalid_argument(where +
                                "front.n_b and rear.n_a must both be the silicon index; got (" +
                                std::to_string(wafer.front.n_b.real()) + " + " +
                                std::to_string(wafer.front.n_b.imag()) + "i) and (" +
                                std::to_string(wafer.rear.n_a.real()) + " + " +
                                std::to_string(wafer.rear.n_a.imag()) + "i)");
  const cplx n_si = wafer.front.n_b;

  // Angle in the slab from the real indices (Snell); the stacks use the same
  // tangential index because they ignore the incident medium's extinction.
  const double sin0 = std::sqrt(1.0 - cos_incident * cos_incident);
  const double sin_si = wafer.front.n_a.real() * sin0 / n_si.real();

  const StackResponse front_out =
      solve_stack(wafer.front, wavelength_nm, cos_incident, Incidence::from_a);

  // Special case: an ambient denser than the slab, beyond the slab's
  // critical angle. No wave propagates in the slab; whatever the front stack
  // lets into it (an evanescent field, T_f > 0 only if the slab absorbs) is
  // absorbed at the surface: τ = 0, and the rear never sees light.
  double tau = 0.0;
  double cos_si = 1.0;  // placeholder angle for the unused rear/internal responses
  if (sin_si < 1.0) {
    cos_si = std::sqrt((1.0 - sin_si) * (1.0 + sin_si));
    tau = std::exp(-absorption_coefficient_per_nm(n_si, wavelength_nm) * wafer.thickness_nm /
                   cos_si);
  }
  const StackResponse rear_in = solve_stack(wafer.rear, wavelength_nm, cos_si, Incidence::from_a);
  const StackResponse front_in =
      solve_stack(wafer.front, wavelength_nm, cos_si, Incidence::from_b);
  const bool rear_medium_absorbs = wafer.rear.n_b.imag() > 0.0;

  switch (polarization) {
    case Polarization::s:
      return solve_one(front_out, rear_in, front_in, false, tau, rear_medium_absorbs);
    case Polarization::p:
      return solve_one(front_out, rear_in, front_in, true, tau, rear_medium_absorbs);
    case Polarization::unpolarized:
    default:
      return average(solve_one(front_out, rear_in, front_in, false, tau, rear_medium_absorbs),
                     solve_one(front_out, rear_in, front_in, true, tau, rear_medium_absorbs));
  }
}

}  // namespace lumtrap
