#pragma once
// The lumtrap command line: each subcommand registers itself on the app and
// runs through the callback it installs. Exit codes: 0 success, 1 bad input
// or failure (message on stderr), 130 interrupted (work so far is kept).
#include <CLI/CLI.hpp>

namespace lumtrap::cli {

void add_run_command(CLI::App& app);       // lumtrap run SCENE
void add_planar_command(CLI::App& app);    // lumtrap planar SCENE
void add_check_command(CLI::App& app);     // lumtrap check SCENE
void add_materials_command(CLI::App& app); // lumtrap materials
void add_sweep_command(CLI::App& app);     // lumtrap sweep plan|task|local|merge|status
void add_end_states_command(CLI::App& app);  // lumtrap end-states
void add_plot_command(CLI::App& app);      // lumtrap plot FOLDER...
void add_report_command(CLI::App& app);    // lumtrap report FOLDER...
void add_exr_channels_command(CLI::App& app);  // lumtrap exr-channels FILE (hidden helper of plot)
void add_texture_command(CLI::App& app);   // lumtrap texture SCENE
void add_verify_command(CLI::App& app);    // lumtrap verify
void add_fit_command(CLI::App& app);       // lumtrap fit SCENE --measured R.csv

/// Thrown by commands to end with a given exit code after a message.
struct ExitCode {
  int code;
};

}  // namespace lumtrap::cli
