// lumtrap sweep plan|task|local|merge|status: parameter sweeps, on this
// machine or as a SLURM job array with a dependent merge job. The folder
// layout is described in trace/sweep_run.hpp, the [sweep] syntax in
// docs/scene-format.md and the cluster workflow in docs/cluster.md.
#include <fmt/format.h>
#include <tbb/global_control.h>
#include <tbb/info.h>
#include <unistd.h>

#include <atomic>
#include <chrono>
#include <csignal>
#include <cstdlib>
#include <iostream>
#include <regex>

#include "cli/commands.hpp"
#include "cli/output.hpp"
#include "io/result_writer.hpp"
#include "io/sweep.hpp"
#include "trace/sweep_run.hpp"

namespace lumtrap::cli {

namespace fs = std::filesystem;

namespace {

std::atomic<bool> g_sweep_stop{false};
extern "C" void on_sweep_signal(int) { g_sweep_stop.store(true); }

struct PlanOptions {
  std::string sweep, out;
  std::size_t per_task = 1;
  int cpus_per_task = 1;
  std::string time = "04:00:00";
  std::string mem = "2G";
  std::string partition;
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

/// Paths go into #SBATCH lines, which take no quoting.
void require_plain_path(const fs::path& p, const char* what) {
  const std::string s = p.string();
  if (s.find_first_of(" \t\n\"'`$\\%;&|<>*?") != std::string::npos)
    throw std::runtime_error(fmt::format("{} {}: contains a space or one of \"'`$\\%;&|<>*?, which #SBATCH lines "
                                         "cannot hold; allowed: a path without them",
                                         what, s));
}

std::string job_name(const SweepFolder& f) {
  std::string stem = fs::path(f.source).stem().string();
  for (char& c : stem)
    if (!std::isalnum(static_cast<unsigned char>(c)) && c != '-' && c != '_') c = '_';
  return "lumtrap-" + stem;
}

std::string submit_line(const SweepFolder& f) {
  return fmt::format("A=$(sbatch --parsable {0}/submit.sbatch) && sbatch --dependency=afterok:$A "
                     "--kill-on-invalid-dep=yes {0}/merge.sbatch",
                     f.dir.string());
}

std::string sbatch_header(const SweepFolder& f, const PlanOptions& o, const std::string& what) {
  std::string s = "#!/bin/bash\n";
  s += fmt::format("# {}: lumtrap sweep of {} ({} variants, {} array tasks of {} work unit{}{}).\n", what, f.source,
                   f.variants.size(), f.tasks, f.per_task, f.per_task == 1 ? "" : "s",
                   f.split > 1 ? fmt::format(", each variant split into {} photon ranges", f.split) : "");
  s += "# Written by `lumtrap sweep plan`. Submit both jobs at once (the merge runs when every\n";
  s += "# array task has succeeded):\n";
  s += "#   " + submit_line(f) + "\n";
  s += "# A task stopped by the scheduler (time limit, pre-emption) keeps its checkpoints:\n";
  s += "# submitting again skips finished variants and resumes the others with identical numbers.\n";
  if (!o.partition.empty()) s += fmt::format("#SBATCH --partition={}\n", o.partition);
  return s;
}

std::string submit_script(const SweepFolder& f, const PlanOptions& o, const fs::path& binary) {
  std::string s = sbatch_header(f, o, "array job");
  s += fmt::format("#SBATCH --job-name={}\n", job_name(f));
  s += fmt::format("#SBATCH --array=0-{}\n", f.tasks - 1);
  s += fmt::format("#SBATCH --cpus-per-task={}\n", o.cpus_per_task);
  s += fmt::format("#SBATCH --time={}\n", o.time);
  s += fmt::format("#SBATCH --mem={}\n", o.mem);
  s += fmt::format("#SBATCH --output={}/logs/task_%a.log\n", f.dir.string());
  s += "#SBATCH --open-mode=append\n";
  s += fmt::format("exec '{}' sweep task '{}'\n", binary.string(), f.dir.string());
  return s;
}

std::string merge_script(const SweepFolder& f, const PlanOptions& o, const fs::path& binary) {
  std::string s = sbatch_header(f, o, "merge job");
  s += fmt::format("#SBATCH --job-name={}-merge\n", job_name(f));
  s += "#SBATCH --cpus-per-task=1\n";
  s += fmt::format("#SBATCH --time={}\n", o.time);
  s += fmt::format("#SBATCH --mem={}\n", o.mem);
  s += fmt::format("#SBATCH --output={}/logs/merge.log\n", f.dir.string());
  s += "#SBATCH --open-mode=append\n";
  s += fmt::format("exec '{}' sweep merge '{}'\n", binary.string(), f.dir.string());
  return s;
}

/// Threads of a task: -j, else SLURM_CPUS_PER_TASK, else every core.
int task_threads(int requested) {
  if (requested > 0) return requested;
  if (const char* s = std::getenv("SLURM_CPUS_PER_TASK")) {
    const int n = std::atoi(s);
    if (n > 0) return n;
  }
  return tbb::info::default_concurrency();
}

void add_run_options(CLI::App& cmd, RunOptions& o) {
  cmd.add_option("dir", o.dir, "sweep folder (from lumtrap sweep plan)")->required()->check(CLI::ExistingDirectory);
  cmd.add_option("-j,--threads", o.threads,
                 "threads (default: SLURM_CPUS_PER_TASK when set, else all cores; results do not depend on it)")
      ->check(CLI::PositiveNumber);
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
  std::signal(SIGINT, on_sweep_signal);
  std::signal(SIGTERM, on_sweep_signal);
  for (std::size_t k = 0; k < units.size(); ++k) {
    if (g_sweep_stop.load()) {
      totals.interrupted = true;
      break;
    }
    UnitRunOptions u;
    u.checkpoint_seconds = o.checkpoint_seconds;
    u.batch = o.batch;
    u.stop = &g_sweep_stop;
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
                               f.split > 1 ? fmt::format(" part {}/{}", w.part + 1, f.split) : "", e.what())
                << std::endl;
      ++totals.failed;
    }
    if (progress) progress->update(double(k + 1) / double(units.size()));
  }
  std::signal(SIGINT, SIG_DFL);
  std::signal(SIGTERM, SIG_DFL);
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
  cmd->add_option("--cpus-per-task", o->cpus_per_task, "CPUs per array task (default 1)")->check(CLI::PositiveNumber);
  cmd->add_option("--time", o->time, "time limit per array task, HH:MM:SS or D-HH:MM:SS (default 04:00:00)");
  cmd->add_option("--mem", o->mem, "memory per array task, e.g. 500M, 2G (default 2G)");
  cmd->add_option("--partition", o->partition, "SLURM partition (default: the cluster's default)");
  cmd->add_option("--split-photons", o->split,
                  "split every variant into K photon ranges, each its own work unit (default 1)")
      ->check(CLI::PositiveNumber);
  cmd->callback([o] {
    static const std::regex time_re(R"(^(\d+-)?\d+(:\d{1,2}){0,2}$)");
    static const std::regex mem_re(R"(^\d+[KMGT]?$)");
    if (!std::regex_match(o->time, time_re))
      throw std::runtime_error(fmt::format("--time {}: not a SLURM time; allowed: MM, HH:MM:SS or D-HH:MM:SS, e.g. "
                                           "04:00:00",
                                           o->time));
    if (!std::regex_match(o->mem, mem_re))
      throw std::runtime_error(
          fmt::format("--mem {}: not a SLURM memory size; allowed: a whole number with K, M, G or T, e.g. 2G", o->mem));
    const fs::path binary = self_binary();
    const fs::path dir = fs::absolute(o->out).lexically_normal();
    require_plain_path(dir, "--out");
    const Sweep sweep = read_sweep_file(o->sweep);  // validates every variant
    nlohmann::ordered_json requests = {{"cpus_per_task", o->cpus_per_task},
                                       {"time", o->time},
                                       {"mem", o->mem},
                                       {"partition", o->partition},
                                       {"lumtrap", binary.string()}};
    const SweepFolder f = write_sweep_plan(sweep, dir, SweepPlanOptions{o->per_task, o->split}, requests);
    write_file_atomically(f.dir / "submit.sbatch", submit_script(f, *o, binary));
    write_file_atomically(f.dir / "merge.sbatch", merge_script(f, *o, binary));
    std::uint64_t photons = 0;
    for (const auto& v : sweep.variants)
      photons += v.scene.run.photons * v.scene.illumination.wavelengths_nm.size();
    std::cout << fmt::format("planned {} variants of {} into {}/\n", f.variants.size(), o->sweep, f.dir.string());
    std::cout << fmt::format("  {} array tasks ({} work unit{} each{}), {} CPU{}, --time {}, --mem {} per task\n",
                             f.tasks, f.per_task, f.per_task == 1 ? "" : "s",
                             f.split > 1 ? fmt::format("; each variant in {} photon ranges", f.split) : "",
                             o->cpus_per_task, o->cpus_per_task == 1 ? "" : "s", o->time, o->mem);
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
    const int threads = task_threads(o->threads);
    tbb::global_control limit(tbb::global_control::max_allowed_parallelism, std::size_t(threads));
    char host[256] = {};
    ::gethostname(host, sizeof host - 1);
    std::cout << fmt::format("lumtrap {} sweep task {} of {} in {} on {}, {} thread{}, {} work unit{}\n",
                             LUMTRAP_VERSION, task, f.tasks, f.dir.string(), host, threads, threads == 1 ? "" : "s",
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
    const int threads = o->threads > 0 ? o->threads : tbb::info::default_concurrency();
    tbb::global_control limit(tbb::global_control::max_allowed_parallelism, std::size_t(threads));
    std::cout << fmt::format("lumtrap sweep local: {} variants in {} ({} work units, {} threads)\n",
                             f.variants.size(), f.dir.string(), units.size(), threads)
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
    const MergeReport r = merge_sweep(f);
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
