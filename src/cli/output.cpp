#include "cli/output.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <iostream>
#include <stdexcept>


namespace lumtrap::cli {

void add_output_options(CLI::App& cmd, OutputOptions& o) {
  cmd.add_option("-o,--out", o.out, "result folder (default: results/<scene name>)");
  cmd.add_flag("--overwrite", o.overwrite, "replace an existing result folder");
}

std::filesystem::path result_folder(const OutputOptions& o, const Scene& scene, const std::string& kind) {
  if (!o.out.empty()) return o.out;
  std::string stem = scene.file.stem().string();
  if (kind != "run") stem += "-" + kind;
  return std::filesystem::path("results") / stem;
}

void refuse_existing(const std::filesystem::path& out, bool overwrite) {
  if (std::filesystem::exists(out) && !overwrite)
    throw std::runtime_error("result folder " + out.string() +
                             " already exists; choose another --out or pass --overwrite to replace it");
}

void print_summary(const Results& r, const std::filesystem::path& out) {
  std::cout << fmt::format("{} under {}, {:g}-{:g} nm ({} wavelengths)\n", r.method, r.spectrum,
                           r.wavelength_nm.front(), r.wavelength_nm.back(), r.wavelength_nm.size());
  std::cout << fmt::format("  {:<40} {:>9} {:>9}\n", "", "mA/cm2", "sigma");
  for (const auto& b : r.bins)
    std::cout << fmt::format("  {:<40} {:>9.3f} {:>9.3f}\n",
                             b.bin.state == EndState::absorbed_silicon ? "J_G (absorbed_silicon)" : b.bin.name,
                             b.current_mA_cm2, b.current_sigma_mA_cm2);
  std::cout << fmt::format("  {:<40} {:>9.3f}\n", "J_max", r.J_max_mA_cm2);
  std::cout << "(model estimates)\n";
  std::cout << "results in " << out.string() << "/\n";
}

Progress::Progress(std::string label) : label_(std::move(label)), tty_(::isatty(2) == 1) {}

Progress::~Progress() {
  if (tty_ && last_permille_ >= 0) std::cerr << "\n";
}

void Progress::update(double fraction) {
  if (!tty_) return;
  const int pm = int(fraction * 1000.0);
  if (pm == last_permille_) return;
  last_permille_ = pm;
  std::cerr << fmt::format("\r{} {:5.1f} %", label_, pm / 10.0) << std::flush;
}

}  // namespace lumtrap::cli
