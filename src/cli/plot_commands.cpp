// lumtrap plot / lumtrap report: charts (PNG + SVG) and a self-contained HTML
// report of result and sweep folders. The work is done by the Python package
// lumtrap_plots (scripts/lumtrap_plots/, Python 3 + Debian's
// python3-matplotlib); these commands find the package and an interpreter and
// run `python3 -m lumtrap_plots plot|report ...`, passing the version, the
// materials folder (for the solar spectrum) and this binary (which reads
// OpenEXR images for the package: `lumtrap exr-channels`).
//
// Interpreter: $LUMTRAP_PYTHON if set, else /usr/bin/python3 (where Debian's
// python3-matplotlib is installed), else python3 on the PATH.
// Exit codes: those of the package (0, or 1 after one line on stderr).
#include <fmt/format.h>
#include <spawn.h>
#include <sys/wait.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <iostream>
#include <string>
#include <vector>

#include "cli/commands.hpp"
#include "optics/material.hpp"

extern char** environ;

namespace lumtrap::cli {

namespace fs = std::filesystem;

namespace {

/// The folder that holds the lumtrap_plots package: <exe dir>/../share/lumtrap/python,
/// in an installed tree and in the build tree (where CMake links it to
/// scripts/lumtrap_plots), as for the materials; no source path is compiled in.
/// The one place to change when the install layout changes.
fs::path plot_package_dir() {
  std::error_code ec;
  const fs::path exe = fs::read_symlink("/proc/self/exe", ec);
  std::vector<fs::path> tried;
  if (!ec) {
    tried.push_back((exe.parent_path() / ".." / "share" / "lumtrap" / "python").lexically_normal());  // installed
    tried.push_back(exe.parent_path() / "share" / "lumtrap" / "python");                             // build tree
  }
  for (const auto& dir : tried)
    if (fs::is_regular_file(dir / "lumtrap_plots" / "__main__.py", ec)) return fs::weakly_canonical(dir, ec);
  std::string where;
  for (const auto& dir : tried) where += (where.empty() ? "" : ", ") + (dir / "lumtrap_plots").string();
  throw std::runtime_error(fmt::format(
      "the plotting package lumtrap_plots is missing (looked in {}): reinstall lumtrap or build it from a "
      "complete source tree",
      where.empty() ? "nowhere" : where));
}

std::string python_interpreter() {
  if (const char* env = std::getenv("LUMTRAP_PYTHON"); env != nullptr && *env != '\0') return env;
  std::error_code ec;
  if (fs::exists("/usr/bin/python3", ec)) return "/usr/bin/python3";
  return "python3";
}

std::string this_executable() {
  std::error_code ec;
  const fs::path exe = fs::read_symlink("/proc/self/exe", ec);
  return ec ? std::string("lumtrap") : exe.string();
}

/// Runs `python -B -m lumtrap_plots ARGS` with the package folder on
/// PYTHONPATH; returns its exit code.
int run_package(const std::string& command, const std::vector<std::string>& folders, const std::string& out) {
  const fs::path package = plot_package_dir();
  const std::string python = python_interpreter();
  std::vector<std::string> args{python, "-B", "-m", "lumtrap_plots", command,
                                "--version", LUMTRAP_VERSION,
                                "--materials-dir", materials_dir().string(),
                                "--lumtrap-exe", this_executable()};
  if (!out.empty()) {
    args.push_back("--out");
    args.push_back(out);
  }
  args.push_back("--");
  args.insert(args.end(), folders.begin(), folders.end());

  std::vector<std::string> env_strings;
  const char* old_path = std::getenv("PYTHONPATH");
  env_strings.push_back("PYTHONPATH=" + package.string() +
                        (old_path && *old_path ? ":" + std::string(old_path) : std::string()));
  env_strings.push_back("MPLBACKEND=Agg");
  for (char** e = environ; *e != nullptr; ++e)
    if (std::strncmp(*e, "PYTHONPATH=", 11) != 0 && std::strncmp(*e, "MPLBACKEND=", 11) != 0)
      env_strings.emplace_back(*e);
  std::vector<char*> argv, envp;
  for (auto& a : args) argv.push_back(a.data());
  argv.push_back(nullptr);
  for (auto& e : env_strings) envp.push_back(e.data());
  envp.push_back(nullptr);

  pid_t pid = 0;
  const int rc = posix_spawnp(&pid, python.c_str(), nullptr, nullptr, argv.data(), envp.data());
  if (rc != 0)
    throw std::runtime_error(fmt::format(
        "cannot run the Python interpreter '{}' ({}): install python3 and python3-matplotlib "
        "(apt-get install python3-matplotlib, or bash scripts/install-deps.sh), or set LUMTRAP_PYTHON",
        python, std::strerror(rc)));
  int status = 0;
  while (waitpid(pid, &status, 0) < 0)
    if (errno != EINTR) throw std::runtime_error(fmt::format("waiting for {}: {}", python, std::strerror(errno)));
  if (WIFEXITED(status)) return WEXITSTATUS(status);
  return 128 + (WIFSIGNALED(status) ? WTERMSIG(status) : 0);
}

void run_or_exit(const std::string& command, const std::vector<std::string>& folders, const std::string& out) {
  int code = 0;
  try {
    code = run_package(command, folders, out);
  } catch (const std::exception& e) {
    std::cerr << "lumtrap " << command << ": error: " << e.what() << "\n";
    code = 1;
  }
  if (code != 0) throw ExitCode{code};
}

}  // namespace

void add_plot_command(CLI::App& app) {
  auto* cmd = app.add_subcommand(
      "plot",
      "charts (PNG + SVG) of result folders into FOLDER/plots/, comparison charts of several, sweep charts "
      "of a sweep folder (model estimates; needs python3-matplotlib)");
  auto folders = std::make_shared<std::vector<std::string>>();
  auto out = std::make_shared<std::string>();
  cmd->add_option("folders", *folders, "result folders (lumtrap run/planar) and/or sweep folders")->required();
  cmd->add_option("-o,--out", *out,
                  "folder of the comparison charts of several result folders "
                  "(default: comparison-plots/ beside the first folder)");
  cmd->callback([folders, out] { run_or_exit("plot", *folders, *out); });
}

void add_report_command(CLI::App& app) {
  auto* cmd = app.add_subcommand(
      "report",
      "one self-contained HTML file per result or sweep folder (FOLDER/report.html): charts, J_G and losses "
      "with errors, warnings, run facts, the resolved scene; opens offline in any browser");
  auto folders = std::make_shared<std::vector<std::string>>();
  auto out = std::make_shared<std::string>();
  cmd->add_option("folders", *folders, "result folders and/or sweep folders")->required();
  cmd->add_option("-o,--out", *out, "the HTML file to write (one folder only; default FOLDER/report.html)");
  cmd->callback([folders, out] { run_or_exit("report", *folders, *out); });
}

}  // namespace lumtrap::cli
