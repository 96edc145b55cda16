// libFuzzer target: sweep file text -> expanded, validated variants
// (read_sweep_file), as `lumtrap sweep plan` and `sweep local` start. A bad
// sweep must end in a SweepError or SceneError (std::runtime_error with a
// message); anything else is a finding. Inputs whose expansion would exceed
// a few hundred variants are still parsed, but the variant count is bounded
// by the reader's own limits. Seeds: scenes/*sweep*.toml.
#include <cstddef>
#include <cstdint>
#include <stdexcept>

#include "fuzz/fuzz_input_file.hpp"
#include "sweep/expand.hpp"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  if (size > 64 * 1024) return -1;
  const lumtrap::fuzz::InputFile file(data, size, ".toml");
  try {
    (void)lumtrap::read_sweep_file(file.path());
  } catch (const std::runtime_error&) {
  }
  return 0;
}
