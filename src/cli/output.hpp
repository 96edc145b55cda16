#pragma once
// Shared pieces of the commands that write result folders.
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

/// Fails before any work is done when the folder exists and --overwrite was not given.
void refuse_existing(const std::filesystem::path& out, bool overwrite);

/// A short human-readable table of J_G and the losses on stdout.
void print_summary(const Results& r, const std::filesystem::path& out);

/// Progress line on stderr, only when stderr is a terminal.
class Progress {
 public:
  explicit Progress(std::string label);
  ~Progress();
  void update(double fraction);

 private:
  std::string label_;
  bool tty_;
  int last_permille_ = -1;
};

}  // namespace lumtrap::cli
