// Glossary: see include/tidewright/planning/amplification.hpp.
#include "tidewright/planning/amplification.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "tidewright/common/error.hpp"

namespace tidewright::planning {
namespace {

double reciprocal_period(double rate) {
  return rate > 0.0 ? 1.0 / rate : std::numeric_limits<double>::infinity();
}

}  // namespace

Amplification amplification(const extremes::StillWaterModel& present, const YearConditions& conditions,
                            double level_m, const AmplificationOptions& options) {
  if (!std::isfinite(level_m)) throw InputError("level", "is not a finite number", "give a level in metres");
  Amplification a;
  a.year = conditions.year;
  a.level_m = level_m;
  a.present_rate_per_yr = present.annual_exceedance_rate(level_m);
  a.future_rate_per_yr = future_exceedance_rate(present, conditions, level_m);
  a.present_return_period_yr = reciprocal_period(a.present_rate_per_yr);
  a.future_return_period_yr = reciprocal_period(a.future_rate_per_yr);
  a.present_rate_is_zero = !(a.present_rate_per_yr > 0.0);
  a.present_aep = annual_exceedance_probability(a.present_rate_per_yr);
  a.beyond_range_fraction = beyond_range_share(present, conditions, level_m);
  const RiseDistribution& rise = conditions.rise;
  const bool annual_maxima = present.family != extremes::Family::gpd;
  if (conditions.storminess.active() || options.future_aep) {
    // Member by member: under a storminess change N_0 is not monotone in the rise.
    std::vector<double> rates(rise.size());
    node_rates(present, conditions, level_m, rates);
    double bound = 0.0;
    double aep = 0.0;
    bool any_above_one = false;
    for (std::size_t i = 0; i < rates.size(); ++i) {
      any_above_one = any_above_one || rates[i] > 1.0;
      bound += rise.weight[i] * std::min(rates[i], 1.0);
      aep += rise.weight[i] * -std::expm1(-rates[i]);
    }
    a.future_aep = options.future_aep ? aep : std::numeric_limits<double>::quiet_NaN();
    a.beyond_annual_maxima_range = annual_maxima && any_above_one;
    a.rate_lower_bound_per_yr = a.beyond_annual_maxima_range ? bound : a.future_rate_per_yr;
  } else {
    // N_0 falls with z, so the member with the largest rise has the largest rate; for annual
    // maxima N_0(mu) = 1, so a member's rate exceeds 1 exactly when z - delta_i < mu.
    a.future_aep = std::numeric_limits<double>::quiet_NaN();
    a.beyond_annual_maxima_range = annual_maxima && present.annual_exceedance_rate(level_m - rise.max_m()) > 1.0;
    a.rate_lower_bound_per_yr = a.future_rate_per_yr;
    if (a.beyond_annual_maxima_range) {
      std::vector<double> below;
      std::vector<double> below_weight;
      double above_one_weight = 0.0;
      for (std::size_t i = 0; i < rise.size(); ++i) {
        if (level_m - rise.rise_m[i] < present.location_m) {
          above_one_weight += rise.weight[i];
        } else {
          below.push_back(rise.rise_m[i]);
          below_weight.push_back(rise.weight[i]);
        }
      }
      a.rate_lower_bound_per_yr =
          above_one_weight + (below.empty() ? 0.0 : present.weighted_shifted_rates(level_m, below, below_weight, false).rate);
    }
  }
  if (a.beyond_range_fraction == 0.0 && !a.present_rate_is_zero) {
    a.monte_carlo = scaled(rate_mean_error_of_rate(present, conditions, level_m), 1.0 / a.present_rate_per_yr);
  }
  // AF = N_t(z) / N_0(z) (IPCC AR5 WG1 ch. 13; Buchanan et al. 2017).
  a.amplification_factor = a.present_rate_is_zero
                               ? (a.future_rate_per_yr > 0.0 ? std::numeric_limits<double>::infinity()
                                                             : std::numeric_limits<double>::quiet_NaN())
                               : a.future_rate_per_yr / a.present_rate_per_yr;
  return a;
}

double Amplification::quotable_factor() const {
  if (present_rate_is_zero) return std::numeric_limits<double>::quiet_NaN();
  return beyond_annual_maxima_range ? rate_lower_bound_per_yr / present_rate_per_yr : amplification_factor;
}

Amplification amplification_of_return_level(const extremes::StillWaterModel& present,
                                            const YearConditions& conditions, double return_period_yr,
                                            const AmplificationOptions& options) {
  Amplification a = amplification(present, conditions, present_return_level(present, return_period_yr), options);
  a.present_return_period_yr = return_period_yr;  // exact by construction, not 1/(1/T) in floating point
  return a;
}

Emergence emergence_year(const extremes::StillWaterModel& present, std::span<const YearConditions> years,
                         double level_m, double frequency_per_yr) {
  if (!(frequency_per_yr > 0.0) || !std::isfinite(frequency_per_yr)) {
    throw InputError("emergence frequency " + std::to_string(frequency_per_yr), "must be a positive number per year",
                     "give a frequency such as 1 (once a year)");
  }
  if (years.empty()) throw InputError("emergence", "no years given", "give the years to search");
  Emergence e;
  e.level_m = level_m;
  e.frequency_per_yr = frequency_per_yr;
  int previous = std::numeric_limits<int>::min();
  for (const auto& c : years) {
    if (c.year <= previous) {
      throw InputError("emergence", "years are not strictly ascending at " + std::to_string(c.year),
                       "list the years in order");
    }
    previous = c.year;
    e.rate_in_year_per_yr = future_exceedance_rate(present, c, level_m);
    if (e.rate_in_year_per_yr >= frequency_per_yr) {
      e.year = c.year;
      break;
    }
  }
  return e;
}

}  // namespace tidewright::planning
