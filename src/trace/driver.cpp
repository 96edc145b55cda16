#include "trace/driver.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <fmt/format.h>
#include <stdexcept>

#include <tbb/parallel_for.h>

#include "trace/checkpoint.hpp"

namespace lumtrap {

double jg_sigma(const PreparedRun& run, const std::vector<WavelengthTally>& tallies) {
  const std::size_t si = run.layout.bins.slot(EndState::absorbed_silicon);
  double var = 0;
  for (std::size_t i = 0; i < tallies.size(); ++i) {
    const auto& t = tallies[i];
    if (!t.photons) continue;
    const double p = double(t.ended[si]) / double(t.photons);
    var += run.band_weight[i] * run.band_weight[i] * p * (1 - p) / double(t.photons);
  }
  return current_mA_per_cm2(std::sqrt(var));
}

std::vector<std::uint64_t> precision_pilot(const PreparedRun& run, std::uint64_t cap, double target) {
  const std::size_t nw = run.band_weight.size();
  double sum_w = 0;
  for (double w : run.band_weight) sum_w += w;
  // Photons that meet the target whatever the p_i (s_i <= 1/2), allocated ∝ w_i.
  const double sigma_flux = target / current_mA_per_cm2(1.0);
  const double n_bound = (0.5 * sum_w) * (0.5 * sum_w) / (sigma_flux * sigma_flux);
  std::vector<std::uint64_t> pilot(nw);
  for (std::size_t i = 0; i < nw; ++i) {
    const double share = sum_w > 0 ? kPilotFraction * n_bound * run.band_weight[i] / sum_w : 0.0;
    const double n = std::clamp(std::ceil(share), double(kFewestPilotPhotons), double(kMostPilotPhotons));
    pilot[i] = std::min(cap, std::uint64_t(n));
  }
  return pilot;
}

namespace {

struct Driver {
  const PreparedRun& run;
  const DriveOptions& opt;
  std::vector<WavelengthTally> tallies;
  std::vector<WavelengthOptics> optics;  // built lazily, one per wavelength
  std::chrono::steady_clock::time_point last_save = std::chrono::steady_clock::now();
  std::uint64_t first = 0;  // index of the first photon of every wavelength (split runs)
  std::uint64_t slice = 64;  // photons of the next slice, adapted to the measured speed
  std::string checkpoint_problem;
  int failed_saves = 0;
  std::vector<std::uint64_t> round_goals;  // precision mode: photons per wavelength of this round
  int round = 0;                           // precision mode: 0 = the pilot
  double reported = 0;                     // progress already reported (never goes back)
  static constexpr int kMostRounds = 50;

  // Builds the tables of wavelength i and of the next few (the wavelengths are
  // worked through in order), in parallel: a few thousand photons per
  // wavelength then spend no time building tables on one thread.
  const WavelengthOptics& optics_of(std::size_t i) {
    if (optics.size() != tallies.size()) optics.resize(tallies.size());
    if (optics[i].wavelength_nm == 0) {
      const std::size_t end = std::min(optics.size(), i + 8);
      tbb::parallel_for(i, end, [&](std::size_t j) {
        if (optics[j].wavelength_nm == 0) optics[j] = wavelength_optics(run, j);
      });
    }
    return optics[i];
  }

  bool stopped() const { return opt.stop && opt.stop->load(); }

  void save(bool now) {
    if (opt.checkpoint.empty()) return;
    const auto t = std::chrono::steady_clock::now();
    if (!now && std::chrono::duration<double>(t - last_save).count() < opt.checkpoint_seconds) return;
    last_save = t;
    try {
      save_tally_set(opt.checkpoint, TallySet{opt.scene_hash, LUMTRAP_VERSION, tallies, round_goals, round},
                     run.layout);
    } catch (const std::exception& e) {
      // The run goes on: only the ability to resume is lost meanwhile.
      if (opt.warn && (failed_saves == 0 || checkpoint_problem != e.what()))
        opt.warn(fmt::format("checkpoint not written ({}); the run goes on, but an interruption now would lose "
                             "the photons traced since the last checkpoint",
                             e.what()));
      checkpoint_problem = e.what();
      ++failed_saves;
      return;
    }
    if (failed_saves > 0 && opt.warn)
      opt.warn(fmt::format("checkpoint {} written again (after {} failed attempts)", opt.checkpoint.string(),
                           failed_saves));
    failed_saves = 0;
    checkpoint_problem.clear();
  }

  // Photons of the next slice: about opt.slice_seconds at the speed of the
  // last one, at most opt.batch, at least a few.
  void adapt_slice(std::uint64_t traced, double seconds) {
    constexpr std::uint64_t kFewest = 8;
    const std::uint64_t most = std::max<std::uint64_t>(opt.batch, kFewest);
    if (seconds <= 0 || traced == 0) {
      slice = std::min(most, slice * 2);
      return;
    }
    const double aimed = double(traced) * opt.slice_seconds / seconds;
    const double capped = std::min(aimed, 2.0 * double(slice));  // grow gently, shrink at once
    slice = std::clamp<std::uint64_t>(std::uint64_t(std::max(capped, 1.0)), kFewest, most);
  }

  // Brings wavelength i up to `target` photons (counted from `first`) in
  // batches; false if stopped.
  bool top_up(std::size_t i, std::uint64_t target, double done_before, double total_work) {
    while (tallies[i].photons < target) {
      if (stopped()) {
        save(true);
        return false;
      }
      const WavelengthOptics& optics = optics_of(i);
      const std::uint64_t begin = tallies[i].photons;
      const std::uint64_t end = std::min(target, begin + slice);
      const auto t0 = std::chrono::steady_clock::now();
      tallies[i] += trace_wavelength(run, optics, i, first + begin, first + end);
      adapt_slice(end - begin, std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count());
      save(false);
      if (opt.progress && total_work > 0) {
        // (in precision mode a later round may raise the total: the bar waits)
        reported = std::max(reported, std::min(1.0, (done_before + double(tallies[i].photons)) / total_work));
        opt.progress(reported);
      }
    }
    return true;
  }

  // Fixed mode: `count` photons per wavelength (of this part of the run).
  bool fixed(std::uint64_t count) {
    const double total = double(count) * double(tallies.size());
    double done_before = 0;
    for (std::size_t i = 0; i < tallies.size(); ++i) {
      if (!top_up(i, count, done_before, total)) return false;
      done_before += double(count);
    }
    return true;
  }

  // Precision mode: a pilot sized from the target, then Neyman allocation
  // rounds until σ(J_G) <= target. Each round's goals are kept in the
  // checkpoint, so a resumed run finishes the round it was in and then
  // decides exactly as an uninterrupted run would.
  bool precision(std::uint64_t cap, double target) {
    const std::size_t nw = tallies.size();
    if (round_goals.empty()) {
      round = 0;
      round_goals = precision_pilot(run, cap, target);
    }
    for (;;) {
      if (!reach_round_goals()) return false;
      if (round >= kMostRounds || jg_sigma(run, tallies) <= target) break;
      // Total photons needed if allocated optimally: (Σ w_i s_i)^2 / σ_t^2,
      // with s_i = sqrt(p_i (1 - p_i)) (floored so no wavelength starves).
      std::vector<double> ws(nw);
      double sum_ws = 0;
      for (std::size_t i = 0; i < nw; ++i) {
        const auto& t = tallies[i];
        double p = double(t.ended[run.layout.bins.slot(EndState::absorbed_silicon)]) /
                   double(std::max<std::uint64_t>(t.photons, 1));
        p = std::clamp(p, 0.5 / double(t.photons + 1), 1.0 - 0.5 / double(t.photons + 1));
        ws[i] = run.band_weight[i] * std::sqrt(p * (1 - p));
        sum_ws += ws[i];
      }
      const double sigma_flux = target / current_mA_per_cm2(1.0);  // target in photons m^-2 s^-1
      const double n_total = sum_ws * sum_ws / (sigma_flux * sigma_flux) * 1.05;
      std::vector<std::uint64_t> goals(nw);
      bool grew = false;
      for (std::size_t i = 0; i < nw; ++i) {
        const auto want = std::uint64_t(std::ceil(n_total * ws[i] / sum_ws));
        goals[i] = std::max(tallies[i].photons, std::min(cap, want));
        grew = grew || goals[i] > tallies[i].photons;
      }
      if (!grew) break;  // capped everywhere
      round_goals = std::move(goals);
      ++round;
    }
    return true;
  }

  // Brings every wavelength up to this round's goal; false if stopped.
  bool reach_round_goals() {
    double total = 0, done = 0;
    for (std::size_t i = 0; i < tallies.size(); ++i) {
      total += double(std::max(round_goals[i], tallies[i].photons));
      done += double(tallies[i].photons);
    }
    for (std::size_t i = 0; i < tallies.size(); ++i) {
      const double before = done - double(tallies[i].photons);
      if (!top_up(i, round_goals[i], before, total)) return false;
      done = before + double(tallies[i].photons);
    }
    return true;
  }
};

}  // namespace

DriveResult drive_run(const PreparedRun& run, const DriveOptions& opt) {
  const std::size_t nw = run.scene.illumination.wavelengths_nm.size();
  Driver d{run, opt, std::vector<WavelengthTally>(nw, WavelengthTally(run.layout)), {}};
  if (!opt.checkpoint.empty()) {
    if (auto saved = load_tally_set(opt.checkpoint, run.layout)) {
      if (saved->scene_hash != opt.scene_hash || saved->tallies.size() != nw)
        throw std::runtime_error(fmt::format(
            "checkpoint {} belongs to another scene (hash {}, this scene {}); remove it to start afresh",
            opt.checkpoint.string(), saved->scene_hash, opt.scene_hash));
      d.tallies = std::move(saved->tallies);
      d.round_goals = std::move(saved->round_goals);
      d.round = saved->round;
    }
  }
  const std::uint64_t cap = run.scene.run.photons;
  const double target = run.scene.run.target_jg_error;
  DriveResult out;
  const bool ranged = opt.first_photon != 0 || opt.last_photon != 0;
  if (ranged && target > 0)
    throw std::invalid_argument(
        "a photon range (split run) needs a fixed photon count; this scene sets run.target_jg_error");
  const std::uint64_t last = opt.last_photon ? opt.last_photon : cap;
  if (ranged && (opt.first_photon > last || last > cap))
    throw std::invalid_argument(fmt::format("photon range [{}, {}) does not lie within the {} photons per wavelength "
                                            "of the scene (run.photons)",
                                            opt.first_photon, last, cap));
  d.first = opt.first_photon;

  const bool finished = target <= 0 ? d.fixed(last - opt.first_photon) : d.precision(cap, target);
  out.checkpoint_problem = d.checkpoint_problem;
  if (!finished) {  // stopped: the checkpoint holds the work done
    out.tallies = std::move(d.tallies);
    return out;
  }
  out.jg_sigma_mA_cm2 = jg_sigma(run, d.tallies);
  out.tallies = std::move(d.tallies);
  out.complete = true;
  return out;
}

}  // namespace lumtrap
