#pragma once
// A stable 64-bit hash of a text, for identities (scenes, sweeps) that must
// agree across machines and runs.
#include <string>
#include <string_view>

namespace lumtrap {

/// 64-bit FNV-1a of a text, as 16 hex digits (stable across platforms).
std::string text_hash(std::string_view text);

}  // namespace lumtrap
