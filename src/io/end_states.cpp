// The table of end states. See end_states.hpp.
#include "io/end_states.hpp"

#include <fmt/format.h>

#include <cctype>

#include "io/units.hpp"

namespace lumtrap {

namespace {

std::vector<EndBin> single(const EndStateInfo& e, const Scene&) {
  return {EndBin{e.state, 0, std::string(e.name), std::string(e.meaning), e.group}};
}

std::string material_label(const MaterialRef& m) {
  std::string label = m.describe();
  for (char& c : label)
    if (!std::isalnum(static_cast<unsigned char>(c))) c = '_';
  return label;
}

// One bin per film, numbered from 0 as in the scene keys (front.films[0]).
std::vector<EndBin> films(const EndStateInfo& e, const std::vector<Film>& list, std::string_view surface) {
  std::vector<EndBin> out;
  for (std::size_t k = 0; k < list.size(); ++k)
    out.push_back({e.state, int(k), fmt::format("{}{}_{}", e.name, k, material_label(list[k].material)),
                   fmt::format("absorbed in {}.films[{}] ({}, {} nm)", surface, k, list[k].material.describe(),
                               format_number(list[k].thickness_nm)),
                   e.group});
  return out;
}
std::vector<EndBin> front_films(const EndStateInfo& e, const Scene& s) { return films(e, s.front.films, "front"); }
std::vector<EndBin> rear_films(const EndStateInfo& e, const Scene& s) { return films(e, s.rear.films, "rear"); }

std::vector<EndBin> rear_medium(const EndStateInfo& e, const Scene& s) {
  return {EndBin{e.state, 0, std::string(e.name),
                 fmt::format("{} ({})", e.meaning, s.rear_perfect_mirror ? "perfect_mirror" : s.rear_medium.describe()),
                 e.group}};
}

// One bin when the scene has a rear given by its measured reflectance, none otherwise.
std::vector<EndBin> rear_reflector(const EndStateInfo& e, const Scene& s) {
  if (!s.rear_reflector) return {};
  const RearReflector& r = *s.rear_reflector;
  return {EndBin{e.state, 0, std::string(e.name),
                 fmt::format("{} (R = {}, diffuse fraction {})", e.meaning,
                             r.file.empty() ? format_number(r.constant_reflectance) : r.file.filename().string(),
                             format_number(r.diffuse_fraction)),
                 e.group}};
}

// [rear.pattern]: one bin per film of the openings, and one for their
// medium or their measured reflector; none in scenes without a pattern.
std::vector<EndBin> opening_films(const EndStateInfo& e, const Scene& s) {
  if (!s.rear_pattern) return {};
  return films(e, s.rear_pattern->films, "rear.pattern");
}
std::vector<EndBin> opening_medium(const EndStateInfo& e, const Scene& s) {
  if (!s.rear_pattern || s.rear_pattern->reflector) return {};
  return {EndBin{e.state, 0, std::string(e.name), fmt::format("{} ({})", e.meaning, s.rear_pattern->medium.describe()),
                 e.group}};
}
std::vector<EndBin> opening_reflector(const EndStateInfo& e, const Scene& s) {
  if (!s.rear_pattern || !s.rear_pattern->reflector) return {};
  const RearReflector& r = *s.rear_pattern->reflector;
  return {EndBin{e.state, 0, std::string(e.name),
                 fmt::format("{} (R = {}, diffuse fraction {})", e.meaning,
                             r.file.empty() ? format_number(r.constant_reflectance) : r.file.filename().string(),
                             format_number(r.diffuse_fraction)),
                 e.group}};
}

// [front.grid]: one bin each in scenes with a grid, none otherwise.
std::vector<EndBin> grid_state(const EndStateInfo& e, const Scene& s) {
  if (!s.front_grid) return {};
  return {EndBin{e.state, 0, std::string(e.name), fmt::format("{} ({})", e.meaning, s.front_grid->metal.describe()),
                 e.group}};
}

using G = EndGroup;
const std::array<EndStateInfo, kEndStateCount> kTable = {{
    {EndState::absorbed_silicon, "absorbed_silicon", "absorbed in the silicon bulk: this is J_G", G::generation,
     single},
    {EndState::reflected_front, "reflected_front",
     "reflected by the front without ever entering the silicon (first-surface reflection, including multiple "
     "facet bounces)",
     G::reflection, single},
    {EndState::escaped_front, "escaped_front", "entered the silicon, then left through the front (escape after trapping)",
     G::escape, single},
    {EndState::absorbed_front_film, "absorbed_front_film",
     "absorbed in front film k (front.films[k], counted from the ambient, from 0)", G::parasitic, front_films},
    {EndState::absorbed_rear_film, "absorbed_rear_film",
     "absorbed in rear film k (rear.films[k], counted from the silicon, from 0)", G::parasitic, rear_films},
    {EndState::absorbed_rear_medium, "absorbed_rear_medium", "absorbed in the rear medium (the rear metal)",
     G::parasitic, rear_medium},
    {EndState::absorbed_rear_reflector, "absorbed_rear_reflector",
     "absorbed by a rear given by its measured reflectance (rear.medium = { reflectance = ... }; only in such scenes)",
     G::parasitic, rear_reflector},
    {EndState::absorbed_rear_opening_film, "absorbed_rear_opening_film",
     "absorbed in film k of the rear openings (rear.pattern.films[k], counted from the silicon, from 0; only in "
     "scenes with [rear.pattern])",
     G::parasitic, opening_films},
    {EndState::absorbed_rear_opening_medium, "absorbed_rear_opening_medium",
     "absorbed in the medium of the rear openings (rear.pattern.medium, e.g. the contact metal; only in scenes with "
     "[rear.pattern])",
     G::parasitic, opening_medium},
    {EndState::absorbed_rear_opening_reflector, "absorbed_rear_opening_reflector",
     "absorbed by the measured reflectance of the rear openings (rear.pattern.medium = { reflectance = ... }; only "
     "in such scenes)",
     G::parasitic, opening_reflector},
    {EndState::absorbed_grid, "absorbed_grid",
     "light from the ambient absorbed in the front grid (fingers, busbars; only in scenes with [front.grid])",
     G::parasitic, grid_state},
    {EndState::reflected_grid, "reflected_grid",
     "light from the ambient reflected away by the front grid without entering the silicon (only in scenes with "
     "[front.grid])",
     G::reflection, grid_state},
    {EndState::absorbed_front_contact, "absorbed_front_contact",
     "light from inside the silicon absorbed in the metal where the grid contacts the front (only in scenes with "
     "[front.grid])",
     G::parasitic, grid_state},
    {EndState::transmitted_rear, "transmitted_rear", "left through the rear into a non-absorbing medium",
     G::transmission, single},
    {EndState::unresolved, "unresolved", "stopped at run.max_bounces interactions (reported; 0 on the shipped scenes)",
     G::numerical, single},
    {EndState::lost, "lost", "slipped through a crack of the mesh by floating-point error (reported, not dropped)",
     G::numerical, single},
}};

}  // namespace

std::string_view group_name(EndGroup g) {
  switch (g) {
    case G::generation: return "generation";
    case G::reflection: return "reflection";
    case G::escape: return "escape";
    case G::parasitic: return "parasitic";
    case G::transmission: return "transmission";
    case G::numerical: return "numerical";
  }
  return "?";
}

std::span<const EndStateInfo> end_state_table() { return kTable; }

const EndStateInfo& end_state_info(EndState s) { return kTable[std::size_t(s)]; }

EndBinLayout end_bin_layout(const Scene& scene) {
  EndBinLayout layout;
  for (const EndStateInfo& e : kTable) {
    const std::size_t k = std::size_t(e.state);
    layout.first[k] = std::uint32_t(layout.bins.size());
    for (EndBin& b : e.bins(e, scene)) layout.bins.push_back(std::move(b));
    layout.count[k] = std::uint32_t(layout.bins.size()) - layout.first[k];
  }
  return layout;
}

std::string end_state_markdown() {
  std::string s = "| end state | group | meaning |\n|---|---|---|\n";
  for (const EndStateInfo& e : kTable) {
    const bool per_film = e.bins == front_films || e.bins == rear_films || e.bins == opening_films;
    s += fmt::format("| `{}{}` | {} | {} |\n", e.name, per_film ? "<k>_<material>" : "", group_name(e.group),
                     e.meaning);
  }
  return s;
}

}  // namespace lumtrap
