// The years of a water-level record and how complete each is. A year runs from 00:00Z on the
// first day of the start month to the same instant a year later and is labelled by the year
// in which it starts: with start month 7, "1990" is 1990-07-01 to 1991-07-01 (a storm season
// straddling new year stays in one year).
//
// Glossary: n_y samples in year y; Δt median sampling interval of the whole series (s);
// L_y length of year y (s); c_y = min(1, n_y Δt / L_y) completeness, the fraction of the
// expected samples that are there.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "tidewright/record/water_level_series.hpp"

namespace tidewright::record {

// Minimum completeness of a year: more than 75 % of its expected samples, the rule of
// Slangen et al. (2017) J. Mar. Sci. Eng. 5(2):21 (docs/references.md, confirmed).
inline constexpr double default_min_completeness = 0.75;

struct RecordYear {
  int year = 0;
  std::int64_t start_utc_s = 0;
  std::int64_t end_utc_s = 0;  // exclusive
  std::size_t first = 0;       // samples [first, last) of the series fall in this year
  std::size_t last = 0;
  double completeness = 0.0;  // c_y
  bool kept = false;          // c_y >= the minimum asked for
};

struct RecordYears {
  std::vector<RecordYear> years;  // every year from the first sample's to the last's, in order
  double median_interval_s = 0.0;
  int start_month = 1;
  double min_completeness = default_min_completeness;

  [[nodiscard]] std::size_t kept_count() const;
  // Sum over kept years of c_y L_y, in mean Gregorian years: the time the record covers.
  [[nodiscard]] double effective_years() const;
};

// InputError for a start month outside 1–12 ("year start month") or a completeness outside
// [0, 1] ("minimum completeness").
[[nodiscard]] RecordYears partition_record_years(const WaterLevelSeries& series, int start_month,
                                                 double min_completeness);

}  // namespace tidewright::record
