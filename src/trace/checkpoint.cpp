#include "trace/checkpoint.hpp"

#include <fmt/format.h>

#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <stdexcept>

#include "io/result_writer.hpp"

namespace lumtrap {

namespace {

nlohmann::json tally_json(const WavelengthTally& t) {
  return {{"R_front", t.R_front},     {"R_escape", t.R_escape},   {"A_si", t.A_si},
          {"A_front", t.A_front},     {"A_rear", t.A_rear},       {"A_rear_medium", t.A_rear_medium},
          {"T", t.T},                 {"unresolved", t.unresolved}, {"lost", t.lost},
          {"photons", t.photons},     {"interactions", t.interactions}, {"bulk_passes", t.bulk_passes},
          {"depth", t.depth},         {"escape_angle", t.escape_angle}, {"rear_angle", t.rear_angle},
          {"passes_absorbed", t.passes_absorbed}, {"R_front_hits", t.R_front_hits}};
}

void read_vector(const nlohmann::json& j, const char* key, std::vector<std::uint64_t>& v, const std::string& file) {
  auto got = j.at(key).get<std::vector<std::uint64_t>>();
  if (got.size() != v.size())
    throw std::runtime_error(fmt::format("{}: '{}' has {} entries, this scene needs {}", file, key, got.size(),
                                         v.size()));
  v = std::move(got);
}

}  // namespace

std::string tally_set_json(const TallySet& set) {
  nlohmann::json j;
  j["format"] = "lumtrap tallies 1";
  j["scene_hash"] = set.scene_hash;
  j["tool_version"] = set.tool_version;
  j["tallies"] = nlohmann::json::array();
  for (const auto& t : set.tallies) j["tallies"].push_back(tally_json(t));
  return j.dump() + "\n";
}

TallySet tally_set_from_json(const std::string& text, const TallyLayout& layout, const std::string& file) {
  TallySet set;
  try {
    auto j = nlohmann::json::parse(text);
    if (j.at("format") != "lumtrap tallies 1") throw std::runtime_error("unknown format");
    set.scene_hash = j.at("scene_hash");
    set.tool_version = j.at("tool_version");
    for (const auto& e : j.at("tallies")) {
      WavelengthTally t(layout);
      t.R_front = e.at("R_front");
      t.R_escape = e.at("R_escape");
      t.A_si = e.at("A_si");
      read_vector(e, "A_front", t.A_front, file);
      read_vector(e, "A_rear", t.A_rear, file);
      t.A_rear_medium = e.at("A_rear_medium");
      t.T = e.at("T");
      t.unresolved = e.at("unresolved");
      t.lost = e.at("lost");
      t.photons = e.at("photons");
      t.interactions = e.at("interactions");
      t.bulk_passes = e.at("bulk_passes");
      read_vector(e, "depth", t.depth, file);
      read_vector(e, "escape_angle", t.escape_angle, file);
      read_vector(e, "rear_angle", t.rear_angle, file);
      read_vector(e, "passes_absorbed", t.passes_absorbed, file);
      read_vector(e, "R_front_hits", t.R_front_hits, file);
      set.tallies.push_back(std::move(t));
    }
  } catch (const nlohmann::json::exception& e) {
    throw std::runtime_error(fmt::format("{}: not a lumtrap tally file ({})", file, e.what()));
  }
  return set;
}

void save_tally_set(const std::filesystem::path& file, const TallySet& set) {
  write_file_atomically(file, tally_set_json(set));
}

std::optional<TallySet> load_tally_set(const std::filesystem::path& file, const TallyLayout& layout) {
  std::ifstream in(file, std::ios::binary);
  if (!in) return std::nullopt;
  std::stringstream ss;
  ss << in.rdbuf();
  return tally_set_from_json(ss.str(), layout, file.string());
}

std::string text_hash(const std::string& text) {
  std::uint64_t h = 1469598103934665603ull;  // FNV-1a 64 offset basis
  for (unsigned char c : text) {
    h ^= c;
    h *= 1099511628211ull;  // FNV prime
  }
  return fmt::format("{:016x}", h);
}

}  // namespace lumtrap
