#include "tidewright/planning/parameter_range.hpp"

#include <gtest/gtest.h>

#include <vector>

#include "planning/planning_test_support.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/planning/allowance.hpp"

using tidewright::extremes::StillWaterModel;
using namespace tidewright::planning;
using tidewright::testing::gumbel;

// Allowance over Gumbel scale draws 0.08, 0.10, 0.12 with normal Delta (0.5, 0.1): each is
// Hunter's mu + sigma^2/(2 lambda) = 0.5625, 0.55, 0.541667; the 5-95 % type-7 quantiles of
// three values are at h = 0.1 and 1.9: 0.541667 + 0.1 (0.55 - 0.541667) and
// 0.55 + 0.9 (0.5625 - 0.55) (Hyndman & Fan 1996, computed by hand).
TEST(ParameterRange, AllowanceOverScaleDraws) {
  const YearConditions c{2100, RiseDistribution::normal(0.5, 0.1), {}};
  const std::vector<StillWaterModel> draws{gumbel(3.0, 0.08), gumbel(3.0, 0.10), gumbel(3.0, 0.12)};
  const ParameterRange r = range_over_parameters(
      gumbel(3.0, 0.1), draws, [&](const StillWaterModel& m) { return allowance(m, c, 100.0).allowance_m; });
  const double a12 = 0.5 + 0.01 / 0.24, a10 = 0.55, a08 = 0.5 + 0.01 / 0.16;
  EXPECT_NEAR(r.at_fit, 0.55, 1e-12);
  EXPECT_NEAR(r.lower, a12 + 0.1 * (a10 - a12), 1e-12);
  EXPECT_NEAR(r.upper, a10 + 0.9 * (a08 - a10), 1e-12);
  EXPECT_EQ(r.draws_used, 3);
  EXPECT_NE(r.label.find("5-95 % range over 3 draws of the extreme-value parameters"), std::string::npos) << r.label;
}

TEST(ParameterRange, TooManyFailedDrawsIsComputationError) {
  const YearConditions c{2100, RiseDistribution::normal(0.5, 0.1), {}};
  // Levels above a xi = -0.5 draw's upper end point cannot have an allowance.
  std::vector<StillWaterModel> draws(5, gumbel(3.0, 0.1));
  draws[0] = tidewright::testing::gev(2.0, 0.1, -0.5);
  const auto product = [&](const StillWaterModel& m) { return allowance_at_level(m, c, 3.4).allowance_m; };
  EXPECT_THROW((void)range_over_parameters(gumbel(3.0, 0.1), draws, product), tidewright::ComputationError);
  EXPECT_THROW((void)range_over_parameters(gumbel(3.0, 0.1), std::vector<StillWaterModel>{}, product),
               tidewright::InputError);
}
