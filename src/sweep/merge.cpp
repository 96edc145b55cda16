// merged.csv and merged.json. See merge.hpp.
#include "sweep/merge.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <map>
#include <stdexcept>

#include "io/paired_difference.hpp"
#include "io/summary.hpp"
#include "io/text_file.hpp"

namespace lumtrap {

namespace fs = std::filesystem;
using ojson = nlohmann::ordered_json;

namespace {
constexpr const char* kMergeFormat = "lumtrap sweep merge 3";
}  // namespace

MergeReport merge_sweep(const SweepFolder& f, const AssembleVariant& assemble, const std::string& reference) {
  MergeReport report;
  std::vector<std::string> foreign;
  std::vector<std::pair<std::size_t, Summary>> rows;
  std::vector<std::string> losses;  // loss names in order of first appearance
  std::map<std::size_t, std::string> assembly_errors;
  std::vector<std::size_t> missing;
  for (std::size_t v = 0; v < f.variant_count; ++v) {
    const SweepFolderVariant& var = folder_variant(f, v);
    if (!result_complete(f, v) && f.split_photons > 1 && assemble) {
      try {
        assemble(f, v);
      } catch (const std::exception& e) {
        assembly_errors[v] = e.what();
      }
    }
    if (!result_complete(f, v)) {
      missing.push_back(v);
      continue;
    }
    Summary s;
    try {
      s = read_summary(result_dir(f, v) / "summary.json");
    } catch (const std::exception& e) {
      foreign.push_back(e.what());
      continue;
    }
    if (s.sweep_hash != f.sweep_hash || s.tool_version != f.tool_version || s.variant != var.id ||
        s.scene_hash != var.scene_hash) {
      foreign.push_back(fmt::format("{}: variant '{}' of sweep {} by lumtrap {} (this folder: variant {} of sweep {} "
                                    "by lumtrap {})",
                                    result_dir(f, v).string(), s.variant, s.sweep_hash.empty() ? "?" : s.sweep_hash,
                                    s.tool_version.empty() ? "?" : s.tool_version, var.id, f.sweep_hash,
                                    f.tool_version));
      continue;
    }
    for (const auto& l : s.losses)
      if (std::find(losses.begin(), losses.end(), l.name) == losses.end()) losses.push_back(l.name);
    rows.push_back({v, std::move(s)});
  }
  if (!missing.empty()) {  // their states from the folder's files (no SLURM queries here)
    const SweepStatus status = sweep_status(f);
    for (std::size_t v : missing) {
      VariantStatus st = status.variants[v];
      if (auto it = assembly_errors.find(v); it != assembly_errors.end()) {
        st.state = VariantState::failed;
        st.kind = "its parts do not add up";
        st.reason = it->second;
      }
      report.missing.push_back({v, st});
    }
  }
  if (!foreign.empty()) {
    std::string msg = fmt::format("refusing to merge {}: {} result{} belong{} to another sweep or lumtrap version "
                                  "(hash check):",
                                  f.dir.string(), foreign.size(), foreign.size() == 1 ? "" : "s",
                                  foreign.size() == 1 ? "s" : "");
    for (const auto& e : foreign) msg += "\n  " + e;
    msg += "\nremove those result folders (`lumtrap sweep task` then runs the variants again) and merge again";
    throw std::runtime_error(msg);
  }

  // The reference variant of the differences.
  const Summary* ref = rows.empty() ? nullptr : &rows.front().second;
  if (!reference.empty()) {
    ref = nullptr;
    for (const auto& [v, s] : rows)
      if (s.variant == reference) ref = &s;
    if (!ref)
      throw std::invalid_argument(fmt::format("reference variant '{}': no finished variant of {} has that id; allowed: "
                                              "an id of variants.csv whose result is complete",
                                              reference, f.dir.string()));
  }
  // J_G - J_G(reference); its error from the paired groups when both have
  // them (sigma < 0: not known, e.g. fewer photons than groups).
  auto difference = [&](const Summary& s) {
    Difference d{s.J_G_mA_cm2 - ref->J_G_mA_cm2, -1.0};
    if (s.J_G_groups_mA_cm2.size() >= 2 && s.J_G_groups_mA_cm2.size() == ref->J_G_groups_mA_cm2.size())
      d = paired_difference(s.J_G_mA_cm2, s.J_G_groups_mA_cm2, ref->J_G_mA_cm2, ref->J_G_groups_mA_cm2);
    return d;
  };

  std::string csv = "id";
  auto add = [&csv](const std::string& cell) {
    csv += ',';
    csv += csv_field(cell);
  };
  for (const auto& h : f.headers) add(h);
  add("J_G [mA/cm2]");
  add("J_G_sigma [mA/cm2]");
  add("J_G_minus_reference [mA/cm2]");
  add("J_G_minus_reference_sigma [mA/cm2]");
  for (const auto& l : losses) {
    add(l + " [mA/cm2]");
    add(l + "_sigma [mA/cm2]");
  }
  add("J_max [mA/cm2]");
  add("photons");
  csv += "\n";
  ojson j;
  j["format"] = kMergeFormat;
  j["sweep_hash"] = f.sweep_hash;
  j["tool_version"] = f.tool_version;
  j["source"] = f.source;
  j["variant_count"] = f.variant_count;
  j["merged"] = rows.size();
  j["complete"] = report.missing.empty();
  j["columns"] = f.headers;
  j["reference"] = ref ? ref->variant : std::string();
  j["variants"] = ojson::array();
  for (const auto& [v, s] : rows) {
    const SweepFolderVariant& var = folder_variant(f, v);
    csv += var.id;
    for (const auto& c : var.cells) add(c);
    add(fmt::format("{}", s.J_G_mA_cm2));
    add(fmt::format("{}", s.J_G_sigma_mA_cm2));
    const Difference diff = difference(s);
    add(fmt::format("{}", diff.value));
    add(diff.sigma < 0 ? std::string() : fmt::format("{}", diff.sigma));
    ojson lj = ojson::object();
    for (const auto& l : losses) {
      if (const StateCurrent* c = find_loss(s, l)) {
        add(fmt::format("{}", c->mA_cm2));
        add(fmt::format("{}", c->sigma_mA_cm2));
        lj[l] = {{"mA_cm2", c->mA_cm2}, {"sigma_mA_cm2", c->sigma_mA_cm2}};
      } else {
        add("");
        add("");
      }
    }
    add(fmt::format("{}", s.J_max_mA_cm2));
    add(fmt::format("{}", s.photons));
    csv += "\n";
    j["variants"].push_back({{"id", var.id},
                             {"index", var.index},
                             {"parameters", variant_parameters(f, var)},
                             {"J_G_mA_cm2", s.J_G_mA_cm2},
                             {"J_G_sigma_mA_cm2", s.J_G_sigma_mA_cm2},
                             {"J_G_minus_reference_mA_cm2", diff.value},
                             {"losses", lj},
                             {"J_max_mA_cm2", s.J_max_mA_cm2},
                             {"photons", s.photons},
                             {"trace_seconds", s.trace_seconds},
                             {"peak_memory_MB", s.peak_memory_MB},
                             {"result", "variants/" + var.id + "/result"}});
    if (diff.sigma >= 0) j["variants"].back()["J_G_minus_reference_sigma_mA_cm2"] = diff.sigma;
  }
  j["missing"] = ojson::array();
  for (const auto& [v, st] : report.missing)
    j["missing"].push_back({{"id", variant_id(f, v)},
                            {"state", state_name(st.state)},
                            {"array_index", st.task},
                            {"log", st.log.string()},
                            {"reason", st.reason}});
  write_file_atomically(f.dir / "merged.csv", csv);
  write_file_atomically(f.dir / "merged.json", j.dump(2) + "\n");
  report.merged = rows.size();
  return report;
}

}  // namespace lumtrap
