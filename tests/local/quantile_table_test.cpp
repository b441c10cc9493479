#include "tidewright/local/quantile_table.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <fstream>
#include <numbers>
#include <numeric>

#include "support/run_cli.hpp"
#include "tidewright/common/error.hpp"

using tidewright::InputError;
using namespace tidewright::local;

namespace {

// Where a parse fails, or "" when it does not.
std::string error_where(const std::string& text) {
  try {
    (void)parse_quantile_table(text, "t.csv");
  } catch (const InputError& e) {
    return e.where();
  }
  return "";
}

double phi_inv(double p) { return boost::math::quantile(boost::math::normal_distribution<double>(), p); }

// A table whose quantiles are those of N(m_t, s_t), m_t = 0.005 (t - 2020), s_t = 0.002 (t - 2020)
// + 0.01, at 5/17/50/83/95 % (normal quantiles from Boost.Math).
QuantileTable normal_table() {
  QuantileTable t;
  t.years = {2030, 2050, 2100};
  t.probabilities = {0.05, 0.17, 0.5, 0.83, 0.95};
  t.rise_m.resize(3, 5);
  for (int r = 0; r < 3; ++r) {
    const double dt = t.years[static_cast<std::size_t>(r)] - 2020.0;
    for (int k = 0; k < 5; ++k) {
      t.rise_m(r, k) = 0.005 * dt + (0.002 * dt + 0.01) * phi_inv(t.probabilities[static_cast<std::size_t>(k)]);
    }
  }
  t.source = "normal";
  return t;
}

// A skewed table (wider upper tail, like published projections), values invented for the test.
QuantileTable skewed_table() {
  return parse_quantile_table(
      "year,p5,p17,p50,p83,p95\n2050,0.15,0.18,0.21,0.26,0.31\n2100,0.35,0.45,0.58,0.80,1.02\n", "skewed.csv");
}

}  // namespace

TEST(QuantileTable, ReadsYearsProbabilitiesAndValues) {
  tidewright::testing::TempDir dir;
  const auto path = dir / "table.csv";
  std::ofstream(path) << "# invented test table\nyear,p5,p17,p50,p83,p95\n2050,0.15,0.18,0.21,0.26,0.31\n"
                         "2100,0.35,0.45,0.58,0.80,1.02\n";
  const QuantileTable t = read_quantile_table(path);
  ASSERT_EQ(t.years, (std::vector<int>{2050, 2100}));
  ASSERT_EQ(t.probabilities.size(), 5U);
  EXPECT_DOUBLE_EQ(t.probabilities[1], 0.17);
  EXPECT_DOUBLE_EQ(t.rise_m(1, 4), 1.02);
  EXPECT_THROW((void)read_quantile_table(dir / "missing.csv"), InputError);
}

// Issue 12: a published table may state the period its rise is measured from.
TEST(QuantileTable, ReferencePeriodLineIsRead) {
  const auto t = parse_quantile_table(
      "# reference_period: 1995-2014\nyear,p17,p50,p83\n2100,0.4,0.5,0.7\n", "t.csv");
  ASSERT_TRUE(t.reference_period.has_value());
  EXPECT_EQ(*t.reference_period, (tidewright::climate::YearSpan{1995, 2014}));
  EXPECT_FALSE(parse_quantile_table("year,p17,p50,p83\n2100,0.4,0.5,0.7\n", "t.csv")
                   .reference_period.has_value());
  EXPECT_EQ(error_where("# reference_period: mid-90s\nyear,p50\n2100,0.5\n"),
            "t.csv:1: reference_period");
  TableSampling sampling;
  sampling.members = 5;
  EXPECT_EQ(sample_quantile_table(t, sampling).reference_period, t.reference_period);
}

TEST(QuantileTable, BadTablesNameFileAndLine) {
  EXPECT_EQ(error_where("year,p5,p50,p95\n2050,0.1,0.2,0.3\n2100,0.5,0.4,0.9\n"), "t.csv:3");  // not increasing
  EXPECT_EQ(error_where("year,p5,p50,p95\n2100,0.1,0.2,0.3\n2050,0.2,0.3,0.4\n"), "t.csv:3");  // unsorted years
  EXPECT_EQ(error_where("year,p5,p50,p95\n2050,0.1,0.2,0.3\n2050,0.2,0.3,0.4\n"), "t.csv:3");  // repeated year
  EXPECT_EQ(error_where("year,p50,p5,p95\n2050,0.1,0.2,0.3\n"), "t.csv:1");    // probabilities out of order
  EXPECT_EQ(error_where("year,p0,p50,p95\n2050,0.1,0.2,0.3\n"), "t.csv:1");    // 0 %
  EXPECT_EQ(error_where("year,p5,p50,p100\n2050,0.1,0.2,0.3\n"), "t.csv:1");   // 100 %
  EXPECT_EQ(error_where("year,p5,median,p95\n2050,0.1,0.2,0.3\n"), "t.csv:1");  // not a quantile column
  EXPECT_EQ(error_where("year,p50\n2050,0.2\n"), "t.csv:1");                    // one quantile only
  EXPECT_EQ(error_where("# c\nyear,p5,p95\n2050.5,0.1,0.3\n"), "t.csv:3");      // not a whole year
  EXPECT_EQ(error_where("year,p5,p95\n2050,NA,0.3\n"), "t.csv:2");              // missing value
  EXPECT_EQ(error_where("year,p5,p95\n2050,0.2,0.2\n"), "");                    // equal quantiles are allowed
}

// The distribution passes through every given quantile (interpolation), and for quantiles of a
// normal it is that normal everywhere, tails included, because PCHIP through collinear points
// in normal-score space is the line (closed form: x = m + s Phi^-1(p)).
TEST(QuantileDistribution, ReproducesQuantilesAndNormalTails) {
  const QuantileTable t = normal_table();
  const QuantileDistribution d = distribution_in_year(t, 2100);
  for (std::size_t k = 0; k < 5; ++k) EXPECT_NEAR(d.quantile(t.probabilities[k]), t.rise_m(2, static_cast<Eigen::Index>(k)), 1e-14);
  for (double p : {0.001, 0.01, 0.3, 0.7, 0.99, 0.999}) {
    EXPECT_NEAR(d.quantile(p), 0.4 + 0.17 * phi_inv(p), 1e-12) << p;
  }
  // Between listed years each quantile is linear in time: 2075 is the mean of 2050 and 2100.
  const QuantileDistribution mid = distribution_in_year(t, 2075);
  EXPECT_NEAR(mid.quantile(0.95), 0.5 * (t.rise_m(1, 4) + t.rise_m(2, 4)), 1e-14);
  EXPECT_THROW((void)distribution_in_year(t, 2101), InputError);
}

TEST(QuantileDistribution, SkewedTableIsMonotoneWithLinearScoreTails) {
  const QuantileDistribution d = distribution_in_year(skewed_table(), 2100);
  double prev = -1e9;
  for (double s = -6.0; s <= 6.0; s += 0.01) {
    const double x = d.rise_at_score(s);
    EXPECT_GE(x, prev) << s;
    prev = x;
  }
  // Upper tail: slope of the outermost pair (0.80 -> 1.02 m between Phi^-1(0.83) and Phi^-1(0.95)).
  const double slope = 0.22 / (phi_inv(0.95) - phi_inv(0.83));
  EXPECT_NEAR(d.quantile(0.99), 1.02 + slope * (phi_inv(0.99) - phi_inv(0.95)), 1e-12);
  // Three quantiles: piecewise linear in score.
  const QuantileDistribution three({0.17, 0.5, 0.83}, {0.4, 0.5, 0.7});
  EXPECT_NEAR(three.rise_at_score(0.5 * phi_inv(0.83)), 0.6, 1e-12);
}

// Sampled members reproduce the table in each year: the fraction of members at or below the
// p quantile is binomial with sd sqrt(p(1 - p)/n); the test allows 4 sd (n = 10000).
TEST(TableSampling, MembersReproduceQuantilesEachYearAndKeepRanks) {
  const QuantileTable t = skewed_table();
  TableSampling s;
  s.members = 10000;
  const RiseEnsemble e = sample_quantile_table(t, s);
  ASSERT_EQ(e.rise_m.rows(), 10000);
  ASSERT_EQ(e.years, t.years);
  for (Eigen::Index k = 0; k < 2; ++k) {
    for (std::size_t q = 0; q < t.probabilities.size(); ++q) {
      const double x = t.rise_m(k, static_cast<Eigen::Index>(q));
      const double frac = (e.rise_m.col(k).array() <= x).cast<double>().mean();
      const double p = t.probabilities[q];
      EXPECT_NEAR(frac, p, 4.0 * std::sqrt(p * (1 - p) / 1e4)) << t.years[static_cast<std::size_t>(k)] << " " << p;
    }
  }
  // Comonotone: the member order is the same in both years.
  std::vector<Eigen::Index> a(10000), b(10000);
  std::iota(a.begin(), a.end(), 0);
  std::iota(b.begin(), b.end(), 0);
  std::sort(a.begin(), a.end(), [&](auto i, auto j) { return e.rise_m(i, 0) < e.rise_m(j, 0); });
  std::sort(b.begin(), b.end(), [&](auto i, auto j) { return e.rise_m(i, 1) < e.rise_m(j, 1); });
  EXPECT_EQ(a, b);
  // Same seed, same members.
  EXPECT_EQ(sample_quantile_table(t, s).rise_m, e.rise_m);
}

namespace {
std::vector<double> ranks(const Eigen::VectorXd& x) {
  std::vector<Eigen::Index> idx(static_cast<std::size_t>(x.size()));
  std::iota(idx.begin(), idx.end(), 0);
  std::sort(idx.begin(), idx.end(), [&](auto i, auto j) { return x(i) < x(j); });
  std::vector<double> r(idx.size());
  for (std::size_t k = 0; k < idx.size(); ++k) r[static_cast<std::size_t>(idx[k])] = static_cast<double>(k);
  return r;
}
}  // namespace

// With rho = 0.95 per year and 10 years apart, the scores correlate r = 0.95^10 = 0.599; the
// Spearman rank correlation of a bivariate normal is (6/pi) asin(r/2) = 0.583 (Pearson 1907,
// closed form); its sampling sd is below 1/sqrt(n - 1), the test allows 4 of them.
TEST(TableSampling, CorrelationParameterSetsRankCorrelation) {
  const QuantileTable t = normal_table();
  TableSampling s;
  s.members = 10000;
  s.years = {2040, 2050};
  s.year_to_year_correlation = 0.95;
  const RiseEnsemble e = sample_quantile_table(t, s);
  const auto r0 = ranks(e.rise_m.col(0));
  const auto r1 = ranks(e.rise_m.col(1));
  const double n = 10000;
  const double mean = (n - 1) / 2;
  double sxy = 0, sxx = 0;
  for (std::size_t i = 0; i < r0.size(); ++i) {
    sxy += (r0[i] - mean) * (r1[i] - mean);
    sxx += (r0[i] - mean) * (r0[i] - mean);
  }
  const double expect = 6.0 / std::numbers::pi * std::asin(std::pow(0.95, 10) / 2.0);
  EXPECT_NEAR(sxy / sxx, expect, 4.0 / std::sqrt(n - 1));
  // Marginals stay right in the second year: 95 % quantile of N(0.15, 0.07) at 2050.
  const double x95 = 0.15 + 0.07 * phi_inv(0.95);
  EXPECT_NEAR((e.rise_m.col(1).array() <= x95).cast<double>().mean(), 0.95, 4.0 * std::sqrt(0.95 * 0.05 / n));
  s.year_to_year_correlation = 1.5;
  EXPECT_THROW((void)sample_quantile_table(t, s), InputError);
  s.year_to_year_correlation = 1.0;
  s.members = 0;
  EXPECT_THROW((void)sample_quantile_table(t, s), InputError);
}
