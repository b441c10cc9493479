#include "tidewright/record/water_level_series.hpp"

#include <algorithm>

#include "prepared_record.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/record/level_plausibility.hpp"
#include "tidewright/record/timestamp.hpp"

namespace tidewright::record {
namespace {

using detail::format_number;

WaterLevelSeries from_table(const CsvTable& table, const ReadOptions& options) {
  const double to_m = metres_per_unit(options.unit);
  const std::size_t time_col = table.column(options.time_column);
  const std::size_t level_col = table.column(options.level_column);
  WaterLevelSeries s;
  s.datum = options.datum;
  s.source = options.recorded_as.empty() ? table.source() : options.recorded_as;
  const auto& rows = table.rows();
  s.time_utc_s.reserve(rows.size());
  s.level_m.reserve(rows.size());
  s.line.reserve(rows.size());
  std::int64_t previous_time = 0;
  std::size_t previous_line = 0;
  for (const auto& row : rows) {
    ++s.cleaning.rows_read;
    const std::string& time_cell = row.cells[time_col];
    const ParsedTimestamp t = parse_utc_timestamp(time_cell);
    if (!t.utc_s) {
      // The marker test runs only on a failure: it costs as much as the parse on every row.
      if (options.missing.is_marker(time_cell)) {
        throw InputError(table.where(row), "column '" + table.header()[time_col] + "' has no time",
                         "give every row an ISO 8601 time, or remove the row");
      }
      throw InputError(table.where(row),
                       "column '" + table.header()[time_col] + "' holds '" + time_cell +
                           "', which is not an ISO 8601 timestamp (" + t.problem + ")",
                       "write times like 2020-01-31T13:00:00Z or 2020-01-31 13:00+01:00");
    }
    if (previous_line != 0 && *t.utc_s <= previous_time) {
      const bool same = *t.utc_s == previous_time;
      throw InputError(table.where(row),
                       same ? "time " + format_utc_timestamp(*t.utc_s) + " is given twice (lines " +
                                  std::to_string(previous_line) + " and " +
                                  std::to_string(row.line) +
                                  "; times are kept to the whole second, in UTC)"
                            : "time " + format_utc_timestamp(*t.utc_s) + " comes before " +
                                  format_utc_timestamp(previous_time) + " on line " +
                                  std::to_string(previous_line) + " (times in UTC)",
                       same ? "remove the duplicated row" : "sort the rows by time");
    }
    previous_time = *t.utc_s;
    previous_line = row.line;
    const auto value = table.number(row, level_col, options.missing);
    if (!value) {
      // A marker or a sentinel; tell them apart only here, on the rows without a value.
      ++(options.missing.is_marker(row.cells[level_col]) ? s.cleaning.missing
                                                         : s.cleaning.sentinels);
      continue;
    }
    s.time_utc_s.push_back(*t.utc_s);
    s.level_m.push_back(*value * to_m);
    s.line.push_back(row.line);
  }
  s.cleaning.values_kept = s.level_m.size();
  if (s.level_m.size() < 2) {
    throw InputError(table.source(),
                     "has " + std::to_string(s.level_m.size()) + " level" +
                         (s.level_m.size() == 1 ? "" : "s") + " in column '" +
                         options.level_column + "' (" + std::to_string(s.cleaning.missing) +
                         " missing, " + std::to_string(s.cleaning.sentinels) +
                         " sentinels): too few values for a water-level series",
                     "give a series of at least 2 levels (years of data for an extreme-value fit)");
  }
  check_level_plausibility(s.level_m, s.line, table.source(), options);
  const auto [lo, hi] = std::minmax_element(s.level_m.begin(), s.level_m.end());
  if (*lo == *hi) {
    throw InputError(table.source(),
                     "all " + std::to_string(s.level_m.size()) + " levels equal " +
                         format_number(*lo, "%.6g") + " m: the series is constant",
                     "check the level column, its missing-value markers and sentinels");
  }
  return s;
}

}  // namespace

double WaterLevelSeries::median_interval_s() const {
  if (time_utc_s.size() < 2) return 0.0;
  std::vector<std::int64_t> d(time_utc_s.size() - 1);
  for (std::size_t i = 1; i < time_utc_s.size(); ++i) d[i - 1] = time_utc_s[i] - time_utc_s[i - 1];
  const std::size_t mid = d.size() / 2;
  std::nth_element(d.begin(), d.begin() + static_cast<std::ptrdiff_t>(mid), d.end());
  const auto upper = static_cast<double>(d[mid]);
  if (d.size() % 2 == 1) return upper;
  const auto lower = static_cast<double>(
      *std::max_element(d.begin(), d.begin() + static_cast<std::ptrdiff_t>(mid)));
  return 0.5 * (lower + upper);
}

std::string WaterLevelSeries::summary() const {
  std::string out = source + ": " + std::to_string(cleaning.rows_read) + " rows, " +
                    std::to_string(cleaning.values_kept) + " levels kept, " +
                    std::to_string(cleaning.missing) + " missing, " +
                    std::to_string(cleaning.sentinels) + " sentinels";
  if (!time_utc_s.empty()) {
    out += "; " + format_utc_timestamp(time_utc_s.front()) + " to " +
           format_utc_timestamp(time_utc_s.back()) + ", median interval " +
           format_number(median_interval_s() / 60.0, "%.4g") + " min";
  }
  out += "; datum: " + (datum.empty() ? std::string("not stated") : datum);
  return out;
}

WaterLevelSeries read_water_level_series(const std::filesystem::path& path,
                                         const ReadOptions& options) {
  (void)metres_per_unit(options.unit);  // a bad unit is reported before the file is read
  return from_table(CsvTable::read(path, options.csv), options);
}

WaterLevelSeries parse_water_level_series(std::string_view text, std::string source,
                                          const ReadOptions& options) {
  (void)metres_per_unit(options.unit);
  return from_table(CsvTable::parse(text, std::move(source), options.csv), options);
}

}  // namespace tidewright::record
