// lumtrap fit SCENE --measured R.csv: least-squares fit of the [fit]
// parameters of a scene to a measured reflectance curve.
#include <fmt/format.h>

#include <chrono>
#include <iostream>
#include <limits>

#include "cli/commands.hpp"
#include "cli/option_checks.hpp"
#include "cli/output.hpp"
#include "cli/output_folder_lock.hpp"
#include "cli/output_path_check.hpp"
#include "cli/thread_limit.hpp"
#include "fit/fit_files.hpp"
#include "fit/least_squares_fit.hpp"
#include "io/result_writer.hpp"

namespace lumtrap::cli {

namespace {

struct FitOptions : OutputOptions {
  std::string measured;
  int threads = -1;
  long long photons = -1;
};

}  // namespace

void add_fit_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("fit", "fit the [fit] parameters of a scene to a measured reflectance curve");
  auto o = std::make_shared<FitOptions>();
  cmd->add_option("scene", o->scene, "scene file (TOML) with a [fit] table")->required()->check(CLI::ExistingFile);
  cmd->add_option("--measured", o->measured,
                  "measured curve CSV: wavelength_nm,reflectance[,uncertainty][,transmittance]")
      ->required()
      ->check(CLI::ExistingFile);
  add_output_options(*cmd, *o);
  cmd->add_option("-j,--threads", o->threads, "threads, 0 = all cores (default: run.threads of the scene)")
      ->check(whole_number_in(0, std::numeric_limits<int>::max(), "0 = all cores"));
  cmd->add_option("--photons", o->photons, "photons per wavelength and evaluation (overrides run.photons)")
      ->check(whole_number_in(1, std::int64_t(kMaxPhotonsPerWavelength), kMaxPhotonsReason));
  cmd->callback([o] {
    const FitSetup setup = prepare_fit(o->scene, o->measured, o->photons);
    const auto out = result_folder(*o, setup.start_scene, "fit");
    check_output_folder(out, setup.start_scene.file, o->overwrite);
    const int threads = o->threads >= 0 ? o->threads : setup.start_scene.run.threads;
    const ThreadLimit limit(threads, o->threads >= 0 ? "--threads" : "run.threads");
    std::cerr << fmt::format("lumtrap fit: {} parameter(s), {} measured points ({} to {} nm), {}\n",
                             setup.spec.parameters.size(), setup.measured.wavelength_nm.size(),
                             setup.measured.wavelength_nm.front(), setup.measured.wavelength_nm.back(),
                             setup.exact ? "planar solver (exact)"
                                         : fmt::format("ray tracing, {} photons per wavelength, seed {}",
                                                       setup.start_scene.run.photons, setup.start_scene.run.seed));
    const OutputFolderLock lock(out);
    const auto t0 = std::chrono::steady_clock::now();
    const FitResult res = fit_model(setup, [](int evaluations, double chi2) {
      std::cerr << fmt::format("  evaluation {:3d}: chi2 {:.6g}\n", evaluations, chi2);
    });
    const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    write_result_folder(out, fit_files(setup, res, seconds, limit.threads()), o->overwrite);
    std::cout << fmt::format("{} ({} evaluations, {:.1f} s)\n", res.stop_reason, res.evaluations, seconds);
    std::cout << "best fit (model estimates):\n";
    for (std::size_t j = 0; j < res.best.size(); ++j) {
      const auto& p = setup.spec.parameters[j];
      std::cout << fmt::format("  {:32s} {:.6g} +- {:.2g} {}\n", p.key, res.best[j], res.standard_error[j], p.unit);
    }
    std::cout << fmt::format("chi2 {:.4g} over {} points ({:.4g} per point){}\n", res.chi2, res.points,
                             res.chi2 / double(res.points),
                             res.weighted ? "" : fmt::format("; unweighted, rms residual {:.3g}",
                                                             std::sqrt(res.chi2 / double(res.points))));
    std::cout << "results in " << out.string() << "\n";
  });
}

}  // namespace lumtrap::cli
