// Maximum-likelihood fits of the extreme-value models to plain values (no I/O).
//
// Glossary (Coles 2001): mu location, sigma scale, xi shape (xi > 0 heavy tail); u threshold;
// lambda_u Poisson rate of exceedances of u per year; n number of observations (annual maxima,
// years for the r-largest model, exceedances for the GPD).
//
// Every fit starts from L-moment estimates (l_moments.hpp), maximises the log-likelihood with
// the damped Newton method of newton_maximiser.hpp on the analytic Hessian inside the support
// 1 + xi (z - mu)/sigma > 0 (and xi > -1, below which the GEV/GPD likelihood is unbounded;
// Coles 2001, sec. 3.3.2), and takes the covariance as the inverse observed information
// (Coles 2001, sec. 2.6.4). A fit that does not converge, or whose observed information is not
// positive definite, throws ComputationError; too few or non-finite values throw InputError.
#pragma once

#include <cstddef>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "tidewright/extremes/likelihood.hpp"
#include "tidewright/extremes/still_water_model.hpp"

namespace tidewright::extremes {

// Smallest samples accepted: project floor (a 3-parameter fit on fewer values is meaningless;
// common practice asks for 20 or more years of maxima).
inline constexpr std::size_t min_values_gumbel = 3;
inline constexpr std::size_t min_values_gev = 5;
inline constexpr std::size_t min_values_gpd = 5;

struct FitResult {
  Family family = Family::gev;
  bool r_largest = false;                    // GEV fitted by the r-largest likelihood
  std::vector<std::string> parameter_names;  // "location", "scale", "shape" (GPD: "scale", "shape")
  ParamVector estimate;
  ParamMatrix covariance;  // inverse observed information
  ParamVector standard_error;
  double log_likelihood = 0.0;
  std::size_t n = 0;
  int iterations = 0;
  // GPD only: threshold u, years of record, lambda_u = k / years and its standard error
  // sqrt(k)/years (Poisson counts: the ML estimate and its inverse information; the binomial
  // form zeta(1 - zeta)/n of Coles 2001, sec. 4.4.1 for a per-observation rate).
  double threshold_m = 0.0;
  double years_of_record = 0.0;
  double rate_per_yr = 1.0;
  double rate_standard_error_per_yr = 0.0;
  // The data the fit used (for the profile likelihood, bootstrap and diagnostics).
  std::vector<double> data;                         // maxima, or GPD exceedance levels
  std::vector<std::vector<double>> data_r_largest;  // r-largest only

  [[nodiscard]] double parameter(const std::string& name) const;
  [[nodiscard]] double location() const;  // GPD: the threshold
  [[nodiscard]] double scale() const;
  [[nodiscard]] double shape() const;  // 0 for Gumbel
  // Number of free parameters (the GPD counts its rate: 3).
  [[nodiscard]] std::size_t parameter_count() const;
  // N_0(z) as the planning stage sees it.
  [[nodiscard]] StillWaterModel model() const;
  // The model's log-likelihood at other parameters (same order as estimate), on the same data.
  [[nodiscard]] LogLikelihood log_likelihood_at(const ParamVector& theta) const;
};

struct FitOptions {
  int max_iterations = 200;          // generous; Port Pirie takes about 5 (measured)
  std::optional<ParamVector> start;  // instead of the L-moment estimates
};

[[nodiscard]] FitResult fit_gumbel(std::span<const double> annual_maxima_m,
                                   const FitOptions& options = {});
[[nodiscard]] FitResult fit_gev(std::span<const double> annual_maxima_m,
                                const FitOptions& options = {});
// largest_per_year_m[i]: the r_i largest values of year i (any order); r > 0 keeps only the r
// largest of each year (Coles 2001, sec. 3.5.3).
[[nodiscard]] FitResult fit_gev_r_largest(
    const std::vector<std::vector<double>>& largest_per_year_m, std::size_t r = 0,
    const FitOptions& options = {});
// exceedance_levels_m: declustered peaks above threshold_m (levels, not excesses);
// years_of_record > 0 gives the rate lambda_u = k / years.
[[nodiscard]] FitResult fit_gpd(std::span<const double> exceedance_levels_m, double threshold_m,
                                double years_of_record, const FitOptions& options = {});

}  // namespace tidewright::extremes
