#include "io/text_hash.hpp"

#include <cstdint>

#include <fmt/format.h>

namespace lumtrap {

std::string text_hash(std::string_view text) {
  std::uint64_t h = 1469598103934665603ull;  // FNV-1a 64 offset basis
  for (unsigned char c : text) {
    h ^= c;
    h *= 1099511628211ull;  // FNV prime
  }
  return fmt::format("{:016x}", h);
}

}  // namespace lumtrap
