// Return levels of a fitted model with confidence intervals: delta method, profile likelihood
// and parametric bootstrap.
//
// Glossary (Coles 2001): T return period (years), one meaning for every family and command:
// the level exceeded on average once in T years, N_0(z_T) = 1/T, with annual exceedance
// probability AEP = 1 - exp(-1/T) (Poisson occurrence); z_T return level.
// Annual maxima (Gumbel, GEV, r-largest GEV): N_0 = -log F, so F(z_T) = exp(-1/T), y_p = 1/T and
// z_T = mu + sigma [y_p^(-xi) - 1]/xi (Coles 2001, eq. 3.10, whose F = 1 - 1/T is the same level
// for T' = -1/log(1 - 1/T), e.g. 99.50 years for Coles' 100). GPD with rate lambda_u per year:
// the level exceeded on average once in T years, lambda_u [1 + xi (z_T - u)/sigma]^(-1/xi) = 1/T,
// so z_T = u + sigma [(lambda_u T)^xi - 1]/xi (Coles 2001, eq. 4.13 with m = lambda_u T).
#pragma once

#include <cstdint>
#include <span>
#include <vector>

#include "tidewright/extremes/fit.hpp"

namespace tidewright::extremes {

// The project's standard list (common practice in coastal design tables).
inline const std::vector<double> standard_return_periods_yr = {2,   5,   10,  20,  50,
                                                               100, 200, 500, 1000};

// The meaning of "T-year level" stated in every output that lists return periods.
inline constexpr const char* return_period_definition =
    "T-year level: exceeded on average once in T years (annual rate 1/T), "
    "annual exceedance probability 1 - exp(-1/T)";

// The annual exceedance probability of the T-year level, 1 - exp(-1/T) (Poisson occurrence of
// a rate 1/T; Coles 2001, sec. 4.4), by expm1 so that long periods keep their digits.
[[nodiscard]] double annual_exceedance_probability_of_period(double return_period_yr);

enum class IntervalMethod { delta, profile, bootstrap };
[[nodiscard]] const char* interval_method_name(IntervalMethod method);

struct ReturnLevel {
  double return_period_yr = 0.0;
  double level_m = 0.0;
  double lower_m = 0.0;  // -inf / +inf when the profile deviance never reaches the critical
  double upper_m = 0.0;  // value on that side (the data do not bound the level)
  IntervalMethod method = IntervalMethod::delta;
  double standard_error_m = 0.0;  // delta method (bootstrap: standard deviation of the draws)
};

// z_T of the fit (throws InputError for T <= 1, or for a GPD when lambda_u T <= 1, i.e. a
// level below the threshold).
[[nodiscard]] double return_level(const FitResult& fit, double return_period_yr);

// Delta method: var z_T = grad' V grad (Coles 2001, sec. 3.3.3 and 4.4.1); interval
// z_T +- z_(1+c)/2 se.
[[nodiscard]] std::vector<ReturnLevel> return_levels_delta(const FitResult& fit,
                                                           std::span<const double> periods_yr,
                                                           double confidence = 0.95);

// Profile likelihood (Coles 2001, sec. 3.3.3, 4.4.2): the likelihood reparametrised in z_T
// and maximised over the other parameters; the interval is where the deviance
// 2 (l_max - l_p(z_T)) is below the chi-square_1 quantile (3.841 for 95%). Ends found with
// Boost.Math's TOMS 748 root finder.
[[nodiscard]] std::vector<ReturnLevel> return_levels_profile(const FitResult& fit,
                                                             std::span<const double> periods_yr,
                                                             double confidence = 0.95);

// The profile log-likelihood of z_T (maximised over the other parameters).
[[nodiscard]] double profile_log_likelihood(const FitResult& fit, double return_period_yr,
                                            double level_m);

struct BootstrapOptions {
  std::size_t samples = 1000;
  // The project's default seed (DEVELOPERS.md, --seed default).
  std::uint64_t seed = 20261201;
  double confidence = 0.95;
};

struct BootstrapResult {
  std::vector<ReturnLevel> levels;  // percentile intervals
  std::size_t samples_used = 0;
  std::size_t failed_fits = 0;  // refits that threw ComputationError (left out)
};

// Parametric bootstrap: samples of the fitted size drawn from the fitted model by inversion of
// the cdf with std::mt19937_64(seed) (uniforms u = (bits >> 11 + 0.5) 2^-53, so the draws do
// not depend on the standard library's distributions; the GPD's exceedance count is drawn with
// std::poisson_distribution, whose algorithm is the library's), refitted, and the percentile
// interval of each z_T taken (type-7 quantiles, Hyndman & Fan 1996). Gumbel, GEV and GPD;
// an r-largest fit throws InputError. Throws ComputationError when more than 10% of the
// refits fail.
[[nodiscard]] BootstrapResult return_levels_bootstrap(const FitResult& fit,
                                                      std::span<const double> periods_yr,
                                                      const BootstrapOptions& options = {});

}  // namespace tidewright::extremes
