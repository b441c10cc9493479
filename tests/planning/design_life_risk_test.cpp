#include "tidewright/planning/design_life_risk.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "planning/planning_test_support.hpp"
#include "tidewright/common/error.hpp"

using tidewright::extremes::StillWaterModel;
using namespace tidewright::planning;
using tidewright::testing::ensemble;
using tidewright::testing::gev;
using tidewright::testing::gumbel;

// Constant Delta = 0: P = 1 - exp(-n N_0(H)) exactly (Poisson occurrence; Coles 2001 §4.4).
TEST(DesignLifeRisk, NoRiseIsPoissonClosedForm) {
  const StillWaterModel m = gev(2.0, 0.15, -0.05);
  const auto e = ensemble({2020, 2100}, Eigen::MatrixXd::Zero(3, 2));
  const auto years = conditions_over_years(e, 2030, 2079);  // 50 years
  for (double h : {2.2, 2.8, 3.5}) {
    const DesignLifeRisk r = design_life_risk(m, years, h);
    const double expect = -std::expm1(-50.0 * m.annual_exceedance_rate(h));
    // "Exactly" up to the round-off of summing 50 equal rates (at most 50 half-ulps).
    EXPECT_NEAR(r.probability, expect, 50 * 1.1e-16 * expect) << h;
    EXPECT_NEAR(r.probability_none, std::exp(-50.0 * m.annual_exceedance_rate(h)), 1e-15) << h;
    EXPECT_FALSE(r.rounds_to_one);
  }
}

TEST(DesignLifeRisk, RareAndCertainEndsKeepTheirDigits) {
  const StillWaterModel m = gumbel(2.0, 0.1);
  const auto e = ensemble({2020, 2100}, Eigen::MatrixXd::Zero(2, 2));
  const auto years = conditions_over_years(e, 2030, 2049);  // 20 years
  // N_0 = exp(-30) ~ 9.4e-14: P ~ 1.9e-12 with full relative precision (expm1).
  const DesignLifeRisk rare = design_life_risk(m, years, 5.0);
  EXPECT_NEAR(rare.probability / (20.0 * std::exp(-30.0)), 1.0, 1e-11);
  // N_0 = exp(3) ~ 20 per year: Q = exp(-402), P rounds to 1 and says so.
  const DesignLifeRisk sure = design_life_risk(m, years, 1.7);
  EXPECT_TRUE(sure.rounds_to_one);
  EXPECT_NEAR(std::log(sure.probability_none), -20.0 * std::exp(3.0), 1e-9);
}

// Brute-force Monte Carlo, independent of the library: along each member's path draw one
// annual maximum per year from the GEV shifted by Delta_t (inverse cdf, Coles 2001 eq. 3.2)
// and count paths with at least one exceedance of H. The estimate's standard error is at
// most sqrt(0.25 / trials); the test allows 4 of them.
TEST(DesignLifeRisk, MatchesBruteForceAnnualMaximaAlongMembers) {
  const double mu = 2.0, sigma = 0.15, xi = -0.1;
  const StillWaterModel m = gev(mu, sigma, xi);
  const int members = 200;
  const int first = 2040, last = 2069;
  // Members: linear paths with member-specific rates 0.004..0.012 m/yr from 2020.
  Eigen::MatrixXd rise(members, 2);
  std::mt19937_64 gen(42);
  std::uniform_real_distribution<double> rate(0.004, 0.012);
  for (int i = 0; i < members; ++i) {
    const double r = rate(gen);
    rise(i, 0) = 0.0;
    rise(i, 1) = r * 80.0;
  }
  const auto e = ensemble({2020, 2100}, rise);
  const auto years = conditions_over_years(e, first, last);
  const double h = 2.9;
  const DesignLifeRisk risk = design_life_risk(m, years, h);

  const int reps = 500;
  std::uniform_real_distribution<double> unif(0.0, 1.0);
  long hits = 0;
  for (int i = 0; i < members; ++i) {
    for (int k = 0; k < reps; ++k) {
      bool hit = false;
      for (int t = first; t <= last && !hit; ++t) {
        const double delta = rise(i, 1) * (t - 2020) / 80.0;
        const double u = unif(gen);
        // GEV quantile: mu + sigma ((-ln u)^(-xi) - 1)/xi (Coles 2001, eq. 3.4 inverted).
        const double x = mu + delta + sigma * (std::pow(-std::log(u), -xi) - 1.0) / xi;
        hit = x > h;
      }
      hits += hit;
    }
  }
  const double trials = static_cast<double>(members) * reps;
  const double p_mc = static_cast<double>(hits) / trials;
  EXPECT_GT(risk.probability, 0.05);  // a case far from 0 and 1
  EXPECT_LT(risk.probability, 0.95);
  EXPECT_NEAR(risk.probability, p_mc, 4.0 * std::sqrt(0.25 / trials));
}

// Inverse: with Delta = 0 the height for target p is z with n N_0(z) = -ln(1 - p), closed form.
TEST(DesignLifeLevel, InvertsPoissonClosedFormAndRoundTrips) {
  const StillWaterModel m = gev(2.0, 0.15, 0.1);
  const auto zero = ensemble({2020, 2100}, Eigen::MatrixXd::Zero(2, 2));
  const auto years = conditions_over_years(zero, 2030, 2079);
  for (double p : {0.01, 0.1, 0.5, 0.99}) {
    const DesignLifeLevel l = level_for_design_life_risk(m, years, p);
    EXPECT_NEAR(l.level_m, m.level_for_rate(-std::log1p(-p) / 50.0), 1e-6) << p;
    EXPECT_NEAR(l.risk.probability, p, 1e-5 * p) << p;
  }
  Eigen::MatrixXd rise(3, 2);
  rise << 0.0, 0.5, 0.0, 0.8, 0.0, 1.2;
  const auto e = ensemble({2020, 2100}, rise);
  const auto span = conditions_over_years(e, 2050, 2099);
  const DesignLifeLevel l = level_for_design_life_risk(m, span, 0.05);
  EXPECT_NEAR(design_life_risk(m, span, l.level_m).probability, 0.05, 1e-6);
  EXPECT_THROW((void)level_for_design_life_risk(m, span, 1.0), tidewright::InputError);
}

TEST(DesignLifeRisk, RefusesMismatchedPaths) {
  const StillWaterModel m = gumbel(2.0, 0.1);
  std::vector<YearConditions> years{{2030, RiseDistribution::members(Eigen::VectorXd::Zero(3)), {}},
                                    {2031, RiseDistribution::members(Eigen::VectorXd::Zero(4)), {}}};
  EXPECT_THROW((void)design_life_risk(m, years, 2.5), tidewright::InputError);
  years[1] = {2033, RiseDistribution::members(Eigen::VectorXd::Zero(3)), {}};
  EXPECT_THROW((void)design_life_risk(m, years, 2.5), tidewright::InputError);
}

// An annual-maxima model with xi > 0 has a lower end point mu - sigma/xi (Coles 2001, §3.1.1):
// GEV(2, 0.15, 0.3) ends at 1.5 m. Of two members, one rises 0.6 m in every year, taking a
// height of 2.0 m below that end point (N_0 infinite: exceeded for certain each year); the
// other does not rise. Over 10 years the expected number of years with an exceedance is
// (10 + 10 (1 - exp(-N_0(2.0))))/2 with N_0(2.0) = 1, the share of member-years beyond the
// model 0.5, and the rate sum is infinite (not reported as a number).
TEST(DesignLifeRisk, BeyondAnAnnualMaximaModelsRangeCountsYearsNotRates) {
  const StillWaterModel m = gev(2.0, 0.15, 0.3);
  Eigen::MatrixXd rise(2, 2);
  rise << 0.6, 0.6, 0.0, 0.0;
  const auto years = conditions_over_years(ensemble({2020, 2100}, rise), 2030, 2039);
  const DesignLifeRisk r = design_life_risk(m, years, 2.0);
  EXPECT_NEAR(m.annual_exceedance_rate(2.0), 1.0, 1e-15);
  EXPECT_NEAR(r.expected_years_with_exceedance, 0.5 * (10.0 + 10.0 * -std::expm1(-1.0)), 1e-12);
  EXPECT_DOUBLE_EQ(r.beyond_range_fraction, 0.5);
  EXPECT_TRUE(std::isinf(r.expected_exceedances));
  EXPECT_NEAR(r.probability, 0.5 * (1.0 + -std::expm1(-10.0)), 1e-12);
  // Two members: the probability's Monte Carlo error is that of a mean of two values.
  ASSERT_TRUE(r.monte_carlo.sampled);
  EXPECT_NEAR(r.monte_carlo.standard_error, 0.5 * std::exp(-10.0), 1e-12);
}
