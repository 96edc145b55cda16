#pragma once
// Leftovers of runs that died while writing a result folder (killed between
// starting and finishing write_result_folder, result_writer.hpp): the
// temporary folders `.NAME.partial-PID` and `.NAME.old-PID` and checkpoint
// temporaries `.NAME.checkpoint.json.tmp-PID` beside the folder NAME.
// Call it while holding the folder's lock, so that no living lumtrap run
// writes them.
#include <filesystem>
#include <string>
#include <vector>

namespace lumtrap {

/// Removes the leftovers of processes that no longer exist; an `.old-PID`
/// folder is put back as `dir` when `dir` is missing (the process died
/// between moving the old result aside and putting the new one in place).
/// Leftovers of processes that still exist are kept and reported. Returns
/// one line per leftover, saying what was done.
std::vector<std::string> tidy_stale_result_folders(const std::filesystem::path& dir);

}  // namespace lumtrap
