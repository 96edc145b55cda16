#include "cli/output_folder_lock.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <stdexcept>
#include <string>

#include "io/io_error.hpp"

namespace lumtrap::cli {

namespace fs = std::filesystem;

namespace {

std::string read_small(int fd) {
  char buf[64] = {};
  const ssize_t n = ::pread(fd, buf, sizeof buf - 1, 0);
  std::string s(buf, n > 0 ? std::size_t(n) : 0);
  while (!s.empty() && (s.back() == '\n' || s.back() == ' ')) s.pop_back();
  return s;
}

}  // namespace

OutputFolderLock::OutputFolderLock(const fs::path& out) {
  const fs::path parent = out.parent_path().empty() ? fs::path(".") : out.parent_path();
  file_ = parent / fmt::format(".{}.lock", out.filename().string());
  // Create the missing folders above, remembering them.
  std::vector<fs::path> missing;
  std::error_code ec;
  for (fs::path p = parent; !p.empty() && !fs::exists(fs::symlink_status(p, ec)); p = p.parent_path()) {
    missing.push_back(p);
    if (p == p.parent_path()) break;
  }
  for (auto it = missing.rbegin(); it != missing.rend(); ++it) {
    if (::mkdir(it->c_str(), 0777) != 0 && errno != EEXIST) {
      const int err = errno;
      for (auto c = created_.rbegin(); c != created_.rend(); ++c) ::rmdir(c->c_str());
      throw std::runtime_error(fmt::format("cannot create the folder {}: {}", it->string(), io_error_text(err)));
    }
    created_.push_back(*it);
  }
  // flock the file; if it was removed or replaced between open and flock (its
  // previous holder removes it when done), take the new one.
  for (int attempt = 0; attempt < 20; ++attempt) {
    fd_ = ::open(file_.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0666);
    if (fd_ < 0) {
      const int err = errno;
      for (auto c = created_.rbegin(); c != created_.rend(); ++c) ::rmdir(c->c_str());
      throw std::runtime_error(fmt::format("cannot create the lock file {}: {}", file_.string(), io_error_text(err)));
    }
    if (::flock(fd_, LOCK_EX | LOCK_NB) != 0) {
      const int err = errno;
      const std::string holder = read_small(fd_);
      ::close(fd_);
      fd_ = -1;
      if (err == EWOULDBLOCK)
        throw std::runtime_error(fmt::format(
            "result folder {} is being written by another lumtrap run{} (lock {}); wait until it has finished, or "
            "choose another --out",
            out.string(), holder.empty() ? "" : " (process " + holder + ")", file_.string()));
      throw std::runtime_error(fmt::format("cannot lock {}: {}", file_.string(), io_error_text(err)));
    }
    struct stat held {}, named {};
    if (::fstat(fd_, &held) == 0 && ::stat(file_.c_str(), &named) == 0 && held.st_ino == named.st_ino &&
        held.st_dev == named.st_dev) {
      const std::string pid = std::to_string(::getpid()) + "\n";
      if (::ftruncate(fd_, 0) == 0 && ::pwrite(fd_, pid.data(), pid.size(), 0) < 0) {
        // the PID is only a courtesy for the message of a second run
      }
      return;
    }
    ::close(fd_);
    fd_ = -1;
  }
  throw std::runtime_error("cannot lock " + file_.string() + ": it keeps being replaced");
}

OutputFolderLock::~OutputFolderLock() {
  if (fd_ >= 0) {
    ::unlink(file_.c_str());  // while still holding the lock (see the constructor's check)
    ::close(fd_);
  }
  for (auto c = created_.rbegin(); c != created_.rend(); ++c) ::rmdir(c->c_str());  // only if still empty
}

}  // namespace lumtrap::cli
