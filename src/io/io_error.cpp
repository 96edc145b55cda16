#include "io/io_error.hpp"

#include <cerrno>
#include <cstring>

namespace lumtrap {

std::string io_error_text(int e) {
  switch (e) {
    case ENOSPC: return "no space left on device (disk full)";
    case EDQUOT: return "disk quota exceeded (disk full for this user)";
    case EACCES:
    case EPERM: return "permission denied";
    case EROFS: return "read-only file system";
    case ENOENT: return "no such file or folder";
    case ENOTDIR: return "a part of the path is a file, not a folder";
    case EISDIR: return "is a folder";
    case EEXIST: return "already exists";
    case ENOTEMPTY: return "folder not empty";
    default: break;
  }
  std::string s = std::strerror(e);
  if (!s.empty() && s[0] >= 'A' && s[0] <= 'Z') s[0] = char(s[0] - 'A' + 'a');
  return s;
}

}  // namespace lumtrap
