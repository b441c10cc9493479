// Annual maxima taken from a water-level series: one maximum per year that is complete enough,
// optionally relative to the mean sea level of a reference epoch.
#pragma once

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
};

// Years below the completeness are dropped and listed with their completeness. InputError
// when no year is complete enough (the message names the most complete one).
[[nodiscard]] AnnualMaxima annual_maxima_from_series(const WaterLevelSeries& series,
                                                     const AnnualMaximaOptions& options = {});

}  // namespace tidewright::record
