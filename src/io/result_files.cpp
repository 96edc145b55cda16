// The files of a result folder. See result_files.hpp.
#include "io/result_files.hpp"

#include <fmt/format.h>

#include "io/exr_image.hpp"

namespace lumtrap {

std::string spectral_csv(const Results& r) {
  std::string out = "# lumtrap per-wavelength result (" + r.method + "); fractions of incident photons\n";
  out += "wavelength [nm],photons";
  for (const auto& b : r.bins) out += "," + b.bin.name + "," + b.bin.name + "_sigma";
  out += "\n";
  for (std::size_t i = 0; i < r.wavelength_nm.size(); ++i) {
    out += fmt::format("{:.6g},{}", r.wavelength_nm[i], r.photons.empty() ? 0 : r.photons[i]);
    for (const auto& b : r.bins) out += fmt::format(",{:.9g},{:.3g}", b.fraction[i], b.sigma[i]);
    out += "\n";
  }
  return out;
}

namespace {

std::string generation_csv(const Results& r) {
  const GenerationProfile& g = r.generation;
  std::string s = "# photogeneration rate in the silicon vs depth below the front surface (vertical distance)\n";
  s += fmt::format("# spectrum {}; q * sum(G * dz) = J_G\n", r.spectrum);
  s += "depth_top [um],depth_bottom [um],G [cm-3 s-1],G_sigma [cm-3 s-1]\n";
  for (std::size_t b = 0; b < g.G_cm3_s.size(); ++b)
    s += fmt::format("{:.6g},{:.6g},{:.6e},{:.3e}\n", g.edges_um[b], g.edges_um[b + 1], g.G_cm3_s[b],
                     g.sigma_cm3_s[b]);
  return s;
}

std::string angle_csv(const AngleMap& m, const std::string& spectrum) {
  std::string s = fmt::format("# {}; photon current in mA/cm2 per bin, spectrum {}\n", m.title, spectrum);
  s += "polar_lo [deg],polar_hi [deg],azimuth_lo [deg],azimuth_hi [deg],current [mA/cm2]\n";
  const double dp = 90.0 / m.polar_bins, da = 360.0 / m.azimuth_bins;
  for (int p = 0; p < m.polar_bins; ++p)
    for (int a = 0; a < m.azimuth_bins; ++a)
      s += fmt::format("{:g},{:g},{:g},{:g},{:.6e}\n", p * dp, (p + 1) * dp, a * da, (a + 1) * da,
                       m.current_mA_cm2[std::size_t(p) * m.azimuth_bins + a]);
  return s;
}

std::string passes_csv(const Results& r) {
  std::string s = "# photons absorbed in the silicon by the number of bulk crossings before absorption\n";
  s += "# (last row: that many or more); spectrum-weighted photon current in mA/cm2\n";
  s += "passes,current [mA/cm2]\n";
  for (std::size_t b = 0; b < r.passes_current_mA_cm2.size(); ++b)
    s += fmt::format("{},{:.6e}\n", b, r.passes_current_mA_cm2[b]);
  return s;
}

std::string depth_by_wavelength_csv(const Results& r) {
  const auto& edges = r.generation.edges_um;
  std::string s = "# fraction of incident photons absorbed in each depth bin, per wavelength\n";
  s += "wavelength [nm]";
  for (std::size_t b = 0; b + 1 < edges.size(); ++b) s += fmt::format(",{:.6g}-{:.6g} [um]", edges[b], edges[b + 1]);
  s += "\n";
  for (std::size_t i = 0; i < r.depth_by_wavelength.size(); ++i) {
    s += fmt::format("{:.6g}", r.wavelength_nm[i]);
    for (double f : r.depth_by_wavelength[i]) s += fmt::format(",{:.6e}", f);
    s += "\n";
  }
  return s;
}

}  // namespace

std::vector<OutputFile> result_files(const Results& r, const std::string& resolved_scene_text) {
  std::vector<OutputFile> files{{"spectral.csv", spectral_csv(r)},
                                {"summary.json", summary_json(r.summary)},
                                {"scene.toml", resolved_scene_text}};
  if (!r.generation.G_cm3_s.empty()) files.push_back({"generation.csv", generation_csv(r)});
  for (const auto& [stem, map] : {std::pair{"escape_angles", &r.escape_angles}, std::pair{"rear_angles", &r.rear_angles}}) {
    if (map->current_mA_cm2.empty()) continue;
    files.push_back({std::string(stem) + ".csv", angle_csv(*map, r.spectrum)});
    files.push_back({std::string(stem) + ".exr", exr_image(map->azimuth_bins, map->polar_bins, map->current_mA_cm2)});
  }
  if (!r.passes_current_mA_cm2.empty()) files.push_back({"passes.csv", passes_csv(r)});
  if (!r.depth_by_wavelength.empty()) files.push_back({"depth_by_wavelength.csv", depth_by_wavelength_csv(r)});
  return files;
}

}  // namespace lumtrap
