// The resolved-scene writer. See scene_writer.hpp and docs/scene-format.md.
#include "io/scene_writer.hpp"

#include <fmt/format.h>

#include <cmath>
#include <cstdint>

#include "io/scene_words.hpp"
#include "io/toml_text.hpp"
#include "io/units.hpp"

namespace lumtrap {

namespace {

/// (to - from)/step may differ from a whole number by this many steps.
constexpr double kStepTolerance = 1e-6;

std::string material_toml(const MaterialRef& m, const PathText& path_text) {
  if (m.constant) return fmt::format("{{ n = {}, k = {} }}", toml_float_text(m.n), toml_float_text(m.k));
  return toml_quote(is_bare_key(m.id_or_path) ? m.id_or_path : path_text(m.id_or_path));
}

/// The shortest wavelength text that reads back as `wl`: a range table when
/// from/to/step regenerates the values exactly, else an array.
std::string wavelengths_toml(const std::vector<double>& wl) {
  if (wl.size() == 1) return toml_quote(format_length_nm(wl[0]));
  if (wl.size() >= 2) {
    const double from = wl.front(), to = wl.back();
    const double intervals = static_cast<double>(wl.size() - 1);
    for (double step : {(to - from) / intervals, wl[1] - wl[0]}) {
      if (!(step > 0)) continue;
      const double steps = (to - from) / step;
      if (std::abs(steps - std::round(steps)) > kStepTolerance || std::round(steps) != intervals) continue;
      bool same = true;
      for (std::size_t i = 0; i + 1 < wl.size() && same; ++i)
        same = from + static_cast<double>(i) * step == wl[i];
      if (same)
        return fmt::format("{{ from = {}, to = {}, step = {} }}", toml_quote(format_length_nm(from)),
                           toml_quote(format_length_nm(to)), toml_quote(format_length_nm(step)));
    }
  }
  std::string s = "[";
  for (std::size_t i = 0; i < wl.size(); ++i) {
    s += (i % 8 == 0) ? "\n  " : " ";
    s += toml_quote(format_length_nm(wl[i])) + ",";
  }
  return s + "\n]";
}

/// The texture's table with every key that applies, in descriptor order.
std::string texture_toml(const Texture& t, const std::string& surface, const PathText& path_text) {
  using geometry::ParamKind;
  const geometry::TextureDescriptor& d = geometry::texture_of(t);
  std::string out;
  if (d.table.empty()) return out;
  out += fmt::format("\n[{}.{}]\n", surface, d.table);
  for (const geometry::ParamSpec& p : d.params) {
    if (!t.has(p.key)) continue;
    std::string value;
    switch (p.kind) {
      case ParamKind::length_um: value = toml_quote(format_length_um(t.number(p.key))); break;
      case ParamKind::angle_deg: value = toml_quote(format_angle_deg(t.number(p.key))); break;
      case ParamKind::number: value = toml_float_text(t.number(p.key)); break;
      case ParamKind::integer: value = fmt::format("{}", static_cast<std::int64_t>(t.number(p.key))); break;
      case ParamKind::word: value = toml_quote(t.word(p.key)); break;
      case ParamKind::file_path: value = toml_quote(path_text(t.word(p.key))); break;
    }
    out += fmt::format("{} = {}\n", p.key, value);
  }
  return out;
}

void write_surface(std::string& out, const PathText& path_text, const Surface& s, const std::string& name, const MaterialRef* medium,
                   bool perfect_mirror = false, const RearReflector* reflector = nullptr) {
  out += fmt::format("\n[{}]\n", name);
  out += fmt::format("texture = {}\n", toml_quote(s.texture.kind));
  out += fmt::format("conformality = \"{}\"\n", word_of(s.conformality, kConformalityWords));
  out += fmt::format("scattering = \"{}\"\n", word_of(s.scattering, kScatteringWords));
  out += fmt::format("interface = \"{}\"\n", word_of(s.interface_model, kInterfaceWords));
  if (s.scattering == SurfaceScattering::mixed)
    out += fmt::format("diffuse_fraction = {}\n", toml_float_text(s.diffuse_fraction));
  if (medium && reflector) {
    const std::string r = reflector->file.empty() ? toml_float_text(reflector->constant_reflectance)
                                                  : toml_quote(path_text(reflector->file.string()));
    out += fmt::format("medium = {{ reflectance = {}, diffuse_fraction = {} }}\n", r,
                       toml_float_text(reflector->diffuse_fraction));
  } else if (medium) {
    out += fmt::format("medium = {}\n", perfect_mirror ? "\"perfect_mirror\"" : material_toml(*medium, path_text));
  }

  out += texture_toml(s.texture, name, path_text);
  for (const Film& f : s.films) {
    out += fmt::format("\n[[{}.films]]\n", name);
    out += fmt::format("material = {}\n", material_toml(f.material, path_text));
    out += fmt::format("thickness = {}\n", toml_quote(format_length_nm(f.thickness_nm)));
  }
}

/// [front.grid], when the front has one.
void write_front_grid(std::string& out, const PathText& path_text, const FrontGrid& grid) {
  const FrontGridGeometry& g = grid.geometry;
  out += "\n[front.grid]\n";
  out += fmt::format("finger_shape = \"{}\"\n", word_of(g.shape, kFingerShapeWords));
  out += fmt::format("finger_width = {}\n", toml_quote(format_length_um(g.finger_width_um)));
  if (g.shape != FingerShape::round_wire)
    out += fmt::format("finger_height = {}\n", toml_quote(format_length_um(g.finger_height_um)));
  out += fmt::format("finger_pitch = {}\n", toml_quote(format_length_um(g.finger_pitch_um)));
  if (g.busbar_pitch_um > 0) {
    out += fmt::format("busbar_pitch = {}\n", toml_quote(format_length_um(g.busbar_pitch_um)));
    out += fmt::format("busbar_width = {}\n", toml_quote(format_length_um(g.busbar_width_um)));
  }
  out += fmt::format("material = {}\n", material_toml(grid.metal, path_text));
  out += fmt::format("scattering = \"{}\"\n", word_of(grid.scattering, kScatteringWords));
  if (grid.scattering == SurfaceScattering::mixed)
    out += fmt::format("diffuse_fraction = {}\n", toml_float_text(grid.diffuse_fraction));
}

/// [rear.pattern] and its films, when the rear has openings.
void write_rear_pattern(std::string& out, const PathText& path_text, const RearPattern& p) {
  const RearPatternGeometry& g = p.geometry;
  const bool lines = g.layout == RearPatternLayout::lines;
  out += "\n[rear.pattern]\n";
  out += fmt::format("layout = \"{}\"\n", word_of(g.layout, kPatternLayoutWords));
  out += fmt::format("pitch = {}\n", toml_quote(format_length_um(g.pitch_um)));
  out += fmt::format("{} = {}\n", lines ? "width" : "diameter", toml_quote(format_length_um(g.size_um)));
  if (!lines) out += fmt::format("lattice = \"{}\"\n", word_of(g.lattice, kDotLatticeWords));
  if (p.reflector) {
    const RearReflector& r = *p.reflector;
    out += fmt::format("medium = {{ reflectance = {}, diffuse_fraction = {} }}\n",
                       r.file.empty() ? toml_float_text(r.constant_reflectance) : toml_quote(path_text(r.file.string())),
                       toml_float_text(r.diffuse_fraction));
  } else {
    out += fmt::format("medium = {}\n", material_toml(p.medium, path_text));
  }
  for (const Film& f : p.films) {
    out += "\n[[rear.pattern.films]]\n";
    out += fmt::format("material = {}\n", material_toml(f.material, path_text));
    out += fmt::format("thickness = {}\n", toml_quote(format_length_nm(f.thickness_nm)));
  }
}

/// The scene's physics as TOML; `full` adds the header comments, the name
/// and the thread count.
std::string scene_toml(const Scene& s, bool full, const PathText& path_text) {
  std::string out;
  if (full) {
    out += "# Resolved scene: every value explicit, with units; material and spectrum paths absolute.\n";
    if (!s.file.empty()) out += fmt::format("# Read from {}\n", s.file.string());
    out += fmt::format("\n[scene]\nname = {}\n", toml_quote(s.name));
  }
  out += fmt::format("\n[ambient]\nmaterial = {}\n", material_toml(s.ambient, path_text));
  out += fmt::format("\n[wafer]\nmaterial = {}\nthickness = {}\nthickness_convention = \"{}\"\n",
                     material_toml(s.wafer.material, path_text), toml_quote(format_length_um(s.wafer.thickness_um)),
                     word_of(s.wafer.thickness_convention, kConventionWords));
  write_surface(out, path_text, s.front, "front", nullptr);
  if (s.front_grid) write_front_grid(out, path_text, *s.front_grid);
  write_surface(out, path_text, s.rear, "rear", &s.rear_medium, s.rear_perfect_mirror,
                s.rear_reflector ? &*s.rear_reflector : nullptr);
  if (s.rear_pattern) write_rear_pattern(out, path_text, *s.rear_pattern);

  const Illumination& ill = s.illumination;
  out += "\n[illumination]\n";
  out += fmt::format("spectrum = {}\n", ill.spectrum == SpectrumKind::file
                                            ? toml_quote(path_text(ill.spectrum_file.string()))
                                            : fmt::format("\"{}\"", word_of(ill.spectrum, kSpectrumWords)));
  out += fmt::format("kind = \"{}\"\n", word_of(ill.kind, kIlluminationWords));
  if (ill.kind == IlluminationKind::collimated) {
    out += fmt::format("polar_angle = {}\n", toml_quote(format_angle_rad(ill.polar_rad)));
    out += fmt::format("azimuth = {}\n", toml_quote(format_angle_rad(ill.azimuth_rad)));
  }
  out += fmt::format("polarization = \"{}\"\n", word_of(ill.polarization, kPolarizationWords));
  out += fmt::format("wavelengths = {}\n", wavelengths_toml(ill.wavelengths_nm));

  const RunSettings& r = s.run;
  out += "\n[run]\n";
  out += fmt::format("photons = {}\nseed = {}\nmax_bounces = {}\n", r.photons, r.seed, r.max_bounces);
  out += fmt::format("randomize_lateral = {}\n", r.randomize_lateral);
  if (full) out += fmt::format("threads = {}\n", r.threads);
  out += fmt::format("depth_histograms = {}\n", r.depth_histograms);
  out += fmt::format("polarization = \"{}\"\n", word_of(r.track_polarization, kPolarizationTrackingWords));
  if (r.target_jg_error > 0)
    out += fmt::format("target_jg_error = {}\n", toml_quote(format_current_mA_cm2(r.target_jg_error)));
  else if (full)
    out += "# target_jg_error not set: runs exactly `photons` per wavelength\n";
  return out;
}

}  // namespace

std::string resolved_scene_toml(const Scene& s) {
  return scene_toml(s, true, [](const std::string& path) { return path; });
}

std::string scene_physics_toml(const Scene& s, const PathText& path_text) { return scene_toml(s, false, path_text); }

}  // namespace lumtrap
