// ISO 8601 timestamps to UTC seconds, checked against std::chrono civil-date arithmetic
// (an independent computation: sys_days of the calendar date plus the clock time, minus the
// offset, as ISO 8601-1:2019 §4.3.13 defines local time = UTC + offset).
#include "tidewright/record/timestamp.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <chrono>

namespace tr = tidewright::record;
using ::testing::HasSubstr;
using namespace std::chrono;

namespace {
std::int64_t chrono_utc(year_month_day ymd, int h, int m, int s) {
  return (sys_days(ymd) + hours(h) + minutes(m) + seconds(s)).time_since_epoch().count();
}
std::int64_t parsed(std::string_view text) {
  const auto p = tr::parse_utc_timestamp(text);
  EXPECT_TRUE(p.utc_s.has_value()) << text << ": " << p.problem;
  return p.utc_s.value_or(-1);
}
std::string problem(std::string_view text) {
  const auto p = tr::parse_utc_timestamp(text);
  EXPECT_FALSE(p.utc_s.has_value()) << text;
  return p.problem;
}
}  // namespace

TEST(Timestamp, FormsWithoutOffsetAreUtc) {
  const auto expect = chrono_utc(2020y / January / 31, 13, 0, 0);
  EXPECT_EQ(parsed("2020-01-31T13:00:00"), expect);
  EXPECT_EQ(parsed("2020-01-31 13:00"), expect);
  EXPECT_EQ(parsed("2020-01-31T13:00Z"), expect);
  EXPECT_EQ(parsed("2020-01-31t13:00:00z"), expect);
  EXPECT_EQ(parsed("  2020-01-31T13:00:00.000Z "), expect);
  EXPECT_EQ(parsed("2020-01-31"), chrono_utc(2020y / January / 31, 0, 0, 0));
  // 1970-01-01T00:00Z is second 0 of the POSIX clock.
  EXPECT_EQ(parsed("1970-01-01T00:00:00Z"), 0);
}

TEST(Timestamp, OffsetsAcrossDayAndYearBoundaries) {
  // 00:30 at +01:00 is 23:30 UTC the day before, here the year before.
  EXPECT_EQ(parsed("2020-01-01T00:30:00+01:00"), chrono_utc(2019y / December / 31, 23, 30, 0));
  // 19:15 at -0500 is 00:15 UTC the next day, across new year.
  EXPECT_EQ(parsed("2019-12-31 19:15-0500"), chrono_utc(2020y / January / 1, 0, 15, 0));
  EXPECT_EQ(parsed("2019-12-31T19:15:00-05"), chrono_utc(2020y / January / 1, 0, 15, 0));
  // A quarter-hour offset (Nepal, +05:45).
  EXPECT_EQ(parsed("2021-06-01T05:45+05:45"), chrono_utc(2021y / June / 1, 0, 0, 0));
}

TEST(Timestamp, LeapDays) {
  EXPECT_EQ(parsed("2020-02-29T12:00"), chrono_utc(2020y / February / 29, 12, 0, 0));
  // +02:00 on 1 March 2000 at 01:00 falls on 29 February (2000 is a leap year: divisible by 400).
  EXPECT_EQ(parsed("2000-03-01T01:00+02:00"), chrono_utc(2000y / February / 29, 23, 0, 0));
  // 1900 is not a leap year (divisible by 100, not by 400).
  EXPECT_THAT(problem("1900-02-29T00:00"), HasSubstr("the date 1900-02-29 does not exist"));
  EXPECT_THAT(problem("2021-02-29"), HasSubstr("does not exist"));
  // The day after 28 February 2100 is 1 March (2100 is not a leap year).
  EXPECT_EQ(parsed("2100-03-01T00:00") - parsed("2100-02-28T00:00"), 86400);
}

TEST(Timestamp, FractionalSecondsRoundToNearestSecond) {
  const auto base = chrono_utc(2010y / May / 5, 10, 20, 30);
  EXPECT_EQ(parsed("2010-05-05T10:20:30.4"), base);
  EXPECT_EQ(parsed("2010-05-05T10:20:30.5"), base + 1);
  EXPECT_EQ(parsed("2010-05-05T10:20:30,999+00:00"), base + 1);
  // 59.6 s rounds into the next minute, hour and day.
  EXPECT_EQ(parsed("2010-12-31T23:59:59.6Z"), chrono_utc(2011y / January / 1, 0, 0, 0));
}

TEST(Timestamp, RefusesWhatIsNotIso8601) {
  EXPECT_THAT(problem("31/01/2020 13:00"), HasSubstr("expected YYYY-MM-DD"));
  EXPECT_THAT(problem("2020-13-01"), HasSubstr("month 13 does not exist"));
  EXPECT_THAT(problem("2020-01-01T24:00"), HasSubstr("hour 24"));
  EXPECT_THAT(problem("2020-01-01T12:60"), HasSubstr("minute 60"));
  EXPECT_THAT(problem("2016-12-31T23:59:60Z"), HasSubstr("leap seconds"));
  EXPECT_THAT(problem("2020-01-01T12:00+1"), HasSubstr("UTC offset"));
  EXPECT_THAT(problem("2020-01-01T12:00+01:0"), HasSubstr("UTC offset"));
  EXPECT_THAT(problem("2020-01-01T12:00:00."), HasSubstr("decimal point"));
  EXPECT_THAT(problem("2020-01-01T12:00 UTC"), HasSubstr("expected"));
  EXPECT_THAT(problem(""), HasSubstr("expected"));
  EXPECT_THAT(problem("2020-01-01T12"), HasSubstr("expected"));
}

TEST(Timestamp, FormatsAndDecimalYears) {
  EXPECT_EQ(tr::format_utc_timestamp(chrono_utc(1969y / December / 31, 23, 59, 59)),
            "1969-12-31T23:59:59Z");
  EXPECT_EQ(tr::format_utc_timestamp(parsed("2024-02-29 06:07:08+00:00")), "2024-02-29T06:07:08Z");
  // 2000 has 366 days and 2 July 00:00 is 183 days after 1 January: half the year.
  EXPECT_DOUBLE_EQ(tr::decimal_year(static_cast<double>(chrono_utc(2000y / July / 2, 0, 0, 0))),
                   2000.5);
  // 2001 has 365 days and 2 July 12:00 is 182.5 days after 1 January.
  EXPECT_DOUBLE_EQ(tr::decimal_year(static_cast<double>(chrono_utc(2001y / July / 2, 12, 0, 0))),
                   2001.5);
  EXPECT_DOUBLE_EQ(tr::utc_s_of_decimal_year(1990.0),
                   static_cast<double>(chrono_utc(1990y / January / 1, 0, 0, 0)));
  const double t = static_cast<double>(chrono_utc(1987y / October / 17, 3, 0, 0));
  EXPECT_NEAR(tr::utc_s_of_decimal_year(tr::decimal_year(t)), t, 1e-5);
  EXPECT_EQ(tr::utc_s_of_month_start(2001, 10), chrono_utc(2001y / October / 1, 0, 0, 0));
}
