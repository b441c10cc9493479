#include "tidewright/extremes/still_water_model.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string_view>
#include <vector>

#include "tidewright/common/error.hpp"

using tidewright::extremes::Family;
using tidewright::extremes::StillWaterModel;

// Closed forms: for Gumbel N_0(z) = exp(-(z - mu)/sigma), so the T-year level
// z_T = mu - sigma ln(1/T) (Coles 2001, eq. 3.4 with xi = 0 and -ln(1 - 1/T) ~ 1/T; here the
// rate form N_0 = 1/T is exact by construction).
TEST(StillWaterModel, GumbelRateAndInverseAreClosedForm) {
  StillWaterModel m{Family::gumbel, 3.87, 0.2, 0.0, 0.0, 1.0, {}};
  EXPECT_NEAR(m.annual_exceedance_rate(3.87), 1.0, 1e-15);
  EXPECT_NEAR(m.annual_exceedance_rate(3.87 + 0.2 * std::log(100.0)), 0.01, 1e-15);
  EXPECT_NEAR(m.level_for_rate(0.01), 3.87 + 0.2 * std::log(100.0), 1e-12);
}

TEST(StillWaterModel, GevIsContinuousThroughZeroShape) {
  StillWaterModel a{Family::gev, 3.87, 0.2, 1e-12, 0.0, 1.0, {}};
  StillWaterModel b{Family::gev, 3.87, 0.2, 1e-7, 0.0, 1.0, {}};
  StillWaterModel g{Family::gumbel, 3.87, 0.2, 0.0, 0.0, 1.0, {}};
  for (double z : {3.5, 4.0, 4.5, 5.0}) {
    EXPECT_NEAR(a.annual_exceedance_rate(z), g.annual_exceedance_rate(z), 1e-12);
    // First-order term of the series in xi: N_xi / N_0 - 1 = xi y^2 / 2 + O(xi^2), y = (z - mu)/sigma.
    const double y = (z - 3.87) / 0.2;
    EXPECT_NEAR(b.annual_exceedance_rate(z) / g.annual_exceedance_rate(z) - 1.0, 1e-7 * y * y / 2.0, 1e-12);
  }
}

TEST(StillWaterModel, GevUpperEndPointHasZeroRate) {
  StillWaterModel m{Family::gev, 3.87, 0.2, -0.25, 0.0, 1.0, {}};  // end point mu + sigma/0.25
  EXPECT_EQ(m.annual_exceedance_rate(3.87 + 0.8 + 1e-9), 0.0);
  EXPECT_GT(m.annual_exceedance_rate(3.87 + 0.8 - 1e-3), 0.0);
}

TEST(StillWaterModel, GpdJoinsEmpiricalCurveBelowThreshold) {
  StillWaterModel m{Family::gpd, 0.0, 0.15, 0.05, 2.0, 3.0, {{1.6, 1.8}, {20.0, 8.0}}};
  EXPECT_NEAR(m.annual_exceedance_rate(2.0), 3.0, 1e-12);
  EXPECT_NEAR(m.annual_exceedance_rate(1.8), 8.0, 1e-12);
  EXPECT_NEAR(m.annual_exceedance_rate(1.9), std::sqrt(8.0 * 3.0), 1e-12);  // log-linear midpoint
  EXPECT_NEAR(m.level_for_rate(std::sqrt(8.0 * 3.0)), 1.9, 1e-12);
  EXPECT_NEAR(m.level_for_rate(m.annual_exceedance_rate(2.7)), 2.7, 1e-12);
}

namespace {

// Central differences of N_0 with step h: the first derivative to O(h^2), the second to O(h^2).
double central_first(const StillWaterModel& m, double z, double h) {
  return (m.annual_exceedance_rate(z + h) - m.annual_exceedance_rate(z - h)) / (2.0 * h);
}
double central_second(const StillWaterModel& m, double z, double h) {
  return (m.annual_exceedance_rate(z + h) - 2.0 * m.annual_exceedance_rate(z) + m.annual_exceedance_rate(z - h)) /
         (h * h);
}

void expect_derivatives_match_differences(const StillWaterModel& m, double z) {
  const auto d = m.annual_exceedance_rate_derivatives(z);
  EXPECT_EQ(d.rate, m.annual_exceedance_rate(z)) << "z " << z;
  const double first = central_first(m, z, 1e-6);
  const double second = central_second(m, z, 1e-4);
  EXPECT_NEAR(d.first, first, 1e-6 * std::abs(first) + 1e-12) << "z " << z;
  EXPECT_NEAR(d.second, second, 1e-5 * std::abs(second) + 1e-9) << "z " << z;
}

}  // namespace

// dN/dz = -N/(sigma t) and d2N/dz2 = (1 + xi) N/(sigma t)^2 against central differences, for
// each family: Gumbel, GEV of both signs and of tiny shape, GPD above u and on the empirical
// curve below it.
TEST(StillWaterModel, DerivativesMatchCentralDifferences) {
  for (const StillWaterModel& m : {StillWaterModel{Family::gumbel, 3.87, 0.2, 0.0, 0.0, 1.0, {}},
                                   StillWaterModel{Family::gev, 3.87, 0.2, 0.2, 0.0, 1.0, {}},
                                   StillWaterModel{Family::gev, 3.87, 0.2, -0.25, 0.0, 1.0, {}},
                                   StillWaterModel{Family::gev, 3.87, 0.2, 1e-12, 0.0, 1.0, {}}}) {
    for (double z : {3.3, 3.7, 4.0, 4.4}) expect_derivatives_match_differences(m, z);
  }
  const StillWaterModel gpd{Family::gpd, 0.0, 0.15, 0.05, 2.0, 3.0, {{1.6, 1.8}, {20.0, 8.0}}};
  for (double z : {2.05, 2.3, 2.9}) expect_derivatives_match_differences(gpd, z);  // GPD tail
  for (double z : {1.65, 1.75, 1.85, 1.95}) expect_derivatives_match_differences(gpd, z);  // curve
  // Log-linear segment [1.8, 2.0] from 8 to 3 per year: slope b = ln(3/8)/0.2 of ln N.
  const double b = std::log(3.0 / 8.0) / 0.2;
  const auto d = gpd.annual_exceedance_rate_derivatives(1.9);
  EXPECT_NEAR(d.first, b * std::sqrt(24.0), 1e-12);
  EXPECT_NEAR(d.second, b * b * std::sqrt(24.0), 1e-11);
  // Below the curve's first point the rate is flat; beyond a GEV upper end point all is 0.
  const auto flat = gpd.annual_exceedance_rate_derivatives(1.5);
  EXPECT_EQ(flat.rate, 20.0);
  EXPECT_EQ(flat.first, 0.0);
  EXPECT_EQ(flat.second, 0.0);
  const StillWaterModel bounded{Family::gev, 3.87, 0.2, -0.25, 0.0, 1.0, {}};
  const auto beyond = bounded.annual_exceedance_rate_derivatives(3.87 + 0.8 + 1e-9);
  EXPECT_EQ(beyond.rate, 0.0);
  EXPECT_EQ(beyond.first, 0.0);
  EXPECT_EQ(beyond.second, 0.0);
}

namespace {

// The plain node-by-node sums the batch form stands for.
tidewright::extremes::RateDerivatives scalar_sums(const StillWaterModel& m, double z, const std::vector<double>& d,
                                                  const std::vector<double>& w) {
  tidewright::extremes::RateDerivatives s;
  for (std::size_t i = 0; i < d.size(); ++i) {
    if (!(w[i] > 0.0)) continue;
    const auto r = m.annual_exceedance_rate_derivatives(z - d[i]);
    s.rate += w[i] * r.rate;
    s.first += w[i] * r.first;
    s.second += w[i] * r.second;
  }
  return s;
}

void expect_batch_matches_scalar(const StillWaterModel& m, double z, const std::vector<double>& d,
                                 const std::vector<double>& w, double relative = 1e-13) {
  const auto want = scalar_sums(m, z, d, w);
  // Every build this processor runs (AVX-512, AVX2 and the portable one on most machines).
  for (const std::string_view build : tidewright::extremes::rate_sum_builds()) {
    const auto plain = tidewright::extremes::weighted_shifted_rates_in_build(m, build, z, d, w, false);
    const auto batch = tidewright::extremes::weighted_shifted_rates_in_build(m, build, z, d, w, true);
    EXPECT_EQ(plain.rate, batch.rate) << build;
    if (!std::isfinite(want.rate)) {  // a node below a GEV lower end point
      EXPECT_EQ(batch.rate, want.rate) << build << ", z " << z;
      continue;
    }
    EXPECT_NEAR(batch.rate, want.rate, relative * std::abs(want.rate))
        << build << ", z " << z << ", " << d.size() << " nodes";
    EXPECT_NEAR(batch.first, want.first, relative * std::abs(want.first)) << build << ", z " << z;
    EXPECT_NEAR(batch.second, want.second, relative * std::abs(want.second)) << build << ", z " << z;
  }
  EXPECT_EQ(m.weighted_shifted_rates(z, d, w, true).rate,
            tidewright::extremes::weighted_shifted_rates_in_build(m, tidewright::extremes::rate_sum_builds().front(), z,
                                                                  d, w, true)
                .rate);
}

}  // namespace

// The vectorised sum gives the node-by-node sum to 1e-13 relative for every family, for node
// counts that do and do not fill the vector lanes, over rates from about 1e-300 to 1e3.
TEST(StillWaterModel, BatchSumMatchesNodeByNodeSum) {
  std::vector<double> d;
  std::vector<double> w;
  for (int i = 0; i < 37; ++i) {
    d.push_back(0.9 * std::sin(1.7 * i));
    w.push_back(1.0 + 0.5 * std::cos(0.3 * i));
  }
  const StillWaterModel models[] = {{Family::gumbel, 3.87, 0.2, 0.0, 0.0, 1.0, {}},
                                    {Family::gev, 3.87, 0.2, 0.2, 0.0, 1.0, {}},
                                    {Family::gev, 3.87, 0.2, -0.1, 0.0, 1.0, {}},
                                    {Family::gev, 3.87, 0.2, 1e-7, 0.0, 1.0, {}},
                                    {Family::gpd, 0.0, 0.15, 0.05, 2.0, 3.0, {{1.6, 1.8}, {20.0, 8.0}}},
                                    {Family::gpd, 0.0, 0.15, -0.2, 2.0, 3.0, {{1.6, 1.8}, {20.0, 8.0}}}};
  for (const auto& m : models) {
    for (std::size_t n : {1U, 3U, 4U, 8U, 13U, 37U}) {
      const std::vector<double> dn(d.begin(), d.begin() + static_cast<std::ptrdiff_t>(n));
      const std::vector<double> wn(w.begin(), w.begin() + static_cast<std::ptrdiff_t>(n));
      for (double z : {3.0, 3.9, 4.6, 5.5}) expect_batch_matches_scalar(m, z, dn, wn);
    }
  }
  // Far tails: rates down to about 1e-300 (Gumbel y near 690) and up to 1e41 keep their
  // relative digits to 1e-12; here the rounding of y alone, |y| 1e-16, moves exp(-y) by 7e-14.
  const StillWaterModel g{Family::gumbel, 0.0, 0.01, 0.0, 0.0, 1.0, {}};
  expect_batch_matches_scalar(g, 6.9, d, w, 1e-12);
  expect_batch_matches_scalar(g, -0.06, d, w, 1e-12);
}

// A node with zero weight stays out of the sum even where its rate is infinite (below a GEV
// lower end point); a weighted node there makes the sum infinite, as node by node.
TEST(StillWaterModel, BatchSumBuildsAreListedAndAnUnknownOneIsInputError) {
  const auto builds = tidewright::extremes::rate_sum_builds();
  ASSERT_FALSE(builds.empty());
  const StillWaterModel m{Family::gumbel, 3.87, 0.2, 0.0, 0.0, 1.0, {}};
  const std::vector<double> d{0.0};
  EXPECT_THROW((void)tidewright::extremes::weighted_shifted_rates_in_build(m, "no-such-build", 4.0, d, d, false),
               tidewright::InputError);
}

TEST(StillWaterModel, BatchSumLeavesOutZeroWeights) {
  const StillWaterModel m{Family::gev, 3.87, 0.2, 0.25, 0.0, 1.0, {}};  // lower end mu - sigma/xi = 3.07
  const std::vector<double> d{0.0, 0.1, 2.0, 0.2, 0.3};
  std::vector<double> w{0.25, 0.25, 0.0, 0.25, 0.25};
  const auto s = m.weighted_shifted_rates(4.0, d, w, true);
  EXPECT_TRUE(std::isfinite(s.rate));
  EXPECT_NEAR(s.rate, scalar_sums(m, 4.0, d, w).rate, 1e-13 * s.rate);
  w[2] = 0.1;
  EXPECT_EQ(m.weighted_shifted_rates(4.0, d, w, false).rate, std::numeric_limits<double>::infinity());
}

TEST(StillWaterModel, BatchSumBelowThresholdWithoutCurveIsComputationError) {
  const StillWaterModel m{Family::gpd, 0.0, 0.15, 0.05, 2.0, 3.0, {}};
  const std::vector<double> d{0.0, 0.5};
  const std::vector<double> w{0.5, 0.5};
  EXPECT_NO_THROW((void)m.weighted_shifted_rates(2.6, d, w, false));
  EXPECT_THROW((void)m.weighted_shifted_rates(2.3, d, w, true), tidewright::ComputationError);
  EXPECT_THROW((void)m.weighted_shifted_rates(2.3, d, std::vector<double>{1.0}, false), tidewright::InputError);
}
