#include "trace/run.hpp"

#include <tbb/blocked_range.h>
#include <tbb/combinable.h>
#include <tbb/parallel_for.h>

#include <algorithm>
#include <cmath>
#include <fmt/format.h>

#include "io/exr_image.hpp"
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

std::string film_bin_name(const std::string& surface, std::size_t k, const Film& film) {
  std::string label = film.material.describe();
  for (char& c : label)
    if (!std::isalnum(static_cast<unsigned char>(c))) c = '_';
  return fmt::format("A_{}_{}_{}", surface, k + 1, label);
}

std::string film_bin_meaning(const std::string& surface, std::size_t k, const Film& film) {
  return fmt::format("absorbed in {} film {} ({}, {:g} nm)", surface, k + 1, film.material.describe(),
                     film.thickness_nm);
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
  // The Embree scenes are built before the per-triangle normals exist: on a
  // large tile the BVH build's working memory then never coexists with them.
  run->model = build_wafer_geometry(scene);
  const double deepest = scene.wafer.thickness_um + (run->model.front.mesh.max_z() - run->model.front.mesh.min_z()) +
                         (run->model.rear.mesh.max_z() - run->model.rear.mesh.min_z());
  run->layout = make_tally_layout(int(scene.front.films.size()), int(scene.rear.films.size()), deepest);
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

Results results_from_tallies(const PreparedRun& run, const std::vector<WavelengthTally>& tallies) {
  const Scene& sc = run.scene;
  Results r;
  r.method = "ray tracing";
  r.spectrum = run.spectrum.name;
  r.wavelength_nm = sc.illumination.wavelengths_nm;
  r.band_weight = run.band_weight;
  for (const auto& t : tallies) r.photons.push_back(t.photons);

  auto add = [&](std::string name, std::string meaning, bool loss, auto count_of) {
    ResultBin b;
    b.name = std::move(name);
    b.meaning = std::move(meaning);
    b.loss = loss;
    for (const auto& t : tallies) {
      const std::uint64_t c = count_of(t);
      b.fraction.push_back(t.photons ? double(c) / double(t.photons) : 0.0);
      b.sigma.push_back(binomial_sigma(c, t.photons));
    }
    r.bins.push_back(std::move(b));
  };
  add("A_si", "absorbed in the silicon bulk (J_G)", false, [](const WavelengthTally& t) { return t.A_si; });
  add("R_front", "reflected at the front without entering the silicon", true,
      [](const WavelengthTally& t) { return t.R_front; });
  add("R_escape", "entered the silicon, then escaped through the front", true,
      [](const WavelengthTally& t) { return t.R_escape; });
  for (std::size_t k = 0; k < sc.front.films.size(); ++k)
    add(film_bin_name("front", k, sc.front.films[k]), film_bin_meaning("front", k, sc.front.films[k]), true, [k](const WavelengthTally& t) { return t.A_front[k]; });
  for (std::size_t k = 0; k < sc.rear.films.size(); ++k)
    add(film_bin_name("rear", k, sc.rear.films[k]), film_bin_meaning("rear", k, sc.rear.films[k]), true, [k](const WavelengthTally& t) { return t.A_rear[k]; });
  add("A_rear_medium", "absorbed in the rear medium (" + sc.rear_medium.describe() + ")", true,
      [](const WavelengthTally& t) { return t.A_rear_medium; });
  add("T", "transmitted through the rear", true, [](const WavelengthTally& t) { return t.T; });
  add("unresolved", "stopped at the interaction limit (run.max_bounces)", true,
      [](const WavelengthTally& t) { return t.unresolved; });
  add("lost", "slipped through the mesh by numerical error", true, [](const WavelengthTally& t) { return t.lost; });
  compute_currents(r);

  std::uint64_t photons = 0, interactions = 0, passes = 0;
  std::uint64_t fewest = tallies.empty() ? 0 : tallies.front().photons, most = 0;
  for (const auto& t : tallies) {
    photons += t.photons;
    interactions += t.interactions;
    passes += t.bulk_passes;
    fewest = std::min(fewest, t.photons);
    most = std::max(most, t.photons);
  }
  r.summary["photons"] = photons;
  // The photons per wavelength differ in precision mode (Neyman allocation).
  r.summary["photons_spent"] = photons;
  r.summary["photons_per_wavelength_min"] = fewest;
  r.summary["photons_per_wavelength_max"] = most;
  r.summary["interactions"] = interactions;
  r.summary["bulk_passes"] = passes;
  r.summary["seed"] = sc.run.seed;
  r.summary["lateral_randomization"] = sc.run.randomize_lateral;
  const char* conv[] = {"mean", "base", "apex"};
  r.summary["thickness_convention"] = conv[int(sc.wafer.thickness_convention)];
  r.summary["thickness_um"] = sc.wafer.thickness_um;
  r.summary["front_triangles"] = run.model.front.mesh.triangles.size();
  r.summary["rear_triangles"] = run.model.rear.mesh.triangles.size();
  return r;
}

std::vector<OutputFile> trace_result_files(const PreparedRun& run, const Results& results,
                                           const std::vector<WavelengthTally>& tallies,
                                           const std::string& scene_text) {
  std::vector<OutputFile> files{{"spectral.csv", spectral_csv(results)},
                                {"summary.json", summary_json(results)},
                                {"scene.toml", scene_text}};
  for (auto& f : trace_extra_files(run, tallies)) files.push_back(std::move(f));
  return files;
}

std::vector<OutputFile> trace_extra_files(const PreparedRun& run, const std::vector<WavelengthTally>& tallies) {
  std::vector<OutputFile> files;
  const TallyLayout& L = run.layout;
  const auto& w = run.band_weight;

  // Generation profile G(z): Σ_i w_i (counts_i / N_i) / Δz, photons m^-2 s^-1
  // per µm → cm^-3 s^-1 (1 m^-2 = 1e-4 cm^-2, 1 µm = 1e-4 cm).
  {
    std::string s = "# photogeneration rate in the silicon vs depth below the front surface (vertical distance)\n";
    s += fmt::format("# spectrum {}; q * sum(G * dz) = J_G\n", run.spectrum.name);
    s += "depth_top_um,depth_bottom_um,G_cm3_s,G_sigma_cm3_s\n";
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
      s += fmt::format("{:.6g},{:.6g},{:.6e},{:.3e}\n", L.depth_edges_um[b], L.depth_edges_um[b + 1], g,
                       std::sqrt(var));
    }
    files.push_back({"generation.csv", s});
  }
  // Angular distributions, spectrum weighted, as currents per bin: a CSV
  // and an EXR map (rows: polar bins, columns: azimuth bins).
  auto angle_map = [&](auto member) {
    std::vector<float> map(std::size_t(L.polar_bins) * L.azimuth_bins);
    for (std::size_t b = 0; b < map.size(); ++b) {
      double flux = 0;
      for (std::size_t i = 0; i < tallies.size(); ++i)
        if (tallies[i].photons) flux += w[i] * double((tallies[i].*member)[b]) / double(tallies[i].photons);
      map[b] = float(current_mA_per_cm2(flux));
    }
    return map;
  };
  auto angle_csv = [&](const char* title, const std::vector<float>& map) {
    std::string s = fmt::format("# {}; photon current in mA/cm2 per bin, spectrum {}\n", title, run.spectrum.name);
    s += "polar_lo_deg,polar_hi_deg,azimuth_lo_deg,azimuth_hi_deg,current_mA_cm2\n";
    const double dp = 90.0 / L.polar_bins, da = 360.0 / L.azimuth_bins;
    for (int p = 0; p < L.polar_bins; ++p)
      for (int a = 0; a < L.azimuth_bins; ++a)
        s += fmt::format("{:g},{:g},{:g},{:g},{:.6e}\n", p * dp, (p + 1) * dp, a * da, (a + 1) * da,
                         map[std::size_t(p) * L.azimuth_bins + a]);
    return s;
  };
  const auto escape = angle_map(&WavelengthTally::escape_angle);
  const auto rear = angle_map(&WavelengthTally::rear_angle);
  files.push_back({"escape_angles.csv", angle_csv("polar angle (from the wafer normal) and azimuth of light escaping "
                                                  "through the front after entering the silicon",
                                                  escape)});
  files.push_back({"escape_angles.exr", exr_image(L.azimuth_bins, L.polar_bins, escape)});
  files.push_back({"rear_angles.csv", angle_csv("polar angle (from the downward wafer normal) and azimuth of light "
                                                "arriving at the rear zone from the bulk",
                                                rear)});
  files.push_back({"rear_angles.exr", exr_image(L.azimuth_bins, L.polar_bins, rear)});
  {
    std::string s = "# photons absorbed in the silicon by the number of bulk crossings before absorption\n";
    s += "# (last row: that many or more); spectrum-weighted photon current in mA/cm2\n";
    s += "passes,current_mA_cm2\n";
    for (int b = 0; b < L.pass_bins; ++b) {
      double flux = 0;
      for (std::size_t i = 0; i < tallies.size(); ++i)
        if (tallies[i].photons) flux += w[i] * double(tallies[i].passes_absorbed[b]) / double(tallies[i].photons);
      s += fmt::format("{},{:.6e}\n", b, current_mA_per_cm2(flux));
    }
    files.push_back({"passes.csv", s});
  }
  if (run.scene.run.depth_histograms) {
    std::string s = "# fraction of incident photons absorbed in each depth bin, per wavelength\n";
    s += "wavelength_nm";
    for (std::size_t b = 0; b + 1 < L.depth_edges_um.size(); ++b)
      s += fmt::format(",{:.6g}-{:.6g}um", L.depth_edges_um[b], L.depth_edges_um[b + 1]);
    s += "\n";
    for (std::size_t i = 0; i < tallies.size(); ++i) {
      s += fmt::format("{:.6g}", run.scene.illumination.wavelengths_nm[i]);
      for (auto c : tallies[i].depth)
        s += fmt::format(",{:.6e}", tallies[i].photons ? double(c) / double(tallies[i].photons) : 0.0);
      s += "\n";
    }
    files.push_back({"depth_by_wavelength.csv", s});
  }
  return files;
}

}  // namespace lumtrap
