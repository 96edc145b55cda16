// summary.json writing and reading. See summary.hpp.
#include "io/summary.hpp"

#include <fmt/format.h>

#include <fstream>
#include <sstream>
#include <stdexcept>

namespace lumtrap {

namespace {

using ojson = nlohmann::ordered_json;

ojson current_json(const StateCurrent& c) {
  return {{"mA_cm2", c.mA_cm2}, {"sigma_mA_cm2", c.sigma_mA_cm2}, {"group", c.group}, {"meaning", c.meaning}};
}

struct Writer {
  ojson& j;
  template <class T>
  void operator()(const char* key, const T& value) {
    j[key] = value;
  }
  void operator()(const char* key, const std::vector<StateCurrent>& losses) {
    ojson o = ojson::object();
    for (const auto& c : losses) o[c.name] = current_json(c);
    j[key] = std::move(o);
  }
  void operator()(const char* key, const CellFacts& c) {
    if (!c.facts.empty()) j[key] = c.facts;
  }
};

struct Reader {
  const ojson& j;
  template <class T>
  void operator()(const char* key, T& value) {
    value = j.at(key).get<T>();
  }
  void operator()(const char* key, std::vector<StateCurrent>& losses) {
    losses.clear();
    for (auto it = j.at(key).begin(); it != j.at(key).end(); ++it) {
      const ojson& e = it.value();
      losses.push_back({it.key(), e.at("mA_cm2").get<double>(), e.at("sigma_mA_cm2").get<double>(),
                        e.at("group").get<std::string>(), e.at("meaning").get<std::string>()});
    }
  }
  void operator()(const char* key, CellFacts& c) {
    c.facts = j.contains(key) ? j.at(key) : ojson::object();
  }
};

}  // namespace

std::string summary_json(const Summary& s) {
  ojson j;
  visit_summary(s, Writer{j});
  return j.dump(2) + "\n";
}

Summary summary_from_json(const std::string& text, const std::string& file) {
  Summary s;
  try {
    const ojson j = ojson::parse(text);
    const std::string format = j.value("format", std::string("(none)"));
    if (format != kResultFormat)
      throw std::runtime_error(fmt::format(
          "{}: result format \"{}\", this lumtrap reads \"{}\" (written by another lumtrap version); run the scene "
          "again to get a result of this version",
          file, format, kResultFormat));
    visit_summary(s, Reader{j});
  } catch (const nlohmann::json::exception& e) {
    throw std::runtime_error(fmt::format("{}: not a lumtrap summary ({})", file, e.what()));
  }
  return s;
}

Summary read_summary(const std::filesystem::path& file) {
  std::ifstream in(file, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read " + file.string());
  std::stringstream ss;
  ss << in.rdbuf();
  return summary_from_json(ss.str(), file.string());
}

const StateCurrent* find_loss(const Summary& s, const std::string& name) {
  for (const auto& c : s.losses)
    if (c.name == name) return &c;
  return nullptr;
}

}  // namespace lumtrap
