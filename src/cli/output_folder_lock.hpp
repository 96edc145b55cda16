#pragma once
// One writer per result folder: while an OutputFolderLock lives, this
// process holds an exclusive flock(2) on `.NAME.lock` beside the folder NAME,
// so a second run (or planar, or texture) writing the same folder refuses at
// once instead of both writing it and one printing the other's numbers. The
// kernel releases the lock when the process ends, even by SIGKILL; a lock
// file left behind is then harmless (the next run takes it over).
// The folders above NAME that the lock had to create are removed again when
// they are still empty at the end (a refused run leaves nothing behind).
#include <filesystem>
#include <vector>

namespace lumtrap::cli {

class OutputFolderLock {
 public:
  /// Throws std::runtime_error naming the folder and the process holding it.
  explicit OutputFolderLock(const std::filesystem::path& out);
  ~OutputFolderLock();
  OutputFolderLock(const OutputFolderLock&) = delete;
  OutputFolderLock& operator=(const OutputFolderLock&) = delete;

  const std::filesystem::path& file() const { return file_; }

 private:
  std::filesystem::path file_;
  std::vector<std::filesystem::path> created_;  ///< folders made for the lock, deepest last
  int fd_ = -1;
};

}  // namespace lumtrap::cli
