#pragma once
// One descriptor per texture: its scene keys (with kinds, defaults, ranges
// and the documentation line of each), the rules that tie keys together,
// the smallest-feature rule behind the "near the wavelength" warning, and
// the mesh builder. The scene reader and the resolved-scene writer
// (src/io/) work from the descriptor alone, so a new texture is one file
// (its generator and its descriptor) plus a line in texture_registry.cpp.
//
// Parameters are held as plain values by key (TextureParams); lengths in µm,
// angles in degrees. No TOML, no optics, no Embree here.
#include <limits>
#include <map>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "geometry/mesh.hpp"

namespace lumtrap::geometry {

/// How a parameter is written in a scene file.
enum class ParamKind {
  length_um,  ///< a length with a unit, "5 um"; held in µm
  angle_deg,  ///< an angle with a unit, "54.74 deg"; held in degrees
  number,     ///< a plain number, 0.25
  integer,    ///< a plain integer, 7
  word,       ///< one of a list of words, "uniform"
  file_path,  ///< a file, "maps/afm.csv"; held in `words` as an absolute path
              ///< (src/io resolves relative paths against the scene file's
              ///< folder; the scene identity hashes the file's content)
};

/// One key of a texture's table.
struct ParamSpec {
  std::string_view key{};
  ParamKind kind = ParamKind::number;
  std::string_view doc{};                  ///< one line for docs/scene-format.md
  double fallback = 0;                     ///< default of a numeric key
  std::string_view fallback_word{};        ///< default of a word key
  std::vector<std::string_view> words{};   ///< allowed words of a word key
  double lo = -std::numeric_limits<double>::infinity();  ///< allowed range of a numeric key
  double hi = std::numeric_limits<double>::infinity();
  bool lo_open = false, hi_open = false;   ///< strict bounds
  /// The key belongs to the texture only when key `when_key` holds one of
  /// `when_words` (e.g. "sd" only with distribution = "normal"); empty: always.
  std::string_view when_key{};
  std::vector<std::string_view> when_words{};
  bool required = false;                   ///< no default: must be given (where it belongs)
  std::string_view example{};              ///< example value for messages, e.g. "3 um"
};

/// A texture as the scene gives it: its kind and the value of every key that
/// belongs to it (defaults filled in).
struct TextureParams {
  std::string kind = "planar";
  std::map<std::string, double, std::less<>> numbers;      ///< lengths µm, angles deg, numbers, integers
  std::map<std::string, std::string, std::less<>> words;  ///< word and file_path keys

  /// The value of a numeric / word key; std::out_of_range naming the key when absent.
  double number(std::string_view key) const;
  const std::string& word(std::string_view key) const;
  bool has(std::string_view key) const;
  bool operator==(const TextureParams&) const = default;
};

/// A rule between keys that does not hold: the keys it concerns (the first
/// one the scene gives is reported) and what is wrong and allowed.
struct ParamProblem {
  std::vector<std::string> keys;
  std::string message;
};

struct TextureDescriptor {
  std::string_view kind;     ///< texture = "<kind>"
  std::string_view table;    ///< keys live in [front.<table>] / [rear.<table>]; empty: no keys
  std::string_view summary;  ///< one line for the docs
  std::vector<ParamSpec> params;
  /// A perfectly regular lattice: without lateral randomization weakly
  /// absorbed light follows deterministic paths (a warning).
  bool regular = false;
  /// Rules between keys, checked after every key was read (may be null).
  std::optional<ParamProblem> (*check)(const TextureParams&) = nullptr;
  /// The smallest typical facet size, µm (0: no features).
  double (*smallest_feature_um)(const TextureParams&) = nullptr;
  /// The mesh of one periodic tile (mesh.hpp conventions).
  TileMesh (*build)(const TextureParams&) = nullptr;
  /// About how many triangles `build` makes, from the parameters alone
  /// (without building, in well under a second), to bound memory and time
  /// before any work (src/trace/build_estimate.hpp).
  double (*estimate_triangles)(const TextureParams&) = nullptr;
  /// The key that sets the size of the tile mesh, named when a tile is
  /// refused as too large (empty: none); when it is a length, the
  /// triangles grow as its square.
  std::string_view size_key{};
  /// What to change when a tile is refused as too large.
  std::string_view size_advice{};
};

/// Every texture, in the order of the registry.
std::span<const TextureDescriptor* const> texture_descriptors();
/// The descriptor of a kind, or nullptr.
const TextureDescriptor* find_texture(std::string_view kind);
/// The descriptor of params.kind; std::invalid_argument when unknown.
const TextureDescriptor& texture_of(const TextureParams& params);

/// Whether a key belongs to the texture, given the values read so far.
bool param_applies(const ParamSpec& spec, const TextureParams& params);
/// The params of a kind with every default that applies.
TextureParams default_texture(std::string_view kind);

/// The tile mesh of a texture (descriptor's builder).
TileMesh build_texture(const TextureParams& params);

}  // namespace lumtrap::geometry
