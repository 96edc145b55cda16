#pragma once
// Parameter sweeps: the [sweep] table of a scene file expanded into
// variants, each a fully validated scene. Pure: reads and checks, traces
// nothing. The syntax is documented in docs/scene-format.md ("Sweeps"):
//
//   [sweep.grid]                       # every combination of the axes
//   "wafer.thickness" = ["120 um", "160 um"]
//   "front.films[0].thickness" = "60 nm .. 90 nm step 5 nm"
//
//   random_streams = "independent"     # optional; default "common" (variants share
//                                      # random streams, so differences have small errors)
//
//   [[sweep.zip]]                      # one axis whose lists move together
//   "front.random_pyramids.min" = ["1 um", "2 um"]
//   "front.random_pyramids.max" = ["3 um", "5 um"]
//
// Axes (each grid key, each zip table) vary in the order they are written:
// the first one slowest, the last one fastest. Variant k gets the id
// "v%04d" (more digits beyond 10 000 variants) in that expansion order, so
// the same file always gives the same ids. Every variant is validated with
// scene_from_table() before anything runs; an invalid one is a SweepError
// naming the variant and its parameter values.
#include <cstddef>
#include <filesystem>
#include <functional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include <nlohmann/json.hpp>
#include <toml++/toml.h>

#include "io/scene.hpp"

namespace lumtrap {

struct SweepError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// One swept key's value in one variant.
struct SweepValue {
  std::string key;       ///< dotted scene key, e.g. "front.films[0].thickness"
  std::string toml;      ///< the value as TOML text: "\"65 nm\"", "0.25", "{ n = 2.0, k = 0 }"
  nlohmann::json json;   ///< the same value as JSON (strings stay strings, with their unit)
};

struct SweepVariant {
  std::size_t index = 0;            ///< position in expansion order; keys its random numbers with independent streams
  std::string id;                   ///< "v0000", "v0001", ...
  std::vector<SweepValue> values;   ///< one per swept key, in Sweep::keys order
  Scene scene;                      ///< validated
  std::string resolved;             ///< resolved_scene_toml(scene)
  std::string identity;             ///< scene_identity(scene)
};

struct Sweep {
  std::filesystem::path file;        ///< the scene file holding [sweep]
  std::vector<std::string> keys;     ///< swept keys: axes in written order, keys of a zip in written order
  std::string random_streams = "common";  ///< [sweep] random_streams: "common" or "independent"
  std::vector<SweepVariant> variants;
};

/// A check of a whole scene beyond reading it (e.g. that the wafer holds
/// its textures); throws std::runtime_error with the problem.
using SceneCheck = std::function<void(const Scene&)>;

/// The scene table of one variant: `root` (the sweep file's table) with each
/// (dotted key, TOML value text) of `values` set (set_at_key_path). The
/// plan stores a variant as its values only; a task rebuilds the scene
/// with this and scene_from_table(table, sweep file, {"sweep"}), exactly as
/// expand_sweep() validated it. SweepError for a value that is no TOML value.
toml::table variant_table(const toml::table& root, const std::vector<std::pair<std::string, std::string>>& values);

/// read_scene_table + expand_sweep. SceneError for TOML syntax errors.
Sweep read_sweep_file(const std::filesystem::path& file, const SceneCheck& check = {});

/// Expands root's [sweep] table (SweepError when absent or malformed) and
/// validates every variant (scene_from_table, then `check`). `file` names
/// the sweep in messages and anchors relative paths, as for scene_from_table().
Sweep expand_sweep(const toml::table& root, const std::filesystem::path& file, const SceneCheck& check = {});

/// The values of a range "FROM .. TO step STEP", both ends included:
///   "60 nm .. 90 nm step 5 nm"   -> "60 nm", "65 nm", ..., "90 nm" (strings, in FROM's unit)
///   "0 .. 1 step 0.25"           -> 0.0, 0.25, ..., 1.0            (floats)
///   "1 .. 4 step 1"              -> 1, 2, 3, 4                      (integers: all three written as integers)
/// FROM, TO and STEP are quantities of one kind (length, angle, current
/// density; any accepted unit, units.hpp) or all plain numbers. TO >= FROM,
/// STEP > 0, (TO - FROM)/STEP a whole number within 1e-6; values are
/// FROM + k STEP rounded to 12 significant digits, the last one exactly TO.
/// Throws SweepError whose message starts with `value "<text>": `.
toml::array sweep_range_values(std::string_view text);

/// Sets `value` at a dotted key path ("front.films[0].thickness") of `root`:
/// missing tables on the way are created, array elements must exist.
/// Throws SweepError naming the path on a path through a non-table, an
/// index out of range, or a malformed path.
void set_at_key_path(toml::table& root, std::string_view path, const toml::node& value);

/// Parameter columns of a table of variants (variants.csv, merged.csv):
/// a key whose values are all "<number> <unit>" strings with one unit gets
/// the header "key [unit]" and plain numbers, so the table plots directly;
/// other keys keep their values as written (strings unquoted).
struct ParameterTable {
  std::vector<std::string> headers;              ///< one per swept key
  std::vector<std::vector<std::string>> rows;    ///< per variant, one cell per header
};
ParameterTable parameter_table(const Sweep& sweep);

/// variants.csv: "id,<parameter headers>" then one row per variant.
std::string variants_csv(const Sweep& sweep);

/// A CSV field, quoted when it holds a comma, quote or line break.
std::string csv_field(std::string_view text);

/// The text that identifies a sweep: keys, ids, values and the variants'
/// scene identities in order. Its hash (text_hash) is the sweep hash.
std::string sweep_identity_text(const Sweep& sweep);

}  // namespace lumtrap
