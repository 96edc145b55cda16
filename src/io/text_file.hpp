#pragma once
// Whole text files: read at once, written atomically (a temporary file in
// the same folder, renamed over the target when complete).
#include <filesystem>
#include <string>

#include <nlohmann/json.hpp>

namespace lumtrap {

/// The file's bytes; std::runtime_error naming the file when it cannot be read.
std::string read_text_file(const std::filesystem::path& file);

/// The file parsed as JSON (keys in file order); std::runtime_error naming
/// the file when it cannot be read or is not JSON.
nlohmann::ordered_json read_json_file(const std::filesystem::path& file);

/// Writes `content` to a temporary sibling, flushes it to the disk and
/// renames it to `file`;
/// std::runtime_error naming the file and the system's reason (e.g. "no
/// space left on device (disk full)", io_error.hpp) on any I/O error
/// (nothing left behind).
void write_file_atomically(const std::filesystem::path& file, const std::string& content);

/// Creates (or truncates) `file` and writes `content` to it (with `sync`,
/// flushed to the disk by fsync before returning); std::runtime_error naming
/// the file and the system's reason on any error (a full disk is reported by
/// write, close or fsync, whichever notices it).
void write_whole_file(const std::filesystem::path& file, const std::string& content, bool sync = false);

}  // namespace lumtrap
