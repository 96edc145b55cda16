#include "io/text_hash.hpp"

#include <cstdint>
#include <fstream>
#include <stdexcept>
#include <vector>

#include <fmt/format.h>

namespace lumtrap {

namespace {

constexpr std::uint64_t kOffsetBasis = 1469598103934665603ull;  // FNV-1a 64 offset basis

std::uint64_t fnv1a(std::uint64_t h, std::string_view text) {
  for (unsigned char c : text) {
    h ^= c;
    h *= 1099511628211ull;  // FNV prime
  }
  return h;
}

}  // namespace

std::string text_hash(std::string_view text) { return fmt::format("{:016x}", fnv1a(kOffsetBasis, text)); }

std::string file_content_hash(const std::filesystem::path& file) {
  std::ifstream in(file, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read " + file.string() + " (a file the scene uses)");
  std::uint64_t h = kOffsetBasis;
  std::vector<char> buf(1 << 20);
  while (in) {
    in.read(buf.data(), std::streamsize(buf.size()));
    h = fnv1a(h, std::string_view(buf.data(), std::size_t(in.gcount())));
  }
  if (in.bad()) throw std::runtime_error("error while reading " + file.string() + " (a file the scene uses)");
  return fmt::format("{:016x}", h);
}

}  // namespace lumtrap
