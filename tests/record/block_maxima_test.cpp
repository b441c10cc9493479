// Annual maxima from a series: completeness per year, the year start month, and removal of a
// known mean-sea-level trend (closed forms worked out beside each check).
#include "tidewright/record/block_maxima.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <chrono>
#include <cmath>
#include <numbers>

#include "record/record_test_helpers.hpp"
#include "tidewright/record/timestamp.hpp"

namespace tr = tidewright::record;
using ::testing::ElementsAre;
using ::testing::HasSubstr;
using tr::testing::hour_s;
using tr::testing::input_error_of;
using tr::testing::make_series;
using tr::testing::utc;
using namespace std::chrono;

namespace {
// Hourly samples in [from, to) with level f(t).
template <class F>
tr::WaterLevelSeries hourly(std::int64_t from, std::int64_t to, F f) {
  std::vector<std::int64_t> t;
  std::vector<double> h;
  for (std::int64_t s = from; s < to; s += hour_s) {
    t.push_back(s);
    h.push_back(f(s));
  }
  return make_series(std::move(t), std::move(h));
}
// A small daily tide-like pattern that never repeats a level within the day.
double pattern(std::int64_t s) {
  const auto hour_of_day = static_cast<double>((s / hour_s) % 24);
  return 0.5 * std::cos(4.0 * std::numbers::pi * (hour_of_day - 11.5) / 24.0);
}
}  // namespace

TEST(BlockMaxima, CompletenessWithGapsDropsAndListsYears) {
  // Hourly 2001-2003; 100 days of 2002 missing. 2002: (365 − 100) / 365 = 0.7260 < 0.75.
  auto s = hourly(utc(2001y / January / 1), utc(2004y / January / 1), pattern);
  const std::int64_t gap_from = utc(2002y / March / 1);
  const std::int64_t gap_to = gap_from + std::int64_t{100} * 86400;
  tr::WaterLevelSeries g;
  for (std::size_t i = 0; i < s.size(); ++i) {
    if (s.time_utc_s[i] >= gap_from && s.time_utc_s[i] < gap_to) continue;
    g.time_utc_s.push_back(s.time_utc_s[i]);
    // A planted maximum each year: +1 m on 1 July 06:00 (2001-2003 have 365 days each).
    const bool peak =
        (s.time_utc_s[i] - utc(2001y / July / 1, 6)) % (std::int64_t{365} * 86400) == 0;
    g.level_m.push_back(s.level_m[i] + (peak ? 1.0 : 0.0));
  }
  g.source = "gaps";
  g.datum = "test datum";
  const auto years = tr::partition_record_years(g, 1, 0.75);
  ASSERT_EQ(years.years.size(), 3U);
  EXPECT_DOUBLE_EQ(years.median_interval_s, 3600.0);
  EXPECT_DOUBLE_EQ(years.years[0].completeness, 1.0);
  EXPECT_DOUBLE_EQ(years.years[1].completeness, 265.0 / 365.0);
  EXPECT_FALSE(years.years[1].kept);
  // Effective years: two complete years of 365 days, in mean Gregorian years of 365.2425 d.
  EXPECT_DOUBLE_EQ(years.effective_years(), 2 * 365.0 / 365.2425);

  const auto am = tr::annual_maxima_from_series(g);
  EXPECT_THAT(am.years, ElementsAre(2001, 2003));
  ASSERT_EQ(am.dropped.size(), 1U);
  EXPECT_EQ(am.dropped[0].year, 2002);
  EXPECT_DOUBLE_EQ(am.dropped[0].completeness, 265.0 / 365.0);
  EXPECT_EQ(am.dropped[0].reason, "72.6% complete, below 75.0%");
  EXPECT_EQ(am.datum, "test datum");
  // The planted hour, 1 + p(06:00) = 1 + 0.5 cos(11π/12) = 0.517 m, beats the pattern's own
  // maximum 0.5 cos(π/12) = 0.483 m.
  EXPECT_DOUBLE_EQ(am.level_m[0], 1.0 + pattern(utc(2001y / July / 1, 6)));
  EXPECT_EQ(am.time_utc_s[0], utc(2001y / July / 1, 6));
  // With a 0.7 minimum the gappy year is kept.
  tr::AnnualMaximaOptions lenient;
  lenient.min_completeness = 0.7;
  EXPECT_EQ(tr::annual_maxima_from_series(g, lenient).size(), 3U);
  EXPECT_THAT(am.summary(), HasSubstr("\n  years kept when at least 75.0% complete (expected "
                                      "samples from the 60-min median spacing)\n"));
  EXPECT_THAT(am.summary(), HasSubstr("1 year dropped: 2002 (72.6% complete, below 75.0%)"));
}

TEST(BlockMaxima, PartialFirstAndLastYears) {
  // 2001-07-01 to 2003-03-01: 2001 is 184/365 complete and 2003 is 59/365: both dropped.
  const auto s = hourly(utc(2001y / July / 1), utc(2003y / March / 1), pattern);
  const auto am = tr::annual_maxima_from_series(s);
  EXPECT_THAT(am.years, ElementsAre(2002));
  ASSERT_EQ(am.dropped.size(), 2U);
  EXPECT_DOUBLE_EQ(am.dropped[0].completeness, 184.0 / 365.0);
  EXPECT_DOUBLE_EQ(am.dropped[1].completeness, 59.0 / 365.0);
}

TEST(BlockMaxima, YearStartMonthKeepsAStormSeasonTogether) {
  // Start month 10: year "2001" is 2001-10-01 to 2002-10-01. Storms on 2001-12-31 (1.2 m) and
  // 2002-01-02 (1.4 m) fall in the same season year 2001; a storm on 2002-11-05 is in 2002.
  const std::int64_t storm1 = utc(2001y / December / 31, 12);
  const std::int64_t storm2 = utc(2002y / January / 2, 3);
  const std::int64_t storm3 = utc(2002y / November / 5, 20);
  const auto s = hourly(utc(2000y / October / 1), utc(2003y / October / 1), [&](std::int64_t t) {
    if (t == storm1) return 1.2;
    if (t == storm2) return 1.4;
    if (t == storm3) return 1.1;
    return pattern(t);
  });
  tr::AnnualMaximaOptions o;
  o.year_start_month = 10;
  const auto am = tr::annual_maxima_from_series(s, o);
  EXPECT_THAT(am.years, ElementsAre(2000, 2001, 2002));
  EXPECT_DOUBLE_EQ(am.level_m[1], 1.4);
  EXPECT_EQ(am.time_utc_s[1], storm2);
  EXPECT_DOUBLE_EQ(am.level_m[2], 1.1);
  EXPECT_TRUE(am.dropped.empty());
  EXPECT_THAT(am.summary(),
              HasSubstr("years start in month 10, labelled by the year they start in"));
  // Calendar years split the season: 2001 gets 1.2 m and 2002 gets 1.4 m (2000 and 2003 are
  // a quarter and three quarters complete and are dropped).
  const auto calendar = tr::annual_maxima_from_series(s);
  EXPECT_THAT(calendar.years, ElementsAre(2001, 2002));
  EXPECT_DOUBLE_EQ(calendar.level_m[0], 1.2);
  EXPECT_DOUBLE_EQ(calendar.level_m[1], 1.4);
}

// Level h(t) = 1 + b (t − t_e) + p(t) with b = 3.2 mm/yr and p the daily pattern, which is
// symmetric about 11:30 within each day and sums to zero over a day, so it is orthogonal to
// both 1 and t over whole days: the least-squares line is exactly 1 + b (t − t_e).
TEST(BlockMaxima, LinearTrendRecoveredAndRemoved) {
  const double b_m_per_yr = 0.0032;
  const double epoch_yr = 2005.0;
  const double epoch_s = tr::utc_s_of_decimal_year(epoch_yr);
  const auto level = [&](std::int64_t t) {
    return 1.0 + b_m_per_yr * (static_cast<double>(t) - epoch_s) / tr::seconds_per_year +
           pattern(t);
  };
  const auto s = hourly(utc(2000y / January / 1), utc(2010y / January / 1), level);
  tr::AnnualMaximaOptions o;
  o.detrend = tr::DetrendMethod::linear;
  o.epoch_yr = epoch_yr;
  const auto am = tr::annual_maxima_from_series(s, o);
  ASSERT_TRUE(am.detrend.has_value());
  EXPECT_NEAR(am.detrend->trend_mm_per_yr, 3.2, 1e-9);
  EXPECT_NEAR(am.detrend->mean_at_epoch_m, 1.0, 1e-9);
  EXPECT_FALSE(am.detrend->epoch_is_default);
  EXPECT_EQ(am.detrend->points, s.size());
  ASSERT_EQ(am.size(), 10U);
  // Detrended, every year's maximum is 1 + max p = 1 + 0.5 cos(π/12) (hours 11 and 12).
  for (double m : am.level_m) EXPECT_NEAR(m, 1.0 + 0.5 * std::cos(std::numbers::pi / 12.0), 1e-9);
  EXPECT_THAT(am.summary(), HasSubstr("mean-sea-level trend removed (linear): 3.20 mm/yr; levels "
                                      "relative to the mean sea level of epoch 2005.00\n"));

  // The default epoch is the record's mid-point: 2000-01-01 to 2010-01-01 is 3653 days (leap
  // years 2000, 2004, 2008), so the middle is 1826.5 days in, 2004-12-31T12:00Z, which is
  // decimal year 2004 + 365.5/366.
  tr::AnnualMaximaOptions d;
  d.detrend = tr::DetrendMethod::linear;
  const auto am_default = tr::annual_maxima_from_series(s, d);
  EXPECT_TRUE(am_default.detrend->epoch_is_default);
  EXPECT_DOUBLE_EQ(am_default.detrend->epoch_yr, 2004.0 + 365.5 / 366.0);
  EXPECT_THAT(am_default.summary(), HasSubstr("(the record's mid-point)"));
}

// Annual-mean subtraction on the same series: year y's mean is m_y = 1 + b (t̄_y − t_e), where
// t̄_y, the mean sample time, is half an hour before the year's centre t_y (hourly samples from
// 00:00). The line through (t_y, m_y) has slope b and value a = 1 − b·0.5 h at t_e, and each
// maximum becomes max_y − m_y + a.
TEST(BlockMaxima, AnnualMeanSubtraction) {
  const double b_m_per_yr = 0.0032;
  const double epoch_s = tr::utc_s_of_decimal_year(2005.0);
  const auto years_of = [&](double t) { return (t - epoch_s) / tr::seconds_per_year; };
  const auto level = [&](std::int64_t t) {
    return 1.0 + b_m_per_yr * years_of(static_cast<double>(t)) + pattern(t);
  };
  const auto s = hourly(utc(2000y / January / 1), utc(2010y / January / 1), level);
  tr::AnnualMaximaOptions o;
  o.detrend = tr::DetrendMethod::annual_mean;
  o.epoch_yr = 2005.0;
  const auto am = tr::annual_maxima_from_series(s, o);
  ASSERT_TRUE(am.detrend.has_value());
  EXPECT_NEAR(am.detrend->trend_mm_per_yr, 3.2, 1e-9);
  const double half_hour_yr = 1800.0 / tr::seconds_per_year;
  const double a = 1.0 - b_m_per_yr * half_hour_yr;
  EXPECT_NEAR(am.detrend->mean_at_epoch_m, a, 1e-12);
  EXPECT_EQ(am.detrend->points, 10U);
  const auto raw = tr::annual_maxima_from_series(s);
  for (std::size_t i = 0; i < am.size(); ++i) {
    const int y = am.years[i];
    const double start = static_cast<double>(tr::utc_s_of_month_start(y, 1));
    const double end = static_cast<double>(tr::utc_s_of_month_start(y + 1, 1));
    const double mean_y = 1.0 + b_m_per_yr * (years_of(0.5 * (start + end)) - half_hour_yr);
    EXPECT_NEAR(am.level_m[i], raw.level_m[i] - mean_y + a, 1e-12) << y;
  }
}

TEST(BlockMaxima, BadOptions) {
  const auto s = hourly(utc(2001y / January / 1), utc(2001y / March / 1), pattern);
  EXPECT_EQ(input_error_of([&] { (void)tr::annual_maxima_from_series(s); }),
            "synthetic: no year is at least 75.0% complete (the most complete, 2001, is 16.2%); "
            "give a longer record or a lower minimum completeness");
  tr::AnnualMaximaOptions o;
  o.year_start_month = 13;
  EXPECT_EQ(input_error_of([&] { (void)tr::annual_maxima_from_series(s, o); }),
            "year start month: 13 is not a month; give a month from 1 (January, calendar years) "
            "to 12");
  o.year_start_month = 1;
  o.min_completeness = 1.5;
  EXPECT_THAT(input_error_of([&] { (void)tr::annual_maxima_from_series(s, o); }),
              HasSubstr("minimum completeness: 1.5"));
  o.min_completeness = 0.1;
  o.detrend = tr::DetrendMethod::annual_mean;
  EXPECT_EQ(input_error_of([&] { (void)tr::annual_maxima_from_series(s, o); }),
            "detrend: annual-mean detrending needs at least 2 complete years; the record has 1; "
            "give a longer record or choose no detrending");
  const auto two_years = hourly(utc(2001y / January / 1), utc(2003y / January / 1), pattern);
  o.detrend = tr::DetrendMethod::linear;
  o.epoch_yr = 1e300;
  EXPECT_EQ(input_error_of([&] { (void)tr::annual_maxima_from_series(two_years, o); }),
            "reference epoch: 1e+300 is not a year from 1 to 9999; give a decimal year such as "
            "2000.0");
  o.epoch_yr = std::nan("");
  EXPECT_THAT(input_error_of([&] { (void)tr::annual_maxima_from_series(two_years, o); }),
              HasSubstr("is not a year from 1 to 9999"));
  EXPECT_EQ(tr::parse_detrend_method("annual-mean"), tr::DetrendMethod::annual_mean);
  EXPECT_EQ(input_error_of([] { (void)tr::parse_detrend_method("quadratic", "--detrend"); }),
            "--detrend: 'quadratic' is not a detrending method; use none, annual-mean or linear");
}

TEST(BlockMaxima, RLargestIndependentEventsOfEachYear) {
  // 2001: storms of 1.9 m (hour 1000, with 1.85 m an hour later, the same event), 1.7 m
  // (hour 1100, 100 h on), 1.6 m (hour 1160, only 60 h after 1.7 m: the same event) and 1.5 m
  // (hour 5000). 2002: a single storm of 1.4 m; the rest is the background pattern (≤ 0.483 m,
  // repeated daily, so its next independent values are 0.483 m three days apart).
  const std::int64_t y2001 = utc(2001y / January / 1);
  const std::int64_t y2002 = utc(2002y / January / 1);
  const auto s = hourly(y2001, utc(2003y / January / 1), [&](std::int64_t t) {
    const std::int64_t k = (t - y2001) / hour_s;
    if (k == 1000) return 1.9;
    if (k == 1001) return 1.85;
    if (k == 1100) return 1.7;
    if (k == 1160) return 1.6;
    if (k == 5000) return 1.5;
    if (t == y2002 + 2000 * hour_s) return 1.4;
    return pattern(t);
  });
  tr::AnnualMaximaOptions o;
  o.r_largest = 3;
  const auto am = tr::annual_maxima_from_series(s, o);
  ASSERT_EQ(am.r_largest_m.size(), 2U);
  EXPECT_THAT(am.r_largest_m[0], ElementsAre(1.9, 1.7, 1.5));
  const double p_max = 0.5 * std::cos(std::numbers::pi / 12.0);
  EXPECT_THAT(am.r_largest_m[1], ElementsAre(1.4, p_max, p_max));
  EXPECT_DOUBLE_EQ(am.level_m[0], am.r_largest_m[0][0]);
  // With a 50 h separation the 1.6 m peak, 60 h after 1.7 m, counts as its own event.
  o.separation_h = 50.0;
  EXPECT_THAT(tr::annual_maxima_from_series(s, o).r_largest_m[0], ElementsAre(1.9, 1.7, 1.6));
  o.r_largest = 0;
  EXPECT_EQ(input_error_of([&] { (void)tr::annual_maxima_from_series(s, o); }),
            "r largest: 0 values per year asked for; ask for 1 or more");
  EXPECT_TRUE(tr::annual_maxima_from_series(s).r_largest_m.empty());
}
