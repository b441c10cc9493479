// Annual maxima taken from a water-level series: one maximum per year that is complete enough,
// optionally relative to the mean sea level of a reference epoch.
#pragma once

#include <cstddef>
#include <optional>

#include "tidewright/record/annual_maxima.hpp"
#include "tidewright/record/mean_sea_level_trend.hpp"
#include "tidewright/record/record_years.hpp"
#include "tidewright/record/water_level_series.hpp"

namespace tidewright::record {

struct AnnualMaximaOptions {
  double min_completeness = default_min_completeness;  // Slangen et al. (2017)
  int year_start_month = 1;                            // 1: calendar years
  DetrendMethod detrend = DetrendMethod::none;
  std::optional<double> epoch_yr;  // empty: the record's mid-point (record_mid_epoch)
  // r > 1 also fills AnnualMaxima::r_largest_m with the r largest independent events of each
  // year (for the r-largest GEV, Coles 2001 §3.5): the highest level, then the highest at least
  // `separation_h` from every one already taken, and so on (fewer in a year with fewer events).
  std::size_t r_largest = 1;
  double separation_h = 72.0;  // between independent events: common practice
};

// Years below the completeness are dropped and listed with their completeness. InputError
// when no year is complete enough (the message names the most complete one).
[[nodiscard]] AnnualMaxima annual_maxima_from_series(const WaterLevelSeries& series,
                                                     const AnnualMaximaOptions& options = {});

}  // namespace tidewright::record
