// lumtrap sweep plan|task|local|merge|status: parameter sweeps, on this
// machine or as a SLURM job array with a dependent merge job. The folder
// layout is described in sweep/plan_folder.hpp, the [sweep] syntax in
// docs/scene-format.md and the cluster workflow in docs/cluster.md.
#include <fmt/format.h>
#include <unistd.h>

#include <chrono>
#include <cstdlib>
#include <iostream>
#include <limits>

#include "cli/build_progress.hpp"
#include "cli/commands.hpp"
#include "cli/memory_limit.hpp"
#include "cli/option_checks.hpp"
#include "cli/output.hpp"
#include "cli/stop_signal.hpp"
#include "cli/thread_limit.hpp"
#include "io/run_facts.hpp"
#include "io/text_file.hpp"
#include "optics/material.hpp"
#include "sweep/array_limits.hpp"
#include "sweep/expand.hpp"
#include "sweep/merge.hpp"
#include "sweep/node_check.hpp"
#include "sweep/run_mark.hpp"
#include "sweep/run_unit.hpp"
#include "sweep/slurm_query.hpp"
#include "sweep/slurm_scripts.hpp"
#include "sweep/status.hpp"
#include "trace/build_estimate.hpp"
#include "trace/wafer_model.hpp"

namespace lumtrap::cli {

namespace fs = std::filesystem;

namespace {

struct PlanOptions {
  std::string sweep, out;
  std::size_t per_task = 0;  // 0: chosen so the array fits MaxArraySize
  SlurmRequests requests;
  std::uint32_t split = 1;
  bool lean = false;
  std::string max_memory;
};

struct RunOptions {
  std::string dir;
  long long index = -1;
  std::string plan_id;
  bool check = false;
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
  cmd.add_option("dir", o.dir, "sweep folder (from lumtrap sweep plan)")->check(CLI::ExistingDirectory);
  cmd.add_option("-j,--threads", o.threads,
                 "threads, 0 = all cores (default: SLURM_CPUS_PER_TASK when set, else all cores; results do not "
                 "depend on it)")
      ->check(whole_number_in(0, std::numeric_limits<int>::max(), "0 = all cores"));
  cmd.add_option("--checkpoint-every", o.checkpoint_seconds,
                 "seconds between checkpoints of a running variant (default 10)")
      ->check(number_at_least(0));
  cmd.add_option("--batch", o.batch, "photons per wavelength per batch (default 50000; results do not depend on it)")
      ->check(whole_number_in(1, std::int64_t(kMaxPhotonsPerWavelength)));
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
      std::cerr << fmt::format("lumtrap sweep: error: variant {}{}: {}", variant_id(f, w.variant),
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
  cmd->add_option("--per-task", o->per_task,
                  "work units per array task (default: 1, or as many as the cluster's MaxArraySize needs)")
      ->check(whole_number_in(1, std::numeric_limits<std::int32_t>::max()));
  cmd->add_option("--throttle", o->requests.throttle, "run at most N array tasks at once (SLURM's %N)")
      ->check(whole_number_in(1, std::numeric_limits<std::int32_t>::max()));
  cmd->add_option("--cpus-per-task", o->requests.cpus_per_task, "CPUs per array task (default 1)")
      ->check(whole_number_in(1, std::numeric_limits<int>::max()));
  cmd->add_option("--time", o->requests.time, "time limit per array task, HH:MM:SS or D-HH:MM:SS (default 04:00:00)");
  cmd->add_option("--mem", o->requests.mem, "memory per array task, e.g. 500M, 2G (default 1G)");
  cmd->add_option("--partition", o->requests.partition, "SLURM partition (default: the cluster's default)");
  cmd->add_option("--split-photons", o->split,
                  "split every variant into K photon ranges, each its own work unit (default 1)")
      ->check(whole_number_in(1, std::numeric_limits<std::int32_t>::max()));
  cmd->add_flag("--lean", o->lean, "result folders without the angle maps (escape/rear angle CSV and EXR)");
  add_max_memory_option(*cmd, o->max_memory);
  cmd->callback([o] {
    // Everything that can be wrong is found before anything is written.
    check_slurm_requests(o->requests);
    // Every variant must build within this machine's limit and within the
    // memory each array task asks for (--mem).
    MemoryLimit memory = memory_limit(o->max_memory);
    const double task_bytes = slurm_megabytes(o->requests.mem) * 1024.0 * 1024.0;
    if (task_bytes < memory.bytes)
      memory = {task_bytes, fmt::format("--mem {} of each array task; give a larger --mem", o->requests.mem)};
    const JobProgram program{self_binary(), fs::absolute(materials_dir()).lexically_normal()};
    const fs::path dir = fs::absolute(o->out).lexically_normal();
    require_plain_path(dir, "--out");
    const std::string sweep_text = read_text_file(o->sweep);
    TileHeightCache cache;
    const Sweep sweep =  // validates every variant
        read_sweep_file(o->sweep, [&](const Scene& s) {
          const BuildCost cost = estimate_build(s);
          check_build_cost(s, cost, memory.bytes, memory.origin);
          const BuildProgress building("lumtrap sweep plan: building the textures", cost.seconds);
          check_wafer_geometry(s, &cache);
        });
    const ClusterLimits limits = query_cluster_limits();
    const ArrayFit fit = fit_array(sweep.variants.size() * o->split, o->per_task, limits.max_array_size);
    check_requests(o->requests, limits.partitions);
    const SweepFolder f = write_sweep_plan(sweep, sweep_text, dir, SweepPlanOptions{fit.per_task, o->split, o->lean},
                                           slurm_requests_json(o->requests, program));
    write_file_atomically(f.dir / "submit.sbatch", submit_script(f, o->requests, program));
    write_file_atomically(f.dir / "merge.sbatch", merge_script(f, o->requests, program));
    std::uint64_t photons = 0;
    for (const auto& v : sweep.variants)
      photons += v.scene.run.photons * v.scene.illumination.wavelengths_nm.size();
    std::cout << fmt::format("planned {} variants of {} into {}/ (plan {}{})\n", f.variant_count, o->sweep,
                             f.dir.string(), f.plan_id, f.lean ? ", lean result folders" : "");
    std::cout << fmt::format("  {} array task{} ({} work unit{} each{}), {} CPU{}, --time {}, --mem {} per task{}\n",
                             f.tasks, f.tasks == 1 ? "" : "s", f.per_task, f.per_task == 1 ? "" : "s",
                             f.split_photons > 1 ? fmt::format("; each variant in {} photon ranges", f.split_photons)
                                                 : "",
                             o->requests.cpus_per_task, o->requests.cpus_per_task == 1 ? "" : "s", o->requests.time,
                             o->requests.mem,
                             o->requests.throttle ? fmt::format(", at most {} at once", o->requests.throttle) : "");
    std::cout << fmt::format("  array indices 0-{}: below MaxArraySize {} ({})\n", f.tasks - 1, fit.max_array_size,
                             fit.from_cluster ? "scontrol show config" : "SLURM's default; scontrol gave no answer");
    if (limits.partitions.empty())
      std::cout << "  resources not checked against the partitions (sinfo gave no answer here)\n";
    else
      std::cout << "  --mem, --cpus-per-task and --time fit the partition (sinfo)\n";
    std::cout << fmt::format("  {:.3g} million photons in all; variants listed in {}/variants.csv\n",
                             double(photons) / 1e6, f.dir.string());
    std::cout << fmt::format("  jobs run {} with materials {}\n", program.binary.string(), program.materials.string());
    std::cout << "submit to SLURM (array job, then the merge when all tasks succeeded):\n";
    std::cout << "  " << submit_line(f) << "\n";
    std::cout << fmt::format("or run here: {} sweep local {} && {} sweep merge {}\n", program.binary.string(),
                             f.dir.string(), program.binary.string(), f.dir.string());
  });
}

void add_task(CLI::App& sweep) {
  auto* cmd = sweep.add_subcommand("task", "run one array task of a sweep folder (SLURM_ARRAY_TASK_ID or --index); "
                                           "--check: can this node run tasks?");
  auto o = std::make_shared<RunOptions>();
  add_run_options(*cmd, *o);
  cmd->add_option("--index", o->index, "array task index (default: $SLURM_ARRAY_TASK_ID)")
      ->check(whole_number_in(0, std::numeric_limits<std::int64_t>::max()));
  cmd->add_option("--plan-id", o->plan_id,
                  "the plan the job script was written for (the scripts pass it; a re-planned folder refuses an "
                  "old script)");
  cmd->add_flag("--check", o->check,
                "check this machine instead of running: libraries, materials, a tiny trace, and DIR when given");
  cmd->callback([o] {
    if (o->check) {
      const ThreadLimit limit(task_threads(o->threads), "--threads");
      bool ok = true;
      for (const CheckLine& c : node_check(o->dir.empty() ? fs::path() : fs::path(o->dir))) {
        std::cout << fmt::format("{:<4} {:<9} {}\n", c.ok ? "ok" : "FAIL", c.what, c.detail);
        ok = ok && c.ok;
      }
      std::cout << (ok ? "check passed: this machine can run lumtrap sweep tasks\n" : "check FAILED\n");
      if (!ok) throw ExitCode{1};
      return;
    }
    if (o->dir.empty()) throw std::runtime_error("sweep task: give the sweep folder (DIR), or --check");
    const auto t0 = std::chrono::steady_clock::now();
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
    const SweepFolder f = load_sweep_task(o->dir, task);  // reads only this task's variants
    require_same_tool_version(f);
    if (!o->plan_id.empty() && o->plan_id != f.plan_id)
      throw std::runtime_error(fmt::format(
          "this job script was written for plan {}, but {} was planned again as {} (other array indices); nothing "
          "was run: submit {}/submit.sbatch as `lumtrap sweep plan` or `sweep status` prints it",
          o->plan_id, f.dir.string(), f.plan_id, f.dir.string()));
    const std::vector<std::size_t> units = units_of_task(f, task);
    const double startup_ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - t0).count();
    const ThreadLimit limit(task_threads(o->threads), "--threads");
    const int threads = limit.threads();
    RunMark record = this_run_mark();
    std::cout << fmt::format("lumtrap {} sweep task {} of {} in {} on {}, {} thread{}, {} work unit{}{}; inputs read "
                             "in {:.1f} ms; materials {}\n",
                             LUMTRAP_VERSION, task, f.tasks, f.dir.string(), host_name(), threads,
                             threads == 1 ? "" : "s", units.size(), units.size() == 1 ? "" : "s",
                             record.slurm_job.empty() ? "" : " (SLURM job " + record.slurm_job + ")", startup_ms,
                             materials_dir().string())
              << std::flush;
    try {  // informative: a task runs even where it cannot leave its record
      write_run_mark(task_record(f, task), record);
    } catch (const std::exception&) {
    }
    const UnitTotals t = run_units(f, units, *o, nullptr);
    const int code = finish(t, fmt::format("task {}", task),
                            std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count());
    record.ended = utc_now_text();
    record.outcome = fmt::format("{} finished, {} already done, {} failed{}", t.finished, t.skipped, t.failed,
                                 t.interrupted ? ", interrupted" : "");
    try {
      write_run_mark(task_record(f, task), record);
    } catch (const std::exception&) {
    }
    if (code) throw ExitCode{code};
  });
}

void add_local(CLI::App& sweep) {
  auto* cmd = sweep.add_subcommand("local", "run every variant of a sweep folder on this machine");
  auto o = std::make_shared<RunOptions>();
  add_run_options(*cmd, *o);
  cmd->callback([o] {
    if (o->dir.empty()) throw std::runtime_error("sweep local: give the sweep folder (DIR)");
    const SweepFolder f = load_sweep_folder(o->dir);
    require_same_tool_version(f);
    std::vector<std::size_t> units(unit_count(f));
    for (std::size_t u = 0; u < units.size(); ++u) units[u] = u;
    const ThreadLimit limit(o->threads, "--threads");
    std::cout << fmt::format("lumtrap sweep local: {} variants in {} ({} work units, {} threads)\n",
                             f.variant_count, f.dir.string(), units.size(), limit.threads())
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
  auto reference = std::make_shared<std::string>();
  cmd->add_option("--reference", *reference,
                  "variant id whose J_G the column J_G_minus_reference subtracts (default: the first finished variant)");
  cmd->callback([dir, reference] {
    const SweepFolder f = load_sweep_folder(*dir);
    require_same_tool_version(f);
    const MergeReport r =
        merge_sweep(f, [](const SweepFolder& sf, std::size_t v) { assemble_variant(sf, v); }, *reference);
    std::cout << fmt::format("merged {} of {} variants into {}/merged.csv and merged.json\n", r.merged,
                             f.variant_count, f.dir.string());
    if (r.missing.empty()) return;
    std::cerr << fmt::format("lumtrap sweep merge: {} of {} variants have no result (the merged table is incomplete; "
                             "merged.json lists each):\n",
                             r.missing.size(), f.variant_count);
    std::vector<VariantStatus> states(f.variant_count);
    for (auto& s : states) s.state = VariantState::done;
    for (const auto& [v, st] : r.missing) states[v] = st;
    for (const auto& line : status_lines(f, group_not_done(f, states))) std::cerr << "  " << line << "\n";
    std::cerr << fmt::format("logs: {}/task_<array index>.log\n", log_dir(f).string());
    std::cerr << fmt::format("`lumtrap sweep status {}` prints the line that submits exactly those tasks again "
                             "(finished variants are skipped); then merge again\n",
                             f.dir.string());
    throw ExitCode{1};
  });
}

/// status --json: every variant that is not done, in full.
nlohmann::ordered_json status_json(const SweepFolder& f, const SweepStatus& st) {
  nlohmann::ordered_json j;
  j["dir"] = f.dir.string();
  j["variants"] = f.variant_count;
  j["tasks"] = f.tasks;
  j["plan_id"] = f.plan_id;
  j["slurm_answered"] = st.slurm_answered;
  j["counts"] = nlohmann::ordered_json::object();
  for (VariantState s : kVariantStates) j["counts"][state_name(s)] = st.counts[std::size_t(s)];
  j["all_done"] = st.all_done();
  j["not_done"] = nlohmann::ordered_json::array();
  for (std::size_t v = 0; v < st.variants.size(); ++v) {
    const VariantStatus& s = st.variants[v];
    if (s.state == VariantState::done) continue;
    j["not_done"].push_back({{"id", variant_id(f, v)},
                             {"variant_index", v},
                             {"array_index", s.task},
                             {"state", state_name(s.state)},
                             {"reason", s.reason},
                             {"log", s.log.string()},
                             {"slurm_job", s.slurm_job},
                             {"slurm_state", s.slurm_state}});
  }
  j["resubmit_array"] = array_ranges(st.resubmit_tasks);
  j["resubmit_line"] = st.resubmit_tasks.empty() ? "" : resubmit_line(f, st.resubmit_tasks);
  j["merge_job"] = st.merge_job ? st.merge_job->job + " " + st.merge_job->state : "";
  return j;
}

void add_status(CLI::App& sweep) {
  auto* cmd = sweep.add_subcommand(
      "status", "done / running / queued / failed / missing variants, why, and the line that resubmits what is "
                "needed; exit 0 only when all are done (2: still running or queued, 3: failed or missing)");
  struct StatusOptions {
    std::string dir;
    bool json = false, no_slurm = false;
    std::size_t lines = 20;
  };
  auto o = std::make_shared<StatusOptions>();
  cmd->add_option("dir", o->dir, "sweep folder")->required()->check(CLI::ExistingDirectory);
  cmd->add_flag("--json", o->json, "one JSON object on stdout, every variant that is not done listed");
  cmd->add_flag("--no-slurm", o->no_slurm, "do not ask SLURM (squeue, sacct, scontrol); the files only");
  cmd->add_option("--lines", o->lines, "at most this many lines of variants that are not done (default 20)")
      ->check(whole_number_in(1, std::numeric_limits<std::int32_t>::max()));
  cmd->callback([o] {
    const SweepFolder f = load_sweep_header(o->dir);
    const SweepStatus st = sweep_status(f, o->no_slurm ? SlurmSource{} : slurm_from_commands());
    const int code = st.all_done() ? 0 : st.resubmit_tasks.empty() ? 2 : 3;
    if (o->json) {
      std::cout << status_json(f, st).dump(2) << "\n";
      if (code) throw ExitCode{code};
      return;
    }
    std::cout << fmt::format("{}: {} variants in {} array tasks (plan {}; SLURM {})\n", f.dir.string(),
                             f.variant_count, f.tasks, f.plan_id,
                             o->no_slurm ? "not asked" : st.all_done() ? "not needed" : st.slurm_answered ? "asked"
                                                                                                : "gave no answer");
    for (VariantState s : kVariantStates)
      std::cout << fmt::format("  {:<8} {}\n", state_name(s), st.counts[std::size_t(s)]);
    if (!st.all_done()) {
      std::cout << "not done (variant, array index, state: reason):\n";
      for (const auto& line : status_lines(f, group_not_done(f, st.variants), o->lines))
        std::cout << "  " << line << "\n";
      std::cout << fmt::format("logs: {}/task_<array index>.log\n", log_dir(f).string());
    }
    if (st.merge_job) std::cout << fmt::format("merge job {} is {}\n", st.merge_job->job, st.merge_job->state);
    if (!st.resubmit_tasks.empty()) {
      std::cout << fmt::format("resubmit the {} array task{} with failed or missing variants (finished variants are "
                               "skipped, stopped ones resume from their checkpoints):\n",
                               st.resubmit_tasks.size(), st.resubmit_tasks.size() == 1 ? "" : "s");
      std::cout << "  " << resubmit_line(f, st.resubmit_tasks) << "\n";
    } else if (st.all_done()) {
      std::cout << fmt::format("all done: lumtrap sweep merge {}\n", f.dir.string());
    }
    if (code) throw ExitCode{code};
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
