#include "verify/scene_text.hpp"

#include <toml++/toml.h>

#include "io/scene_reader.hpp"

namespace lumtrap::verify {

Scene scene_of_text(const std::string& name, const std::string& toml_text) {
  return scene_from_table(toml::parse(toml_text), "verify-" + name + ".toml");
}

std::vector<WavelengthTally> trace_all(const PreparedRun& run, std::uint64_t photons) {
  std::vector<WavelengthTally> out;
  for (std::size_t i = 0; i < run.scene.illumination.wavelengths_nm.size(); ++i)
    out.push_back(trace_wavelength(run, wavelength_optics(run, i), i, 0, photons));
  return out;
}

TracedScene trace_scene(const std::string& name, const std::string& toml_text, std::uint64_t photons) {
  TracedScene t;
  t.run = prepare_run(scene_of_text(name, toml_text));
  t.tallies = trace_all(*t.run, photons);
  t.results = results_from_tallies(*t.run, t.tallies);
  t.photons = photons;
  return t;
}

double TracedScene::fraction(const std::string& name, std::size_t i) const {
  double sum = 0;
  for (const ResultBin& b : results.bins)
    if (b.bin.name == name) sum += b.fraction.at(i);
  return sum;
}

}  // namespace lumtrap::verify
