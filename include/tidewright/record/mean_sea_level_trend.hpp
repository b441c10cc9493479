// Removal of the mean-sea-level trend from a water-level record, so that extremes are
// expressed relative to the mean sea level of a reference epoch.
//
// Glossary: t time in mean Gregorian years (365.2425 d); t_e reference epoch (calendar decimal
// year); h(t) level; b trend (m/yr); a mean level at t_e; m_y mean level of year y, centred at
// t_y (the middle of the year).
//
// Methods:
//  - annual_mean: h'(t) = h(t) − m_y + a, with a + b (t − t_e) the least-squares line through
//    the (t_y, m_y) of the kept years (so a year's maximum becomes max_y − m_y + a). Samples of
//    dropped years (not used) get h − b (t − t_e).
//  - linear: the least-squares line a + b (t − t_e) through every sample of the kept years;
//    h'(t) = h(t) − b (t − t_e), which leaves levels at the epoch unchanged.
// Least squares by Eigen's column-pivoting Householder QR (Golub & Van Loan, Matrix
// Computations, §5.4), with time centred at the epoch.
#pragma once

#include <optional>
#include <string_view>
#include <vector>

#include "tidewright/record/record_years.hpp"
#include "tidewright/record/water_level_series.hpp"

namespace tidewright::record {

enum class DetrendMethod { none, annual_mean, linear };

[[nodiscard]] std::string_view detrend_method_name(DetrendMethod method);
// "none", "annual-mean" or "linear"; an InputError at `where` for anything else.
[[nodiscard]] DetrendMethod parse_detrend_method(std::string_view name,
                                                 std::string_view where = "detrend");

struct Detrend {
  DetrendMethod method = DetrendMethod::none;
  double epoch_yr = 0.0;         // t_e, calendar decimal year
  bool epoch_is_default = true;  // true when t_e is the record's mid-point (not given)
  double trend_mm_per_yr = 0.0;  // b
  double mean_at_epoch_m = 0.0;  // a
  std::size_t points = 0;        // samples (linear) or years (annual_mean) in the fit
};

struct DetrendedLevels {
  std::vector<double> level_m;  // h', one per sample of the series
  Detrend detrend;
};

// The record's mid-point as a calendar decimal year: half-way between the start of the first
// kept year and the end of the last (the default reference epoch).
[[nodiscard]] double record_mid_epoch(const RecordYears& years);

// How far a given epoch may lie outside the record's years: our choice, a decade of
// extrapolated trend (at 3 mm/yr about 3 cm) before the levels' reference becomes a guess.
inline constexpr double max_epoch_outside_record_yr = 10.0;

// `epoch_yr` empty: record_mid_epoch. With DetrendMethod::none the levels are returned as they
// are and detrend.method is none. InputError when fewer than 2 kept years (annual_mean) or
// samples (linear) are there to fit, or when a given epoch lies more than
// max_epoch_outside_record_yr years before the record's first year or after its last.
[[nodiscard]] DetrendedLevels remove_mean_sea_level_trend(const WaterLevelSeries& series,
                                                          const RecordYears& years,
                                                          DetrendMethod method,
                                                          std::optional<double> epoch_yr = {});

}  // namespace tidewright::record
