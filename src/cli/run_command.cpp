// lumtrap run SCENE: ray tracing of one scene into a result folder.
#include <fmt/format.h>
#include <tbb/global_control.h>
#include <tbb/info.h>

#include <atomic>
#include <chrono>
#include <csignal>
#include <iostream>

#include "cli/commands.hpp"
#include "cli/output.hpp"
#include "io/result_writer.hpp"
#include "io/scene_parser.hpp"
#include "io/scene_warnings.hpp"
#include "trace/driver.hpp"

namespace lumtrap::cli {

namespace {

std::atomic<bool> g_stop{false};
extern "C" void on_signal(int) { g_stop.store(true); }

struct RunOptions : OutputOptions {
  int threads = -1;
  long long photons = -1;
};

}  // namespace

void add_run_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("run", "ray-trace a scene: J_G, losses, generation profile into a result folder");
  auto o = std::make_shared<RunOptions>();
  cmd->add_option("scene", o->scene, "scene file (TOML)")->required()->check(CLI::ExistingFile);
  add_output_options(*cmd, *o);
  cmd->add_option("-j,--threads", o->threads, "threads (default: run.threads of the scene, 0 = all cores)")
      ->check(CLI::NonNegativeNumber);
  cmd->add_option("--photons", o->photons, "photons per wavelength (overrides run.photons)")
      ->check(CLI::PositiveNumber);
  cmd->callback([o] {
    Scene scene = parse_scene_file(o->scene);
    if (o->photons > 0) scene.run.photons = std::uint64_t(o->photons);
    if (o->threads >= 0) scene.run.threads = o->threads;
    const auto out = result_folder(*o, scene, "run");
    refuse_existing(out, o->overwrite);
    const std::string resolved = resolved_scene_toml(scene);
    const std::string hash = scene_hash(scene);
    const auto warnings = scene_warnings(scene);
    for (const auto& w : warnings) std::cerr << "lumtrap: warning: " << w << "\n";

    const int threads = scene.run.threads > 0 ? scene.run.threads : tbb::info::default_concurrency();
    tbb::global_control limit(tbb::global_control::max_allowed_parallelism, std::size_t(threads));

    const auto t0 = std::chrono::steady_clock::now();
    auto run = prepare_run(scene);
    const auto t1 = std::chrono::steady_clock::now();

    DriveOptions d;
    d.scene_hash = hash;
    d.checkpoint = (out.parent_path().empty() ? std::filesystem::path(".") : out.parent_path()) /
                   ("." + out.filename().string() + ".checkpoint.json");
    Progress progress(fmt::format("lumtrap run {}:", scene.name));
    d.progress = [&progress](double f) { progress.update(f); };
    d.stop = &g_stop;
    std::signal(SIGINT, on_signal);
    std::signal(SIGTERM, on_signal);
    DriveResult result = drive_run(*run, d);
    std::signal(SIGINT, SIG_DFL);
    std::signal(SIGTERM, SIG_DFL);
    const auto t2 = std::chrono::steady_clock::now();
    if (!result.complete) {
      std::cerr << fmt::format("\nlumtrap: interrupted; finished batches are kept in {}; run the same command "
                               "again to resume\n",
                               d.checkpoint.string());
      throw ExitCode{130};
    }

    Results r = results_from_tallies(*run, result.tallies);
    const double trace_s = std::chrono::duration<double>(t2 - t1).count();
    std::uint64_t photons = r.summary["photons"];
    r.summary["scene_hash"] = hash;
    r.summary["tool_version"] = LUMTRAP_VERSION;
    r.summary["threads"] = threads;
    r.summary["setup_seconds"] = std::chrono::duration<double>(t1 - t0).count();
    r.summary["trace_seconds"] = trace_s;
    r.summary["photons_per_second"] = trace_s > 0 ? double(photons) / trace_s : 0.0;
    r.summary["interactions_per_second"] = trace_s > 0 ? double(r.summary["interactions"]) / trace_s : 0.0;
    if (scene.run.target_jg_error > 0) r.summary["target_J_G_sigma_mA_cm2"] = scene.run.target_jg_error;
    // The achieved σ(J_G) is that of the tallies (J_G_sigma_mA_cm2 above,
    // the same formula as the driver's).
    r.summary["achieved_J_G_sigma_mA_cm2"] = result.jg_sigma_mA_cm2;
    if (scene.run.target_jg_error > 0)
      r.summary["target_J_G_sigma_met"] = result.jg_sigma_mA_cm2 <= scene.run.target_jg_error;
    r.summary["warnings"] = warnings;

    write_result_folder(out, trace_result_files(*run, r, result.tallies, resolved), o->overwrite);
    std::filesystem::remove(d.checkpoint);
    print_summary(r, out);
  });
}

}  // namespace lumtrap::cli
