// Glossary: see include/tidewright/planning/allowance.hpp.
#include "tidewright/planning/allowance.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

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

// What the solve needs of the years besides N_t: pooled mean and sd of Delta, its range and
// whether storminess changes; one pass per year, shared by every level solved for.
struct PooledRise {
  int first_year = 0;
  int last_year = 0;
  double mean_m = 0.0;
  double sd_m = 0.0;
  double lo_m = 0.0;
  double hi_m = 0.0;
  bool storm = false;
};

PooledRise pool(std::span<const YearConditions> years) {
  if (years.empty()) {
    throw InputError("allowance", "no years given", "give at least one year");
  }
  PooledRise p;
  p.first_year = years.front().year;
  p.last_year = years.back().year;
  // Pooled mean and sd of Delta over the years (each year weighted equally).
  double mean = 0.0;
  double second = 0.0;
  double lo = std::numeric_limits<double>::infinity();
  double hi = -lo;
  for (const auto& c : years) {
    const double year_mean = c.rise.mean_m();
    mean += year_mean;
    const double sd = c.rise.sd_m();
    second += sd * sd + year_mean * year_mean;
    lo = std::min(lo, c.rise.min_m());
    hi = std::max(hi, c.rise.max_m());
    p.storm = p.storm || c.storminess.active();
  }
  const auto n = static_cast<double>(years.size());
  mean /= n;
  p.mean_m = mean;
  p.sd_m = std::sqrt(std::max(0.0, second / n - mean * mean));
  p.lo_m = lo;
  p.hi_m = hi;
  return p;
}

// Halley steps are accepted once below this fraction of the local scale lambda_z: the error
// after such a step is about (1e-5)^3 lambda_z, far below the 1e-9 m tolerance (our choice).
constexpr double settled_fraction = 1e-5;

// True when N_0 is twice continuously differentiable wherever the nodes can take it, so that
// Halley's error estimate holds: not on the piecewise curve below a GPD threshold (nor at u),
// nor at an upper end point where N_0 ~ t^(-1/xi) with -1/xi < 3 loses its second derivative.
bool smooth_rate_curve(const extremes::StillWaterModel& m) {
  if (m.family == extremes::Family::gpd && !m.below_threshold.level_m.empty()) return false;
  return m.family == extremes::Family::gumbel || m.shape >= -1.0 / 3.0;
}

// The members' rates at the raised level, summed over the years per member (node i is one
// path through the years), and the slope of their mean, give the allowance's Monte Carlo error.
MonteCarloError allowance_error(const extremes::StillWaterModel& present, std::span<const YearConditions> years,
                                double raised_level_m) {
  const RiseDistribution& first = years.front().rise;
  if (years.size() == 1 && !years.front().storminess.active()) {
    // One year: every figure from batch sums, without a pass member by member.
    return rate_mean_error(present, years.front(), raised_level_m);
  }
  std::vector<double> per_member(first.size(), 0.0);
  std::vector<double> rates(first.size());
  double slope = 0.0;
  for (const auto& c : years) {
    if (c.rise.size() != first.size()) return {};  // not one set of paths: no per-member error
    node_rates(present, c, raised_level_m, rates);
    for (std::size_t i = 0; i < rates.size(); ++i) per_member[i] += rates[i];
    slope += future_exceedance_rate_derivatives(present, c, raised_level_m).first;
  }
  return through_root(weighted_mean_error(per_member, first.weight, first.kind == "members"), slope);
}

Allowance solve_root(const extremes::StillWaterModel& present, std::span<const YearConditions> years,
                const PooledRise& pooled, double level_m, const AllowanceOptions& options) {
  if (!std::isfinite(level_m)) {
    throw InputError("allowance level", "is not a finite number", "give a level in metres");
  }
  Allowance a;
  a.first_year = pooled.first_year;
  a.last_year = pooled.last_year;
  a.present_level_m = level_m;
  a.mean_rise_m = pooled.mean_m;
  a.sd_rise_m = pooled.sd_m;
  const double lo = pooled.lo_m;
  const double hi = pooled.hi_m;
  const bool storm = pooled.storm;
  const auto n = static_cast<double>(years.size());

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
    // First guess: Hunter's form for Gumbel scale and normal Delta, mu + sigma^2/(2 lambda_z)
    // (Hunter 2012), with the model's local scale at z, lambda_z = h / ln(N_0(z)/N_0(z + h))
    // (exact for Gumbel, close otherwise); near the root d/dA ln N_t(z + A) is about -1/lambda_z.
    const double h = 0.01 * present.scale_m;
    const double lambda_z = h / std::log(present_rate / present.annual_exceedance_rate(level_m + h));
    const bool have_scale = std::isfinite(lambda_z) && lambda_z > 0.0;
    const double guess = have_scale ? pooled.mean_m + pooled.sd_m * pooled.sd_m / (2.0 * lambda_z) : 0.5 * (lo + hi);
    // f = ln S - target with S the sum of N_t over the years: f' = S'/S, f'' = S''/S - f'^2.
    const auto fd = [&](double allowance_m) {
      extremes::RateDerivatives s;
      for (const auto& c : years) {
        const extremes::RateDerivatives t = future_exceedance_rate_derivatives(present, c, level_m + allowance_m);
        s.rate += t.rate;
        s.first += t.first;
        s.second += t.second;
      }
      const double slope = s.first / s.rate;
      return ValueAndSlopes{std::log(s.rate) - target, slope, s.second / s.rate - slope * slope};
    };
    const double settled = have_scale && smooth_rate_curve(present) ? settled_fraction * lambda_z : 0.0;
    r = solve_non_increasing_halley(fd, guess, lo, hi, options.tolerance_m, settled, "allowance");
    a.method = "root_halley_toms748";  // Halley steps in the bracket, TOMS748 if they do not settle
  } else {
    r = solve_non_increasing(f, lo, hi, options.tolerance_m, "allowance");
    a.method = "root_toms748";
  }
  a.allowance_m = r.x;
  a.evaluations = r.evaluations;
  return a;
}

Allowance solve(const extremes::StillWaterModel& present, std::span<const YearConditions> years,
                const PooledRise& pooled, double level_m, const AllowanceOptions& options) {
  Allowance a = solve_root(present, years, pooled, level_m, options);
  a.monte_carlo = allowance_error(present, years, level_m + a.allowance_m);
  double beyond = 0.0;
  for (const auto& c : years) beyond += beyond_range_share(present, c, level_m);
  a.beyond_range_fraction = beyond / static_cast<double>(years.size());
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
  const std::span<const YearConditions> one(&conditions, 1);
  Allowance a = solve(present, one, pool(one), present_return_level(present, return_period_yr), options);
  a.return_period_yr = return_period_yr;
  return a;
}

std::vector<Allowance> allowances(const extremes::StillWaterModel& present, const YearConditions& conditions,
                                  std::span<const double> return_periods_yr, const AllowanceOptions& options) {
  const std::span<const YearConditions> one(&conditions, 1);
  const PooledRise pooled = pool(one);
  std::vector<Allowance> out;
  out.reserve(return_periods_yr.size());
  for (const double t : return_periods_yr) {
    out.push_back(solve(present, one, pooled, present_return_level(present, t), options));
    out.back().return_period_yr = t;
  }
  return out;
}

Allowance allowance_at_level(const extremes::StillWaterModel& present, const YearConditions& conditions,
                             double level_m, const AllowanceOptions& options) {
  const std::span<const YearConditions> one(&conditions, 1);
  return solve(present, one, pool(one), level_m, options);
}

Allowance design_life_allowance(const extremes::StillWaterModel& present, std::span<const YearConditions> years,
                                double return_period_yr, const AllowanceOptions& options) {
  Allowance a = solve(present, years, pool(years), present_return_level(present, return_period_yr), options);
  a.return_period_yr = return_period_yr;
  return a;
}

Allowance design_life_allowance_at_level(const extremes::StillWaterModel& present,
                                         std::span<const YearConditions> years, double level_m,
                                         const AllowanceOptions& options) {
  return solve(present, years, pool(years), level_m, options);
}

}  // namespace tidewright::planning
