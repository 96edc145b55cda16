#include "cli/output_path_check.hpp"

#include <fmt/format.h>
#include <sys/statvfs.h>
#include <unistd.h>

#include <cerrno>
#include <stdexcept>

#include "io/io_error.hpp"
#include "io/result_folder_marker.hpp"

namespace lumtrap::cli {

namespace fs = std::filesystem;

namespace {

/// Longest file name on the usual Linux file systems (NAME_MAX = 255 bytes;
/// common practice), less the room of the longest temporary name lumtrap puts
/// beside a result folder (".NAME.checkpoint.json.tmp-PID").
constexpr std::size_t kMaxFolderName = 255 - 40;

/// `p` without a trailing separator ("a/b/" -> "a/b").
fs::path without_trailing_slash(fs::path p) {
  if (p.has_parent_path() && p.filename().empty()) p = p.parent_path();
  return p;
}

bool is_same_or_inside(const fs::path& inner, const fs::path& outer) {
  auto i = inner.begin();
  for (auto o = outer.begin(); o != outer.end(); ++o, ++i)
    if (i == inner.end() || *i != *o) return false;
  return true;
}

[[noreturn]] void refuse(const fs::path& out, const std::string& why) {
  throw std::runtime_error(fmt::format("result folder {}: {}", out.string(), why));
}

}  // namespace

void check_output_folder(const fs::path& out, const fs::path& scene_file, bool overwrite) {
  if (out.empty()) refuse(out, "an empty path; allowed: a path to a new folder, e.g. -o results/k7_recipe_a");
  std::error_code ec;
  const fs::path cwd = fs::canonical(fs::current_path(ec), ec);
  const fs::path abs = without_trailing_slash(fs::absolute(out, ec).lexically_normal());
  const fs::path real = without_trailing_slash(fs::weakly_canonical(abs, ec));
  const std::string last = out.lexically_normal().filename().string();
  if (last == "." || last == ".." || (!cwd.empty() && is_same_or_inside(cwd, real)))
    refuse(out, "is the working folder or a parent of it; a result folder must be a folder of its own, e.g. -o "
                "results/k7_recipe_a");
  if (real.filename().string().size() > kMaxFolderName)
    refuse(out, fmt::format("its name is {} bytes long; allowed: at most {} bytes", real.filename().string().size(),
                            kMaxFolderName));
  if (!scene_file.empty()) {
    const fs::path scene = fs::weakly_canonical(fs::absolute(scene_file, ec), ec);
    if (!scene.empty() && real == scene) refuse(out, "is the scene file; choose a folder name, e.g. -o results/" + scene.stem().string());
    if (!scene.empty() && is_same_or_inside(scene, real))
      refuse(out, "holds the scene file " + scene_file.string() + "; choose a new folder for the results");
  }
  // The nearest existing folder above: the result folder, its lock and the
  // checkpoint are created there.
  fs::path above = abs.parent_path();
  while (!above.empty() && !fs::exists(fs::symlink_status(above, ec)) && above != above.root_path())
    above = above.parent_path();
  if (above.empty()) above = "/";
  if (!fs::is_directory(above, ec))
    refuse(out, fmt::format("{} is a file, not a folder; a result folder cannot be made under it", above.string()));
  struct statvfs vfs {};
  if (::statvfs(above.c_str(), &vfs) == 0 && (vfs.f_flag & ST_RDONLY))
    refuse(out, fmt::format("cannot write in {}: {}", above.string(), io_error_text(EROFS)));
  if (::access(above.c_str(), W_OK | X_OK) != 0)
    refuse(out, fmt::format("cannot write in {}: {}", above.string(), io_error_text(errno)));

  const fs::file_status st = fs::symlink_status(out, ec);
  if (!fs::exists(st)) return;
  if (!overwrite) {
    if (!fs::is_directory(st))
      refuse(out, "exists and is not a folder; choose another --out (--overwrite never replaces a file)");
    throw std::runtime_error("result folder " + out.string() +
                             " already exists; choose another --out or pass --overwrite to replace it");
  }
  if (auto why = why_not_replaceable(out)) refuse(out, "cannot be replaced (--overwrite): " + *why);
}

}  // namespace lumtrap::cli
