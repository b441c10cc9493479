// Annual maxima (and optionally the r largest values of each year) in metres above a named
// datum: read from a CSV file, or taken from a water-level series (record/block_maxima.hpp).
#pragma once

#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tidewright/record/mean_sea_level_trend.hpp"
#include "tidewright/record/read_options.hpp"

namespace tidewright::record {

// A year left out of the analysis, and why ("no value in the file", "62% complete").
struct DroppedYear {
  int year = 0;
  double completeness = 0.0;  // fraction of the expected samples (0 for a year read as missing)
  std::string reason;
};

// Where the values a model is fitted to came from and what was done to them: the same for
// annual maxima and for peaks over a threshold.
struct RecordProvenance {
  std::string datum;
  std::string source;
  CleaningCounts cleaning;
  std::vector<DroppedYear> dropped;
  std::optional<Detrend> detrend;    // set when a mean-sea-level trend was removed
  int year_start_month = 1;          // 1: calendar years
  double min_completeness = 0.0;     // the rule applied (series only; 0 for a file of maxima)
  double sampling_interval_s = 0.0;  // median spacing the completeness used (series only)
};

struct AnnualMaxima : RecordProvenance {
  std::vector<int> years;       // increasing; a year is labelled by the year it starts in
  std::vector<double> level_m;  // the largest level of each year
  // Empty unless r-largest columns were read; otherwise, per year, its largest values in
  // decreasing order with r_largest_m[i][0] == level_m[i] (some years hold fewer).
  std::vector<std::vector<double>> r_largest_m;
  std::vector<std::int64_t> time_utc_s;  // time of each maximum; empty when read from a file

  [[nodiscard]] std::size_t size() const noexcept { return level_m.size(); }
  // A few lines: counts of rows, missing values, dropped years and why, the trend removed.
  [[nodiscard]] std::string summary() const;
};

// Errors (InputError at file:line): a missing column, a year that is not a whole number, a
// year given twice or out of order (both lines named), a level that is not a number, an
// r-largest value after a missing one or larger than the value before it, fewer than 2
// maxima, all maxima equal. A year whose level is missing is dropped and listed.
[[nodiscard]] AnnualMaxima read_annual_maxima(const std::filesystem::path& path,
                                              const ReadOptions& options = {});
[[nodiscard]] AnnualMaxima parse_annual_maxima(std::string_view text, std::string source,
                                               const ReadOptions& options = {});

// Smallest samples this module asks of a fit, about five values per fitted parameter (common
// practice; from memory, not a published rule): Gumbel (2 parameters) 10 annual maxima; GEV
// and r-largest GEV (3) 15 years; GPD (2 parameters plus the Poisson rate) 15 exceedances.
inline constexpr std::size_t minimum_maxima_gumbel = 10;
inline constexpr std::size_t minimum_maxima_gev = 15;
inline constexpr std::size_t minimum_exceedances_gpd = 15;

// The minimum above for "gumbel", "gev", "rlargest" or "gpd"; an InputError for another name.
[[nodiscard]] std::size_t minimum_maxima(std::string_view model);

// Throws an InputError at `source` (or at the model name when empty) stating n and the
// minimum when n < minimum.
void require_minimum_maxima(std::size_t n, std::string_view model, std::size_t minimum,
                            std::string_view source = {});

}  // namespace tidewright::record
