#include "io/formula_material_file.hpp"

#include "io/dispersion_file.hpp"
#include "optics/dispersion.hpp"

namespace lumtrap {

Material formula_file_material(const std::filesystem::path& file) {
  try {
    const DispersionFormula f = read_dispersion_file(file);
    Material m = formula_material(f, kFormulaSampleStepNm);
    m.name = file.stem().string();
    m.file = file.string();
    return m;
  } catch (const MaterialError&) {
    throw;
  } catch (const DispersionError& e) {
    throw MaterialError(file.string() + ": " + e.what());
  } catch (const std::runtime_error& e) {
    throw MaterialError(e.what());
  }
}

void install_formula_file_reader() { set_formula_file_loader(&formula_file_material); }

}  // namespace lumtrap
