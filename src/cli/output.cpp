#include "cli/output.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <iostream>
#include <stdexcept>


namespace lumtrap::cli {

void add_output_options(CLI::App& cmd, OutputOptions& o) {
  cmd.add_option("-o,--out", o.out, "result folder (default: results/<scene name>)")
      ->check(CLI::Validator(
          [](std::string& text) -> std::string {
            return text.empty() ? "an empty path; allowed: a path to a new folder, e.g. -o results/k7_recipe_a" : "";
          },
          "PATH"));
  cmd.add_flag("--overwrite", o.overwrite, "replace an existing result folder");
}

std::filesystem::path result_folder(const OutputOptions& o, const Scene& scene, const std::string& kind) {
  if (!o.out.empty()) return o.out;
  std::string stem = scene.file.stem().string();
  if (kind != "run") stem += "-" + kind;
  return std::filesystem::path("results") / stem;
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

Progress::~Progress() { finish(); }

void Progress::finish() {
  if (tty_ && last_permille_ >= 0) std::cerr << "\n";
  last_permille_ = -1;
}

void Progress::message(const std::string& line) {
  const int shown = last_permille_;
  finish();
  std::cerr << line << "\n";
  if (shown >= 0) {
    std::cerr << fmt::format("\r{} {:5.1f} %", label_, shown / 10.0) << std::flush;
    last_permille_ = shown;
  }
}

void Progress::update(double fraction) {
  const double elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
  if (!time_noted_ && elapsed > 5 && fraction > 0 && fraction < 1) {
    const double left_hours = elapsed * (1 - fraction) / fraction / 3600;
    if (left_hours > 1) {
      time_noted_ = true;
      message(fmt::format("lumtrap: note: at the present speed this run needs about {:.0f} more hours; fewer "
                          "photons (--photons, run.photons) make it shorter, and Ctrl-C stops it keeping the "
                          "finished photons",
                          left_hours));
    }
  }
  if (!tty_) return;
  const int pm = int(fraction * 1000.0);
  if (pm == last_permille_) return;
  last_permille_ = pm;
  std::cerr << fmt::format("\r{} {:5.1f} %", label_, pm / 10.0) << std::flush;
}

}  // namespace lumtrap::cli
