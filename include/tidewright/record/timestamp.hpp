// ISO 8601 timestamps of tide-gauge records, read to whole seconds of UTC, and the calendar
// helpers the record module needs (decimal years, month starts).
//
// Accepted: "YYYY-MM-DD", then 'T' or ' ' and "hh:mm", optional ":ss", optional fraction
// (".f…" or ",f…"), then nothing (read as UTC), "Z", or an offset "+hh", "+hh:mm", "+hhmm"
// (or '-'). The offset is subtracted to give UTC, so "2020-01-01T00:30+01:00" is
// 2019-12-31T23:30Z. Fractions are rounded to the nearest second (half up); leap seconds
// (":60") and "24:00" are refused.
//
// Hand-written because nothing packaged in Debian fits: GCC 12's libstdc++ has no
// std::chrono::parse (C++20; it arrives with GCC 14), Boost.Date_Time's ISO readers do not take
// UTC offsets, and Howard Hinnant's date library (libhowardhinnant-date-dev) parses one fixed
// format per call on an iostream, so the optional parts above would need a cascade of formats
// tried per cell of a 438,000-row file and would give no reason for a failure. The calendar
// arithmetic itself is C++20 <chrono> (year_month_day, sys_days), which is exact.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace tidewright::record {

struct ParsedTimestamp {
  std::optional<std::int64_t> utc_s;  // seconds since 1970-01-01T00:00Z; empty on failure
  std::string problem;                // why it failed, for messages ("month 13 does not exist")
};

[[nodiscard]] ParsedTimestamp parse_utc_timestamp(std::string_view text);

// "YYYY-MM-DDThh:mm:ssZ".
[[nodiscard]] std::string format_utc_timestamp(std::int64_t utc_s);

// Seconds of 00:00Z on the first day of `month` (1–12) of `year`.
[[nodiscard]] std::int64_t utc_s_of_month_start(int year, int month);

// Calendar decimal year: the year plus the fraction of that calendar year elapsed
// (2000-07-02T00:00Z is 2000.5; 2000 is a leap year of 366 days).
[[nodiscard]] double decimal_year(double utc_s);
// The inverse of decimal_year.
[[nodiscard]] double utc_s_of_decimal_year(double decimal_yr);

// Length of the mean Gregorian year (365.2425 days) in seconds: the unit of "per year" in
// trends (mm/yr) and in effective years of record.
inline constexpr double seconds_per_year = 365.2425 * 86400.0;

}  // namespace tidewright::record
