#pragma once
// Operating-system I/O errors in plain words for messages: "no space left on
// device (disk full)", "permission denied", "read-only file system", ...
// (the errno values of POSIX.1-2017, IEEE Std 1003.1).
#include <string>

namespace lumtrap {

/// Plain words for an errno value, lower case, the disk-full case named as such.
std::string io_error_text(int errno_value);

}  // namespace lumtrap
