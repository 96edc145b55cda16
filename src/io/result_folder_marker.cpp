#include "io/result_folder_marker.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <nlohmann/json.hpp>

#include "io/text_file.hpp"

namespace lumtrap {

namespace fs = std::filesystem;

namespace {

constexpr const char* kMarkFormat = "lumtrap result folder mark 1";

/// What `lumtrap plot` and `lumtrap report` add to a result folder.
bool added_by_chart_commands(const fs::directory_entry& e) {
  std::error_code ec;
  const std::string name = e.path().filename().string();
  if (name == "report.html") return e.is_regular_file(ec);
  if (name != "plots" || e.is_symlink(ec) || !e.is_directory(ec)) return false;
  for (const auto& c : fs::directory_iterator(e.path(), ec))
    if (c.is_symlink(ec) || !c.is_regular_file(ec)) return false;
  return !ec;
}

}  // namespace

std::string result_mark_text(const std::vector<std::string>& file_names) {
  nlohmann::ordered_json j;
  j["format"] = kMarkFormat;
  j["tool_version"] = LUMTRAP_VERSION;
  j["note"] = "written by lumtrap: --overwrite replaces this folder only while it holds nothing but these files "
              "(and plots/, report.html)";
  j["files"] = file_names;
  return j.dump(2) + "\n";
}

std::optional<std::string> why_not_replaceable(const fs::path& dir) {
  std::error_code ec;
  const fs::file_status link = fs::symlink_status(dir, ec);
  if (!fs::exists(link)) return std::nullopt;
  if (fs::is_symlink(link)) return "it is a symbolic link, not a result folder lumtrap wrote";
  if (!fs::is_directory(link)) return "it is a file, not a result folder";
  if (fs::is_empty(dir, ec) && !ec) return std::nullopt;
  const fs::path mark = dir / kResultMarkName;
  if (!fs::is_regular_file(fs::symlink_status(mark, ec)))
    return fmt::format("it is a folder that lumtrap did not write (it has no {} mark); only result folders of "
                       "lumtrap are replaced",
                       kResultMarkName);
  std::vector<std::string> listed;
  try {
    const auto j = nlohmann::json::parse(read_text_file(mark));
    if (j.value("format", std::string()) != kMarkFormat) throw std::runtime_error("format");
    listed = j.at("files").get<std::vector<std::string>>();
  } catch (const std::exception&) {
    return fmt::format("its {} mark is not one lumtrap wrote", kResultMarkName);
  }
  for (const auto& e : fs::directory_iterator(dir, ec)) {
    const std::string name = e.path().filename().string();
    if (name == kResultMarkName) continue;
    const bool known = std::find(listed.begin(), listed.end(), name) != listed.end();
    if (known && !e.is_symlink(ec) && e.is_regular_file(ec)) continue;
    if (added_by_chart_commands(e)) continue;
    return fmt::format("it holds '{}', which lumtrap did not write there; move your own files out of a result "
                       "folder (or choose another --out)",
                       name);
  }
  if (ec) return "its content cannot be listed: " + ec.message();
  return std::nullopt;
}

}  // namespace lumtrap
