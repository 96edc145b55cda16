// lumtrap verify: the built-in physics self-checks (src/verify), printed one
// line each with the deviation and pass/fail; exit 1 when any fails. Meant
// to be run after installing, e.g. on a cluster node.
#include <fmt/format.h>

#include <chrono>
#include <iostream>

#include "cli/commands.hpp"
#include "verify/self_check.hpp"

namespace lumtrap::cli {

namespace {

std::string outcome_line(const verify::CheckOutcome& c) {
  const std::string verdict = c.passed ? "pass" : "FAIL";
  if (c.sigma > 0)
    return fmt::format("{}  {}\n        expected {:.6f}, got {:.6f} ± {:.6f}: {:.2f} standard errors (allowed "
                       "{:.2f}); reference: {}\n",
                       verdict, c.name, c.expected, c.obtained, c.sigma, c.deviation, c.allowed, c.reference);
  return fmt::format("{}  {}\n        expected {:.12g}, got {:.12g}: deviation {:.2g} (relative; allowed {:.2g}); "
                     "reference: {}\n",
                     verdict, c.name, c.expected, c.obtained, c.deviation, c.allowed, c.reference);
}

}  // namespace

void add_verify_command(CLI::App& app) {
  auto* cmd = app.add_subcommand(
      "verify", "physics self-checks against closed forms (Fresnel, quarter-wave film, incoherent slab, ideal "
                "Lambertian wafer), energy closure and thread invariance; run after installing");
  cmd->callback([] {
    std::cout << "lumtrap verify: the model against closed forms; Monte Carlo values within 4 standard errors "
                 "+ 1e-4, exact ones to round-off\n"
              << std::flush;
    const auto t0 = std::chrono::steady_clock::now();
    std::size_t failed = 0;
    const auto checks = verify::run_self_checks([&](const verify::CheckOutcome& c) {
      failed += !c.passed;
      std::cout << outcome_line(c) << std::flush;
    });
    const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    if (failed) {
      std::cout << fmt::format("lumtrap verify: {} of {} checks FAILED ({:.1f} s)\n", failed, checks.size(), seconds);
      throw ExitCode{1};
    }
    std::cout << fmt::format("lumtrap verify: all {} checks passed ({:.1f} s)\n", checks.size(), seconds);
  });
}

}  // namespace lumtrap::cli
