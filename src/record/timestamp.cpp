// ISO 8601 timestamps to UTC seconds; see the header for the accepted forms and why this is
// hand-written. Calendar arithmetic: C++20 <chrono> civil dates (year_month_day, sys_days).
#include "tidewright/record/timestamp.hpp"

#include <cctype>
#include <chrono>
#include <cmath>
#include <cstdio>

namespace tidewright::record {
namespace {

namespace chr = std::chrono;

// Reads exactly `count` decimal digits at `pos`; false if they are not all digits.
bool read_digits(std::string_view s, std::size_t& pos, std::size_t count, int& value) {
  if (pos + count > s.size()) return false;
  int v = 0;
  for (std::size_t k = 0; k < count; ++k) {
    const char c = s[pos + k];
    if (c < '0' || c > '9') return false;
    v = v * 10 + (c - '0');
  }
  value = v;
  pos += count;
  return true;
}

ParsedTimestamp fail(std::string problem) { return {std::nullopt, std::move(problem)}; }

std::int64_t days_since_epoch(const chr::year_month_day& ymd) {
  return chr::sys_days(ymd).time_since_epoch().count();
}

}  // namespace

ParsedTimestamp parse_utc_timestamp(std::string_view raw) {
  std::string_view s = raw;  // trimmed in place: no copy on the hot path of a large file
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  constexpr const char* form = "expected YYYY-MM-DD[Thh:mm[:ss[.f]]][Z|+hh:mm]";
  std::size_t pos = 0;
  int year = 0;
  int month = 0;
  int day = 0;
  if (!read_digits(s, pos, 4, year) || pos >= s.size() || s[pos++] != '-' ||
      !read_digits(s, pos, 2, month) || pos >= s.size() || s[pos++] != '-' ||
      !read_digits(s, pos, 2, day)) {
    return fail(form);
  }
  if (month < 1 || month > 12) return fail("month " + std::to_string(month) + " does not exist");
  const chr::year_month_day ymd{chr::year(year), chr::month(static_cast<unsigned>(month)),
                                chr::day(static_cast<unsigned>(day))};
  if (!ymd.ok()) {
    char buf[16];
    std::snprintf(buf, sizeof buf, "%04d-%02d-%02d", year, month, day);
    return fail(std::string("the date ") + buf + " does not exist");
  }
  int hour = 0;
  int minute = 0;
  int second = 0;
  bool round_up = false;
  int offset_s = 0;
  if (pos < s.size()) {
    const char sep = s[pos++];
    if (sep != 'T' && sep != 't' && sep != ' ') return fail(form);
    if (!read_digits(s, pos, 2, hour) || pos >= s.size() || s[pos++] != ':' ||
        !read_digits(s, pos, 2, minute)) {
      return fail(form);
    }
    if (pos < s.size() && s[pos] == ':') {
      ++pos;
      if (!read_digits(s, pos, 2, second)) return fail(form);
      if (pos < s.size() && (s[pos] == '.' || s[pos] == ',')) {
        ++pos;
        const std::size_t first = pos;
        while (pos < s.size() && s[pos] >= '0' && s[pos] <= '9') ++pos;
        if (pos == first) return fail("a decimal point must be followed by digits");
        round_up = s[first] >= '5';  // nearest second, half up
      }
    }
    if (hour > 23) return fail("hour " + std::to_string(hour) + " is outside 00-23");
    if (minute > 59) return fail("minute " + std::to_string(minute) + " is outside 00-59");
    if (second == 60) return fail("leap seconds (:60) are not supported");
    if (second > 59) return fail("second " + std::to_string(second) + " is outside 00-59");
    if (pos < s.size()) {
      const char z = s[pos++];
      if (z == 'Z' || z == 'z') {
        if (pos != s.size()) return fail(form);
      } else if (z == '+' || z == '-') {
        int oh = 0;
        int om = 0;
        if (!read_digits(s, pos, 2, oh))
          return fail("a UTC offset is written +hh, +hh:mm or +hhmm");
        if (pos < s.size()) {
          if (s[pos] == ':') ++pos;
          if (!read_digits(s, pos, 2, om) || pos != s.size()) {
            return fail("a UTC offset is written +hh, +hh:mm or +hhmm");
          }
        }
        if (oh > 23 || om > 59) return fail("the UTC offset is out of range");
        offset_s = (z == '+' ? 1 : -1) * (oh * 3600 + om * 60);
      } else {
        return fail(form);
      }
    }
  }
  const std::int64_t clock_s = std::int64_t{hour} * 3600 + std::int64_t{minute} * 60 + second;
  const std::int64_t local_s = days_since_epoch(ymd) * 86400 + clock_s + (round_up ? 1 : 0);
  return {local_s - offset_s, {}};  // local time = UTC + offset (ISO 8601-1:2019, 4.3.13)
}

std::string format_utc_timestamp(std::int64_t utc_s) {
  const std::int64_t days = (utc_s >= 0 ? utc_s : utc_s - 86399) / 86400;  // floor division
  const std::int64_t rem = utc_s - days * 86400;
  const chr::year_month_day ymd{chr::sys_days(chr::days(days))};
  char buf[40];
  std::snprintf(buf, sizeof buf, "%04d-%02u-%02uT%02d:%02d:%02dZ", static_cast<int>(ymd.year()),
                static_cast<unsigned>(ymd.month()), static_cast<unsigned>(ymd.day()),
                static_cast<int>(rem / 3600), static_cast<int>(rem % 3600 / 60),
                static_cast<int>(rem % 60));
  return buf;
}

std::int64_t utc_s_of_month_start(int year, int month) {
  const chr::year_month_day ymd{chr::year(year), chr::month(static_cast<unsigned>(month)),
                                chr::day(1)};
  return days_since_epoch(ymd) * 86400;
}

double decimal_year(double utc_s) {
  const auto days = static_cast<std::int64_t>(std::floor(utc_s / 86400.0));
  const chr::year_month_day ymd{chr::sys_days(chr::days(days))};
  const int y = static_cast<int>(ymd.year());
  const auto start = static_cast<double>(utc_s_of_month_start(y, 1));
  const auto end = static_cast<double>(utc_s_of_month_start(y + 1, 1));
  return y + (utc_s - start) / (end - start);
}

double utc_s_of_decimal_year(double decimal_yr) {
  const double y = std::floor(decimal_yr);
  const auto start = static_cast<double>(utc_s_of_month_start(static_cast<int>(y), 1));
  const auto end = static_cast<double>(utc_s_of_month_start(static_cast<int>(y) + 1, 1));
  return start + (decimal_yr - y) * (end - start);
}

}  // namespace tidewright::record
