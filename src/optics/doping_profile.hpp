#pragma once
// Doping profiles N(x) of a silicon wafer and the free-carrier absorption
// along straight ray segments through them.
//
// Depth x in µm, measured from one wafer surface into the bulk (x >= 0).
// Densities in cm⁻³. Absorption coefficients in 1/cm (as in
// free_carrier_absorption.hpp); path lengths in µm; optical depths
// τ = ∫ α ds are dimensionless (1 µm = 1e-4 cm).
//
// Dopant layers (each is donors, n, or acceptors, p):
//   uniform   N(x) = N                       for 0 <= x <= depth, 0 beyond
//   Gaussian  N(x) = N_s exp(-(x/d)²)        d: characteristic length (> 0);
//                                            d = 2 sqrt(D t) for a drive-in
//                                            from a fixed dose (common practice)
//   erfc      N(x) = N_s erfc(x/d)           d = 2 sqrt(D t) for diffusion from
//                                            a constant surface source
//                                            (common practice)
//   tabulated (depth_i, N_i), depths >= 0 strictly increasing, N_i > 0:
//             N(x) = N_0 for x < depth_0 (constant up to the surface),
//             log-linear between rows: ln N linear in x,
//             N(x) = 0 beyond the last depth.
// plus the base (bulk) doping, a constant of either type at every depth.
//
// Free carriers (complete ionization at 300 K, minority carriers neglected;
// common practice): with N_D = the sum of donor layers (and the base if
// n-type) and N_A likewise, electrons n = max(N_D - N_A, 0), holes
// p = max(N_A - N_D, 0). The free-carrier absorption at a depth is
// α_fca = α_n(λ, n) + α_p(λ, p) (free_carrier_absorption.hpp).
//
// Segments: a straight piece of a ray from depth z1 to depth z2 with path
// length L >= |z2 - z1| (the depth changes linearly along the path).
// Because every parametrization is a power law α = K(λ) N^b, the depth
// integral of N^b (the "carrier column", per doping type) does not depend on
// λ: τ_fca(λ) = 1e-4 · (K_n(λ) col_n + K_p(λ) col_p). The column is
//   * exact (closed form, to rounding) when b = 1 and all dopants and the
//     base are of one type (no compensation): uniform layers by overlap
//     length, Gaussian by erfc differences, erfc by the antiderivative
//     u erfc(u) - exp(-u²)/sqrt(π), tabulated pieces by the exponential
//     integral of each log-linear piece; profiles made only of uniform
//     layers and the base are exact in every case (piecewise constant
//     integrands, split at the layer edges);
//   * otherwise by adaptive Gauss–Kronrod (7/15 points) on pieces split at
//     every layer edge, table row and at (0.5, 1, 2, 3, 4, 6, 8)·d of each
//     Gaussian/erfc layer; an interval is accepted when |K15 − G7|, summed
//     over the electron and hole columns, is <= 1e-11 · (first estimate of
//     both columns) · (interval / segment), so the summed error estimate is
//     <= 1e-11 of the columns (GK's estimate is pessimistic for smooth
//     integrands; kinks where compensation changes the type converge by
//     bisection).
#include <filesystem>
#include <stdexcept>
#include <string>
#include <variant>
#include <vector>

#include "optics/free_carrier_absorption.hpp"

namespace lumtrap {

struct UniformDoping {
  double density_cm3 = 0.0;  ///< >= 0
  double depth_um = 0.0;     ///< >= 0
};

struct GaussianDoping {
  double surface_density_cm3 = 0.0;  ///< N_s >= 0
  double length_um = 1.0;            ///< d > 0
};

struct ErfcDoping {
  double surface_density_cm3 = 0.0;  ///< N_s >= 0
  double length_um = 1.0;            ///< d > 0
};

struct TabulatedDoping {
  std::vector<double> depth_um;     ///< >= 0, strictly increasing, at least one row
  std::vector<double> density_cm3;  ///< > 0
  std::string source;               ///< text after '# source:' of the file ("" if none)
  std::string file;                 ///< file as opened; empty when built in code
};

using DopantShape = std::variant<UniformDoping, GaussianDoping, ErfcDoping, TabulatedDoping>;

struct DopantLayer {
  DopantShape shape;
  DopingType type = DopingType::n;
};

struct DopingProfile {
  std::vector<DopantLayer> layers;
  double base_density_cm3 = 0.0;  ///< bulk doping at every depth, >= 0
  DopingType base_type = DopingType::p;
};

struct FreeCarrierDensity {
  double electrons_cm3 = 0.0, holes_cm3 = 0.0;
};

/// A straight ray piece from start to end depth (µm) with path length (µm).
struct DepthSegment {
  double start_depth_um = 0.0, end_depth_um = 0.0, length_um = 0.0;
};

/// ∫ n^b_n ds and ∫ p^b_p ds along a segment, in (cm⁻³)^b · µm.
struct FreeCarrierColumn {
  double electrons = 0.0, holes = 0.0;
};

struct DopingProfileError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// Throws DopingProfileError saying which value is wrong and what is allowed.
void check_doping_profile(const DopingProfile& profile);

/// Dopant density of one layer at depth x (>= 0).
double dopant_density_cm3(const DopantLayer& layer, double depth_um);

/// Electrons and holes at depth x (>= 0; the profile is not re-checked).
FreeCarrierDensity free_carriers_cm3(const DopingProfile& profile, double depth_um);

/// α_fca at depth x, 1/cm.
double free_carrier_absorption_at_depth_per_cm(const DopingProfile& profile,
                                               FcaParametrization p, double wavelength_nm,
                                               double depth_um);

/// The carrier column of a segment (see the header comment for accuracy).
/// Checks the profile and the segment (depths >= 0, L >= |z2 - z1|).
FreeCarrierColumn free_carrier_column(const DopingProfile& profile, FcaParametrization p,
                                      const DepthSegment& segment);

/// τ_fca = 1e-4 · (K_n(λ) · column.electrons + K_p(λ) · column.holes).
double free_carrier_optical_depth(const FreeCarrierColumn& column, FcaParametrization p,
                                  double wavelength_nm);

/// τ_fca = ∫ α_fca ds along the segment (dimensionless).
double free_carrier_optical_depth(const DopingProfile& profile, FcaParametrization p,
                                  double wavelength_nm, const DepthSegment& segment);

/// Of the photon flux absorbed along the segment (band-to-band α_bb constant,
/// in 1/cm, plus α_fca(depth)), the fraction taken by free carriers:
///   ∫ α_fca e^{-τ(s)} ds / ∫ (α_bb + α_fca) e^{-τ(s)} ds,
///   τ(s) = ∫_0^s (α_bb + α_fca) ds'.
/// The denominator is 1 - e^{-τ(L)} exactly (τ(L) from the column); the
/// numerator by composite 8-point Gauss–Legendre on the pieces of the column
/// integration, τ at the nodes by the same rule, panels doubled until two
/// successive results agree to 1e-10 relative (at most 2^14 panels per piece).
/// 0 when nothing is absorbed. Throws DopingProfileError for α_bb < 0.
double free_carrier_share_of_segment(const DopingProfile& profile, FcaParametrization p,
                                     double wavelength_nm, double alpha_bb_per_cm,
                                     const DepthSegment& segment);

/// At one absorption point: α_fca / (α_bb + α_fca) at depth x (0 if both vanish).
double free_carrier_share_at(const DopingProfile& profile, FcaParametrization p,
                             double wavelength_nm, double alpha_bb_per_cm, double depth_um);

/// Reads a tabulated profile: '#' comment lines (a '# source:' line is kept),
/// optional header `depth_um,N_cm3`, rows of depth in µm (> 0, strictly
/// increasing: read_numeric_csv's rule for the first column, so a measured
/// profile's first row is taken to hold up to the surface) and N in cm⁻³
/// (> 0). Throws DopingProfileError "FILE:LINE: what is wrong; what is allowed".
TabulatedDoping read_doping_profile_csv(const std::filesystem::path& file);

}  // namespace lumtrap
