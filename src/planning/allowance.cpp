// Glossary: see include/tidewright/planning/allowance.hpp.
#include "tidewright/planning/allowance.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "tidewright/common/error.hpp"
#include "tidewright/planning/monotone_root.hpp"

namespace tidewright::planning {
namespace {

// ln sum_t sum_i w_ti exp(delta_ti / lambda), by log-sum-exp so that large Delta/lambda
// does not overflow.
double log_sum_exp_rise(std::span<const YearConditions> years, double scale_m) {
  double top = -std::numeric_limits<double>::infinity();
  for (const auto& c : years) top = std::max(top, c.rise.max_m() / scale_m);
  double sum = 0.0;
  for (const auto& c : years) {
    for (std::size_t i = 0; i < c.rise.size(); ++i) sum += c.rise.weight[i] * std::exp(c.rise.rise_m[i] / scale_m - top);
  }
  return top + std::log(sum);
}

Allowance solve(const extremes::StillWaterModel& present, std::span<const YearConditions> years, double level_m,
                const AllowanceOptions& options) {
  if (years.empty()) {
    throw InputError("allowance", "no years given", "give at least one year");
  }
  if (!std::isfinite(level_m)) {
    throw InputError("allowance level", "is not a finite number", "give a level in metres");
  }
  Allowance a;
  a.first_year = years.front().year;
  a.last_year = years.back().year;
  a.present_level_m = level_m;
  // Pooled mean and sd of Delta over the years (each year weighted equally).
  double mean = 0.0;
  double second = 0.0;
  double lo = std::numeric_limits<double>::infinity();
  double hi = -lo;
  bool storm = false;
  for (const auto& c : years) {
    mean += c.rise.mean_m();
    const double sd = c.rise.sd_m();
    second += sd * sd + c.rise.mean_m() * c.rise.mean_m();
    lo = std::min(lo, c.rise.min_m());
    hi = std::max(hi, c.rise.max_m());
    storm = storm || c.storminess.active();
  }
  const auto n = static_cast<double>(years.size());
  mean /= n;
  a.mean_rise_m = mean;
  a.sd_rise_m = std::sqrt(std::max(0.0, second / n - mean * mean));

  const double present_rate = present.annual_exceedance_rate(level_m);
  if (!(present_rate > 0.0) || !std::isfinite(present_rate)) {
    throw ComputationError("allowance", "today's exceedance rate of level " + std::to_string(level_m) +
                                            " m is " + std::to_string(present_rate) + " per year",
                           "ask for a level inside the range of the fitted distribution");
  }
  if (options.use_closed_form && present.family == extremes::Family::gumbel && !storm) {
    // Hunter (2012): A = lambda ln( (1/n) sum_t E[exp(Delta_t/lambda)] ) for Gumbel scale lambda.
    a.allowance_m = present.scale_m * (log_sum_exp_rise(years, present.scale_m) - std::log(n));
    a.method = "hunter2012_gumbel_closed_form";
    return a;
  }
  const double target = std::log(n * present_rate);
  const auto f = [&](double allowance_m) {
    double sum = 0.0;
    for (const auto& c : years) sum += future_exceedance_rate(present, c, level_m + allowance_m);
    return std::log(sum) - target;  // decreasing in the allowance
  };
  // Without storminess the root lies in [min Delta, max Delta]: N_0 is non-increasing, so
  // raising by the largest rise cannot leave more exceedances than today, nor the smallest fewer.
  MonotoneRoot r;
  if (!storm && hi > lo) {
    // First guess: Hunter's Gumbel form with the model's local scale at z,
    // lambda_z = h / ln(N_0(z)/N_0(z + h)) (exact for Gumbel, close otherwise); near the root
    // d/dA ln N_t(z + A) is about -1/lambda_z.
    const double h = 0.01 * present.scale_m;
    const double lambda_z = h / std::log(present_rate / present.annual_exceedance_rate(level_m + h));
    const bool have_scale = std::isfinite(lambda_z) && lambda_z > 0.0;
    const double guess = have_scale ? lambda_z * (log_sum_exp_rise(years, lambda_z) - std::log(n)) : 0.5 * (lo + hi);
    r = solve_non_increasing_from_guess(f, guess, have_scale ? -1.0 / lambda_z : -1.0 / present.scale_m, lo, hi,
                                        options.tolerance_m, "allowance");
  } else {
    r = solve_non_increasing(f, lo, hi, options.tolerance_m, "allowance");
  }
  a.allowance_m = r.x;
  a.method = "root_toms748";
  a.evaluations = r.evaluations;
  return a;
}

}  // namespace

double hunter_allowance_gumbel_normal(double scale_m, double mean_m, double sd_m) {
  if (!(scale_m > 0.0) || !(sd_m >= 0.0)) {
    throw InputError("Gumbel allowance", "scale " + std::to_string(scale_m) + " m, sd " + std::to_string(sd_m) + " m",
                     "give a positive scale and a non-negative sd");
  }
  // Hunter (2012), Climatic Change 113:239: A = mu + sigma^2 / (2 lambda).
  return mean_m + sd_m * sd_m / (2.0 * scale_m);
}

Allowance allowance(const extremes::StillWaterModel& present, const YearConditions& conditions,
                    double return_period_yr, const AllowanceOptions& options) {
  Allowance a = solve(present, std::span<const YearConditions>(&conditions, 1),
                      present_return_level(present, return_period_yr), options);
  a.return_period_yr = return_period_yr;
  return a;
}

Allowance allowance_at_level(const extremes::StillWaterModel& present, const YearConditions& conditions,
                             double level_m, const AllowanceOptions& options) {
  return solve(present, std::span<const YearConditions>(&conditions, 1), level_m, options);
}

Allowance design_life_allowance(const extremes::StillWaterModel& present, std::span<const YearConditions> years,
                                double return_period_yr, const AllowanceOptions& options) {
  Allowance a = solve(present, years, present_return_level(present, return_period_yr), options);
  a.return_period_yr = return_period_yr;
  return a;
}

Allowance design_life_allowance_at_level(const extremes::StillWaterModel& present,
                                         std::span<const YearConditions> years, double level_m,
                                         const AllowanceOptions& options) {
  return solve(present, years, level_m, options);
}

}  // namespace tidewright::planning
