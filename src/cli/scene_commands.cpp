// lumtrap planar / check / materials: the commands that need no ray tracing.
#include <fmt/format.h>

#include <iostream>

#include "cli/commands.hpp"
#include "cli/output.hpp"
#include "io/result_writer.hpp"
#include "io/scene_parser.hpp"
#include "optics/material.hpp"
#include "trace/planar_run.hpp"

namespace lumtrap::cli {

void add_planar_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("planar", "exact optics of a planar wafer (no rays): writes a result folder");
  auto opts = std::make_shared<OutputOptions>();
  cmd->add_option("scene", opts->scene, "scene file (TOML)")->required()->check(CLI::ExistingFile);
  add_output_options(*cmd, *opts);
  cmd->callback([opts] {
    const Scene scene = parse_scene_file(opts->scene);
    const auto out = result_folder(*opts, scene, "planar");
    refuse_existing(out, opts->overwrite);
    Results r = planar_results(scene);
    const std::string resolved = resolved_scene_toml(scene);
    r.summary["scene_hash"] = scene_hash(scene);
    r.summary["tool_version"] = LUMTRAP_VERSION;
    write_result_folder(out, {{"spectral.csv", spectral_csv(r)}, {"summary.json", summary_json(r)},
                              {"scene.toml", resolved}},
                        opts->overwrite);
    print_summary(r, out);
  });
}

void add_check_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("check", "validate a scene file and print it with every default filled in");
  auto scene_file = std::make_shared<std::string>();
  cmd->add_option("scene", *scene_file, "scene file (TOML)")->required()->check(CLI::ExistingFile);
  cmd->callback([scene_file] {
    const Scene scene = parse_scene_file(*scene_file);
    std::cout << resolved_scene_toml(scene);
  });
}

void add_materials_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("materials", "list the shipped optical-constant tables");
  cmd->callback([] {
    std::cout << fmt::format("{:<26} {:>14}  {}\n", "id", "range (nm)", "source");
    std::cout << fmt::format("{:<26} {:>14}  {}\n", "air", "any", "constant n = 1, k = 0");
    for (const auto& id : shipped_material_ids()) {
      const Material m = find_material(id);
      std::cout << fmt::format("{:<26} {:>6g}-{:<7g}  {}\n", id, m.min_wavelength_nm(), m.max_wavelength_nm(),
                               m.source.substr(0, 100));
    }
  });
}

}  // namespace lumtrap::cli
