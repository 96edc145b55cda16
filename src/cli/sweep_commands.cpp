// lumtrap sweep plan|task|local|merge|status: parameter sweeps, on this
// machine or as a SLURM job array with a dependent merge job. The folder
// layout is described in sweep/plan_folder.hpp, the [sweep] syntax in
// docs/scene-format.md and the cluster workflow in docs/cluster.md.
#include <fmt/format.h>
#include <unistd.h>

#include <chrono>
#include <cstdlib>
#include <iostream>

#include "cli/commands.hpp"
#include "cli/output.hpp"
#include "cli/stop_signal.hpp"
#include "cli/thread_limit.hpp"
#include "io/run_facts.hpp"
#include "io/text_file.hpp"
#include "sweep/expand.hpp"
#include "sweep/merge.hpp"
#include "sweep/run_unit.hpp"
#include "sweep/slurm_scripts.hpp"
#include "sweep/status.hpp"
#include "trace/wafer_model.hpp"

namespace lumtrap::cli {

namespace fs = std::filesystem;

namespace {

struct PlanOptions {
  std::string sweep, out;
  std::size_t per_task = 1;
  SlurmRequests requests;
  std::uint32_t split = 1;
};

struct RunOptions {
  std::string dir;
  long long index = -1;
  int threads = 0;
  double checkpoint_seconds = 10.0;
  std::uint64_t batch = 50000;
};

/// The running binary, absolute (job scripts must not depend on PATH).
fs::path self_binary() {
  std::error_code ec;
  fs::path p = fs::read_symlink("/proc/self/exe", ec);
  if (ec) throw std::runtime_error("cannot find the path of the lumtrap binary (/proc/self/exe)");
  return p;
}

/// Threads of a task: -j, else SLURM_CPUS_PER_TASK, else every core.
int task_threads(int requested) {
  if (requested > 0) return requested;
  if (const char* s = std::getenv("SLURM_CPUS_PER_TASK")) {
    const int n = std::atoi(s);
    if (n > 0) return n;
  }
  return 0;
}

void add_run_options(CLI::App& cmd, RunOptions& o) {
  cmd.add_option("dir", o.dir, "sweep folder (from lumtrap sweep plan)")->required()->check(CLI::ExistingDirectory);
  cmd.add_option("-j,--threads", o.threads,
                 "threads, 0 = all cores (default: SLURM_CPUS_PER_TASK when set, else all cores; results do not "
                 "depend on it)")
      ->check(CLI::NonNegativeNumber);
  cmd.add_option("--checkpoint-every", o.checkpoint_seconds,
                 "seconds between checkpoints of a running variant (default 10)")
      ->check(CLI::NonNegativeNumber);
  cmd.add_option("--batch", o.batch, "photons per wavelength per batch (default 50000; results do not depend on it)")
      ->check(CLI::PositiveNumber);
}

struct UnitTotals {
  std::size_t finished = 0, skipped = 0, failed = 0;
  bool interrupted = false;
};

/// Runs units in order; prints one line per unit on stdout. Continues past
/// a failing unit (the error goes to stderr, i.e. the task log).
UnitTotals run_units(const SweepFolder& f, const std::vector<std::size_t>& units, const RunOptions& o,
                     Progress* progress) {
  UnitTotals totals;
  const StopOnSignal stop;
  for (std::size_t k = 0; k < units.size(); ++k) {
    if (stop.requested()) {
      totals.interrupted = true;
      break;
    }
    UnitRunOptions u;
    u.checkpoint_seconds = o.checkpoint_seconds;
    u.batch = o.batch;
    u.stop = stop.flag();
    if (progress)
      u.progress = [progress, k, n = units.size()](double x) { progress->update((double(k) + x) / double(n)); };
    try {
      const UnitReport r = run_work_unit(f, units[k], u);
      if (progress && ::isatty(2)) std::cerr << "\r\x1b[K" << std::flush;  // clear the progress line first
      std::cout << r.line << std::endl;
      if (r.outcome == UnitReport::finished) ++totals.finished;
      if (r.outcome == UnitReport::skipped) ++totals.skipped;
      if (r.outcome == UnitReport::interrupted) {
        totals.interrupted = true;
        break;
      }
    } catch (const std::exception& e) {
      const WorkUnit w = unit_at(f, units[k]);
      std::cerr << fmt::format("lumtrap sweep: error: variant {}{}: {}", f.variants[w.variant].id,
                               f.split_photons > 1 ? fmt::format(" part {}/{}", w.part + 1, f.split_photons) : "",
                               e.what())
                << std::endl;
      ++totals.failed;
    }
    if (progress) progress->update(double(k + 1) / double(units.size()));
  }
  return totals;
}

/// Exit code of a run of units: 130 interrupted, 1 any failed, else 0.
int finish(const UnitTotals& t, const std::string& what, double seconds) {
  std::cout << fmt::format("{}: {} finished, {} already done, {} failed{} in {:.1f} s\n", what, t.finished, t.skipped,
                           t.failed, t.interrupted ? ", interrupted (checkpoints kept; run again to resume)" : "",
                           seconds);
  if (t.interrupted) return 130;
  return t.failed ? 1 : 0;
}

void add_plan(CLI::App& sweep) {
  auto* cmd = sweep.add_subcommand("plan", "expand a sweep into a folder: variants, scenes, SLURM job scripts");
  auto o = std::make_shared<PlanOptions>();
  cmd->add_option("sweep", o->sweep, "scene file with a [sweep] table")->required()->check(CLI::ExistingFile);
  cmd->add_option("-o,--out", o->out, "sweep folder to write")->required();
  cmd->add_option("--per-task", o->per_task, "variants (work units) per array task (default 1)")
      ->check(CLI::PositiveNumber);
  cmd->add_option("--cpus-per-task", o->requests.cpus_per_task, "CPUs per array task (default 1)")
      ->check(CLI::PositiveNumber);
  cmd->add_option("--time", o->requests.time, "time limit per array task, HH:MM:SS or D-HH:MM:SS (default 04:00:00)");
  cmd->add_option("--mem", o->requests.mem, "memory per array task, e.g. 500M, 2G (default 2G)");
  cmd->add_option("--partition", o->requests.partition, "SLURM partition (default: the cluster's default)");
  cmd->add_option("--split-photons", o->split,
                  "split every variant into K photon ranges, each its own work unit (default 1)")
      ->check(CLI::PositiveNumber);
  cmd->callback([o] {
    check_slurm_requests(o->requests);
    const fs::path binary = self_binary();
    const fs::path dir = fs::absolute(o->out).lexically_normal();
    require_plain_path(dir, "--out");
    TileHeightCache cache;
    const Sweep sweep =  // validates every variant
        read_sweep_file(o->sweep, [&cache](const Scene& s) { check_wafer_geometry(s, &cache); });
    const SweepFolder f = write_sweep_plan(sweep, dir, SweepPlanOptions{o->per_task, o->split},
                                           slurm_requests_json(o->requests, binary));
    write_file_atomically(f.dir / "submit.sbatch", submit_script(f, o->requests, binary));
    write_file_atomically(f.dir / "merge.sbatch", merge_script(f, o->requests, binary));
    std::uint64_t photons = 0;
    for (const auto& v : sweep.variants)
      photons += v.scene.run.photons * v.scene.illumination.wavelengths_nm.size();
    std::cout << fmt::format("planned {} variants of {} into {}/\n", f.variants.size(), o->sweep, f.dir.string());
    std::cout << fmt::format("  {} array tasks ({} work unit{} each{}), {} CPU{}, --time {}, --mem {} per task\n",
                             f.tasks, f.per_task, f.per_task == 1 ? "" : "s",
                             f.split_photons > 1 ? fmt::format("; each variant in {} photon ranges", f.split_photons)
                                                 : "",
                             o->requests.cpus_per_task, o->requests.cpus_per_task == 1 ? "" : "s", o->requests.time,
                             o->requests.mem);
    std::cout << fmt::format("  {:.3g} million photons in all; variants listed in {}/variants.csv\n", double(photons) / 1e6,
                             f.dir.string());
    if (f.tasks > 1000)
      std::cout << "  note: many clusters accept at most 1000 array tasks (MaxArraySize); use --per-task to group "
                   "variants\n";
    std::cout << "submit to SLURM (array job, then the merge when all tasks succeeded):\n";
    std::cout << "  " << submit_line(f) << "\n";
    std::cout << fmt::format("or run here: {} sweep local {} && {} sweep merge {}\n", binary.string(), f.dir.string(),
                             binary.string(), f.dir.string());
  });
}

void add_task(CLI::App& sweep) {
  auto* cmd = sweep.add_subcommand("task", "run one array task of a sweep folder (SLURM_ARRAY_TASK_ID or --index)");
  auto o = std::make_shared<RunOptions>();
  add_run_options(*cmd, *o);
  cmd->add_option("--index", o->index, "array task index (default: $SLURM_ARRAY_TASK_ID)")
      ->check(CLI::NonNegativeNumber);
  cmd->callback([o] {
    const SweepFolder f = load_sweep_folder(o->dir);
    require_same_tool_version(f);
    std::size_t task = 0;
    if (o->index >= 0) {
      task = std::size_t(o->index);
    } else if (const char* s = std::getenv("SLURM_ARRAY_TASK_ID")) {
      char* end = nullptr;
      const long v = std::strtol(s, &end, 10);
      if (!*s || *end || v < 0)
        throw std::runtime_error(fmt::format("SLURM_ARRAY_TASK_ID=\"{}\" is not an array task index", s));
      task = std::size_t(v);
    } else {
      throw std::runtime_error("no array task given: pass --index I or run inside a SLURM job array "
                               "(SLURM_ARRAY_TASK_ID)");
    }
    const std::vector<std::size_t> units = units_of_task(f, task);
    const ThreadLimit limit(task_threads(o->threads), "--threads");
    const int threads = limit.threads();
    std::cout << fmt::format("lumtrap {} sweep task {} of {} in {} on {}, {} thread{}, {} work unit{}\n",
                             LUMTRAP_VERSION, task, f.tasks, f.dir.string(), host_name(), threads,
                             threads == 1 ? "" : "s",
                             units.size(), units.size() == 1 ? "" : "s")
              << std::flush;
    const auto t0 = std::chrono::steady_clock::now();
    const UnitTotals t = run_units(f, units, *o, nullptr);
    const int code = finish(t, fmt::format("task {}", task),
                            std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count());
    if (code) throw ExitCode{code};
  });
}

void add_local(CLI::App& sweep) {
  auto* cmd = sweep.add_subcommand("local", "run every variant of a sweep folder on this machine");
  auto o = std::make_shared<RunOptions>();
  add_run_options(*cmd, *o);
  cmd->callback([o] {
    const SweepFolder f = load_sweep_folder(o->dir);
    require_same_tool_version(f);
    std::vector<std::size_t> units(unit_count(f));
    for (std::size_t u = 0; u < units.size(); ++u) units[u] = u;
    const ThreadLimit limit(o->threads, "--threads");
    std::cout << fmt::format("lumtrap sweep local: {} variants in {} ({} work units, {} threads)\n",
                             f.variants.size(), f.dir.string(), units.size(), limit.threads())
              << std::flush;
    const auto t0 = std::chrono::steady_clock::now();
    UnitTotals t;
    {
      Progress progress("lumtrap sweep local:");
      t = run_units(f, units, *o, &progress);
    }
    const int code = finish(t, "local", std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count());
    if (!code) std::cout << fmt::format("merge with: lumtrap sweep merge {}\n", f.dir.string());
    if (code) throw ExitCode{code};
  });
}

void add_merge(CLI::App& sweep) {
  auto* cmd = sweep.add_subcommand("merge", "combine the variants' results into merged.csv and merged.json");
  auto dir = std::make_shared<std::string>();
  cmd->add_option("dir", *dir, "sweep folder")->required()->check(CLI::ExistingDirectory);
  cmd->callback([dir] {
    const SweepFolder f = load_sweep_folder(*dir);
    require_same_tool_version(f);
    const MergeReport r = merge_sweep(f, [](const SweepFolder& sf, std::size_t v) { assemble_variant(sf, v); });
    std::cout << fmt::format("merged {} of {} variants into {}/merged.csv and merged.json\n", r.merged,
                             f.variants.size(), f.dir.string());
    if (r.missing.empty()) return;
    std::cerr << fmt::format("lumtrap sweep merge: {} of {} variants have no result (the merged table is incomplete):\n",
                             r.missing.size(), f.variants.size());
    for (const auto& [v, st] : r.missing) {
      std::error_code ec;
      std::cerr << fmt::format("  {} {:<7} log: {}{}{}\n", f.variants[v].id, state_name(st.state), st.log.string(),
                               fs::exists(st.log, ec) ? "" : " (not written yet)",
                               st.detail.empty() ? "" : "  (" + st.detail + ")");
    }
    std::cerr << "run the missing variants again (lumtrap sweep task DIR --index I, or resubmit the array: finished "
                 "variants are skipped), then merge again\n";
    throw ExitCode{1};
  });
}

void add_status(CLI::App& sweep) {
  auto* cmd = sweep.add_subcommand("status", "count done / running / failed / missing variants");
  auto dir = std::make_shared<std::string>();
  cmd->add_option("dir", *dir, "sweep folder")->required()->check(CLI::ExistingDirectory);
  cmd->callback([dir] {
    const SweepFolder f = load_sweep_folder(*dir);
    std::vector<std::vector<std::pair<std::size_t, VariantStatus>>> by(4);
    for (std::size_t v = 0; v < f.variants.size(); ++v) {
      VariantStatus st = variant_status(f, v);
      by[std::size_t(st.state)].push_back({v, std::move(st)});
    }
    std::cout << fmt::format("{}: {} variants in {} array tasks\n", f.dir.string(), f.variants.size(), f.tasks);
    for (VariantState s : {VariantState::done, VariantState::running, VariantState::failed, VariantState::missing})
      std::cout << fmt::format("  {:<8} {}\n", state_name(s), by[std::size_t(s)].size());
    for (VariantState s : {VariantState::running, VariantState::failed})
      for (const auto& [v, st] : by[std::size_t(s)])
        std::cout << fmt::format("  {} {:<7} log: {}{}\n", f.variants[v].id, state_name(s), st.log.string(),
                                 st.detail.empty() ? "" : "  (" + st.detail + ")");
  });
}

}  // namespace

void add_sweep_command(CLI::App& app) {
  auto* sweep = app.add_subcommand("sweep", "parameter sweeps: plan, run locally or as a SLURM job array, merge");
  sweep->require_subcommand(1);
  add_plan(*sweep);
  add_task(*sweep);
  add_local(*sweep);
  add_merge(*sweep);
  add_status(*sweep);
}

}  // namespace lumtrap::cli
