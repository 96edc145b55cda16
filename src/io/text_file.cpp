#include "io/text_file.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <unistd.h>

#include <cerrno>
#include <fstream>
#include <sstream>
#include <stdexcept>

#include "io/io_error.hpp"

namespace lumtrap {

namespace fs = std::filesystem;

std::string read_text_file(const fs::path& file) {
  std::error_code ec;
  if (fs::is_directory(file, ec)) throw std::runtime_error("cannot read " + file.string() + ": it is a folder");
  std::ifstream in(file, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read " + file.string() + ": " + io_error_text(errno));
  std::stringstream ss;
  ss << in.rdbuf();
  if (in.bad()) throw std::runtime_error("error while reading " + file.string());
  return ss.str();
}

nlohmann::ordered_json read_json_file(const fs::path& file) {
  const std::string text = read_text_file(file);
  try {
    return nlohmann::ordered_json::parse(text);
  } catch (const nlohmann::json::exception& e) {
    throw std::runtime_error(fmt::format("{}: not valid JSON ({})", file.string(), e.what()));
  }
}

void write_whole_file(const fs::path& file, const std::string& content, bool sync) {
  const int fd = ::open(file.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0666);
  if (fd < 0) throw std::runtime_error("cannot write " + file.string() + ": " + io_error_text(errno));
  const char* p = content.data();
  std::size_t left = content.size();
  int err = 0;
  while (left > 0) {
    const ssize_t n = ::write(fd, p, left);
    if (n < 0) {
      if (errno == EINTR) continue;
      err = errno;
      break;
    }
    p += n;
    left -= std::size_t(n);
  }
  if (!err && sync && ::fsync(fd) != 0 && errno != EINVAL) err = errno;  // EINVAL: a file that cannot be synced (e.g. a pipe)
  if (::close(fd) != 0 && !err && errno != EINTR) err = errno;
  if (err) throw std::runtime_error("error while writing " + file.string() + ": " + io_error_text(err));
}

void write_file_atomically(const fs::path& file, const std::string& content) {
  fs::path tmp = file;
  tmp += fmt::format(".tmp-{}", ::getpid());
  try {
    write_whole_file(tmp, content, true);
  } catch (...) {
    std::error_code ec;
    fs::remove(tmp, ec);
    throw;
  }
  if (::rename(tmp.c_str(), file.c_str()) != 0) {
    const int err = errno;
    std::error_code ec;
    fs::remove(tmp, ec);
    throw std::runtime_error("cannot rename into " + file.string() + ": " + io_error_text(err));
  }
}

}  // namespace lumtrap
