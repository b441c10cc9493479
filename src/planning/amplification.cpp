// Glossary: see include/tidewright/planning/amplification.hpp.
#include "tidewright/planning/amplification.hpp"

#include <cmath>
#include <limits>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::planning {
namespace {

double reciprocal_period(double rate) {
  return rate > 0.0 ? 1.0 / rate : std::numeric_limits<double>::infinity();
}

}  // namespace

Amplification amplification(const extremes::StillWaterModel& present, const YearConditions& conditions,
                            double level_m) {
  if (!std::isfinite(level_m)) throw InputError("level", "is not a finite number", "give a level in metres");
  Amplification a;
  a.year = conditions.year;
  a.level_m = level_m;
  a.present_rate_per_yr = present.annual_exceedance_rate(level_m);
  a.future_rate_per_yr = future_exceedance_rate(present, conditions, level_m);
  a.present_return_period_yr = reciprocal_period(a.present_rate_per_yr);
  a.future_return_period_yr = reciprocal_period(a.future_rate_per_yr);
  a.present_rate_is_zero = !(a.present_rate_per_yr > 0.0);
  // AF = N_t(z) / N_0(z) (IPCC AR5 WG1 ch. 13; Buchanan et al. 2017).
  a.amplification_factor = a.present_rate_is_zero
                               ? (a.future_rate_per_yr > 0.0 ? std::numeric_limits<double>::infinity()
                                                             : std::numeric_limits<double>::quiet_NaN())
                               : a.future_rate_per_yr / a.present_rate_per_yr;
  return a;
}

Amplification amplification_of_return_level(const extremes::StillWaterModel& present,
                                            const YearConditions& conditions, double return_period_yr) {
  Amplification a = amplification(present, conditions, present_return_level(present, return_period_yr));
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
