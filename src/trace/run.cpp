#include "trace/run.hpp"

#include <tbb/blocked_range.h>
#include <tbb/combinable.h>
#include <tbb/parallel_for.h>

#include <algorithm>
#include <cmath>
#include <numeric>
#include <fmt/format.h>

#include "io/cell_facts.hpp"
#include "io/paired_difference.hpp"
#include "io/scene_words.hpp"
#include "trace/transport.hpp"

namespace lumtrap {

Spectrum scene_spectrum(const Illumination& il) {
  switch (il.spectrum) {
    case SpectrumKind::am15g: return builtin_spectrum("AM1.5G");
    case SpectrumKind::am15d: return builtin_spectrum("AM1.5D");
    case SpectrumKind::am0: return builtin_spectrum("AM0");
    case SpectrumKind::file: return load_spectrum_file(il.spectrum_file);
  }
  return builtin_spectrum("AM1.5G");
}

namespace {

double binomial_sigma(std::uint64_t count, std::uint64_t n) {
  if (n == 0) return 0;
  const double p = double(count) / double(n);
  return std::sqrt(p * (1.0 - p) / double(n));
}

}  // namespace

std::unique_ptr<PreparedRun> prepare_run(const Scene& scene, std::uint64_t variant) {
  auto run = std::make_unique<PreparedRun>();
  run->scene = scene;
  run->variant = variant;
  run->materials = load_scene_materials(scene);
  check_optics_finite(scene, run->materials, {1.0}, {1.0});  // before the (possibly long) mesh build
  // The Embree scenes are built before the per-triangle normals exist: on a
  // large tile the BVH build's working memory then never coexists with them.
  run->model = build_wafer_geometry(scene);
  const double deepest = scene.wafer.thickness_um + (run->model.front.mesh.max_z() - run->model.front.mesh.min_z()) +
                         (run->model.rear.mesh.max_z() - run->model.rear.mesh.min_z());
  run->layout = make_tally_layout(scene, deepest);
  run->spectrum = scene_spectrum(scene.illumination);
  run->band_weight = band_photon_weights(run->spectrum, scene.illumination.wavelengths_nm);
  run->device = std::make_unique<EmbreeDevice>();
  run->front_scene = std::make_unique<TileScene>(*run->device, run->model.front.mesh);
  run->rear_scene = std::make_unique<TileScene>(*run->device, run->model.rear.mesh);
  add_facet_normals(run->model, scene);
  return run;
}

WavelengthOptics wavelength_optics(const PreparedRun& run, std::size_t i) {
  return make_wavelength_optics(run.scene, run.materials, run.model.front.tilt_cos, run.model.rear.tilt_cos,
                                run.scene.illumination.wavelengths_nm.at(i));
}

WavelengthTally trace_wavelength(const PreparedRun& run, const WavelengthOptics& optics, std::size_t i,
                                 std::uint64_t begin, std::uint64_t end) {
  TraceContext ctx = make_trace_context(run.scene, run.model, *run.front_scene, *run.rear_scene, optics,
                                        run.layout, i);
  ctx.variant = run.variant;
  tbb::combinable<WavelengthTally> partial([&] { return WavelengthTally(run.layout); });
  // Small chunks: a few thousand photons per call (the precision pilot) still
  // spread evenly over the threads; photon i's random numbers depend on i
  // only, so the split does not change the tally.
  tbb::parallel_for(tbb::blocked_range<std::uint64_t>(begin, end, 32),
                    [&](const tbb::blocked_range<std::uint64_t>& r) {
                      trace_photons(ctx, r.begin(), r.end(), partial.local());
                    });
  WavelengthTally total(run.layout);
  partial.combine_each([&](const WavelengthTally& t) { total += t; });
  return total;
}

namespace {

/// J_G of every paired photon group, J_g = q Σ_i w_i n_g,i / N_g,i (the same
/// weighting as J_G over the group's photons N_g,i, the sum of its end-state
/// bins), and the batch-means error sd(J_g) / sqrt(G). Left empty when some
/// group has no photon at some wavelength (fewer photons than groups).
void paired_group_currents(const TallyLayout& L, const std::vector<double>& w,
                           const std::vector<WavelengthTally>& tallies, Summary& s) {
  const auto G = std::size_t(L.photon_groups);
  const std::size_t bins = L.bins.size();
  const std::size_t absorbed = L.bins.slot(EndState::absorbed_silicon);
  s.J_G_groups_mA_cm2.clear();
  s.J_G_sigma_groups_mA_cm2 = 0;
  std::vector<double> flux(G, 0.0);
  for (std::size_t i = 0; i < tallies.size(); ++i)
    for (std::size_t g = 0; g < G; ++g) {
      const auto row = tallies[i].ended_by_group.begin() + std::ptrdiff_t(g * bins);
      const std::uint64_t photons = std::accumulate(row, row + std::ptrdiff_t(bins), std::uint64_t(0));
      if (photons == 0) return;
      flux[g] += w[i] * double(row[std::ptrdiff_t(absorbed)]) / double(photons);
    }
  for (double f : flux) s.J_G_groups_mA_cm2.push_back(current_mA_per_cm2(f));
  s.J_G_sigma_groups_mA_cm2 = batch_means_sigma(s.J_G_groups_mA_cm2);
}

}  // namespace

Results results_from_tallies(const PreparedRun& run, const std::vector<WavelengthTally>& tallies) {
  const Scene& sc = run.scene;
  const TallyLayout& L = run.layout;
  const auto& w = run.band_weight;
  Results r;
  r.method = "ray tracing";
  r.spectrum = run.spectrum.name;
  r.wavelength_nm = sc.illumination.wavelengths_nm;
  r.band_weight = w;
  for (const auto& t : tallies) r.photons.push_back(t.photons);
  r.bins = result_bins(L.bins, tallies.size());
  for (std::size_t i = 0; i < tallies.size(); ++i) {
    const WavelengthTally& t = tallies[i];
    for (std::size_t b = 0; b < r.bins.size(); ++b) {
      r.bins[b].fraction[i] = t.photons ? double(t.ended[b]) / double(t.photons) : 0.0;
      r.bins[b].sigma[i] = binomial_sigma(t.ended[b], t.photons);
    }
  }

  // Generation profile G(z): Σ_i w_i (counts_i / N_i) / Δz, photons m^-2 s^-1
  // per µm → cm^-3 s^-1 (1 m^-2 = 1e-4 cm^-2, 1 µm = 1e-4 cm).
  r.generation.edges_um = L.depth_edges_um;
  for (std::size_t b = 0; b + 1 < L.depth_edges_um.size(); ++b) {
    const double dz_cm = (L.depth_edges_um[b + 1] - L.depth_edges_um[b]) * 1e-4;
    double g = 0, var = 0;
    for (std::size_t i = 0; i < tallies.size(); ++i) {
      const auto& t = tallies[i];
      if (!t.photons) continue;
      const double scale = w[i] * 1e-4 / dz_cm;
      g += scale * double(t.depth[b]) / double(t.photons);
      const double sg = scale * binomial_sigma(t.depth[b], t.photons);
      var += sg * sg;
    }
    r.generation.G_cm3_s.push_back(g);
    r.generation.sigma_cm3_s.push_back(std::sqrt(var));
  }
  // Spectrum-weighted currents of a histogram, per bin.
  auto current_of = [&](std::vector<std::uint64_t> WavelengthTally::*member, std::size_t bins) {
    std::vector<double> out(bins);
    for (std::size_t b = 0; b < bins; ++b) {
      double flux = 0;
      for (std::size_t i = 0; i < tallies.size(); ++i)
        if (tallies[i].photons) flux += w[i] * double((tallies[i].*member)[b]) / double(tallies[i].photons);
      out[b] = current_mA_per_cm2(flux);
    }
    return out;
  };
  auto angle_map = [&](std::vector<std::uint64_t> WavelengthTally::*member, const char* title) {
    AngleMap m;
    m.polar_bins = L.polar_bins;
    m.azimuth_bins = L.azimuth_bins;
    m.title = title;
    for (double c : current_of(member, std::size_t(L.polar_bins) * L.azimuth_bins))
      m.current_mA_cm2.push_back(float(c));
    return m;
  };
  r.escape_angles = angle_map(&WavelengthTally::escape_angle,
                              "polar angle (from the wafer normal) and azimuth of light escaping through the front "
                              "after entering the silicon");
  r.rear_angles = angle_map(&WavelengthTally::rear_angle,
                            "polar angle (from the downward wafer normal) and azimuth of light arriving at the rear "
                            "zone from the bulk");
  r.passes_current_mA_cm2 = current_of(&WavelengthTally::passes_absorbed, std::size_t(L.pass_bins));
  if (sc.run.depth_histograms)
    for (const auto& t : tallies) {
      std::vector<double> row;
      for (auto c : t.depth) row.push_back(t.photons ? double(c) / double(t.photons) : 0.0);
      r.depth_by_wavelength.push_back(std::move(row));
    }

  Summary& s = r.summary;
  s.scene_name = sc.name;
  std::uint64_t fewest = tallies.empty() ? 0 : tallies.front().photons, most = 0;
  for (const auto& t : tallies) {
    s.photons += t.photons;
    s.interactions += t.interactions;
    s.bulk_passes += t.bulk_passes;
    fewest = std::min(fewest, t.photons);
    most = std::max(most, t.photons);
  }
  // The photons per wavelength differ in precision mode (Neyman allocation).
  s.photons_per_wavelength_min = fewest;
  s.photons_per_wavelength_max = most;
  s.seed = sc.run.seed;
  s.randomize_lateral = sc.run.randomize_lateral;
  s.thickness_convention = thickness_convention_word(sc.wafer.thickness_convention);
  s.thickness_um = sc.wafer.thickness_um;
  s.cell = cell_facts(sc);
  s.front_triangles = run.model.front.mesh.triangles.size();
  s.rear_triangles = run.model.rear.mesh.triangles.size();
  s.target_J_G_sigma_mA_cm2 = sc.run.target_jg_error;
  compute_currents(r);
  s.target_J_G_sigma_met = sc.run.target_jg_error > 0 && s.J_G_sigma_mA_cm2 <= sc.run.target_jg_error;
  paired_group_currents(L, w, tallies, s);
  return r;
}

}  // namespace lumtrap
