// A measured water-level series: UTC times and levels in metres above a named datum, read from
// a CSV file with an ISO 8601 time column and a level column (see docs/record.md). Rows whose
// level is missing are left out and counted; any sampling, regular or not, is kept as it is.
#pragma once

#include <cstdint>
#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

#include "tidewright/record/read_options.hpp"

namespace tidewright::record {

struct WaterLevelSeries {
  std::vector<std::int64_t> time_utc_s;  // strictly increasing, seconds since 1970-01-01Z
  std::vector<double> level_m;           // same length
  std::vector<std::size_t> line;         // file line of each sample, for messages
  std::string datum;
  std::string source;  // file name, for messages
  CleaningCounts cleaning;

  [[nodiscard]] std::size_t size() const noexcept { return level_m.size(); }
  // Median spacing of consecutive samples (s): the sampling interval the completeness of a
  // year is measured against.
  [[nodiscard]] double median_interval_s() const;
  // One line: rows, missing, sentinels, span, sampling.
  [[nodiscard]] std::string summary() const;
};

// Errors (InputError at file:line): a missing column, a time that is not ISO 8601, a level
// that is not a number, a time given twice or earlier than the row before (both lines named),
// fewer than 2 levels, all levels equal, an unknown unit.
[[nodiscard]] WaterLevelSeries read_water_level_series(const std::filesystem::path& path,
                                                       const ReadOptions& options = {});
[[nodiscard]] WaterLevelSeries parse_water_level_series(std::string_view text, std::string source,
                                                        const ReadOptions& options = {});

}  // namespace tidewright::record
