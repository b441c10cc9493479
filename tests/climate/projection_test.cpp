#include "tidewright/climate/projection.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "tidewright/common/error.hpp"

using namespace tidewright::climate;

namespace {

double quantile(const Eigen::VectorXd& v, double p) {
  std::vector<double> x(v.data(), v.data() + v.size());
  std::sort(x.begin(), x.end());
  const double h = static_cast<double>(x.size() - 1) * p;
  const auto i = static_cast<std::size_t>(h);
  const std::size_t j = std::min(i + 1, x.size() - 1);
  return x[i] + (h - static_cast<double>(i)) * (x[j] - x[i]);
}

Eigen::Index col(const ComponentEnsemble& e, int year) { return year - e.years.front(); }

// Least-squares rate (mm/yr) of each member's series over first..last.
Eigen::VectorXd member_rates_mm(const ComponentEnsemble& e, const Eigen::MatrixXd& m, int first, int last) {
  const double mean_year = 0.5 * (first + last);
  double sxx = 0.0;
  for (int y = first; y <= last; ++y) sxx += (y - mean_year) * (y - mean_year);
  Eigen::VectorXd rate(e.member_count());
  for (Eigen::Index i = 0; i < e.member_count(); ++i) {
    double sxy = 0.0;
    for (int y = first; y <= last; ++y) sxy += (y - mean_year) * m(i, col(e, y));
    rate(i) = 1000.0 * sxy / sxx;
  }
  return rate;
}

ProjectionOptions options(int first, int last, long long members) {
  ProjectionOptions o;
  o.first_year = first;
  o.last_year = last;
  o.member_count = members;
  return o;
}

}  // namespace

TEST(ClimateProjection, SameSeedSameMembersAndPrefixStable) {
  const Scenario s = builtin_pathway("midway");
  const ComponentEnsemble a = project_global_components(s, options(2020, 2100, 300));
  const ComponentEnsemble b = project_global_components(s, options(2020, 2100, 300));
  ASSERT_EQ(a.component_names, b.component_names);
  for (std::size_t c = 0; c < a.rise_m.size(); ++c) EXPECT_TRUE(a.rise_m[c] == b.rise_m[c]);
  EXPECT_TRUE(a.surface_warming_k == b.surface_warming_k);
  // A member depends only on the seed and its index: the first 100 of 300 equal a 100-member run.
  const ComponentEnsemble small = project_global_components(s, options(2020, 2100, 100));
  EXPECT_TRUE(small.total_m() == a.total_m().topRows(100));
  ProjectionOptions other = options(2020, 2100, 300);
  other.seed = 7;
  EXPECT_FALSE(project_global_components(s, other).total_m() == a.total_m());
  EXPECT_EQ(a.seed, 20261201ULL);
  EXPECT_TRUE(a.illustrative);
  EXPECT_EQ(a.scenario, s.label);
  EXPECT_EQ(a.reference, "sea level and ocean heat: 1995-2014 mean; surface warming: 1850-1900 mean");
}

// Members are whole paths: a member high in 2050 stays high in 2100 (seed 20261201, 2000
// members: measured correlation 0.999), and no member jumps from year to year.
TEST(ClimateProjection, MembersAreWholePaths) {
  const ComponentEnsemble e = project_global_components(builtin_pathway("midway"), options(2020, 2150, 2000));
  const Eigen::MatrixXd t = e.total_m();
  const Eigen::VectorXd a = t.col(col(e, 2050)).array() - t.col(col(e, 2050)).mean();
  const Eigen::VectorXd b = t.col(col(e, 2100)).array() - t.col(col(e, 2100)).mean();
  const double corr = a.dot(b) / std::sqrt(a.squaredNorm() * b.squaredNorm());
  EXPECT_GT(corr, 0.9);
  // A member's rate changes smoothly: the largest change of the annual step from one year to the
  // next stays far below the steps themselves (a path stitched from different members would jump).
  const Eigen::MatrixXd step = t.rightCols(t.cols() - 1) - t.leftCols(t.cols() - 1);
  const double max_step = step.cwiseAbs().maxCoeff();
  const double max_jerk = (step.rightCols(step.cols() - 1) - step.leftCols(step.cols() - 1)).cwiseAbs().maxCoeff();
  EXPECT_LT(max_jerk, 0.05 * max_step);
  std::printf("corr(2050, 2100) = %.3f, largest annual step %.4f m, largest change of step %.5f m\n", corr, max_step,
              max_jerk);
}

// Calibration targets, not independent checks: each component's 2100 median and likely range
// (17-83 %) against IPCC AR6 WG1 Table 9.9 for the SSP whose assessed warming each pathway is
// calibrated to (relative to 1995-2014, m; the table's values as read from the chapter,
// docs/methods-climate.md section 6): median within 10 % and both ends within 0.03 m; the same
// for the 2100 totals. Table 9.9 gives 2150 for totals only: there the medians are held to 10 %,
// but the likely ranges are not met (0.07-0.11 m high at the lower end, 0.12-0.20 m at the
// upper; AR6 extends its ice sheets past 2100 at constant rates, the model does not:
// Totals2150UnderAr6ConstantRateExtension below), so the 2150 ends are printed, not asserted. Also the 2050 likely ranges (Table 9.9): SSP1-2.6 0.16-0.25, SSP2-4.5 0.17-0.26,
// SSP5-8.5 0.20-0.29 m. The ensemble is 10,000 members (seed 20261201).
struct Assessed {
  double median, lo, hi;
};
struct PathwayTargets {
  const char* pathway;
  Assessed components[5];  // thermal expansion, glaciers, Greenland, Antarctica, land water
  Assessed total_2100, total_2150;
  double lo_2050, hi_2050;
};

TEST(ClimateProjection, ComponentsMeetAr6Table99) {
  const PathwayTargets cases[] = {
      {"restrained",
       {{0.14, 0.11, 0.18}, {0.09, 0.07, 0.11}, {0.06, 0.01, 0.10}, {0.11, 0.03, 0.27}, {0.03, 0.01, 0.04}},
       {0.44, 0.32, 0.62}, {0.68, 0.46, 0.99}, 0.16, 0.25},
      {"midway",
       {{0.20, 0.16, 0.24}, {0.12, 0.10, 0.15}, {0.08, 0.04, 0.13}, {0.11, 0.03, 0.29}, {0.03, 0.01, 0.04}},
       {0.56, 0.44, 0.76}, {0.92, 0.66, 1.33}, 0.17, 0.26},
      {"unchecked",
       {{0.30, 0.24, 0.36}, {0.18, 0.15, 0.21}, {0.13, 0.09, 0.18}, {0.12, 0.03, 0.34}, {0.03, 0.01, 0.04}},
       {0.77, 0.63, 1.01}, {1.32, 0.98, 1.88}, 0.20, 0.29},
  };
  const auto check = [](const Eigen::VectorXd& v, const Assessed& a, const char* what, bool ends = true) {
    const double m = quantile(v, 0.5), lo = quantile(v, 0.17), hi = quantile(v, 0.83);
    EXPECT_NEAR(m, a.median, 0.10 * a.median) << what;
    if (ends) {
      EXPECT_NEAR(lo, a.lo, 0.03) << what;
      EXPECT_NEAR(hi, a.hi, 0.03) << what;
    }
    std::printf("  %-18s %.3f (%.3f-%.3f)  AR6 %.2f (%.2f-%.2f)\n", what, m, lo, hi, a.median, a.lo, a.hi);
  };
  for (const PathwayTargets& c : cases) {
    SCOPED_TRACE(c.pathway);
    std::printf("%s\n", c.pathway);
    const ComponentEnsemble e = project_global_components(builtin_pathway(c.pathway), options(2020, 2150, 10000));
    for (std::size_t k = 0; k < 5; ++k) check(e.rise_m[k].col(col(e, 2100)), c.components[k], e.component_names[k].c_str());
    const Eigen::MatrixXd t = e.total_m();
    check(t.col(col(e, 2100)), c.total_2100, "total 2100");
    check(t.col(col(e, 2150)), c.total_2150, "total 2150", false);
    const double m2050 = quantile(t.col(col(e, 2050)), 0.5);
    EXPECT_GT(m2050, c.lo_2050);
    EXPECT_LT(m2050, c.hi_2050);
  }
}

// Why the 2150 ranges sit above Table 9.9's: AR6 extends its ice sheets past 2100 at constant
// rates ("only the former (constant rates) is used for time-series projections up to 2150",
// WG1 section 9.6.3.2, read from the chapter: docs/references.md), while the model's ice keeps
// responding to the warming and the still-warming deep layer. Applying AR6's convention to the
// same members (Greenland and Antarctica held at their 2090-2100 mean rates after 2100) must bring
// each 2150 median within 5 % of Table 9.9's and every likely-range end closer to it than the
// model as run; the Antarctic SSP5-8.5 upper end must then meet the same section's "-0.1 to 0.7 m"
// for 2150 within 0.03 m. The lower ends stay 0.04-0.06 m high: AR6's Antarctic likely range is a
// p-box (the lower of two models' 17th percentiles, section 9.6.3.2), which one ensemble does not
// form. Printed in full; docs/methods-climate.md section 6.
TEST(ClimateProjection, Totals2150UnderAr6ConstantRateExtension) {
  const struct {
    const char* pathway;
    Assessed total_2150;
  } cases[] = {{"restrained", {0.68, 0.46, 0.99}}, {"midway", {0.92, 0.66, 1.33}}, {"unchecked", {1.32, 0.98, 1.88}}};
  constexpr std::size_t greenland = 2, antarctica = 3;
  for (const auto& c : cases) {
    SCOPED_TRACE(c.pathway);
    const ComponentEnsemble e = project_global_components(builtin_pathway(c.pathway), options(2020, 2150, 10000));
    ASSERT_EQ(e.component_names[greenland], "greenland");
    ASSERT_EQ(e.component_names[antarctica], "antarctica");
    const Eigen::VectorXd as_run = e.total_m().col(col(e, 2150));
    // rise(2150) = rise(2100) + 50 yr x the 2090-2100 mean rate, for each ice sheet.
    const auto extended = [&e](std::size_t k) -> Eigen::VectorXd {
      return e.rise_m[k].col(col(e, 2100)) + 5.0 * (e.rise_m[k].col(col(e, 2100)) - e.rise_m[k].col(col(e, 2090)));
    };
    const Eigen::VectorXd convention = as_run - e.rise_m[greenland].col(col(e, 2150)) -
                                       e.rise_m[antarctica].col(col(e, 2150)) + extended(greenland) + extended(antarctica);
    const double ps[] = {0.5, 0.17, 0.83};
    const double ar6[] = {c.total_2150.median, c.total_2150.lo, c.total_2150.hi};
    for (std::size_t k = 0; k < 3; ++k) {
      const double run = quantile(as_run, ps[k]), conv = quantile(convention, ps[k]);
      EXPECT_LT(std::fabs(conv - ar6[k]), std::fabs(run - ar6[k])) << "quantile " << ps[k];
      std::printf("%-10s 2150 q%.2f: as run %.3f, AR6's extension %.3f, Table 9.9 %.2f\n", c.pathway, ps[k], run, conv, ar6[k]);
    }
    EXPECT_NEAR(quantile(convention, 0.5), c.total_2150.median, 0.05 * c.total_2150.median);
    if (std::string(c.pathway) == "unchecked") {
      const Eigen::VectorXd ais = extended(antarctica);
      const Eigen::VectorXd ais_run = e.rise_m[antarctica].col(col(e, 2150));
      EXPECT_NEAR(quantile(ais, 0.83), 0.7, 0.03);
      std::printf("unchecked Antarctica 2150 likely: as run %.3f-%.3f, AR6's extension %.3f-%.3f (AR6 -0.1 to 0.7)\n",
                  quantile(ais_run, 0.17), quantile(ais_run, 0.83), quantile(ais, 0.17), quantile(ais, 0.83));
    }
  }
}

// Surface warming against IPCC AR6 WG1 SPM: 2011-2020 1.09 [0.95-1.20] K over 1850-1900
// (SPM A.1.2) within 0.05 K; 2081-2100 medians of the comparable SSPs (Table SPM.1: SSP1-2.6 1.8,
// SSP2-4.5 2.7, SSP5-8.5 4.4 K) within 0.1 K, the level each pathway's forcing is calibrated to.
TEST(ClimateProjection, WarmingMeetsTheAssessedValues) {
  const struct {
    const char* pathway;
    double late_k;
  } cases[] = {{"restrained", 1.8}, {"midway", 2.7}, {"unchecked", 4.4}};
  for (const auto& c : cases) {
    SCOPED_TRACE(c.pathway);
    const ComponentEnsemble e = project_global_components(builtin_pathway(c.pathway), options(2011, 2100, 4000));
    Eigen::VectorXd recent = Eigen::VectorXd::Zero(e.member_count());
    Eigen::VectorXd late = Eigen::VectorXd::Zero(e.member_count());
    for (int y = 2011; y <= 2020; ++y) recent += e.surface_warming_k.col(col(e, y)) / 10.0;
    for (int y = 2081; y <= 2100; ++y) late += e.surface_warming_k.col(col(e, y)) / 20.0;
    EXPECT_NEAR(quantile(recent, 0.5), 1.09, 0.05);
    EXPECT_NEAR(quantile(late, 0.5), c.late_k, 0.1);
    std::printf("%s: warming 2011-2020 %.3f K, 2081-2100 %.2f K (5-95 %% %.2f-%.2f)\n", c.pathway, quantile(recent, 0.5),
                quantile(late, 0.5), quantile(late, 0.05), quantile(late, 0.95));
  }
}

// The past against IPCC AR6 WG1 Table 9.5 (read from the chapter's table, docs/methods-climate.md
// section 6). The model is a sum of components, so its total is held to the table's sum of
// observed contributions, whose very likely range it must meet: 1901-2018 164.6 [116.9-212.4] mm,
// 2006-2018 3.61 [2.88-4.35] mm/yr. The observed GMSL itself is higher (201.9 mm; 3.69 mm/yr):
// the budget's own gap, which the model does not have; it is printed, not asserted.
TEST(ClimateProjection, HistoricalRiseAndRateMeetTheObservedBudget) {
  const ComponentEnsemble e = project_global_components(builtin_pathway("midway"), options(1901, 2020, 2000));
  const Eigen::MatrixXd t = e.total_m();
  const double rise = quantile(t.col(col(e, 2018)) - t.col(col(e, 1901)), 0.5);
  const double rate_mm = quantile(member_rates_mm(e, t, 2006, 2018), 0.5);
  EXPECT_GT(rise, 0.1169);
  EXPECT_LT(rise, 0.2124);
  EXPECT_GT(rate_mm, 2.88);
  EXPECT_LT(rate_mm, 4.35);
  std::printf("median rise 1901-2018 %.3f m (sum of contributions 0.165, observed 0.202), rate 2006-2018 %.2f mm/yr "
              "(3.61; observed 3.69)\n", rise, rate_mm);
}

// Hindcast of the satellite era, 1993-2018, against AR6 WG1 Table 9.5 (mm/yr, very likely
// ranges): the median of the members' least-squares rates of each term must lie in the table's
// range. Greenland is the exception and is only printed: the model gives 0.29 against 0.43
// [0.36-0.51], because a loss that grows with warming from zero cannot carry both today's rate and
// AR6's small SSP1-2.6 loss to 2100 (docs/methods-climate.md, section 6). The total is held to the
// sum of contributions, 2.85 [2.41-3.29], and within 10 % of it; observed GMSL is 3.25 [2.88-3.61].
TEST(ClimateProjection, HindcastOfTheSatelliteEraMeetsTheObservedBudget) {
  // The glaciers' path must reach their volume year 2019, so the run ends there.
  const ComponentEnsemble e = project_global_components(builtin_pathway("midway"), options(1993, 2019, 10000));
  const struct {
    const char* name;
    double central, lo, hi;
    bool asserted;
  } rows[] = {{"thermal_expansion", 1.31, 0.95, 1.66, true}, {"glaciers", 0.55, 0.40, 0.70, true},
              {"greenland", 0.43, 0.36, 0.51, false},        {"antarctica", 0.25, 0.16, 0.33, true},
              {"land_water", 0.31, 0.13, 0.49, true}};
  for (std::size_t k = 0; k < 5; ++k) {
    ASSERT_EQ(e.component_names[k], rows[k].name);
    const double median = quantile(member_rates_mm(e, e.rise_m[k], 1993, 2018), 0.5);
    if (rows[k].asserted) {
      EXPECT_GE(median, rows[k].lo) << rows[k].name;
      EXPECT_LE(median, rows[k].hi) << rows[k].name;
    }
    std::printf("%-18s %.2f mm/yr (AR6 %.2f [%.2f-%.2f])\n", rows[k].name, median, rows[k].central, rows[k].lo, rows[k].hi);
  }
  const double total = quantile(member_rates_mm(e, e.total_m(), 1993, 2018), 0.5);
  EXPECT_GE(total, 2.41);
  EXPECT_LE(total, 3.29);
  EXPECT_NEAR(total, 2.85, 0.285);
  std::printf("total %.2f mm/yr (sum of contributions 2.85 [2.41-3.29]; observed 3.25 [2.88-3.61])\n", total);
}

TEST(ClimateProjection, OutputsAreRelativeToTheChosenReference) {
  ProjectionOptions o = options(1990, 2030, 50);
  const ComponentEnsemble e = project_global_components(builtin_pathway("midway"), o);
  for (const Eigen::MatrixXd& m : e.rise_m) {
    EXPECT_LT((m.middleCols(col(e, 1995), 20).rowwise().mean()).cwiseAbs().maxCoeff(), 1e-12);
  }
  EXPECT_LT((e.ocean_heat_content_change_yj.middleCols(col(e, 1995), 20).rowwise().mean()).cwiseAbs().maxCoeff(), 1e-12);
  o.reference = {2020, 2020};
  const ComponentEnsemble f = project_global_components(builtin_pathway("midway"), o);
  EXPECT_LT(f.total_m().col(col(f, 2020)).cwiseAbs().maxCoeff(), 1e-12);
  EXPECT_NE(f.reference.find("sea level and ocean heat: 2020;"), std::string::npos);
}

// Skipping the energy balance: feeding a member's own warming back as a temperature scenario gives
// the same glacier and Greenland terms exactly and nearly the same thermal expansion and
// Antarctic term (the deep box, which drives both, then sees the surface warming as linear within
// each year).
TEST(ClimateProjection, TemperatureScenarioReproducesForcingRun) {
  ProjectionOptions o = options(1850, 2200, 1);
  const MemberPath forced = simulate_member(builtin_pathway("midway"), o.central, o);
  const Scenario warm = surface_warming_scenario("warming", forced.years, forced.surface_k, "test");
  const MemberPath given = simulate_member(warm, o.central, o);
  const std::size_t i = 2200 - 1850;
  EXPECT_NEAR(given.glaciers_m[i], forced.glaciers_m[i], 1e-12);
  EXPECT_NEAR(given.greenland_m[i], forced.greenland_m[i], 1e-12);
  EXPECT_NEAR(given.antarctica_m[i], forced.antarctica_m[i], 1e-3 * forced.antarctica_m[i]);
  EXPECT_NEAR(given.thermal_efficiency_m[i], forced.thermal_efficiency_m[i], 1e-3 * forced.thermal_efficiency_m[i]);
  // A forcing scenario with the built-in values gives identical members.
  const Scenario mid = builtin_pathway("midway");
  const Scenario copy = forcing_scenario("copy", mid.years, mid.values, "test");
  EXPECT_TRUE(project_global_components(copy, options(2020, 2100, 20)).total_m() ==
              project_global_components(mid, options(2020, 2100, 20)).total_m());
}

TEST(ClimateProjection, LayeredRouteIsCloseToEfficiencyRoute) {
  ProjectionOptions o = options(2020, 2100, 500);
  const ComponentEnsemble a = project_global_components(builtin_pathway("midway"), o);
  o.thermal_route = ThermalExpansionRoute::layered;
  const ComponentEnsemble b = project_global_components(builtin_pathway("midway"), o);
  const double ma = quantile(a.rise_m[0].col(col(a, 2100)), 0.5);
  const double mb = quantile(b.rise_m[0].col(col(b, 2100)), 0.5);
  EXPECT_NEAR(mb, ma, 2.0 * 0.01 / 0.11 * ma);  // two standard deviations of the efficiency
  std::printf("thermal 2100 median: efficiency %.3f m, layered %.3f m\n", ma, mb);
}

TEST(ClimateProjection, BadOptionsThrowInputError) {
  const Scenario s = builtin_pathway("midway", 2150);
  using tidewright::InputError;
  EXPECT_THROW((void)project_global_components(s, options(2020, 2100, 0)), InputError);
  EXPECT_THROW((void)project_global_components(s, options(2020, 2100, -5)), InputError);
  EXPECT_THROW((void)project_global_components(s, options(2020, 2200, 10)), InputError);  // outside scenario
  EXPECT_THROW((void)project_global_components(s, options(1800, 2100, 10)), InputError);
  EXPECT_THROW((void)project_global_components(s, options(2100, 2020, 10)), InputError);
  ProjectionOptions o = options(2020, 2100, 10);
  o.reference = {1800, 1810};
  EXPECT_THROW((void)project_global_components(s, o), InputError);
  Scenario gapped = s;
  gapped.years[5] += 1;  // built by hand, bypassing the builders' checks
  EXPECT_THROW((void)project_global_components(gapped, options(2020, 2100, 10)), InputError);
  const Scenario late = forcing_scenario("late", {2030, 2031}, {3.0, 3.1}, "late.csv");
  EXPECT_THROW((void)project_global_components(late, options(2030, 2031, 10)), InputError);
  try {
    (void)project_global_components(s, options(2020, 2100, -5));
  } catch (const InputError& e) {
    EXPECT_EQ(e.where(), "--samples");
  }
}

// The reference period as the members file, a quantile table, --reference and the site file
// give it: one or two years of up to four digits; anything else (signs, overflow, text after)
// is an InputError at the caller's `where`.
TEST(ParseYearSpan, ReadsAYearOrAPeriodAndNothingElse) {
  using tidewright::climate::parse_year_span;
  using tidewright::climate::YearSpan;
  EXPECT_EQ(parse_year_span("1995-2014", "w"), (YearSpan{1995, 2014}));
  EXPECT_EQ(parse_year_span("2020", "w"), (YearSpan{2020, 2020}));
  EXPECT_DOUBLE_EQ(parse_year_span("1995-2014", "w").middle_year(), 2004.5);
  EXPECT_EQ(parse_year_span("1995-2014", "w").text(), "1995-2014");
  for (const char* bad : {"", "-", "1995-", "-2014", "2014-1995", "1995-2014 mean", "99999999999",
                          "1995-99999999999", "+2020", "20 20", "1995--2014"}) {
    try {
      (void)parse_year_span(bad, "members.csv:2: reference_period");
      ADD_FAILURE() << "'" << bad << "' was accepted";
    } catch (const tidewright::InputError& e) {
      EXPECT_EQ(e.where(), "members.csv:2: reference_period");
    }
  }
}
