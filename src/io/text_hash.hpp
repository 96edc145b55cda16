#pragma once
// A stable 64-bit hash of a text, for identities (scenes, sweeps) that must
// agree across machines and runs.
#include <filesystem>
#include <string>
#include <string_view>

namespace lumtrap {

/// 64-bit FNV-1a of a text, as 16 hex digits (stable across platforms).
std::string text_hash(std::string_view text);

/// text_hash of a file's bytes, read in pieces (large height maps are not
/// held in memory twice); std::runtime_error naming the file when it cannot
/// be read.
std::string file_content_hash(const std::filesystem::path& file);

}  // namespace lumtrap
