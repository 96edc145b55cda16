// lumtrap planar / check / materials: the commands that need no ray tracing.
#include <fmt/format.h>
#include <fmt/ranges.h>

#include <iostream>

#include "cli/build_progress.hpp"
#include "cli/commands.hpp"
#include "cli/memory_limit.hpp"
#include "cli/output.hpp"
#include "cli/output_folder_lock.hpp"
#include "cli/output_path_check.hpp"
#include "io/finite_results.hpp"
#include "io/stale_result_folders.hpp"
#include "io/end_states.hpp"
#include "io/formula_material_file.hpp"
#include "io/result_writer.hpp"
#include "io/scene_identity.hpp"
#include "io/scene_reader.hpp"
#include "io/scene_warnings.hpp"
#include "io/scene_writer.hpp"
#include "optics/material.hpp"
#include "sweep/expand.hpp"
#include "trace/build_estimate.hpp"
#include "trace/planar_run.hpp"
#include "trace/wafer_model.hpp"

namespace lumtrap::cli {

void add_planar_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("planar", "exact optics of a planar wafer (no rays): writes a result folder");
  auto opts = std::make_shared<OutputOptions>();
  cmd->add_option("scene", opts->scene, "scene file (TOML)")->required()->check(CLI::ExistingFile);
  add_output_options(*cmd, *opts);
  cmd->callback([opts] {
    const Scene scene = parse_scene_file(opts->scene);
    const auto out = result_folder(*opts, scene, "planar");
    check_output_folder(out, scene.file, opts->overwrite);
    Results r = planar_results(scene);
    r.summary.scene_hash = scene_identity(scene);
    r.summary.tool_version = LUMTRAP_VERSION;
    r.summary.warnings = scene_warnings(scene);
    require_finite_results(r);
    const OutputFolderLock lock(out);
    const auto tidied = tidy_stale_result_folders(out);
    for (const auto& note : tidied) std::cerr << "lumtrap: note: " << note << "\n";
    if (!tidied.empty()) check_output_folder(out, scene.file, opts->overwrite);  // a result may have been put back
    write_result_folder(out, result_files(r, resolved_scene_toml(scene)), opts->overwrite);
    print_summary(r, out);
  });
}

void add_check_command(CLI::App& app) {
  auto* cmd = app.add_subcommand(
      "check", "validate a scene file (print it with every default filled in) or a sweep file (every variant)");
  auto scene_file = std::make_shared<std::string>();
  auto max_memory = std::make_shared<std::string>();
  cmd->add_option("scene", *scene_file, "scene file or sweep file (TOML)")->required()->check(CLI::ExistingFile);
  add_max_memory_option(*cmd, *max_memory);
  cmd->callback([scene_file, max_memory] {
    const MemoryLimit memory = memory_limit(*max_memory);
    const toml::table table = read_scene_table(*scene_file);
    if (table.contains("sweep")) {
      TileHeightCache cache;
      BuildCost largest;
      const Sweep sweep = expand_sweep(table, *scene_file, [&](const Scene& s) {
        const BuildCost cost = estimate_build(s);
        check_build_cost(s, cost, memory.bytes, memory.origin);
        if (cost.bytes > largest.bytes) largest = cost;
        const BuildProgress building("lumtrap check: building the textures", cost.seconds);
        check_wafer_geometry(s, &cache);
      });
      std::cerr << fmt::format("lumtrap check: largest variant: {} (limit {}: {})\n", describe_build_cost(largest),
                               format_bytes(memory.bytes), memory.origin);
      std::cout << fmt::format("{}: {} sweep variants, all valid (swept keys: {})\n", *scene_file,
                               sweep.variants.size(), fmt::join(sweep.keys, ", "));
      return;
    }
    const Scene scene = scene_from_table(table, *scene_file);
    const BuildCost cost = estimate_build(scene);
    std::cerr << fmt::format("lumtrap check: build estimate: {} (limit {}: {})\n", describe_build_cost(cost),
                             format_bytes(memory.bytes), memory.origin);
    check_build_cost(scene, cost, memory.bytes, memory.origin);
    {
      const BuildProgress building("lumtrap check: building the textures", cost.seconds);
      check_wafer_geometry(scene);
    }
    for (const auto& w : scene_warnings(scene)) std::cerr << "lumtrap: warning: " << w << "\n";
    const auto planar = planar_solver_problem(scene);
    std::cerr << fmt::format("lumtrap check: {} is valid; planar solver: {}\n", *scene_file,
                             planar ? "not applicable (" + *planar + ")" : "applicable (lumtrap planar)");
    std::cout << resolved_scene_toml(scene);
  });
}

namespace {

/// The shipped dispersion formulas (materials/formulas/*.toml), after the tables.
void list_formula_materials() {
  install_formula_file_reader();
  std::cout << fmt::format("\ndispersion formulas (materials/formulas; sampled every {:g} nm):\n",
                           kFormulaSampleStepNm);
  for (const auto& id : shipped_formula_ids()) {
    const Material m = find_material(id);
    std::cout << fmt::format("{:<26} {:>6g}-{:<7g}  {}\n", id, m.min_wavelength_nm(), m.max_wavelength_nm(),
                             m.source.substr(0, 100));
  }
}

}  // namespace

void add_materials_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("materials", "list the shipped optical-constant tables and dispersion formulas");
  cmd->callback([] {
    const MaterialsLocation loc = locate_materials();
    std::error_code ec;
    if (!std::filesystem::is_directory(loc.dir, ec))
      std::cerr << fmt::format("lumtrap: warning: the shipped materials folder {} ({}) is not a folder: only "
                               "\"air\" is available{}\n",
                               loc.dir.string(), loc.how,
                               loc.how == "LUMTRAP_MATERIALS" ? "; unset LUMTRAP_MATERIALS or point it at the "
                                                                "materials folder"
                                                              : "");
    std::cout << fmt::format("{:<26} {:>14}  {}\n", "id", "range (nm)", "source");
    std::cout << fmt::format("{:<26} {:>14}  {}\n", "air", "any", "constant n = 1, k = 0");
    for (const auto& id : shipped_material_ids()) {
      const Material m = find_material(id);
      std::cout << fmt::format("{:<26} {:>6g}-{:<7g}  {}\n", id, m.min_wavelength_nm(), m.max_wavelength_nm(),
                               m.source.substr(0, 100));
    }
    list_formula_materials();
  });
}

}  // namespace lumtrap::cli

namespace lumtrap::cli {

void add_end_states_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("end-states", "print the table of end states (where each photon ends), as Markdown");
  cmd->callback([] { std::cout << end_state_markdown(); });
}

}  // namespace lumtrap::cli
