#pragma once
// The mark lumtrap leaves in every result folder it writes: a small JSON
// file listing the files it wrote. `--overwrite` replaces a folder only when
// the mark is there and the folder holds nothing else than those files and
// what the chart commands add (plots/ and report.html): a folder of the
// user's own files is never deleted.
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

namespace lumtrap {

/// File name of the mark inside a result folder.
inline constexpr const char* kResultMarkName = ".lumtrap-result.json";

/// Text of the mark for a folder holding `file_names`.
std::string result_mark_text(const std::vector<std::string>& file_names);

/// Why `dir` must not be replaced by a new result folder, in words that
/// complete "cannot replace DIR: ..."; empty when it may be (it does not
/// exist, is an empty folder, or is a result folder lumtrap wrote and
/// nothing else).
std::optional<std::string> why_not_replaceable(const std::filesystem::path& dir);

}  // namespace lumtrap
