#pragma once
// Scene files (TOML, docs/scene-format.md) -> the validated Scene structs
// (scene.hpp). The way back is scene_writer.hpp.
//
// Reading is split in two steps so that a sweep can edit the parsed table
// before validation: read_scene_table() parses the TOML, scene_from_table()
// checks every key and builds the Scene. A program may set values at dotted
// key paths (toml::at_path(table, "front.films[0].thickness") or table
// insert_or_assign) and call scene_from_table() again; values without a
// source position are reported with the key and the value only.
//
// Every error is a SceneError whose message reads
//   FILE:LINE:COL: key 'front.films[0].thickness': value "75 um2": <what is wrong>; allowed: <...>
// (LINE:COL omitted for values set by a program; for a missing required key
// the position is that of the table that lacks it).
#include <filesystem>
#include <set>
#include <stdexcept>
#include <string>

#include <toml++/toml.h>

#include "io/scene.hpp"

namespace lumtrap {

struct SceneError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// Parses a TOML file; a syntax error becomes a SceneError "FILE:LINE:COL: ...".
toml::table read_scene_table(const std::filesystem::path& file);

/// Validates a parsed scene table and builds the Scene. `file` names the
/// scene in messages, gives the default scene name (its stem) and the folder
/// that relative material and spectrum paths are resolved against.
/// Top-level keys listed in `ignored_top_level` are skipped (e.g. "sweep").
/// Checks: unknown keys at every level, types, units, ranges, enum words,
/// materials that resolve (find_material) and cover every run wavelength,
/// and the spectrum covering every run wavelength.
Scene scene_from_table(const toml::table& t, const std::filesystem::path& file,
                       const std::set<std::string>& ignored_top_level = {});

/// read_scene_table + scene_from_table. A [sweep] table is an error here
/// (such a file is run through the sweep commands).
Scene parse_scene_file(const std::filesystem::path& file);

}  // namespace lumtrap
