// lumtrap run SCENE: ray tracing of one scene into a result folder.
#include <fmt/format.h>

#include <chrono>
#include <iostream>
#include <limits>

#include "cli/build_progress.hpp"
#include "cli/commands.hpp"
#include "cli/memory_limit.hpp"
#include "cli/option_checks.hpp"
#include "cli/output.hpp"
#include "cli/output_folder_lock.hpp"
#include "cli/output_path_check.hpp"
#include "cli/stop_signal.hpp"
#include "cli/thread_limit.hpp"
#include "io/finite_results.hpp"
#include "io/result_warnings.hpp"
#include "io/result_writer.hpp"
#include "io/run_facts.hpp"
#include "io/scene_identity.hpp"
#include "io/scene_reader.hpp"
#include "io/scene_warnings.hpp"
#include "io/scene_writer.hpp"
#include "trace/build_estimate.hpp"
#include "io/stale_result_folders.hpp"
#include "trace/driver.hpp"

namespace lumtrap::cli {

namespace {

struct RunOptions : OutputOptions {
  int threads = -1;
  long long photons = -1;
  std::string max_memory;
};

double seconds_between(std::chrono::steady_clock::time_point a, std::chrono::steady_clock::time_point b) {
  return std::chrono::duration<double>(b - a).count();
}

}  // namespace

void add_run_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("run", "ray-trace a scene: J_G, losses, generation profile into a result folder");
  auto o = std::make_shared<RunOptions>();
  cmd->add_option("scene", o->scene, "scene file (TOML)")->required()->check(CLI::ExistingFile);
  add_output_options(*cmd, *o);
  cmd->add_option("-j,--threads", o->threads, "threads, 0 = all cores (default: run.threads of the scene)")
      ->check(whole_number_in(0, std::numeric_limits<int>::max(), "0 = all cores"));
  cmd->add_option("--photons", o->photons, "photons per wavelength (overrides run.photons)")
      ->check(whole_number_in(1, std::int64_t(kMaxPhotonsPerWavelength), kMaxPhotonsReason));
  add_max_memory_option(*cmd, o->max_memory);
  cmd->callback([o] {
    Scene scene = parse_scene_file(o->scene);
    if (o->photons > 0) scene.run.photons = std::uint64_t(o->photons);
    if (o->threads >= 0) scene.run.threads = o->threads;
    // Refuse textures too large for the machine before any work.
    const MemoryLimit memory = memory_limit(o->max_memory);
    const BuildCost cost = estimate_build(scene);
    check_build_cost(scene, cost, memory.bytes, memory.origin);
    const auto out = result_folder(*o, scene, "run");
    check_output_folder(out, scene.file, o->overwrite);
    const std::string resolved = resolved_scene_toml(scene);
    const std::string identity = scene_identity(scene);
    const auto warnings = scene_warnings(scene);
    for (const auto& w : warnings) std::cerr << "lumtrap: warning: " << w << "\n";

    const ThreadLimit limit(scene.run.threads, o->threads >= 0 ? "--threads" : "run.threads");
    const OutputFolderLock lock(out);
    const auto tidied = tidy_stale_result_folders(out);
    for (const auto& note : tidied) std::cerr << "lumtrap: note: " << note << "\n";
    if (!tidied.empty()) check_output_folder(out, scene.file, o->overwrite);  // a result may have been put back
    const auto t0 = std::chrono::steady_clock::now();
    std::unique_ptr<PreparedRun> run;
    {
      const BuildProgress building("lumtrap run: building the textures", cost.seconds);
      run = prepare_run(scene);
    }
    const auto t1 = std::chrono::steady_clock::now();

    DriveOptions d;
    d.scene_hash = identity;
    d.checkpoint = (out.parent_path().empty() ? std::filesystem::path(".") : out.parent_path()) /
                   ("." + out.filename().string() + ".checkpoint.json");
    const bool resumed = std::filesystem::exists(d.checkpoint);
    Progress progress(fmt::format("lumtrap run {}:", scene.name));
    d.progress = [&progress](double f) { progress.update(f); };
    d.warn = [&progress](const std::string& m) { progress.message("lumtrap: warning: " + m); };
    // The stop request is honoured until the result folder is in place: a
    // signal while writing waits for the folder to be complete.
    const StopOnSignal stop;
    d.stop = stop.flag();
    const DriveResult result = drive_run(*run, d);
    const auto t2 = std::chrono::steady_clock::now();
    if (!result.complete) {
      progress.finish();
      if (result.checkpoint_problem.empty())
        std::cerr << fmt::format("lumtrap: interrupted; finished photons are kept in {}; run the same command "
                                 "again to resume\n",
                                 d.checkpoint.string());
      else
        std::cerr << fmt::format("lumtrap: interrupted; the work done could not be kept (checkpoint {}: {})\n",
                                 d.checkpoint.string(), result.checkpoint_problem);
      throw ExitCode{130};
    }
    progress.finish();

    Results r = results_from_tallies(*run, result.tallies);
    r.summary.scene_hash = identity;
    r.summary.tool_version = LUMTRAP_VERSION;
    r.summary.warnings = warnings;
    apply_run_facts(r.summary, RunFacts{limit.threads(), host_name(), seconds_between(t0, t1),
                                        seconds_between(t1, t2), peak_memory_MB(), resumed});
    for (const auto& w : result_warnings(r)) std::cerr << "lumtrap: warning: " << w << "\n";
    require_finite_results(r);
    write_result_folder(out, result_files(r, resolved), o->overwrite);
    std::error_code ec;
    std::filesystem::remove(d.checkpoint, ec);
    print_summary(r, out);
  });
}

}  // namespace lumtrap::cli
