// Peaks over threshold: runs declustering on hand-made clusters (the 72 h window edge), the
// effective years and event rate, quantile thresholds (closed form and numpy.quantile run
// live by Debian's Python), and the empirical rate curve below the threshold.
#include "tidewright/record/peaks_over_threshold.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <chrono>
#include <fstream>
#include <map>
#include <sstream>

#include "tidewright/extremes/still_water_model.hpp"

#include "record/record_test_helpers.hpp"
#include "tidewright/record/timestamp.hpp"

namespace tr = tidewright::record;
using ::testing::DoubleEq;
using ::testing::ElementsAre;
using ::testing::HasSubstr;
using tr::testing::hour_s;
using tr::testing::input_error_of;
using tr::testing::make_series;
using tr::testing::utc;
using namespace std::chrono;

namespace {
const std::int64_t start_2001 = utc(2001y / January / 1);

// One calendar year (2001) of hourly levels: a low background that varies a little (so the
// series is not constant) and the given spikes, keyed by the hour of the year.
tr::WaterLevelSeries year_with_spikes(const std::map<int, double>& spikes) {
  std::vector<std::int64_t> t;
  std::vector<double> h;
  for (int k = 0; k < 365 * 24; ++k) {
    t.push_back(start_2001 + k * hour_s);
    const auto it = spikes.find(k);
    h.push_back(it != spikes.end() ? it->second : 0.001 * (k % 3));
  }
  return make_series(std::move(t), std::move(h), "spikes");
}
}  // namespace

TEST(PeaksOverThreshold, RunsDeclusteringWith72HourWindow) {
  // Hour 130 comes 30 h after hour 100: one cluster, peak 1.8. Hour 202 comes exactly 72 h after
  // 130: a new cluster. Hour 273 comes 71 h after 202: the same cluster. Hour 400: a third.
  const auto s =
      year_with_spikes({{100, 1.5}, {101, 1.6}, {130, 1.8}, {202, 1.2}, {273, 1.1}, {400, 2.0}});
  tr::PeaksOptions o;
  o.threshold_m = 1.0;
  o.rate_curve_lowest_m = 0.5;
  const auto pot = tr::peaks_over_threshold(s, o);
  EXPECT_THAT(pot.level_m, ElementsAre(1.8, 1.2, 2.0));
  EXPECT_THAT(pot.time_utc_s, ElementsAre(start_2001 + 130 * hour_s, start_2001 + 202 * hour_s,
                                          start_2001 + 400 * hour_s));
  EXPECT_EQ(pot.exceedances, 6U);
  EXPECT_EQ(pot.separation_h, 72.0);
  EXPECT_FALSE(pot.threshold_quantile.has_value());
  // One complete 365-day year, in mean Gregorian years; λ_u = 3 / T.
  EXPECT_DOUBLE_EQ(pot.effective_years, 365.0 / 365.2425);
  EXPECT_DOUBLE_EQ(pot.events_per_yr, 3.0 / (365.0 / 365.2425));
  // Nothing between 0.5 m and 1 m: the curve below the threshold is empty.
  EXPECT_TRUE(pot.below_threshold.level_m.empty());

  // With a 71 h window the 71 h gap separates too (and the 72 h one still does): four
  // clusters. With 73 h the 72 h gap no longer separates: two clusters.
  o.separation_h = 71.0;
  EXPECT_THAT(tr::peaks_over_threshold(s, o).level_m, ElementsAre(1.8, 1.2, 1.1, 2.0));
  o.separation_h = 73.0;
  EXPECT_THAT(tr::peaks_over_threshold(s, o).level_m, ElementsAre(1.8, 2.0));
}

TEST(PeaksOverThreshold, TiesKeepTheFirstPeakAndLevelsAtTheThresholdDoNotExceed) {
  const auto s = year_with_spikes({{10, 1.5}, {12, 1.5}, {300, 1.0}, {500, 1.25}});
  tr::PeaksOptions o;
  o.threshold_m = 1.0;
  const auto pot = tr::peaks_over_threshold(s, o);
  EXPECT_THAT(pot.level_m, ElementsAre(1.5, 1.25));
  EXPECT_EQ(pot.time_utc_s[0], start_2001 + 10 * hour_s);
}

TEST(PeaksOverThreshold, EmpiricalRateCurveBelowTheThreshold) {
  // Isolated smaller events at 0.855 and 0.555 m, far from the others: with 1 cm steps the
  // count of clusters rises from 3 to 4 at 0.85 m and to 5 at 0.55 m (levels u − k·0.01).
  const auto s =
      year_with_spikes({{100, 1.5}, {1000, 1.2}, {2000, 2.0}, {3000, 0.855}, {4000, 0.555}});
  tr::PeaksOptions o;
  o.threshold_m = 1.0;
  o.rate_curve_lowest_m = 0.3;
  const auto pot = tr::peaks_over_threshold(s, o);
  ASSERT_EQ(pot.size(), 3U);
  const double T = 365.0 / 365.2425;
  ASSERT_EQ(pot.below_threshold.level_m.size(), 2U);
  EXPECT_NEAR(pot.below_threshold.level_m[0], 0.55, 1e-12);
  EXPECT_NEAR(pot.below_threshold.level_m[1], 0.85, 1e-12);
  EXPECT_THAT(pot.below_threshold.rate_per_yr, ElementsAre(DoubleEq(5 / T), DoubleEq(4 / T)));
  // It plugs into the still-water model: N_0 at 0.7 m is log-linear between the two points.
  tidewright::extremes::StillWaterModel m;
  m.family = tidewright::extremes::Family::gpd;
  m.threshold_m = pot.threshold_m;
  m.rate_per_yr = pot.events_per_yr;
  m.below_threshold = pot.below_threshold;
  EXPECT_NEAR(m.annual_exceedance_rate(0.7), std::sqrt(5 / T * 4 / T), 1e-12);
}

TEST(PeaksOverThreshold, RateCurveStopsWhereEventsMerge) {
  // Two 0.9 m events 100 h apart with 0.6 m between them: separate clusters above 0.6 m, one
  // merged run at or below it. The curve gains (0.89, 5/T) then stops before 0.6 m.
  std::map<int, double> spikes{{100, 1.5}, {1000, 1.2}, {2000, 2.0}, {5000, 0.9}, {5100, 0.9}};
  for (int k = 5001; k < 5100; ++k) spikes[k] = 0.6;
  const auto s = year_with_spikes(spikes);
  tr::PeaksOptions o;
  o.threshold_m = 1.0;
  o.rate_curve_lowest_m = 0.2;
  const auto pot = tr::peaks_over_threshold(s, o);
  const double T = 365.0 / 365.2425;
  ASSERT_EQ(pot.below_threshold.level_m.size(), 1U);
  EXPECT_NEAR(pot.below_threshold.level_m[0], 0.89, 1e-12);
  EXPECT_DOUBLE_EQ(pot.below_threshold.rate_per_yr[0], 5 / T);
  EXPECT_EQ(tr::count_clusters(s.time_utc_s, s.level_m, std::vector<bool>(s.size(), true), 0.5,
                               72 * 3600.0),
            4U);
}

TEST(PeaksOverThreshold, SampleQuantileClosedForm) {
  // Type 7: h = (n − 1) p; for 1..10 and p = 0.99, h = 8.91 → 9 + 0.91 = 9.91.
  std::vector<double> v{10, 3, 1, 2, 9, 4, 5, 8, 7, 6};
  EXPECT_DOUBLE_EQ(tr::sample_quantile(v, 0.99), 9.91);
  EXPECT_DOUBLE_EQ(tr::sample_quantile(v, 0.5), 5.5);
  EXPECT_DOUBLE_EQ(tr::sample_quantile(v, 1.0), 10.0);
  EXPECT_DOUBLE_EQ(tr::sample_quantile(v, 0.0), 1.0);
}

// The 99th and 99.7th percentile thresholds of a year of hourly levels, against
// numpy.quantile (default method "linear", Hyndman & Fan type 7) from Debian's Python.
TEST(PeaksOverThresholdReference, QuantileThresholdMatchesNumpy) {
  std::map<int, double> spikes;
  for (int k = 0; k < 365 * 24; k += 7)
    spikes[k] = 0.3 + 0.9 * std::sin(0.37 * k) * std::sin(0.011 * k);
  const auto s = year_with_spikes(spikes);
  tidewright::testing::TempDir dir;
  const auto path = dir / "levels.txt";
  {
    std::ofstream out(path);
    out.precision(17);
    for (double h : s.level_m) out << h << "\n";
  }
  const std::string script = "import numpy as np; x = np.loadtxt('" + path.string() +
                             "'); print(repr(float(np.quantile(x, 0.99))), "
                             "repr(float(np.quantile(x, 0.997))))";
  const auto r = tr::testing::run_command(std::string(TIDEWRIGHT_PYTHON) + " -c " +
                                          tidewright::testing::shell_quote(script));
  ASSERT_EQ(r.exit_code, 0) << "Debian's /usr/bin/python3 with numpy (python3-numpy) is needed: "
                            << r.err;
  std::istringstream in(r.out);
  double q99 = 0.0;
  double q997 = 0.0;
  in >> q99 >> q997;
  tr::PeaksOptions o;
  o.threshold_quantile = 0.99;
  const auto pot = tr::peaks_over_threshold(s, o);
  EXPECT_NEAR(pot.threshold_m, q99, 1e-15);
  EXPECT_EQ(pot.threshold_quantile, 0.99);
  const auto pot_default = tr::peaks_over_threshold(s);  // AR6's 99.7th percentile
  EXPECT_NEAR(pot_default.threshold_m, q997, 1e-15);
  EXPECT_EQ(pot_default.threshold_quantile, 0.997);
  EXPECT_THAT(pot_default.summary(), HasSubstr("(quantile 0.997), separation 72 h"));
}

TEST(PeaksOverThreshold, DroppedYearsAreNotCounted) {
  // 2001 complete with two events, 2002 only January (8.5 %): dropped, its event left out and
  // its time not counted in the effective years.
  auto s = year_with_spikes({{100, 1.5}, {2000, 1.7}});
  const std::int64_t end = s.time_utc_s.back();
  for (int k = 1; k <= 31 * 24; ++k) {
    s.time_utc_s.push_back(end + k * hour_s);
    s.level_m.push_back(k == 50 ? 3.0 : 0.0);
  }
  s.line.resize(s.level_m.size());
  tr::PeaksOptions o;
  o.threshold_m = 1.0;
  const auto pot = tr::peaks_over_threshold(s, o);
  EXPECT_THAT(pot.level_m, ElementsAre(1.5, 1.7));
  ASSERT_EQ(pot.dropped.size(), 1U);
  EXPECT_EQ(pot.dropped[0].year, 2002);
  EXPECT_DOUBLE_EQ(pot.effective_years, 365.0 / 365.2425);
}

TEST(PeaksOverThreshold, BadOptions) {
  const auto s = year_with_spikes({{100, 1.5}});
  tr::PeaksOptions o;
  o.threshold_m = 1.0;
  o.threshold_quantile = 0.99;
  EXPECT_EQ(input_error_of([&] { (void)tr::peaks_over_threshold(s, o); }),
            "threshold: both a level and a quantile are given; give the threshold as a level in "
            "metres or as a quantile, not both");
  o.threshold_m.reset();
  o.threshold_quantile = 1.0;
  EXPECT_EQ(input_error_of([&] { (void)tr::peaks_over_threshold(s, o); }),
            "threshold quantile: 1 is not inside (0, 1); give a quantile such as 0.99 or 0.997");
  o.threshold_quantile.reset();
  o.separation_h = 0.0;
  EXPECT_EQ(input_error_of([&] { (void)tr::peaks_over_threshold(s, o); }),
            "separation: 0 h is not a positive time; give the minimum separation of independent "
            "events in hours, such as 72");
  o.separation_h = 72.0;
  o.rate_curve_lowest_m = std::nan("");
  EXPECT_EQ(input_error_of([&] { (void)tr::peaks_over_threshold(s, o); }),
            "rate curve lowest level: is not a finite level; give a level in metres");
  o.rate_curve_lowest_m.reset();
  o.threshold_m = 2.0;
  EXPECT_EQ(input_error_of([&] { (void)tr::peaks_over_threshold(s, o); }),
            "spikes: no level of the complete years lies above the threshold 2 m; lower the "
            "threshold");
}
