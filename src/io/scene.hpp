#pragma once
// The validated scene: plain structs, SI-free internal units (nm for
// wavelengths and film thicknesses, µm for wafer and texture lengths,
// radians for angles). Produced by parse_scene_file (scene_reader.hpp) from a
// TOML scene file; everything downstream reads only these structs.
// The file format is documented in docs/scene-format.md.
#include <cstdint>
#include <filesystem>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "geometry/texture_descriptor.hpp"
#include "io/front_grid.hpp"
#include "io/rear_pattern.hpp"
#include "io/rear_reflector.hpp"

namespace lumtrap {

/// A material reference as written in the scene: an id of a shipped table,
/// a path to a CSV file, or a constant index.
struct MaterialRef {
  std::string id_or_path;     ///< empty when constant
  bool constant = false;
  double n = 1.0, k = 0.0;    ///< when constant
  std::string describe() const;  ///< "si_green2008", "path/x.csv" or "n=2, k=0"
};

struct Film {
  MaterialRef material;
  double thickness_nm = 0;
};

/// How thick a film is on an inclined facet, given its thickness as
/// deposited on a planar wafer.
enum class Conformality {
  conformal,    ///< same thickness normal to every facet (default)
  directional,  ///< thickness × cos(facet tilt), as for line-of-sight deposition
};

enum class SurfaceScattering {
  specular,    ///< mirror reflection and Snell refraction on the facets (default)
  lambertian,  ///< every reflected and transmitted ray leaves cosine-distributed
  mixed,       ///< a fraction `diffuse_fraction` Lambertian, the rest specular
};

/// A surface's texture: its kind and parameters, as its descriptor
/// (geometry/texture_descriptor.hpp) defines them.
using Texture = geometry::TextureParams;

/// What decides reflection and transmission at a surface.
enum class InterfaceModel {
  films,  ///< Fresnel equations with the coherent film stack (default)
  ideal,  ///< no reflection wherever refraction is possible, total internal
          ///< reflection beyond the critical angle, no absorption: the
          ///< textbook "all light enters" surface of light-trapping limits
};

struct Surface {
  Texture texture;
  InterfaceModel interface_model = InterfaceModel::films;
  std::vector<Film> films;   ///< front: from the ambient inwards; rear: from the silicon outwards
  Conformality conformality = Conformality::conformal;
  SurfaceScattering scattering = SurfaceScattering::specular;
  double diffuse_fraction = 0.0;   ///< for mixed
};

/// [rear.pattern]: openings of a second rear region, with their own films
/// and medium, in the rear of [rear] (io/rear_pattern.hpp).
struct RearPattern {
  RearPatternGeometry geometry;
  std::vector<Film> films;                 ///< in the openings, from the silicon outwards
  MaterialRef medium;                      ///< below the openings' films (default air)
  std::optional<RearReflector> reflector;  ///< medium = { reflectance = ... } in the openings
};

/// [front.grid]: the front metallisation (io/front_grid.hpp).
struct FrontGrid {
  FrontGridGeometry geometry;
  MaterialRef metal;                                    ///< optical constants of the metal
  SurfaceScattering scattering = SurfaceScattering::specular;  ///< of light the metal reflects
  double diffuse_fraction = 0;                          ///< for mixed
};

enum class SpectrumKind { am15g, am15d, am0, file };
enum class PolarizationKind { unpolarized, s, p };
enum class IlluminationKind { collimated, diffuse };

/// The largest polar angle of collimated light, degrees. Closer to grazing,
/// light skims over the texture for tan(polar angle) times its height
/// (over 5 700 times at 89.99°) before it meets a facet: tracing slows by
/// orders of magnitude and photons run out of tile crossings (end state
/// "lost"), while the light falling on the wafer per unit area goes to zero
/// as cos(polar angle) (1.7 % of normal incidence at 89°).
inline constexpr double kMaxPolarAngleDeg = 89.0;

struct Illumination {
  SpectrumKind spectrum = SpectrumKind::am15g;
  std::filesystem::path spectrum_file;   ///< when SpectrumKind::file
  IlluminationKind kind = IlluminationKind::collimated;
  double polar_rad = 0.0;                ///< angle from the wafer normal, [0, kMaxPolarAngleDeg]
  double azimuth_rad = 0.0;              ///< from the texture's x axis
  PolarizationKind polarization = PolarizationKind::unpolarized;
  std::vector<double> wavelengths_nm;    ///< strictly increasing
};

/// Which distance "thickness" means on a textured wafer.
enum class ThicknessConvention {
  mean,   ///< rear plane to the mean front height (equal silicon volume; default)
  base,   ///< rear plane to the lowest front level (pyramid bases)
  apex,   ///< rear plane to the highest front point
};

struct Wafer {
  MaterialRef material;               ///< bulk, default "si_green2008"
  double thickness_um = 180.0;
  ThicknessConvention thickness_convention = ThicknessConvention::mean;
};

/// Most photons per wavelength: 2^53, the largest count below which every
/// integer is exact in a double (IEEE 754-2008 binary64), so that fractions
/// count / photons are computed without rounding the counts.
inline constexpr std::uint64_t kMaxPhotonsPerWavelength = std::uint64_t(1) << 53;
inline constexpr const char* kMaxPhotonsReason = "2^53, the largest count a double holds exactly";

struct RunSettings {
  std::uint64_t photons = 10000;      ///< per wavelength
  std::uint64_t seed = 1;
  int max_bounces = 10000;            ///< surface interactions per photon before it counts as unresolved
  bool randomize_lateral = true;      ///< new random lateral position on each bulk crossing
  bool track_polarization = true;     ///< carry the field through every bounce; false: average R_s, R_p at each hit
  int threads = 0;                    ///< 0 = all cores
  bool depth_histograms = false;      ///< also write per-wavelength depth histograms
  double target_jg_error = 0.0;       ///< mA/cm²; > 0: run until σ(J_G) <= target (photons is then a cap)
};

struct Scene {
  std::filesystem::path file;         ///< where it was read from
  /// "FILE:LINE:COL" of each value as written, by dotted key
  /// ("wafer.thickness", "front.films[0].thickness"); for messages of checks
  /// made after reading. Keys not written in the file are absent.
  std::map<std::string, std::string> positions;
  /// Where a key stands ("FILE:LINE:COL"; for an inline table, where its
  /// first key stands), or the file when it was not written.
  std::string where(const std::string& key) const;
  std::string name;                   ///< [scene] name, default: file stem
  MaterialRef ambient;                ///< medium above the front, default air n = 1
  Wafer wafer;
  Surface front, rear;
  MaterialRef rear_medium;            ///< below the rear films: air (default) or a metal
  bool rear_perfect_mirror = false;   ///< rear.medium = "perfect_mirror": R = 1 at every angle, no films
  /// rear.medium = { reflectance = ..., diffuse_fraction = ... }: a measured
  /// internal reflectance instead of films and a medium (rear_reflector.hpp).
  std::optional<RearReflector> rear_reflector;
  /// [rear.pattern]: openings of another region in the rear (absent: a uniform rear).
  std::optional<RearPattern> rear_pattern;
  /// [front.grid]: fingers and busbars on the front (absent: no grid).
  std::optional<FrontGrid> front_grid;
  Illumination illumination;
  RunSettings run;
};

}  // namespace lumtrap
