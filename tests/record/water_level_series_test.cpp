// Reading water-level series: cleaning counts, units, and every bad input with its message.
#include "tidewright/record/water_level_series.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <chrono>
#include <fstream>

#include "record/record_test_helpers.hpp"

namespace tr = tidewright::record;
using ::testing::HasSubstr;
using tr::testing::input_error_of;
using tr::testing::utc;
using namespace std::chrono;

namespace {
std::string series_error(const std::string& text, const tr::ReadOptions& options = {}) {
  return input_error_of([&] { (void)tr::parse_water_level_series(text, "gauge.csv", options); });
}
}  // namespace

TEST(WaterLevelSeries, ReadsTimesLevelsAndCleaningCounts) {
  tr::ReadOptions o;
  o.time_column = "Date time";
  o.level_column = "sea level";
  o.unit = "ft";
  o.datum = "chart datum";
  o.missing.sentinels = {-99.0, 9999.0};
  const std::string text =
      "# gauge export\n"
      "Date time,sea level,flag\n"
      "2020-01-31 13:00,10,a\n"
      "2020-01-31T14:00:00+00:30,NA,b\n"  // 13:30Z, missing: its time is still checked
      "2020-01-31T14:30Z,-99,c\n"
      "2020-01-31T15:00Z,,d\n"
      "2020-01-31T16:00:00Z,12.5,e\n"
      "2020-01-31T17:00:00Z,9999,f\n"
      "2020-01-31T18:00:00Z,nan,g\n"
      "2020-01-31T19:00:00Z,-1,h\n";
  const auto s = tr::parse_water_level_series(text, "gauge.csv", o);
  ASSERT_EQ(s.size(), 3U);
  EXPECT_EQ(s.time_utc_s[0], utc(2020y / January / 31, 13));
  EXPECT_EQ(s.time_utc_s[1], utc(2020y / January / 31, 16));
  EXPECT_EQ(s.line[1], 7U);
  EXPECT_DOUBLE_EQ(s.level_m[0], 10 * 0.3048);  // international foot
  EXPECT_DOUBLE_EQ(s.level_m[1], 12.5 * 0.3048);
  EXPECT_DOUBLE_EQ(s.level_m[2], -0.3048);
  EXPECT_EQ(s.cleaning.rows_read, 8U);
  EXPECT_EQ(s.cleaning.missing, 3U);    // NA, empty, nan
  EXPECT_EQ(s.cleaning.sentinels, 2U);  // -99, 9999
  EXPECT_EQ(s.cleaning.values_kept, 3U);
  EXPECT_EQ(s.datum, "chart datum");
  EXPECT_EQ(s.summary(),
            "gauge.csv: 8 rows, 3 levels kept, 3 missing, 2 sentinels; 2020-01-31T13:00:00Z to "
            "2020-01-31T19:00:00Z, median interval 180 min; datum: chart datum");
}

TEST(WaterLevelSeries, MillimetresAndMedianIntervalOfIrregularSampling) {
  tr::ReadOptions o;
  o.unit = "mm";
  const auto s = tr::parse_water_level_series(
      "time,level\n2001-01-01T00:00Z,1000\n2001-01-01T00:10Z,1200\n2001-01-01T00:25Z,900\n"
      "2001-01-01T00:35Z,1100\n2001-01-01T03:00Z,1000\n",
      "x.csv", o);
  EXPECT_DOUBLE_EQ(s.level_m[1], 1.2);
  // Spacings 600, 900, 600, 8700 s: the median of an even count is the mean of the middle two.
  EXPECT_DOUBLE_EQ(s.median_interval_s(), 750.0);
}

TEST(WaterLevelSeries, ReadsAFile) {
  tidewright::testing::TempDir dir;
  const auto path = dir / "g.csv";
  std::ofstream(path) << "time,level\n2001-01-01T00:00Z,1.0\n2001-01-01T01:00Z,1.5\n";
  const auto s = tr::read_water_level_series(path);
  EXPECT_EQ(s.size(), 2U);
  EXPECT_EQ(s.source, path.string());
}

// The bad inputs of issue 3, each with the one line the command line prints after "error: ".
TEST(WaterLevelSeries, DuplicatedTimeNamesBothLines) {
  EXPECT_EQ(series_error("time,level\n2020-01-01T00:00Z,1\n2020-01-01T01:00Z,2\n"
                         "2020-01-01T02:00+01:00,3\n"),
            "gauge.csv:4: time 2020-01-01T01:00:00Z is given twice (lines 3 and 4; times are "
            "kept to the whole second, in UTC); remove the duplicated row");
}

TEST(WaterLevelSeries, UnsortedTimeNamesBothLines) {
  EXPECT_EQ(series_error("time,level\n2020-01-01T05:00Z,1\n2020-01-01T03:00Z,2\n"),
            "gauge.csv:3: time 2020-01-01T03:00:00Z comes before 2020-01-01T05:00:00Z on line 2 "
            "(times in UTC); sort the rows by time");
}

TEST(WaterLevelSeries, UnparsableTimestamp) {
  EXPECT_EQ(series_error("time,level\n2020-01-01T05:00Z,1\n2020-02-30T03:00Z,2\n"),
            "gauge.csv:3: column 'time' holds '2020-02-30T03:00Z', which is not an ISO 8601 "
            "timestamp (the date 2020-02-30 does not exist); write times like "
            "2020-01-31T13:00:00Z or 2020-01-31 13:00+01:00");
  EXPECT_EQ(series_error("time,level\nNA,1\n"),
            "gauge.csv:2: column 'time' has no time; give every row an ISO 8601 time, or remove "
            "the row");
}

TEST(WaterLevelSeries, UnparsableNumber) {
  EXPECT_EQ(series_error("time,level\n2020-01-01T05:00Z,1\n2020-01-01T06:00Z,1,5\n"),
            "gauge.csv:3: has 3 cells but the header has 2; give every row as many cells as the "
            "header (check for a stray delimiter)");
  EXPECT_EQ(series_error("time,level\n2020-01-01T05:00Z,1\n2020-01-01T06:00Z,1.2m\n"),
            "gauge.csv:3: column 'level' holds '1.2m', which is not a finite number; correct the "
            "value, or declare it a missing-value marker");
}

TEST(WaterLevelSeries, MissingColumn) {
  tr::ReadOptions o;
  o.level_column = "height";
  EXPECT_EQ(series_error("time,level\n2020-01-01T05:00Z,1\n", o),
            "gauge.csv:1: has no column 'height' (columns: time, level); name one of these "
            "columns in the options");
}

TEST(WaterLevelSeries, ConstantAndTooFew) {
  EXPECT_EQ(series_error("time,level\n2020-01-01T05:00Z,1.25\n2020-01-01T06:00Z,1.25\n"),
            "gauge.csv: all 2 levels equal 1.25 m: the series is constant; check the level "
            "column, its missing-value markers and sentinels");
  EXPECT_EQ(series_error("time,level\n2020-01-01T05:00Z,1.25\n2020-01-01T06:00Z,NA\n"),
            "gauge.csv: has 1 level in column 'level' (1 missing, 0 sentinels): too few values "
            "for a water-level series; give a series of at least 2 levels (years of data for an "
            "extreme-value fit)");
}

TEST(WaterLevelSeries, UnknownUnitBeforeReading) {
  tr::ReadOptions o;
  o.unit = "fathom";
  EXPECT_EQ(series_error("not even read", o),
            "unit: unit 'fathom' is not one tidewright reads; use one of m, cm, mm, ft");
}
