// libFuzzer target: the user-supplied table files — a material's n, k table
// (find_material on a path), a spectrum file (load_spectrum_file), a
// dispersion-formula file (read_dispersion_file) and the height-map text
// formats (CSV grid, x y z). The first input byte picks the reader, the rest
// is the file. A bad file must end in a std::runtime_error with a message;
// anything else is a finding. Seeds: materials/*.csv, materials/formulas/*.
#include <cstddef>
#include <cstdint>
#include <stdexcept>

#include "fuzz/fuzz_input_file.hpp"
#include "io/dispersion_file.hpp"
#include "io/height_map_text.hpp"
#include "optics/material.hpp"
#include "optics/spectrum.hpp"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  if (size < 1 || size > 256 * 1024) return -1;
  const uint8_t which = data[0] % 5;
  const lumtrap::fuzz::InputFile file(data + 1, size - 1, which == 2 ? ".toml" : ".csv");
  try {
    switch (which) {
      case 0: (void)lumtrap::find_material(file.path().string()); break;
      case 1: (void)lumtrap::load_spectrum_file(file.path()); break;
      case 2: (void)lumtrap::read_dispersion_file(file.path()); break;
      case 3: (void)lumtrap::read_height_csv_grid(file.path()); break;
      default: (void)lumtrap::read_height_xyz(file.path(), 1.0); break;
    }
  } catch (const std::runtime_error&) {
  }
  return 0;
}
