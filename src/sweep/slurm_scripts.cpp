// SLURM job scripts of a sweep. See slurm_scripts.hpp.
#include "sweep/slurm_scripts.hpp"

#include "sweep/status.hpp"  // array_ranges

#include <fmt/format.h>

#include <cctype>
#include <regex>
#include <stdexcept>

namespace lumtrap {

namespace fs = std::filesystem;

namespace {

std::string job_name(const SweepFolder& f) {
  std::string stem = fs::path(f.source).stem().string();
  for (char& c : stem)
    if (!std::isalnum(static_cast<unsigned char>(c)) && c != '-' && c != '_') c = '_';
  return "lumtrap-" + stem;
}

std::string sbatch_header(const SweepFolder& f, const SlurmRequests& r, const std::string& what) {
  std::string s = "#!/bin/bash\n";
  s += fmt::format("# {}: lumtrap sweep of {} ({} variants, {} array tasks of {} work unit{}{}).\n", what, f.source,
                   f.variants.size(), f.tasks, f.per_task, f.per_task == 1 ? "" : "s",
                   f.split_photons > 1 ? fmt::format(", each variant split into {} photon ranges", f.split_photons)
                                       : "");
  s += "# Written by `lumtrap sweep plan`. Submit both jobs at once (the merge runs when every\n";
  s += "# array task has succeeded):\n";
  s += "#   " + submit_line(f) + "\n";
  s += "# A task stopped by the scheduler (time limit, pre-emption) keeps its checkpoints:\n";
  s += "# submitting again skips finished variants and resumes the others with identical numbers.\n";
  if (!r.partition.empty()) s += fmt::format("#SBATCH --partition={}\n", r.partition);
  return s;
}

}  // namespace

void check_slurm_requests(const SlurmRequests& r) {
  static const std::regex time_re(R"(^(\d+-)?\d+(:\d{1,2}){0,2}$)");
  static const std::regex mem_re(R"(^\d+[KMGT]?$)");
  if (!std::regex_match(r.time, time_re))
    throw std::runtime_error(
        fmt::format("--time {}: not a SLURM time; allowed: MM, HH:MM:SS or D-HH:MM:SS, e.g. 04:00:00", r.time));
  if (!std::regex_match(r.mem, mem_re))
    throw std::runtime_error(
        fmt::format("--mem {}: not a SLURM memory size; allowed: a whole number with K, M, G or T, e.g. 2G", r.mem));
}

nlohmann::ordered_json slurm_requests_json(const SlurmRequests& r, const JobProgram& program) {
  return {{"cpus_per_task", r.cpus_per_task},
          {"time", r.time},
          {"mem", r.mem},
          {"partition", r.partition},
          {"throttle", r.throttle},
          {"lumtrap", program.binary.string()},
          {"materials", program.materials.string()}};
}

std::size_t planned_throttle(const nlohmann::ordered_json& requests) {
  return requests.is_object() ? requests.value("throttle", std::size_t(0)) : 0;
}

std::string array_spec(std::size_t tasks, std::size_t throttle) {
  std::string s = tasks == 1 ? "0" : fmt::format("0-{}", tasks - 1);
  if (throttle) s += fmt::format("%{}", throttle);
  return s;
}

void require_plain_path(const fs::path& p, const char* what) {
  const std::string s = p.string();
  if (s.find_first_of(" \t\n\"'`$\\%;&|<>*?") != std::string::npos)
    throw std::runtime_error(fmt::format("{} {}: contains a space or one of \"'`$\\%;&|<>*?, which #SBATCH lines "
                                         "cannot hold; allowed: a path without them",
                                         what, s));
}

std::string submit_line(const SweepFolder& f) {
  return fmt::format("A=$(sbatch --parsable {0}/submit.sbatch) && sbatch --dependency=afterok:$A "
                     "--kill-on-invalid-dep=yes {0}/merge.sbatch",
                     f.dir.string());
}

std::string resubmit_line(const SweepFolder& f, const std::vector<std::size_t>& tasks) {
  std::string spec = array_ranges(tasks);
  if (const std::size_t t = planned_throttle(f.requests)) spec += fmt::format("%{}", t);
  return fmt::format("A=$(sbatch --parsable --array={1} {0}/submit.sbatch) && sbatch --dependency=afterok:$A "
                     "--kill-on-invalid-dep=yes {0}/merge.sbatch",
                     f.dir.string(), spec);
}

std::string submit_script(const SweepFolder& f, const SlurmRequests& r, const JobProgram& program) {
  std::string s = sbatch_header(f, r, "array job");
  s += fmt::format("#SBATCH --job-name={}\n", job_name(f));
  s += fmt::format("#SBATCH --array={}\n", array_spec(f.tasks, r.throttle));
  s += fmt::format("#SBATCH --cpus-per-task={}\n", r.cpus_per_task);
  s += fmt::format("#SBATCH --time={}\n", r.time);
  s += fmt::format("#SBATCH --mem={}\n", r.mem);
  s += fmt::format("#SBATCH --output={}/task_%a.log\n", log_dir(f).string());
  s += "#SBATCH --open-mode=append\n";
  s += "# the lumtrap binary and materials this sweep was planned with:\n";
  s += fmt::format("export LUMTRAP_MATERIALS='{}'\n", program.materials.string());
  s += fmt::format("exec '{}' sweep task '{}' --plan-id {}\n", program.binary.string(), f.dir.string(), f.plan_id);
  return s;
}

std::string merge_script(const SweepFolder& f, const SlurmRequests& r, const JobProgram& program) {
  std::string s = sbatch_header(f, r, "merge job");
  s += fmt::format("#SBATCH --job-name={}-merge\n", job_name(f));
  s += "#SBATCH --cpus-per-task=1\n";
  s += fmt::format("#SBATCH --time={}\n", r.time);
  s += fmt::format("#SBATCH --mem={}\n", r.mem);
  s += fmt::format("#SBATCH --output={}\n", merge_log(f).string());
  s += "#SBATCH --open-mode=append\n";
  s += fmt::format("export LUMTRAP_MATERIALS='{}'\n", program.materials.string());
  s += fmt::format("exec '{}' sweep merge '{}'\n", program.binary.string(), f.dir.string());
  return s;
}

}  // namespace lumtrap
