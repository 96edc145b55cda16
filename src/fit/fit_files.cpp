#include "fit/fit_files.hpp"

#include <fmt/format.h>

#include <nlohmann/json.hpp>

#include "io/scene_writer.hpp"
#include "io/units.hpp"
#include "sweep/expand.hpp"

namespace lumtrap {

namespace {

std::string num(double x) { return fmt::format("{:.10g}", x); }

}  // namespace

std::vector<OutputFile> fit_files(const FitSetup& setup, const FitResult& res, double seconds, int threads) {
  const auto& pars = setup.spec.parameters;
  const auto& m = setup.measured;
  const std::size_t p = pars.size(), n = m.wavelength_nm.size();
  std::vector<OutputFile> files;

  std::string csv = "key,unit,start,min,max,best,standard_error\n";
  for (std::size_t j = 0; j < p; ++j)
    csv += fmt::format("{},{},{},{},{},{},{}\n", csv_field(pars[j].key), pars[j].unit, num(pars[j].start),
                       num(pars[j].lower), num(pars[j].upper), num(res.best[j]), num(res.standard_error[j]));
  files.push_back({"parameters.csv", csv});

  csv = "key";
  for (const auto& q : pars) csv.append(",").append(csv_field(q.key));
  csv += "\n";
  for (std::size_t a = 0; a < p; ++a) {
    csv += csv_field(pars[a].key);
    for (std::size_t b = 0; b < p; ++b) csv.append(",").append(num(res.correlation(Eigen::Index(a), Eigen::Index(b))));
    csv += "\n";
  }
  files.push_back({"correlation.csv", csv});

  const bool with_t = !m.transmittance.empty();
  csv = "wavelength_nm,measured,uncertainty,fitted,fitted_sigma,residual,normalized_residual";
  if (with_t) csv += ",measured_transmittance,fitted_transmittance";
  csv += "\n";
  for (std::size_t i = 0; i < n; ++i) {
    const double d = res.fitted.reflectance[i] - m.reflectance[i];
    csv += fmt::format("{},{},{},{},{},{},{}", num(m.wavelength_nm[i]), num(m.reflectance[i]),
                       m.uncertainty.empty() ? std::string() : num(m.uncertainty[i]), num(res.fitted.reflectance[i]),
                       num(res.fitted.reflectance_sigma[i]), num(d), num(d / res.weight[i]));
    if (with_t) csv += fmt::format(",{},{}", num(m.transmittance[i]), num(res.fitted.transmittance[i]));
    csv += "\n";
  }
  files.push_back({"curve.csv", csv});

  const Scene fitted = scene_at(setup, res.best, false);
  std::string scene_text = fmt::format(
      "# The scene at the best fit of {} to {} (lumtrap fit; model estimates of the\n"
      "# fitted parameters, see parameters.csv). Run it with: lumtrap run fitted_scene.toml\n",
      setup.scene_file.filename().string(), m.file.filename().string());
  scene_text += resolved_scene_toml(fitted);
  files.push_back({"fitted_scene.toml", scene_text});

  nlohmann::ordered_json j;
  j["note"] = "fitted values are model estimates of the scene parameters, not measurements";
  j["scene"] = setup.scene_file.string();
  j["measured"] = m.file.string();
  j["compare"] = setup.spec.compare == CompareQuantity::total_reflectance ? "total_reflectance"
                                                                          : "first_surface_reflectance";
  j["method"] = res.fitted.exact ? "planar (exact)" : "ray tracing (common random numbers)";
  j["photons"] = res.fitted.exact ? 0 : setup.start_scene.run.photons;
  j["seed"] = setup.start_scene.run.seed;
  j["wavelength_from_nm"] = m.wavelength_nm.front();
  j["wavelength_to_nm"] = m.wavelength_nm.back();
  j["points"] = res.points;
  j["degrees_of_freedom"] = res.dof;
  j["weighted"] = res.weighted;
  j["chi2"] = res.chi2;
  j["chi2_per_point"] = res.chi2 / double(res.points);
  j["chi2_per_degree_of_freedom"] = res.chi2 / double(res.dof);
  if (!res.weighted) j["rms_residual"] = std::sqrt(res.chi2 / double(res.points));
  j["evaluations"] = res.evaluations;
  j["iterations"] = res.iterations;
  j["stop_reason"] = res.stop_reason;
  j["seconds"] = seconds;
  j["threads"] = threads;
  for (std::size_t a = 0; a < p; ++a) {
    nlohmann::ordered_json q;
    q["key"] = pars[a].key;
    q["unit"] = pars[a].unit;
    q["start"] = pars[a].start;
    q["min"] = pars[a].lower;
    q["max"] = pars[a].upper;
    q["best"] = res.best[a];
    q["standard_error"] = res.standard_error[a];
    std::vector<double> row;
    for (std::size_t b = 0; b < p; ++b) row.push_back(res.correlation(Eigen::Index(a), Eigen::Index(b)));
    q["correlation"] = row;
    j["parameters"].push_back(q);
  }
  files.push_back({"fit.json", j.dump(2) + "\n"});
  return files;
}

}  // namespace lumtrap
