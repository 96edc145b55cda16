#pragma once
// Shared pieces of the commands that write result folders.
#include <chrono>
#include <filesystem>
#include <string>

#include <CLI/CLI.hpp>

#include "io/results.hpp"
#include "io/scene.hpp"

namespace lumtrap::cli {

struct OutputOptions {
  std::string scene;
  std::string out;        ///< result folder; default results/<scene stem>[-<kind>]
  bool overwrite = false;
};

void add_output_options(CLI::App& cmd, OutputOptions& o);

/// The folder to write: --out, or results/<scene stem> (+ "-planar" for the planar solver).
std::filesystem::path result_folder(const OutputOptions& o, const Scene& scene, const std::string& kind);

/// A short human-readable table of J_G and the losses on stdout.
void print_summary(const Results& r, const std::filesystem::path& out);

/// Progress line on stderr, only when stderr is a terminal. Whether a
/// terminal or not, a run that will clearly take longer than an hour says
/// so once, with the expected time, after a few seconds of tracing.
class Progress {
 public:
  explicit Progress(std::string label);
  ~Progress();
  void update(double fraction);
  /// A line of its own on stderr (the progress line is redrawn after it).
  void message(const std::string& line);
  /// Ends the progress line (before other output).
  void finish();

 private:
  std::string label_;
  bool tty_;
  int last_permille_ = -1;
  bool time_noted_ = false;
  std::chrono::steady_clock::time_point start_ = std::chrono::steady_clock::now();
};

}  // namespace lumtrap::cli
