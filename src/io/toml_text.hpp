#pragma once
// TOML values as text: for writing resolved scenes and sweep tables, and for
// quoting values in error messages.
#include <cstddef>
#include <filesystem>
#include <limits>
#include <string>
#include <string_view>
#include <vector>

#include <toml++/toml.h>

namespace lumtrap {

/// A TOML basic string "..." with the escapes TOML requires.
std::string toml_quote(std::string_view s);

/// A TOML float (inf and nan included); integral values get ".0".
std::string toml_float_text(double x);

/// A node as it reads in TOML: strings quoted, inline arrays and tables
/// (keys quoted when not bare). Arrays longer than `max_items` end in "...".
std::string toml_value_text(const toml::node& n,
                            std::size_t max_items = std::numeric_limits<std::size_t>::max());

/// A bare TOML key / plain id: letters, digits, '_' and '-' only, not empty.
bool is_bare_key(std::string_view s);

/// `s` without leading and trailing spaces and tabs.
std::string_view trim_blanks(std::string_view s);

// --- pieces of error messages about TOML files, shared by every reader ------

/// "FILE:LINE:COL" of a source region, or FILE for a value without a position
/// (set by a program, e.g. a sweep).
std::string toml_where(const std::filesystem::path& file, const toml::source_region& r);

/// "a string", "an integer", "a float", "a boolean", "an array", "a table", "a date/time".
std::string_view toml_type_name(const toml::node& n);

/// "path.key", or "key" at the top level.
std::string toml_child_key(std::string_view path, std::string_view key);

/// `text` shortened to about `max` bytes for a message: the middle replaced
/// by "…(N bytes)…", cut at whole UTF-8 characters, so that a huge value is
/// not echoed whole. Shorter texts are returned unchanged.
std::string shortened(std::string_view text, std::size_t max = 80);

/// shortened(text) quoted as a TOML string: "...".
std::string message_excerpt(std::string_view text, std::size_t max = 80);

/// "\"a\", \"b\", \"c\"" for lists of allowed words in messages.
std::string quoted_word_list(const std::vector<std::string_view>& words);

}  // namespace lumtrap
