// lumtrap: ray-tracing light-trapping analysis of textured, coated,
// metallised silicon wafers. See README.md.
#include <exception>
#include <iostream>

#include "cli/commands.hpp"
#include "io/toml_text.hpp"

int main(int argc, char** argv) {
  CLI::App app{"lumtrap " LUMTRAP_VERSION
               ": light trapping in textured, coated, metallised silicon wafers "
               "(ray tracing; J_G and losses under AM1.5G)"};
  app.set_version_flag("--version", std::string("lumtrap ") + LUMTRAP_VERSION);
  app.require_subcommand(1);
  lumtrap::cli::add_run_command(app);
  lumtrap::cli::add_planar_command(app);
  lumtrap::cli::add_check_command(app);
  lumtrap::cli::add_materials_command(app);
  lumtrap::cli::add_sweep_command(app);
  lumtrap::cli::add_end_states_command(app);
  lumtrap::cli::add_plot_command(app);
  lumtrap::cli::add_report_command(app);
  lumtrap::cli::add_exr_channels_command(app);
  lumtrap::cli::add_texture_command(app);
  lumtrap::cli::add_verify_command(app);
  lumtrap::cli::add_fit_command(app);
  // No command, or a first word that is no option and no command: say so
  // plainly, listing the commands (CLI11 would report "A subcommand is required").
  if (argc == 1 || (argv[1][0] != '-' &&
                    app.get_subcommands([&](CLI::App* sub) { return sub->check_name(argv[1]); }).empty())) {
    std::string names;
    for (CLI::App* sub : app.get_subcommands([](CLI::App*) { return true; }))
      if (!sub->get_group().empty()) names += (names.empty() ? "" : ", ") + sub->get_name();
    std::cerr << "lumtrap: error: "
              << (argc == 1 ? std::string("no command given")
                            : "unknown command '" + lumtrap::shortened(argv[1]) + "'")
              << "; allowed: " << names << " (lumtrap --help describes them)\n";
    return 1;
  }
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    return app.exit(e);
  } catch (const lumtrap::cli::ExitCode& e) {
    return e.code;
  } catch (const std::exception& e) {
    std::cerr << "lumtrap: error: " << e.what() << "\n";
    return 1;
  }
  return 0;
}
