#include "trace/checkpoint.hpp"

#include <fmt/format.h>

#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <stdexcept>

#include "io/result_writer.hpp"

namespace lumtrap {

namespace {

constexpr const char* kTallyFormat = "lumtrap tallies 3";

nlohmann::json tally_json(const WavelengthTally& t) {
  nlohmann::json j;
  for (const auto& [name, member] : kTallyCounters) j[std::string(name)] = t.*member;
  for (const auto& [name, member] : kTallyVectors) j[std::string(name)] = t.*member;
  return j;
}

}  // namespace

std::string tally_set_json(const TallySet& set, const TallyLayout& layout) {
  nlohmann::json j;
  j["format"] = kTallyFormat;
  j["scene_hash"] = set.scene_hash;
  j["tool_version"] = set.tool_version;
  j["end_states"] = nlohmann::json::array();
  for (const auto& b : layout.bins.bins) j["end_states"].push_back(b.name);
  j["tallies"] = nlohmann::json::array();
  for (const auto& t : set.tallies) j["tallies"].push_back(tally_json(t));
  if (!set.round_goals.empty()) {
    j["precision_round"] = set.round;
    j["precision_round_goals"] = set.round_goals;
  }
  return j.dump() + "\n";
}

TallySet tally_set_from_json(const std::string& text, const TallyLayout& layout, const std::string& file) {
  TallySet set;
  try {
    auto j = nlohmann::json::parse(text);
    const std::string format = j.value("format", std::string("(none)"));
    if (format != kTallyFormat)
      throw std::runtime_error(fmt::format("{}: tally format \"{}\", this lumtrap reads \"{}\" (written by another "
                                           "lumtrap version); remove it to start afresh",
                                           file, format, kTallyFormat));
    set.scene_hash = j.at("scene_hash");
    set.tool_version = j.at("tool_version");
    std::vector<std::string> names;
    for (const auto& b : layout.bins.bins) names.push_back(b.name);
    if (j.at("end_states").get<std::vector<std::string>>() != names)
      throw std::runtime_error(fmt::format("{}: its end states are not this scene's; remove it to start afresh", file));
    for (const auto& e : j.at("tallies")) {
      WavelengthTally t(layout);
      for (const auto& [name, member] : kTallyCounters) t.*member = e.at(std::string(name)).get<std::uint64_t>();
      for (const auto& [name, member] : kTallyVectors) {
        auto got = e.at(std::string(name)).get<std::vector<std::uint64_t>>();
        if (got.size() != (t.*member).size())
          throw std::runtime_error(fmt::format("{}: '{}' has {} entries, this scene needs {}", file, name, got.size(),
                                               (t.*member).size()));
        t.*member = std::move(got);
      }
      set.tallies.push_back(std::move(t));
    }
    if (j.contains("precision_round_goals")) {
      set.round = j.at("precision_round").get<int>();
      set.round_goals = j.at("precision_round_goals").get<std::vector<std::uint64_t>>();
      if (set.round_goals.size() != set.tallies.size())
        throw std::runtime_error(fmt::format("{}: 'precision_round_goals' has {} entries for {} wavelengths", file,
                                             set.round_goals.size(), set.tallies.size()));
    }
  } catch (const nlohmann::json::exception& e) {
    throw std::runtime_error(fmt::format("{}: not a lumtrap tally file ({})", file, e.what()));
  }
  return set;
}

void save_tally_set(const std::filesystem::path& file, const TallySet& set, const TallyLayout& layout) {
  write_file_atomically(file, tally_set_json(set, layout));
}

std::optional<TallySet> load_tally_set(const std::filesystem::path& file, const TallyLayout& layout) {
  std::ifstream in(file, std::ios::binary);
  if (!in) return std::nullopt;
  std::stringstream ss;
  ss << in.rdbuf();
  return tally_set_from_json(ss.str(), layout, file.string());
}

}  // namespace lumtrap
