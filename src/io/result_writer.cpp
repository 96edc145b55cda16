#include "io/result_writer.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <fmt/format.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <stdexcept>

#include "io/io_error.hpp"
#include "io/result_folder_marker.hpp"

namespace lumtrap {

namespace fs = std::filesystem;

namespace {

[[noreturn]] void fail_errno(const std::string& what, int err) {
  throw std::runtime_error(what + ": " + io_error_text(err));
}

/// Puts the complete folder `tmp` in the place of `dir`. An existing `dir`
/// is swapped with `tmp` in one step (renameat2 RENAME_EXCHANGE, Linux >= 3.15)
/// so that a result folder is there at every moment; the old one, now at
/// `tmp`, is then removed. File systems without the exchange get two renames.
void put_in_place(const fs::path& tmp, const fs::path& dir, const fs::path& parent) {
  std::error_code ec;
  if (!fs::exists(fs::symlink_status(dir, ec))) {
    if (::renameat2(AT_FDCWD, tmp.c_str(), AT_FDCWD, dir.c_str(), RENAME_NOREPLACE) == 0) return;
    if (errno == EEXIST) throw std::runtime_error("result folder " + dir.string() + " appeared while writing; kept");
    if (errno != EINVAL && errno != ENOSYS) fail_errno("cannot rename " + tmp.string() + " to " + dir.string(), errno);
    if (::rename(tmp.c_str(), dir.c_str()) != 0) fail_errno("cannot rename " + tmp.string() + " to " + dir.string(), errno);
    return;
  }
  if (::renameat2(AT_FDCWD, tmp.c_str(), AT_FDCWD, dir.c_str(), RENAME_EXCHANGE) == 0) {
    fs::remove_all(tmp, ec);  // the old result
    return;
  }
  if (errno != EINVAL && errno != ENOSYS) fail_errno("cannot replace " + dir.string(), errno);
  const fs::path old = parent / fmt::format(".{}.old-{}", dir.filename().string(), ::getpid());
  if (::rename(dir.c_str(), old.c_str()) != 0) fail_errno("cannot move the old " + dir.string() + " aside", errno);
  if (::rename(tmp.c_str(), dir.c_str()) != 0) {
    const int err = errno;
    ::rename(old.c_str(), dir.c_str());  // put the old result back
    fail_errno("cannot rename " + tmp.string() + " to " + dir.string(), err);
  }
  fs::remove_all(old, ec);
}

}  // namespace

fs::path partial_folder(const fs::path& dir, long pid) {
  const fs::path parent = dir.parent_path().empty() ? fs::path(".") : dir.parent_path();
  return parent / fmt::format(".{}.partial-{}", dir.filename().string(), pid);
}

void write_result_folder(const fs::path& dir, const std::vector<OutputFile>& files, bool overwrite) {
  std::error_code ec;
  if (fs::exists(fs::symlink_status(dir, ec)) && !overwrite)
    throw std::runtime_error("result folder " + dir.string() +
                             " already exists; choose another --out or pass --overwrite to replace it");
  if (overwrite)
    if (auto why = why_not_replaceable(dir)) throw std::runtime_error("cannot replace " + dir.string() + ": " + *why);
  const fs::path parent = dir.parent_path().empty() ? fs::path(".") : dir.parent_path();
  fs::create_directories(parent, ec);
  if (ec) throw std::runtime_error("cannot create the folder " + parent.string() + ": " + io_error_text(ec.value()));
  const fs::path tmp = partial_folder(dir, ::getpid());
  fs::remove_all(tmp, ec);
  try {
    if (::mkdir(tmp.c_str(), 0777) != 0) fail_errno("cannot create " + tmp.string(), errno);
    std::vector<std::string> names;
    for (const auto& f : files) {
      write_whole_file(tmp / f.name, f.content);
      names.push_back(f.name);
    }
    write_whole_file(tmp / kResultMarkName, result_mark_text(names));
    put_in_place(tmp, dir, parent);
  } catch (...) {
    fs::remove_all(tmp, ec);
    throw;
  }
}

}  // namespace lumtrap
