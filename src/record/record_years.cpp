// Years of a record and their completeness; glossary in the header.
#include "tidewright/record/record_years.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>

#include "tidewright/common/error.hpp"
#include "tidewright/record/timestamp.hpp"

namespace tidewright::record {
namespace {

int season_year_of(std::int64_t utc_s, int start_month) {
  const std::int64_t days = (utc_s >= 0 ? utc_s : utc_s - 86399) / 86400;  // floor division
  const std::chrono::year_month_day ymd{std::chrono::sys_days(std::chrono::days(days))};
  const int y = static_cast<int>(ymd.year());
  return static_cast<int>(static_cast<unsigned>(ymd.month())) >= start_month ? y : y - 1;
}

}  // namespace

std::size_t RecordYears::kept_count() const {
  return static_cast<std::size_t>(
      std::count_if(years.begin(), years.end(), [](const RecordYear& y) { return y.kept; }));
}

double RecordYears::effective_years() const {
  double total_s = 0.0;
  for (const auto& y : years) {
    if (y.kept) total_s += y.completeness * static_cast<double>(y.end_utc_s - y.start_utc_s);
  }
  return total_s / seconds_per_year;
}

RecordYears partition_record_years(const WaterLevelSeries& series, int start_month,
                                   double min_completeness) {
  if (start_month < 1 || start_month > 12) {
    throw InputError("year start month", std::to_string(start_month) + " is not a month",
                     "give a month from 1 (January, calendar years) to 12");
  }
  if (!(min_completeness >= 0.0 && min_completeness <= 1.0)) {
    throw InputError("minimum completeness",
                     std::to_string(min_completeness) + " is not a fraction",
                     "give a fraction of the expected samples from 0 to 1, such as 0.75");
  }
  RecordYears out;
  out.start_month = start_month;
  out.min_completeness = min_completeness;
  if (series.size() < 2) return out;
  out.median_interval_s = series.median_interval_s();
  const auto& t = series.time_utc_s;
  const int first_year = season_year_of(t.front(), start_month);
  const int last_year = season_year_of(t.back(), start_month);
  std::size_t i = 0;
  for (int y = first_year; y <= last_year; ++y) {
    RecordYear ry;
    ry.year = y;
    ry.start_utc_s = utc_s_of_month_start(y, start_month);
    ry.end_utc_s = utc_s_of_month_start(y + 1, start_month);
    ry.first = i;
    while (i < t.size() && t[i] < ry.end_utc_s) ++i;
    ry.last = i;
    const double length_s = static_cast<double>(ry.end_utc_s - ry.start_utc_s);
    // c_y = n_y Δt / L_y, capped at 1 (the expected count is L_y / Δt).
    const double n = static_cast<double>(ry.last - ry.first);
    ry.completeness = std::min(1.0, n * out.median_interval_s / length_s);
    ry.kept = ry.last > ry.first && ry.completeness >= min_completeness;
    out.years.push_back(ry);
  }
  return out;
}

}  // namespace tidewright::record
