#include "io/result_writer.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <fstream>
#include <stdexcept>

namespace lumtrap {

namespace fs = std::filesystem;

std::string spectral_csv(const Results& r) {
  std::string out = "# lumtrap per-wavelength result (" + r.method + "); fractions of incident photons\n";
  out += "wavelength_nm,photons";
  for (const auto& b : r.bins) out += "," + b.name + "," + b.name + "_sigma";
  out += "\n";
  for (std::size_t i = 0; i < r.wavelength_nm.size(); ++i) {
    out += fmt::format("{:.6g},{}", r.wavelength_nm[i], r.photons.empty() ? 0 : r.photons[i]);
    for (const auto& b : r.bins) out += fmt::format(",{:.9g},{:.3g}", b.fraction[i], b.sigma[i]);
    out += "\n";
  }
  return out;
}

std::string summary_json(const Results& r) {
  nlohmann::ordered_json j;
  j["method"] = r.method;
  j["spectrum"] = r.spectrum;
  j["wavelength_range_nm"] = {r.wavelength_nm.front(), r.wavelength_nm.back()};
  j["wavelengths"] = r.wavelength_nm.size();
  j["J_max_mA_cm2"] = r.J_max_mA_cm2;
  const ResultBin& g = r.bins.front();
  j["J_G_mA_cm2"] = g.current_mA_cm2;
  j["J_G_sigma_mA_cm2"] = g.current_sigma_mA_cm2;
  nlohmann::ordered_json losses = nlohmann::ordered_json::object();
  double sum = g.current_mA_cm2;
  for (std::size_t k = 1; k < r.bins.size(); ++k) {
    const auto& b = r.bins[k];
    losses[b.name] = {{"mA_cm2", b.current_mA_cm2}, {"sigma_mA_cm2", b.current_sigma_mA_cm2},
                      {"meaning", b.meaning}};
    sum += b.current_mA_cm2;
  }
  j["losses"] = losses;
  j["closure_J_G_plus_losses_minus_J_max_mA_cm2"] = sum - r.J_max_mA_cm2;
  for (auto it = r.summary.begin(); it != r.summary.end(); ++it) j[it.key()] = it.value();
  return j.dump(2) + "\n";
}

void write_file_atomically(const fs::path& file, const std::string& content) {
  fs::path tmp = file;
  tmp += fmt::format(".tmp-{}", ::getpid());
  {
    std::ofstream f(tmp, std::ios::binary | std::ios::trunc);
    if (!f) throw std::runtime_error("cannot write " + tmp.string());
    f << content;
    f.flush();
    if (!f) {
      std::error_code ec;
      fs::remove(tmp, ec);
      throw std::runtime_error("error while writing " + tmp.string());
    }
  }
  std::error_code ec;
  fs::rename(tmp, file, ec);
  if (ec) {
    fs::remove(tmp, ec);
    throw std::runtime_error("cannot rename into " + file.string());
  }
}

void write_result_folder(const fs::path& dir, const std::vector<OutputFile>& files, bool overwrite) {
  if (fs::exists(dir) && !overwrite)
    throw std::runtime_error("result folder " + dir.string() +
                             " already exists; choose another --out or pass --overwrite to replace it");
  fs::path parent = dir.parent_path().empty() ? fs::path(".") : dir.parent_path();
  fs::create_directories(parent);
  fs::path tmp = parent / fmt::format(".{}.partial-{}", dir.filename().string(), ::getpid());
  std::error_code ec;
  fs::remove_all(tmp, ec);
  try {
    fs::create_directory(tmp);
    for (const auto& f : files) {
      std::ofstream out(tmp / f.name, std::ios::binary | std::ios::trunc);
      out << f.content;
      out.flush();
      if (!out) throw std::runtime_error("error while writing " + (tmp / f.name).string());
    }
    if (fs::exists(dir)) {
      fs::path old = parent / fmt::format(".{}.old-{}", dir.filename().string(), ::getpid());
      fs::rename(dir, old);
      fs::rename(tmp, dir);
      fs::remove_all(old);
    } else {
      fs::rename(tmp, dir);
    }
  } catch (...) {
    fs::remove_all(tmp, ec);
    throw;
  }
}

}  // namespace lumtrap
