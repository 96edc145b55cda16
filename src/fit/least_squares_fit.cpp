#include "fit/least_squares_fit.hpp"

#include <fmt/format.h>

#include <cmath>
#include <map>
#include <unsupported/Eigen/LevenbergMarquardt>

#include "io/scene_reader.hpp"
#include "io/units.hpp"
#include "sweep/expand.hpp"
#include "trace/planar_run.hpp"

namespace lumtrap {

namespace {

toml::table table_at(const FitSetup& setup, const std::vector<double>& x, bool measured_wavelengths) {
  toml::table t = variant_table(setup.root, parameter_values(setup.spec, x));
  if (measured_wavelengths) {
    toml::array wl;
    for (double nm : setup.measured.wavelength_nm) wl.push_back(format_number(nm) + " nm");
    set_at_key_path(t, "illumination.wavelengths", wl);
  }
  return t;
}

std::vector<double> start_values(const FitSpec& spec) {
  std::vector<double> x;
  for (const auto& p : spec.parameters) x.push_back(p.start);
  return x;
}

}  // namespace

Scene scene_at(const FitSetup& setup, const std::vector<double>& x, bool measured_wavelengths) {
  return scene_from_table(table_at(setup, x, measured_wavelengths), setup.scene_file, {"fit"});
}

FitSetup prepare_fit(const std::filesystem::path& scene_file, const std::filesystem::path& measured_file,
                     long long photons) {
  FitSetup s;
  s.scene_file = scene_file;
  s.root = read_scene_table(scene_file);
  if (s.root.contains("sweep"))
    throw FitError(fmt::format("{}: a fit scene has no [sweep] table; allowed: [fit] with [fit.parameters]",
                               scene_file.string()));
  s.spec = read_fit_spec(s.root, scene_file);
  if (photons > 0) {
    if (!s.root["run"].as_table()) s.root.insert_or_assign("run", toml::table{});
    s.root["run"].as_table()->insert_or_assign("photons", std::int64_t(photons));
  }
  // The scene as written (its own wavelengths) must be valid at the start.
  const std::vector<double> x0 = start_values(s.spec);
  const Scene written = scene_at(s, x0, false);
  const MeasuredCurve all = read_measured_curve(measured_file);
  const double lo = std::max(s.spec.from_nm, 0.0), hi = s.spec.to_nm;
  MeasuredCurve& m = s.measured;
  m.file = all.file;
  for (std::size_t i = 0; i < all.wavelength_nm.size(); ++i) {
    const double wl = all.wavelength_nm[i];
    if (wl < lo || wl > hi) continue;
    m.wavelength_nm.push_back(wl);
    m.reflectance.push_back(all.reflectance[i]);
    if (!all.uncertainty.empty()) m.uncertainty.push_back(all.uncertainty[i]);
    if (!all.transmittance.empty()) m.transmittance.push_back(all.transmittance[i]);
    m.line.push_back(all.line[i]);
  }
  const auto range_text = [](double a, double b) {
    return fmt::format("{} to {} nm", format_number(a), std::isfinite(b) ? format_number(b) : std::string("any"));
  };
  if (m.wavelength_nm.empty())
    throw FitError(fmt::format("{}: the measured curve ({}, {} points) has no wavelength in the fit range {} "
                               "({}: fit.from, fit.to); allowed: ranges that overlap",
                               measured_file.string(), range_text(all.wavelength_nm.front(), all.wavelength_nm.back()),
                               all.wavelength_nm.size(), range_text(lo, hi), s.spec.where));
  const std::size_t residuals = m.wavelength_nm.size() * (m.transmittance.empty() ? 1 : 2);
  if (residuals <= s.spec.parameters.size())
    throw FitError(fmt::format("{}: {} measured points in the fit range {} for {} free parameters; allowed: more "
                               "points than parameters",
                               measured_file.string(), m.wavelength_nm.size(), range_text(lo, hi),
                               s.spec.parameters.size()));
  // The scene at the start and at each bound (others at start), at the
  // measured wavelengths: every key, value and material range checked now.
  s.start_scene = scene_at(s, x0, true);
  for (std::size_t j = 0; j < x0.size(); ++j)
    for (double b : {s.spec.parameters[j].lower, s.spec.parameters[j].upper}) {
      std::vector<double> x = x0;
      x[j] = b;
      try {
        const Scene at_bound = scene_at(s, x, true);
        if (bool(planar_solver_problem(at_bound)) != bool(planar_solver_problem(s.start_scene)))
          throw FitError("the scene changes between the planar solver and the ray tracer inside the bounds");
      } catch (const std::exception& e) {
        throw FitError(fmt::format("{}: key 'fit.parameters.\"{}\"': the scene at {} = {}: {}",
                                   s.spec.parameters[j].where, s.spec.parameters[j].key, s.spec.parameters[j].key,
                                   parameter_value_toml(s.spec.parameters[j], b), e.what()));
      }
    }
  s.exact = !planar_solver_problem(s.start_scene);
  (void)written;
  return s;
}

namespace {

struct Objective : Eigen::DenseFunctor<double> {
  const FitSetup& setup;
  const FitProgress& progress;
  std::vector<double> weight;  // per reflectance point
  std::size_t n;               // measured points
  int evaluations = 0;
  std::map<std::vector<double>, Eigen::VectorXd> cache;
  ModelCurve last_curve;

  Objective(const FitSetup& s, const FitProgress& p, int inputs, int values)
      : DenseFunctor<double>(inputs, values), setup(s), progress(p), n(s.measured.wavelength_nm.size()) {}

  const FitParameter& par(int j) const { return setup.spec.parameters[std::size_t(j)]; }

  std::vector<double> physical(const InputType& u) const {
    std::vector<double> x(std::size_t(u.size()));
    for (int j = 0; j < u.size(); ++j)
      x[std::size_t(j)] = par(j).lower + (par(j).upper - par(j).lower) * 0.5 * (1 + std::sin(u[j]));
    return x;
  }

  Eigen::VectorXd residuals(const std::vector<double>& x) {
    if (auto it = cache.find(x); it != cache.end()) return it->second;
    last_curve = model_curve(scene_at(setup, x, true), setup.spec.compare);
    ++evaluations;
    Eigen::VectorXd r(values());
    const auto& m = setup.measured;
    for (std::size_t i = 0; i < n; ++i) {
      r[Eigen::Index(i)] = (last_curve.reflectance[i] - m.reflectance[i]) / weight[i];
      if (!m.transmittance.empty())
        r[Eigen::Index(n + i)] = (last_curve.transmittance[i] - m.transmittance[i]) / weight[i];
    }
    if (progress) progress(evaluations, r.squaredNorm());
    cache.emplace(x, r);
    return r;
  }

  double step(int j) const { return (setup.exact ? 1e-6 : 1e-2) * (par(j).upper - par(j).lower); }

  /// (r(x + h e_j) - r(x)) / h, h negated when x + h passes the upper bound.
  Eigen::VectorXd difference(const std::vector<double>& x, const Eigen::VectorXd& r0, int j, double h) {
    std::vector<double> xh = x;
    if (xh[std::size_t(j)] + h > par(j).upper) h = -h;
    xh[std::size_t(j)] += h;
    return (residuals(xh) - r0) / h;
  }

  /// dr/dx by forward differences. A traced curve is piecewise constant on
  /// the scale where no photon changes its fate (common random numbers), so
  /// a column that comes out exactly zero is tried again with a 10 times
  /// larger step.
  Eigen::MatrixXd jacobian_x(const std::vector<double>& x) {
    const Eigen::VectorXd r0 = residuals(x);
    Eigen::MatrixXd J(values(), inputs());
    for (int j = 0; j < inputs(); ++j) {
      J.col(j) = difference(x, r0, j, step(j));
      if (!setup.exact && J.col(j).isZero(0.0)) J.col(j) = difference(x, r0, j, 10 * step(j));
    }
    return J;
  }

  int operator()(const InputType& u, ValueType& f) {
    f = residuals(physical(u));
    return 0;
  }
  int df(const InputType& u, JacobianType& J) {
    J = jacobian_x(physical(u));
    for (int j = 0; j < u.size(); ++j) J.col(j) *= (par(j).upper - par(j).lower) * 0.5 * std::cos(u[j]);
    return 0;
  }
};

std::string stop_text(Eigen::LevenbergMarquardtSpace::Status s) {
  using namespace Eigen::LevenbergMarquardtSpace;
  switch (s) {
    case RelativeReductionTooSmall: return "converged: relative reduction of chi2 below tolerance";
    case RelativeErrorTooSmall: return "converged: relative change of the parameters below tolerance";
    case RelativeErrorAndReductionTooSmall: return "converged: parameters and chi2 both settled";
    case CosinusTooSmall: return "converged: residuals orthogonal to the Jacobian";
    case TooManyFunctionEvaluation: return "stopped: evaluation limit reached (not converged)";
    case FtolTooSmall: case XtolTooSmall: case GtolTooSmall: return "stopped: tolerance at machine precision";
    default: return "stopped";
  }
}

}  // namespace

FitResult fit_model(const FitSetup& setup, const FitProgress& progress) {
  const std::size_t p = setup.spec.parameters.size();
  const std::size_t n = setup.measured.wavelength_nm.size();
  const bool with_t = !setup.measured.transmittance.empty();
  const std::size_t m = n * (with_t ? 2 : 1);
  const bool weighted = !setup.measured.uncertainty.empty();
  Objective obj(setup, progress, int(p), int(m));

  std::vector<double> x0;
  for (const auto& par : setup.spec.parameters) {
    const double nudge = 1e-6 * (par.upper - par.lower);
    x0.push_back(std::clamp(par.start, par.lower + nudge, par.upper - nudge));
  }
  // Weights at the start: the start curve's Monte Carlo errors.
  const ModelCurve start = model_curve(setup.start_scene, setup.spec.compare);
  ++obj.evaluations;
  obj.weight.assign(n, 1.0);
  if (weighted)
    for (std::size_t i = 0; i < n; ++i)
      obj.weight[i] = std::hypot(setup.measured.uncertainty[i], start.reflectance_sigma[i]);

  // Flat directions: a parameter whose step does not change the curve.
  const Eigen::MatrixXd J0 = obj.jacobian_x(x0);
  for (std::size_t j = 0; j < p; ++j) {
    const auto& par = setup.spec.parameters[j];
    bool flat = J0.col(Eigen::Index(j)).cwiseAbs().maxCoeff() * std::abs(obj.step(int(j))) <= 1e-12;
    if (flat && !setup.exact) {  // a traced curve: also compare with the farther bound
      const double far = x0[j] - par.lower > par.upper - x0[j] ? par.lower : par.upper;
      flat = obj.difference(x0, obj.residuals(x0), int(j), far - x0[j]).isZero(0.0);
    }
    if (flat)
      throw FitError(fmt::format(
          "{}: key 'fit.parameters.\"{}\"': the model curve does not change when {} moves from {} by {}{}{} (a flat "
          "direction: the measured curve cannot fix it); allowed: parameters the compared curve depends on",
          par.where, par.key, par.key, parameter_value_toml(par, x0[j]), format_number(obj.step(int(j))),
          par.unit.empty() ? "" : " ", par.unit, setup.exact ? "" : " or to its farther bound"));
  }

  Eigen::VectorXd u(static_cast<Eigen::Index>(p));
  for (std::size_t j = 0; j < p; ++j) {
    const auto& par = setup.spec.parameters[j];
    u[Eigen::Index(j)] = std::asin(std::clamp(2 * (x0[j] - par.lower) / (par.upper - par.lower) - 1, -1.0, 1.0));
  }
  Eigen::LevenbergMarquardt<Objective> lm(obj);
  lm.setMaxfev(Eigen::Index(40));
  lm.setXtol(1e-5);
  lm.setFtol(1e-7);
  const auto status = lm.minimize(u);

  FitResult res;
  res.weighted = weighted;
  res.iterations = int(lm.iterations());
  res.stop_reason = stop_text(status);
  res.best = obj.physical(u);
  // Weights and Jacobian at the best fit.
  ModelCurve best = model_curve(scene_at(setup, res.best, true), setup.spec.compare);
  ++obj.evaluations;
  if (weighted) {
    for (std::size_t i = 0; i < n; ++i) obj.weight[i] = std::hypot(setup.measured.uncertainty[i], best.reflectance_sigma[i]);
    obj.cache.clear();
  }
  const Eigen::VectorXd r = obj.residuals(res.best);
  const Eigen::MatrixXd J = obj.jacobian_x(res.best);
  res.points = m;
  res.dof = m - p;
  res.chi2 = r.squaredNorm();
  Eigen::MatrixXd C = (J.transpose() * J).ldlt().solve(Eigen::MatrixXd::Identity(Eigen::Index(p), Eigen::Index(p)));
  if (!weighted) C *= res.chi2 / double(res.dof);
  res.standard_error.resize(p);
  res.correlation = Eigen::MatrixXd(Eigen::Index(p), Eigen::Index(p));
  for (std::size_t j = 0; j < p; ++j) res.standard_error[j] = std::sqrt(std::max(C(Eigen::Index(j), Eigen::Index(j)), 0.0));
  for (Eigen::Index a = 0; a < Eigen::Index(p); ++a)
    for (Eigen::Index b = 0; b < Eigen::Index(p); ++b)
      res.correlation(a, b) = C(a, b) / std::sqrt(C(a, a) * C(b, b));
  res.fitted = best;
  res.weight = obj.weight;
  res.evaluations = obj.evaluations;
  return res;
}

}  // namespace lumtrap
