#include "io/text_file.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <fstream>
#include <sstream>
#include <stdexcept>

namespace lumtrap {

namespace fs = std::filesystem;

std::string read_text_file(const fs::path& file) {
  std::ifstream in(file, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read " + file.string());
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

void write_file_atomically(const fs::path& file, const std::string& content) {
  fs::path tmp = file;
  tmp += fmt::format(".tmp-{}", ::getpid());
  {
    std::ofstream f(tmp, std::ios::binary | std::ios::trunc);
    if (!f) throw std::runtime_error("cannot write " + tmp.string());
    f << content;
    f.flush();
    if (!f) {
      std::error_code ec;
      fs::remove(tmp, ec);
      throw std::runtime_error("error while writing " + tmp.string());
    }
  }
  std::error_code ec;
  fs::rename(tmp, file, ec);
  if (ec) {
    fs::remove(tmp, ec);
    throw std::runtime_error("cannot rename into " + file.string());
  }
}

}  // namespace lumtrap
