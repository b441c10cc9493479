#include "tidewright/planning/future_exceedance.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "planning/planning_test_support.hpp"
#include "tidewright/common/error.hpp"

using tidewright::InputError;
using tidewright::ComputationError;
using tidewright::extremes::Family;
using tidewright::extremes::StillWaterModel;
using namespace tidewright::planning;
using tidewright::testing::gumbel;

// Gauss-Hermite moments of the standard normal: E[s^2] = 1, E[s^4] = 3, E[s^6] = 15,
// E[exp(s)] = exp(1/2) (moments of N(0,1); closed form).
TEST(GaussHermiteRule, IntegratesNormalMoments) {
  const GaussHermiteRule r = gauss_hermite_rule(64);
  double m0 = 0, m1 = 0, m2 = 0, m4 = 0, m6 = 0, e = 0;
  for (std::size_t k = 0; k < r.node.size(); ++k) {
    const double s = r.node[k], w = r.weight[k];
    m0 += w;
    m1 += w * s;
    m2 += w * s * s;
    m4 += w * std::pow(s, 4);
    m6 += w * std::pow(s, 6);
    e += w * std::exp(s);
  }
  EXPECT_NEAR(m0, 1.0, 1e-14);
  EXPECT_NEAR(m1, 0.0, 1e-14);
  EXPECT_NEAR(m2, 1.0, 1e-12);
  EXPECT_NEAR(m4, 3.0, 1e-11);
  EXPECT_NEAR(m6, 15.0, 1e-10);
  EXPECT_NEAR(e, std::exp(0.5), 1e-12);
  EXPECT_THROW((void)gauss_hermite_rule(0), InputError);
}

// The default 20-node rule: E[exp(a s)] = exp(a^2/2) to 1e-12 relative up to a = 2 and 4e-12 at
// a = 3 (measured 3.6e-12), the claim in rise_distribution.hpp (closed form of the normal
// moment generating function).
TEST(GaussHermiteRule, DefaultRuleIntegratesExponentials) {
  const GaussHermiteRule r = gauss_hermite_rule(20);
  for (double a : {0.5, 1.0, 2.0, 3.0}) {
    double e = 0;
    for (std::size_t k = 0; k < r.node.size(); ++k) e += r.weight[k] * std::exp(a * r.node[k]);
    EXPECT_NEAR(e / std::exp(a * a / 2), 1.0, a <= 2.0 ? 1e-12 : 4e-12) << a;
  }
  EXPECT_NEAR(r.node.back(), 7.619048541679757, 1e-9);  // largest zero of He_20 = sqrt(2) x 5.387480890011233, the largest zero of H_20 (Abramowitz & Stegun Table 25.10; from memory, agrees to 1e-9)
}

// N_t for Gumbel and normal Delta: E[exp(-(z - Delta - mu)/lambda)] =
// N_0(z) exp(mu_D/lambda + sigma_D^2/(2 lambda^2)) (lognormal mean; closed form).
TEST(FutureExceedanceRate, GumbelNormalRiseIsLognormalMean) {
  const StillWaterModel m = gumbel(2.0, 0.1);
  YearConditions c{2100, RiseDistribution::normal(0.5, 0.1), {}};
  for (double z : {2.0, 2.5, 3.0}) {
    const double expect = m.annual_exceedance_rate(z) * std::exp(0.5 / 0.1 + 0.01 / (2 * 0.01));
    EXPECT_NEAR(future_exceedance_rate(m, c, z) / expect, 1.0, 1e-12) << z;
  }
}

TEST(FutureExceedanceRate, MembersAreAnEqualWeightMean) {
  const StillWaterModel m = gumbel(2.0, 0.1);
  Eigen::VectorXd d(3);
  d << 0.1, 0.2, 0.6;
  YearConditions c{2050, RiseDistribution::members(d), {}};
  const double z = 2.4;
  const double expect =
      (m.annual_exceedance_rate(z - 0.1) + m.annual_exceedance_rate(z - 0.2) + m.annual_exceedance_rate(z - 0.6)) / 3;
  EXPECT_NEAR(future_exceedance_rate(m, c, z), expect, 1e-15 * expect);
  std::vector<double> per_node(3);
  node_rates(m, c, z, per_node);
  EXPECT_DOUBLE_EQ(per_node[2], m.annual_exceedance_rate(z - 0.6));
}

TEST(FutureExceedanceRate, YearOutsideProjectionIsInputError) {
  auto e = tidewright::testing::ensemble({2020, 2100}, Eigen::MatrixXd::Zero(4, 2));
  EXPECT_THROW((void)conditions_in_year(e, 2101, {}), InputError);
  EXPECT_NO_THROW((void)conditions_in_year(e, 2060, {}));
}

// Storminess as a location shift dmu is the same as a further rise dmu (location family,
// Coles 2001 §3.1.3): 0.01 m/yr over 10 years equals Delta + 0.1 m.
TEST(Storminess, LocationChangeEqualsExtraRise) {
  const StillWaterModel m = tidewright::testing::gev(2.0, 0.15, -0.1);
  StorminessChange sc;
  sc.location_m_per_yr = 0.01;
  sc.reference_year = 2020;
  YearConditions storm{2030, RiseDistribution::normal(0.2, 0.05), sc};
  YearConditions shifted{2030, RiseDistribution::normal(0.3, 0.05), {}};
  for (double z : {2.2, 2.6, 3.0}) {
    EXPECT_NEAR(future_exceedance_rate(m, storm, z) / future_exceedance_rate(m, shifted, z), 1.0, 1e-12);
  }
}

// A scale factor s on Gumbel: N(z) = exp(-(z - mu)/(s lambda)) (closed form).
TEST(Storminess, ScaleChangePerKelvinStretchesGumbel) {
  const StillWaterModel m = gumbel(2.0, 0.1);
  StorminessChange sc;
  sc.scale_fraction_per_k = 0.05;  // +5 % per K (an invented scenario value for the test)
  Eigen::VectorXd rise(2), warm(2);
  rise << 0.0, 0.0;
  warm << 1.0, 2.0;
  YearConditions c{2080, RiseDistribution::members(rise, warm), sc};
  const double z = 2.5;
  const double expect = 0.5 * (std::exp(-0.5 / (1.05 * 0.1)) + std::exp(-0.5 / (1.10 * 0.1)));
  EXPECT_NEAR(future_exceedance_rate(m, c, z), expect, 1e-14);
  YearConditions no_warming{2080, RiseDistribution::members(rise), sc};
  EXPECT_THROW((void)future_exceedance_rate(m, no_warming, z), InputError);
  sc.scale_fraction_per_k = -0.6;  // scale factor 1 - 1.2 < 0
  YearConditions negative{2080, RiseDistribution::members(rise, warm), sc};
  EXPECT_THROW((void)future_exceedance_rate(m, negative, z), ComputationError);
}

// Below a GPD threshold the model's empirical rate curve answers: a level of 2.1 m lowered by
// 0.25 m of rise to 1.85 m lies between the curve points (1.8 m, 8/yr) and (u = 2.0 m, 3/yr),
// log-linear: 8^(3/4) 3^(1/4) per year (interpolation rule of extremes::StillWaterModel).
TEST(BelowThreshold, RiseBringsLevelOntoEmpiricalCurve) {
  const StillWaterModel m{Family::gpd, 0.0, 0.15, 0.05, 2.0, 3.0, {{1.6, 1.8}, {20.0, 8.0}}};
  Eigen::VectorXd d = Eigen::VectorXd::Constant(5, 0.25);
  YearConditions c{2090, RiseDistribution::members(d), {}};
  const double expect = std::pow(8.0, 0.75) * std::pow(3.0, 0.25);
  EXPECT_NEAR(future_exceedance_rate(m, c, 2.1), expect, 1e-12 * expect);
  // Without the curve there is no trustworthy rate below u: ComputationError, not a number.
  StillWaterModel bare = m;
  bare.below_threshold = {};
  EXPECT_THROW((void)future_exceedance_rate(bare, c, 2.1), ComputationError);
  // Above u the GPD itself: lambda_u (1 + xi (z - u)/sigma)^(-1/xi) (Coles 2001, eq. 4.13).
  const double above = 3.0 * std::pow(1.0 + 0.05 * (2.6 - 0.25 - 2.0) / 0.15, -1.0 / 0.05);
  EXPECT_NEAR(future_exceedance_rate(m, c, 2.6), above, 1e-12 * above);
}

TEST(AnnualExceedanceProbability, KeepsDigitsForRareEvents) {
  EXPECT_DOUBLE_EQ(annual_exceedance_probability(1e-12), 1e-12 * (1 - 0.5e-12));
  EXPECT_NEAR(annual_exceedance_probability(1.0), 1.0 - std::exp(-1.0), 1e-16);
}

TEST(PresentReturnLevel, RefusesReturnPeriodsUpToOneYear) {
  const StillWaterModel m = gumbel(2.0, 0.1);
  EXPECT_THROW((void)present_return_level(m, 1.0), InputError);
  EXPECT_THROW((void)present_return_level(m, 0.5), InputError);
  EXPECT_THROW((void)present_return_level(m, std::nan("")), InputError);
  // Gumbel: z_T = mu + lambda ln T (rate form N_0 = 1/T).
  EXPECT_NEAR(present_return_level(m, 100.0), 2.0 + 0.1 * std::log(100.0), 1e-12);
}

// A projection table holding the quantiles of N(0.5, 0.1) gives, through the table's
// distribution and Gauss-Hermite, the lognormal-mean N_t of a Gumbel model (closed form as
// above), and a design-life span over the table's comonotone nodes.
TEST(FutureExceedanceRate, ProjectionTableDistribution) {
  tidewright::local::QuantileTable t;
  t.years = {2050, 2100};
  t.probabilities = {0.05, 0.17, 0.5, 0.83, 0.95};
  t.rise_m.resize(2, 5);
  const boost::math::normal_distribution<double> n2050(0.2, 0.04), n2100(0.5, 0.1);
  for (int k = 0; k < 5; ++k) {
    t.rise_m(0, k) = boost::math::quantile(n2050, t.probabilities[static_cast<std::size_t>(k)]);
    t.rise_m(1, k) = boost::math::quantile(n2100, t.probabilities[static_cast<std::size_t>(k)]);
  }
  const StillWaterModel m = gumbel(2.0, 0.1);
  const YearConditions c = conditions_in_year(t, 2100);
  EXPECT_NEAR(future_exceedance_rate(m, c, 2.5) / (m.annual_exceedance_rate(2.5) * std::exp(5.5)), 1.0, 1e-12);
  const auto span = conditions_over_years(t, 2060, 2070);
  ASSERT_EQ(span.size(), 11U);
  EXPECT_EQ(span[3].rise.weight, span[0].rise.weight);
  EXPECT_THROW((void)conditions_in_year(t, 2110), InputError);
}

namespace {

// dN_t/dz and d2N_t/dz2 against central differences of N_t itself.
void expect_rate_derivatives_match_differences(const StillWaterModel& m, const YearConditions& c, double z) {
  const auto d = future_exceedance_rate_derivatives(m, c, z);
  EXPECT_NEAR(d.rate, future_exceedance_rate(m, c, z), 1e-13 * d.rate) << "z " << z;
  const double h1 = 1e-6;
  const double h2 = 1e-4;
  const double first = (future_exceedance_rate(m, c, z + h1) - future_exceedance_rate(m, c, z - h1)) / (2.0 * h1);
  const double second = (future_exceedance_rate(m, c, z + h2) - 2.0 * future_exceedance_rate(m, c, z) +
                         future_exceedance_rate(m, c, z - h2)) /
                        (h2 * h2);
  EXPECT_NEAR(d.first, first, 1e-6 * std::abs(first)) << "z " << z;
  EXPECT_NEAR(d.second, second, 1e-5 * std::abs(second)) << "z " << z;
}

}  // namespace

// The derivatives of N_t in z, without storminess and through a storminess change per year
// and per kelvin (chain rule through the stretched level), for GEV and for a GPD whose nodes
// reach the empirical curve below u.
TEST(FutureExceedanceRate, DerivativesMatchCentralDifferences) {
  const StillWaterModel gev = tidewright::testing::gev(2.0, 0.15, -0.1);
  const StillWaterModel gpd{Family::gpd, 0.0, 0.15, 0.05, 2.0, 3.0, {{1.6, 1.8}, {20.0, 8.0}}};
  Eigen::VectorXd rise(5), warm(5);
  rise << 0.11, 0.23, 0.31, 0.42, 0.57;
  warm << 1.1, 1.6, 2.0, 2.4, 3.1;
  StorminessChange per_year;
  per_year.location_m_per_yr = 0.002;
  per_year.scale_fraction_per_yr = 0.003;
  per_year.reference_year = 2020;
  StorminessChange per_k;
  per_k.location_m_per_k = 0.01;
  per_k.scale_fraction_per_k = 0.04;  // invented scenario values for the test
  for (const StorminessChange& sc : {StorminessChange{}, per_year, per_k}) {
    const YearConditions c{2080, RiseDistribution::members(rise, warm), sc};
    for (double z : {2.3, 2.6, 2.9}) expect_rate_derivatives_match_differences(gev, c, z);
    for (double z : {2.07, 2.2, 2.45}) expect_rate_derivatives_match_differences(gpd, c, z);
  }
}
