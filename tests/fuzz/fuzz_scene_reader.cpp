// libFuzzer target: scene file text -> validated Scene (read_scene_table +
// scene_from_table), the path every `lumtrap run`, `check` and `planar`
// takes. A bad scene must end in a SceneError (or another std::runtime_error
// with a message); any other exception, a crash, a hang or a sanitizer
// report is a finding. Seeds: scenes/*.toml (scripts/sanitize-and-fuzz.sh).
#include <cstddef>
#include <cstdint>
#include <stdexcept>

#include "fuzz/fuzz_input_file.hpp"
#include "io/scene_reader.hpp"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  if (size > 64 * 1024) return -1;  // scenes are a few kB; larger inputs only slow the search
  const lumtrap::fuzz::InputFile file(data, size, ".toml");
  try {
    const toml::table t = lumtrap::read_scene_table(file.path());
    (void)lumtrap::scene_from_table(t, file.path(), {"sweep"});
  } catch (const std::runtime_error&) {
    // a refusal with a message: the expected outcome for most inputs
  }
  return 0;
}
