#include "tidewright/planning/amplification.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "planning/planning_test_support.hpp"
#include "tidewright/common/error.hpp"

using tidewright::extremes::StillWaterModel;
using namespace tidewright::planning;
using tidewright::testing::gev;
using tidewright::testing::gumbel;

// Amplification factor for Gumbel and a known rise: exp(Delta/lambda) (IPCC AR5 WG1 ch. 13;
// docs/references.md: lambda 0.1, Delta 0.5 -> 148.4, computed).
TEST(Amplification, GumbelKnownRiseIsExpDeltaOverLambda) {
  const StillWaterModel m = gumbel(2.0, 0.1);
  const YearConditions c{2100, RiseDistribution::members(Eigen::VectorXd::Constant(1, 0.5)), {}};
  const Amplification a = amplification_of_return_level(m, c, 100.0);
  EXPECT_NEAR(a.amplification_factor, std::exp(5.0), 1e-10 * std::exp(5.0));
  EXPECT_NEAR(a.amplification_factor, 148.4, 0.05);
  EXPECT_DOUBLE_EQ(a.present_return_period_yr, 100.0);
  EXPECT_NEAR(a.future_return_period_yr, 100.0 / std::exp(5.0), 1e-10);
  EXPECT_FALSE(a.present_rate_is_zero);
}

// With Delta ~ N(0.5, 0.1): exp(mu/lambda + sigma^2/(2 lambda^2)) = exp(5.5) = 244.7
// (lognormal mean; docs/references.md, computed).
TEST(Amplification, GumbelNormalRiseIsLognormalMean) {
  const StillWaterModel m = gumbel(2.0, 0.1);
  const YearConditions c{2100, RiseDistribution::normal(0.5, 0.1), {}};
  const Amplification a = amplification(m, c, 2.3);
  EXPECT_NEAR(a.amplification_factor / std::exp(5.5), 1.0, 1e-12);
  EXPECT_NEAR(a.amplification_factor, 244.7, 0.05);
}

// Monte Carlo members from N(0.5, 0.1), n = 20000: the mean of exp(delta/lambda) has relative
// standard error sqrt((exp(sigma^2/lambda^2) - 1)/n) = 0.93 % (lognormal variance; closed
// form); the test allows 4 of them.
TEST(Amplification, MonteCarloMembersWithinSamplingError) {
  const std::size_t n = 20000;
  const auto draws = tidewright::testing::normal_draws(n, 0.5, 0.1, 7);
  const Eigen::VectorXd d = Eigen::Map<const Eigen::VectorXd>(draws.data(), static_cast<Eigen::Index>(n));
  const YearConditions c{2100, RiseDistribution::members(d), {}};
  const double rel_se = std::sqrt(std::expm1(1.0) / static_cast<double>(n));
  const double af = amplification(gumbel(2.0, 0.1), c, 2.5).amplification_factor;
  EXPECT_NEAR(af / std::exp(5.5), 1.0, 4 * rel_se);
}

TEST(Amplification, AboveUpperEndPointIsFlaggedNotPrinted) {
  const StillWaterModel m = gev(2.0, 0.1, -0.5);  // upper end point 2.2 m
  const YearConditions c{2100, RiseDistribution::members(Eigen::VectorXd::Constant(1, 0.3)), {}};
  const Amplification a = amplification(m, c, 2.3);
  EXPECT_TRUE(a.present_rate_is_zero);
  EXPECT_TRUE(std::isinf(a.amplification_factor));
  EXPECT_TRUE(std::isinf(a.present_return_period_yr));
  EXPECT_GT(a.future_rate_per_yr, 0.0);
}

// Emergence: Gumbel lambda 0.1, today's 100-year level, Delta_t = 0.01 (t - 2020) m. The rate
// 0.01 exp(Delta_t/lambda) reaches 1 per year when Delta_t = lambda ln 100 = 0.4605 m, i.e. in
// 2066.05, so the first whole year is 2067 (closed form).
TEST(Emergence, GumbelLinearRiseReachesAnnualInClosedFormYear) {
  const StillWaterModel m = gumbel(2.0, 0.1);
  const auto e = tidewright::testing::linear_rise_from_2020(0.01);
  const auto years = conditions_over_years(e, 2020, 2150);
  const double z100 = present_return_level(m, 100.0);
  const Emergence once = emergence_year(m, years, z100);
  ASSERT_TRUE(once.year.has_value());
  EXPECT_EQ(*once.year, 2067);
  EXPECT_GE(once.rate_in_year_per_yr, 1.0);
  // Ten times a year: Delta = lambda ln 1000 = 0.6908 m -> 2089.08 -> 2090.
  EXPECT_EQ(emergence_year(m, years, z100, 10.0).year.value_or(0), 2090);
  // Never within the span at 1e6 per year.
  EXPECT_FALSE(emergence_year(m, years, z100, 1e6).year.has_value());
  EXPECT_THROW((void)emergence_year(m, years, z100, 0.0), tidewright::InputError);
}

// A member whose rise takes the level below an annual-maxima model's lower end point
// (GEV(2, 0.15, 0.3) ends at 1.5 m, Coles 2001 §3.1.1) makes N_t infinite: the row is beyond
// the model's range, the share of such members is stated, and the quotable factor is the
// bound L/N_0 with L = mean min(N_0(z - delta_i), 1), never inf; here N_0(2.0) = 1 and the
// members at 0.1 and 0.2 m rise have N_0 > 1, so L = 1.
TEST(Amplification, MembersBeyondTheLowerEndPointGiveABoundNotInfinity) {
  const tidewright::extremes::StillWaterModel m = tidewright::testing::gev(2.0, 0.15, 0.3);
  Eigen::VectorXd d(4);
  d << 0.0, 0.1, 0.2, 0.6;
  const YearConditions c{2100, RiseDistribution::members(d), {}};
  const Amplification a = amplification(m, c, 2.0);
  EXPECT_TRUE(a.beyond_annual_maxima_range);
  EXPECT_DOUBLE_EQ(a.beyond_range_fraction, 0.25);
  EXPECT_TRUE(std::isinf(a.amplification_factor));
  EXPECT_NEAR(a.quotable_factor(), 1.0, 1e-12);
  // Without that member the row is inside the range and the factor is N_t/N_0 itself.
  const Eigen::VectorXd inside = d.head(3);
  const Amplification b = amplification(m, YearConditions{2100, RiseDistribution::members(inside), {}}, 3.0);
  EXPECT_FALSE(b.beyond_annual_maxima_range);
  EXPECT_DOUBLE_EQ(b.beyond_range_fraction, 0.0);
  EXPECT_DOUBLE_EQ(b.quotable_factor(), b.amplification_factor);
  EXPECT_TRUE(b.monte_carlo.sampled);
  // Today's AEP and the future one, the expected share of years with an exceedance.
  EXPECT_NEAR(b.present_aep, -std::expm1(-m.annual_exceedance_rate(3.0)), 1e-15);
  double aep = 0.0;
  for (double x : {0.0, 0.1, 0.2}) aep += -std::expm1(-m.annual_exceedance_rate(3.0 - x)) / 3.0;
  EXPECT_NEAR(b.future_aep, aep, 1e-15);
}

// The batch path (AmplificationOptions{false}: bounds, shares and Monte Carlo error from batch
// sums, the squared-rate model and the ordering of N_0) against the member-by-member path, on
// 2,001 members of a GEV with a lower end point, at levels inside and beyond its range.
TEST(Amplification, BatchPathMatchesMemberByMember) {
  const tidewright::extremes::StillWaterModel m = tidewright::testing::gev(2.0, 0.15, 0.25);
  const auto draws = tidewright::testing::normal_draws(2001, 0.4, 0.25, 7);
  const Eigen::VectorXd d = Eigen::Map<const Eigen::VectorXd>(draws.data(), 2001);
  const YearConditions c{2100, RiseDistribution::members(d), {}};
  for (const double z : {1.9, 2.3, 2.8, 3.5}) {
    const Amplification full = amplification(m, c, z);
    const Amplification fast = amplification(m, c, z, AmplificationOptions{false});
    EXPECT_EQ(fast.beyond_annual_maxima_range, full.beyond_annual_maxima_range) << z;
    EXPECT_DOUBLE_EQ(fast.beyond_range_fraction, full.beyond_range_fraction) << z;
    EXPECT_NEAR(fast.rate_lower_bound_per_yr, full.rate_lower_bound_per_yr, 1e-12 * full.rate_lower_bound_per_yr) << z;
    EXPECT_TRUE(std::isnan(fast.future_aep));
    // The error from sums (Q - S^2) against the spread of the members' own rates.
    std::vector<double> rates(c.rise.size());
    node_rates(m, c, z, rates);
    const MonteCarloError direct = weighted_mean_error(rates, c.rise.weight, true);
    if (full.beyond_range_fraction == 0.0) {
      EXPECT_NEAR(fast.monte_carlo.standard_error * m.annual_exceedance_rate(z), direct.standard_error,
                  1e-7 * direct.standard_error)
          << z;
      EXPECT_NEAR(fast.monte_carlo.effective_sample_size, direct.effective_sample_size,
                  1e-7 * direct.effective_sample_size)
          << z;
      EXPECT_NEAR(fast.monte_carlo.heaviest_share, direct.heaviest_share, 1e-9) << z;
    }
  }
}
