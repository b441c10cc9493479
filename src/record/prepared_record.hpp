// Internal to the record module: the steps that annual maxima and peaks over threshold share
// (years and their completeness, dropped years, trend removal) and the text of summaries.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "tidewright/record/annual_maxima.hpp"
#include "tidewright/record/mean_sea_level_trend.hpp"
#include "tidewright/record/record_years.hpp"
#include "tidewright/record/water_level_series.hpp"

namespace tidewright::record::detail {

[[nodiscard]] std::string format_number(double value, const char* printf_format);
[[nodiscard]] std::string percent(double fraction);  // "75.0%"
// "2002 (72.6% complete, below 75.0%); no value in the file: 1925, 1927"
[[nodiscard]] std::string dropped_list(const std::vector<DroppedYear>& dropped);
// "  years kept when at least 75.0% complete (expected samples from the 60-min median spacing)"
[[nodiscard]] std::string completeness_line(double min_completeness, double sampling_interval_s);
// The summary lines for dropped years and a removed trend (empty when there is none).
[[nodiscard]] std::string dropped_and_trend_lines(const std::vector<DroppedYear>& dropped,
                                                  const std::optional<Detrend>& detrend);

struct PreparedRecord {
  RecordYears years;
  DetrendedLevels levels;
  std::vector<DroppedYear> dropped;
  std::optional<Detrend> detrend;  // set unless the method is none
};

// InputError when no year reaches the completeness (naming the most complete year).
[[nodiscard]] PreparedRecord prepare_record(const WaterLevelSeries& series, int start_month,
                                            double min_completeness, DetrendMethod method,
                                            std::optional<double> epoch_yr);

// The provenance of values taken from a prepared series.
[[nodiscard]] RecordProvenance provenance(const WaterLevelSeries& series, int start_month, double min_completeness,
                                          const PreparedRecord& prepared);

}  // namespace tidewright::record::detail
