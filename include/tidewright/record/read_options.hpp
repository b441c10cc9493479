// How a record file is read: column names, the unit of its levels, the datum label carried to
// every output, and the cells that mean "no value".
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "tidewright/common/csv.hpp"

namespace tidewright::record {

struct ReadOptions {
  std::string time_column = "time";    // water-level series: ISO 8601 timestamps
  std::string year_column = "year";    // annual maxima: whole years
  std::string level_column = "level";  // the level (annual maxima: the largest of the year)
  // Annual maxima only: columns with the 2nd, 3rd, … largest values of each year, in order.
  // Missing cells are allowed at the end of a row (fewer values in some years).
  std::vector<std::string> r_largest_columns;
  std::string unit = "m";  // of the levels in the file: m, cm, mm or ft; metres inside
  std::string datum;       // label of the vertical datum, carried through unchanged
  // Markers (empty, NA, NaN, N/A, null, -) and sentinels such as -99 or 9999; sentinels are
  // compared with the value as written in the file, before unit conversion.
  MissingValues missing;
  CsvOptions csv;
  // Read levels far from the record's median, or a column named in another unit, on purpose
  // (level_plausibility.hpp).
  bool accept_implausible_levels = false;
  // The record's name in summaries and outputs once it is read (the record's `source`), e.g. the
  // path as a site file writes it; empty: the path read. Reading errors name the path read.
  std::string recorded_as{};
};

// Metres per unit: m 1, cm 0.01, mm 0.001, ft 0.3048 (the international foot, exact by the
// 1959 international yard and pound agreement). Case-insensitive. Anything else is an
// InputError at `where` that names the accepted units.
[[nodiscard]] double metres_per_unit(std::string_view unit, std::string_view where = "unit");

// "m, cm, mm, ft"
[[nodiscard]] std::string accepted_units();

// What cleaning did to a file, for the summary a command prints.
struct CleaningCounts {
  std::size_t rows_read = 0;    // data rows (header, comments and blank lines not counted)
  std::size_t missing = 0;      // level cells holding a missing-value marker
  std::size_t sentinels = 0;    // level cells holding a user sentinel
  std::size_t values_kept = 0;  // levels read as numbers
};

}  // namespace tidewright::record
