#include "tidewright/planning/allowance.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <numeric>

#include "planning/planning_test_support.hpp"
#include "tidewright/common/error.hpp"

using tidewright::extremes::StillWaterModel;
using namespace tidewright::planning;
using tidewright::testing::gev;
using tidewright::testing::gumbel;

namespace {
AllowanceOptions numerical() {
  AllowanceOptions o;
  o.use_closed_form = false;
  return o;
}
}  // namespace

// Hunter (2012), Climatic Change 113:239: A = mu + sigma^2/(2 lambda); lambda 0.1, mu 0.5,
// sigma 0.1 -> 0.55 m (docs/references.md, computed from the formula).
TEST(Allowance, HunterClosedFormValue) {
  EXPECT_NEAR(hunter_allowance_gumbel_normal(0.1, 0.5, 0.1), 0.55, 1e-15);
}

TEST(Allowance, GumbelNormalClosedFormAndRootAgreeWithHunter) {
  const StillWaterModel m = gumbel(3.0, 0.1);
  const YearConditions c{2100, RiseDistribution::normal(0.5, 0.1), {}};
  const Allowance closed = allowance(m, c, 100.0);
  EXPECT_EQ(closed.method, "hunter2012_gumbel_closed_form");
  EXPECT_NEAR(closed.allowance_m, 0.55, 1e-12);
  EXPECT_NEAR(closed.mean_rise_m, 0.5, 1e-14);
  EXPECT_NEAR(closed.sd_rise_m, 0.1, 1e-12);
  const Allowance root = allowance(m, c, 100.0, numerical());
  EXPECT_EQ(root.method, "root_toms748");
  EXPECT_NEAR(root.allowance_m, 0.55, 1e-6);  // issue 5: to 1e-6 m
  EXPECT_GT(root.evaluations, 0);
}

// GEV with xi -> 0 tends to Gumbel (Coles 2001, §3.1.3); xi = 1e-8 must give Hunter's 0.55 m.
TEST(Allowance, GevLimitXiToZeroGivesHunter) {
  const YearConditions c{2100, RiseDistribution::normal(0.5, 0.1), {}};
  for (double xi : {1e-8, -1e-8}) {
    EXPECT_NEAR(allowance(gev(3.0, 0.1, xi), c, 100.0).allowance_m, 0.55, 1e-6) << xi;
  }
}

// Gumbel: the allowance does not depend on the return period (Hunter 2012); GEV with xi < 0
// gives an allowance that grows with the return period, xi > 0 one that shrinks (Buchanan et
// al. 2016). Numeric values of the GEV case are checked against SciPy in
// tests/reference/planning_scipy_test.cpp.
TEST(Allowance, ReturnPeriodDependenceFollowsShapeSign) {
  const YearConditions c{2100, RiseDistribution::normal(0.5, 0.15), {}};
  const double hunter = hunter_allowance_gumbel_normal(0.12, 0.5, 0.15);
  double prev_neg = -1, prev_pos = 10;
  for (double T : {2.0, 10.0, 100.0, 1000.0}) {
    EXPECT_NEAR(allowance(gumbel(2.0, 0.12), c, T, numerical()).allowance_m, hunter, 1e-6) << T;
    const double neg = allowance(gev(2.0, 0.12, -0.1), c, T).allowance_m;
    const double pos = allowance(gev(2.0, 0.12, 0.1), c, T).allowance_m;
    EXPECT_GT(neg, prev_neg) << T;
    EXPECT_LT(pos, prev_pos) << T;
    prev_neg = neg;
    prev_pos = pos;
  }
}

// Members drawn from N(0.5, 0.1): the allowance estimate lambda ln mean(exp(delta/lambda)) has
// standard error lambda sqrt((exp(sigma^2/lambda^2) - 1)/n) (delta method on the lognormal
// mean; closed form); with n = 20000 that is 0.93 mm, and the test allows 4 of them.
TEST(Allowance, MonteCarloMembersMeetClosedFormWithinSamplingError) {
  const std::size_t n = 20000;
  const auto draws = tidewright::testing::normal_draws(n, 0.5, 0.1, 20261201);
  const Eigen::VectorXd d = Eigen::Map<const Eigen::VectorXd>(draws.data(), static_cast<Eigen::Index>(n));
  const YearConditions c{2100, RiseDistribution::members(d), {}};
  const double se = 0.1 * std::sqrt(std::expm1(1.0) / static_cast<double>(n));
  const StillWaterModel m = gumbel(3.0, 0.1);
  const Allowance closed = allowance(m, c, 100.0);
  EXPECT_NEAR(closed.allowance_m, 0.55, 4 * se);
  // The root solve over the same members gives the same number as the members' closed form.
  EXPECT_NEAR(allowance(m, c, 100.0, numerical()).allowance_m, closed.allowance_m, 1e-8);
}

// Design life: for Gumbel, A = lambda ln( mean_t E[exp(Delta_t/lambda)] ) (Hunter 2012 applied
// to the sum of expected exceedances). With Delta_t = 0.01 (t - 2020) exactly (one member) over
// 2050..2079 this is lambda ln( mean_t exp(0.01 (t - 2020)/lambda) ), computed here directly.
TEST(Allowance, DesignLifeGumbelMatchesDirectSum) {
  const StillWaterModel m = gumbel(3.0, 0.1);
  const auto e = tidewright::testing::linear_rise_from_2020(0.01);
  const auto years = conditions_over_years(e, 2050, 2079);
  double s = 0;
  for (int t = 2050; t <= 2079; ++t) s += std::exp(0.01 * (t - 2020) / 0.1);
  const double expect = 0.1 * std::log(s / 30.0);
  EXPECT_NEAR(design_life_allowance(m, years, 100.0).allowance_m, expect, 1e-12);
  EXPECT_NEAR(design_life_allowance(m, years, 100.0, numerical()).allowance_m, expect, 1e-6);
  // One year of the span alone is the ordinary allowance.
  EXPECT_NEAR(design_life_allowance(m, std::span(years).subspan(5, 1), 100.0).allowance_m, 0.35, 1e-12);
}

TEST(Allowance, DesignLifeWithConstantRiseEqualsSingleYearForGev) {
  const StillWaterModel m = gev(3.0, 0.12, -0.15);
  Eigen::MatrixXd rise(3, 2);
  rise << 0.3, 0.3, 0.4, 0.4, 0.8, 0.8;
  const auto e = tidewright::testing::ensemble({2020, 2150}, rise);
  const auto years = conditions_over_years(e, 2060, 2069);
  const double one = allowance(m, years.front(), 50.0).allowance_m;
  EXPECT_NEAR(design_life_allowance(m, years, 50.0).allowance_m, one, 1e-8);
}

TEST(Allowance, ConstantRiseIsTheRiseItself) {
  const StillWaterModel m = gev(3.0, 0.12, 0.2);
  Eigen::VectorXd d = Eigen::VectorXd::Constant(10, 0.42);
  EXPECT_NEAR(allowance(m, YearConditions{2100, RiseDistribution::members(d), {}}, 20.0).allowance_m, 0.42, 1e-8);
}

TEST(Allowance, LevelAboveUpperEndPointIsComputationError) {
  const StillWaterModel m = gev(3.0, 0.1, -0.5);  // upper end point mu + sigma/0.5 = 3.2
  const YearConditions c{2100, RiseDistribution::normal(0.5, 0.1), {}};
  EXPECT_THROW((void)allowance_at_level(m, c, 3.3), tidewright::ComputationError);
  EXPECT_THROW((void)allowance(m, c, 1.0), tidewright::InputError);
}
