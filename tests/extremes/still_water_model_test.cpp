#include "tidewright/extremes/still_water_model.hpp"

#include <gtest/gtest.h>

#include <cmath>

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
