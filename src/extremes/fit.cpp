// Maximum-likelihood fits. Glossary and method: include/tidewright/extremes/fit.hpp.
#include "tidewright/extremes/fit.hpp"

#include <algorithm>
#include <cmath>
#include <functional>
#include <string>

#include "tidewright/common/error.hpp"
#include "tidewright/extremes/distributions.hpp"
#include "tidewright/extremes/l_moments.hpp"
#include "tidewright/extremes/newton_maximiser.hpp"

namespace tidewright::extremes {
namespace {

void check_values(std::string_view function, std::span<const double> values, std::size_t minimum,
                  std::string_view what) {
  if (values.size() < minimum) {
    throw InputError(std::string(function),
                     std::to_string(values.size()) + " " + std::string(what) + " given",
                     "give at least " + std::to_string(minimum));
  }
  for (std::size_t i = 0; i < values.size(); ++i) {
    if (!std::isfinite(values[i])) {
      throw InputError(std::string(function),
                       std::string(what) + " number " + std::to_string(i + 1) + " is not finite",
                       "remove missing values before fitting");
    }
  }
  const auto [lo, hi] = std::minmax_element(values.begin(), values.end());
  if (*lo == *hi) {
    throw InputError(std::string(function), "all " + std::string(what) + " are equal",
                     "give a record whose values vary");
  }
}

ParamVector vec(std::initializer_list<double> v) {
  ParamVector p(static_cast<Eigen::Index>(v.size()));
  Eigen::Index i = 0;
  for (double x : v) p(i++) = x;
  return p;
}

// xi <= -1: the GEV/GPD likelihood is unbounded as the end point approaches the largest value
// (Coles 2001, sec. 3.3.2); the search stays above.
constexpr double min_shape = -1.0;

void finish(FitResult& f, const MaximiserResult& m, const std::string& what) {
  f.estimate = m.estimate;
  f.log_likelihood = m.at_estimate.value;
  f.iterations = m.iterations;
  const ParamMatrix info = -m.at_estimate.hessian;
  Eigen::LLT<ParamMatrix> llt(info);
  if (llt.info() != Eigen::Success) {
    throw ComputationError(what,
                           "the observed information matrix at the maximum is not positive "
                           "definite",
                           "the fit is not trustworthy; try a simpler model");
  }
  f.covariance = llt.solve(ParamMatrix::Identity(info.rows(), info.cols()));
  f.standard_error = f.covariance.diagonal().cwiseSqrt();
}

Objective objective_for(const FitResult& f) {
  switch (f.family) {
    case Family::gumbel:
      return [&f](const ParamVector& p) { return gumbel_log_likelihood(f.data, p(0), p(1)); };
    case Family::gev:
      if (f.r_largest) {
        return [&f](const ParamVector& p) {
          if (p(2) <= min_shape) return gev_r_largest_log_likelihood({}, 0.0, -1.0, 0.0);
          return gev_r_largest_log_likelihood(f.data_r_largest, p(0), p(1), p(2));
        };
      }
      return [&f](const ParamVector& p) {
        if (p(2) <= min_shape) return gev_log_likelihood({}, 0.0, -1.0, 0.0);
        return gev_log_likelihood(f.data, p(0), p(1), p(2));
      };
    case Family::gpd:
      return [&f](const ParamVector& p) {
        if (p(1) <= min_shape) return gpd_log_likelihood({}, 0.0, -1.0, 0.0);
        return gpd_log_likelihood(f.data, f.threshold_m, p(0), p(1));
      };
  }
  throw ComputationError("fit", "unknown model family", "");
}

ParamVector gev_start(std::span<const double> maxima, const FitOptions& options,
                      const Objective& obj) {
  if (options.start) return *options.start;
  const StartValues s = gev_l_moment_estimates(maxima);
  ParamVector p = vec({s.location, s.scale, s.shape});
  if (obj(p).inside()) return p;
  // A Gumbel start has unbounded support, so it is always feasible.
  const StartValues g = gumbel_l_moment_estimates(maxima);
  return vec({g.location, g.scale, 0.0});
}

}  // namespace

double FitResult::parameter(const std::string& name) const {
  for (std::size_t i = 0; i < parameter_names.size(); ++i) {
    if (parameter_names[i] == name) return estimate(static_cast<Eigen::Index>(i));
  }
  throw InputError(
      "FitResult",
      "no parameter named " + name + " in a " + std::string(family_name(family)) + " fit",
      "use one of the parameter_names");
}
double FitResult::location() const { return family == Family::gpd ? threshold_m : estimate(0); }
double FitResult::scale() const { return family == Family::gpd ? estimate(0) : estimate(1); }
double FitResult::shape() const {
  switch (family) {
    case Family::gumbel:
      return 0.0;
    case Family::gev:
      return estimate(2);
    case Family::gpd:
      return estimate(1);
  }
  return 0.0;
}
std::size_t FitResult::parameter_count() const { return family == Family::gumbel ? 2 : 3; }

StillWaterModel FitResult::model() const {
  StillWaterModel m;
  m.family = family;
  m.scale_m = scale();
  m.shape = shape();
  if (family == Family::gpd) {
    m.location_m = 0.0;
    m.threshold_m = threshold_m;
    m.rate_per_yr = rate_per_yr;
  } else {
    m.location_m = location();
  }
  return m;
}

LogLikelihood FitResult::log_likelihood_at(const ParamVector& theta) const {
  return objective_for(*this)(theta);
}

FitResult fit_gumbel(std::span<const double> annual_maxima_m, const FitOptions& options) {
  check_values("fit_gumbel", annual_maxima_m, min_values_gumbel, "annual maxima");
  FitResult f;
  f.family = Family::gumbel;
  f.parameter_names = {"location", "scale"};
  f.data.assign(annual_maxima_m.begin(), annual_maxima_m.end());
  f.n = f.data.size();
  const Objective obj = objective_for(f);
  ParamVector start;
  if (options.start) {
    start = *options.start;
  } else {
    const StartValues s = gumbel_l_moment_estimates(f.data);
    start = vec({s.location, s.scale});
  }
  finish(f, maximise_newton(obj, start, "Gumbel fit", options.max_iterations), "Gumbel fit");
  return f;
}

FitResult fit_gev(std::span<const double> annual_maxima_m, const FitOptions& options) {
  check_values("fit_gev", annual_maxima_m, min_values_gev, "annual maxima");
  FitResult f;
  f.family = Family::gev;
  f.parameter_names = {"location", "scale", "shape"};
  f.data.assign(annual_maxima_m.begin(), annual_maxima_m.end());
  f.n = f.data.size();
  const Objective obj = objective_for(f);
  const ParamVector start = gev_start(f.data, options, obj);
  finish(f, maximise_newton(obj, start, "GEV fit", options.max_iterations), "GEV fit");
  return f;
}

FitResult fit_gev_r_largest(const std::vector<std::vector<double>>& largest_per_year_m,
                            std::size_t r, const FitOptions& options) {
  FitResult f;
  f.family = Family::gev;
  f.r_largest = true;
  f.parameter_names = {"location", "scale", "shape"};
  std::vector<double> maxima;
  for (std::size_t i = 0; i < largest_per_year_m.size(); ++i) {
    std::vector<double> year = largest_per_year_m[i];
    if (year.empty()) {
      throw InputError("fit_gev_r_largest",
                       "year number " + std::to_string(i + 1) + " holds no values",
                       "give at least the annual maximum of every year");
    }
    for (double v : year) {
      if (!std::isfinite(v)) {
        throw InputError(
            "fit_gev_r_largest",
            "year number " + std::to_string(i + 1) + " holds a value that is not finite",
            "remove missing values before fitting");
      }
    }
    std::sort(year.begin(), year.end(), std::greater<>());
    if (r > 0 && year.size() > r) year.resize(r);
    maxima.push_back(year.front());
    f.data_r_largest.push_back(std::move(year));
  }
  check_values("fit_gev_r_largest", maxima, min_values_gev, "years");
  f.n = f.data_r_largest.size();
  f.data = maxima;
  const Objective obj = objective_for(f);
  const ParamVector start = gev_start(maxima, options, obj);
  finish(f, maximise_newton(obj, start, "r-largest GEV fit", options.max_iterations),
         "r-largest GEV fit");
  return f;
}

FitResult fit_gpd(std::span<const double> exceedance_levels_m, double threshold_m,
                  double years_of_record, const FitOptions& options) {
  check_finite("fit_gpd", "threshold", threshold_m);
  if (!std::isfinite(years_of_record) || years_of_record <= 0.0) {
    throw InputError("fit_gpd",
                     "years of record = " + std::to_string(years_of_record) + " must be > 0",
                     "give the length of the record in years");
  }
  check_values("fit_gpd", exceedance_levels_m, min_values_gpd, "exceedances");
  FitResult f;
  f.family = Family::gpd;
  f.parameter_names = {"scale", "shape"};
  f.threshold_m = threshold_m;
  f.years_of_record = years_of_record;
  std::vector<double> excess;
  for (double x : exceedance_levels_m) {
    if (x < threshold_m) {
      throw InputError(
          "fit_gpd",
          "level " + std::to_string(x) + " lies below the threshold " + std::to_string(threshold_m),
          "pass only the exceedances of the threshold");
    }
    excess.push_back(x - threshold_m);
  }
  f.data.assign(exceedance_levels_m.begin(), exceedance_levels_m.end());
  f.n = f.data.size();
  const double k = static_cast<double>(f.n);
  f.rate_per_yr = k / years_of_record;                            // Poisson ML estimate
  f.rate_standard_error_per_yr = std::sqrt(k) / years_of_record;  // inverse information
  const Objective obj = objective_for(f);
  ParamVector start;
  if (options.start) {
    start = *options.start;
  } else {
    const StartValues s = gpd_l_moment_estimates(excess);
    start = vec({s.scale, s.shape});
    if (!obj(start).inside()) {
      // The exponential (xi = 0) has unbounded support: always feasible. sigma = mean excess.
      double mean = 0.0;
      for (double e : excess) mean += e / k;
      start = vec({mean, 0.0});
    }
  }
  finish(f, maximise_newton(obj, start, "GPD fit", options.max_iterations), "GPD fit");
  return f;
}

}  // namespace tidewright::extremes
