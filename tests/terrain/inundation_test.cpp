// Per-cell flood products against their definitions and closed forms.
#include "tidewright/terrain/inundation.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

#include "tidewright/common/error.hpp"
#include "tidewright/extremes/still_water_model.hpp"

namespace tw = tidewright::terrain;
using tidewright::extremes::Family;
using tidewright::extremes::StillWaterModel;

namespace {
constexpr float inf_f = std::numeric_limits<float>::infinity();
constexpr float nan_f = std::numeric_limits<float>::quiet_NaN();
}  // namespace

TEST(Inundation, ClassifiesByThresholdThenElevation) {
  EXPECT_EQ(tw::classify_cell(0.5F, 0.5F, 0.5), tw::ExtentClass::connected_flooded);  // T <= h
  EXPECT_EQ(tw::classify_cell(0.2F, 0.8F, 1.0), tw::ExtentClass::connected_flooded);
  EXPECT_EQ(tw::classify_cell(0.2F, 3.0F, 1.0), tw::ExtentClass::cut_off_low_ground);
  EXPECT_EQ(tw::classify_cell(0.2F, inf_f, 1.0), tw::ExtentClass::cut_off_low_ground);
  EXPECT_EQ(tw::classify_cell(2.0F, 2.0F, 1.0), tw::ExtentClass::dry);
  EXPECT_EQ(tw::classify_cell(5.0F, -inf_f, 1.0), tw::ExtentClass::sea);
  EXPECT_EQ(tw::classify_cell(nan_f, -inf_f, 1.0), tw::ExtentClass::sea);
  EXPECT_EQ(tw::classify_cell(nan_f, nan_f, 1.0), tw::ExtentClass::nodata);
}

TEST(Inundation, DepthIsLevelMinusGroundOnConnectedLandOnly) {
  EXPECT_FLOAT_EQ(tw::flood_depth_m(0.25F, 0.5F, 1.5), 1.25F);
  EXPECT_FLOAT_EQ(tw::flood_depth_m(0.5F, 0.5F, 0.5), 0.0F);
  EXPECT_TRUE(std::isnan(tw::flood_depth_m(0.2F, 3.0F, 1.0)));    // cut off
  EXPECT_TRUE(std::isnan(tw::flood_depth_m(0.2F, -inf_f, 1.0)));  // sea
}

TEST(Inundation, AepOfGumbelTailMatchesClosedForm) {
  // Gumbel annual maxima: N(z) = exp(-(z - mu)/sigma) (Coles 2001, eq. 3.2 with xi = 0), so
  // ln N is linear in z and the table reproduces it to rounding. P = 1 - exp(-N).
  const StillWaterModel m{Family::gumbel, 1.2, 0.15, 0.0, 0.0, 1.0, {}};
  const tw::AepLookup aep([&](double z) { return m.annual_exceedance_rate(z); }, 0.0, 4.0, 257);
  // Tolerance: the float32 result's rounding (half an ulp, 6e-8 relative) and the table's
  // double rounding far below it.
  for (double z = 0.0; z <= 4.0; z += 0.0137) {
    const auto t = static_cast<float>(z);
    const double want = -std::expm1(-std::exp(-(static_cast<double>(t) - 1.2) / 0.15));
    EXPECT_NEAR(aep(t), want, 7e-8 * want + 1e-30) << z;
  }
  EXPECT_TRUE(std::isnan(aep(-inf_f)));
  EXPECT_TRUE(std::isnan(aep(nan_f)));
  EXPECT_EQ(aep(inf_f), 0.0F);
}

TEST(Inundation, AepOfGevTailWithinInterpolationBound) {
  // GEV xi = 0.1: d^2 ln N / dz^2 = (xi/sigma^2) / (1 + xi y)^2 <= xi/sigma^2 for y >= 0
  // (differentiating Coles 2001 eq. 3.2), so linear interpolation of ln N errs by at most
  // step^2/8 * xi/sigma^2 in ln N. Levels from mu upwards.
  const double mu = 1.0;
  const double sigma = 0.2;
  const double xi = 0.1;
  const StillWaterModel m{Family::gev, mu, sigma, xi, 0.0, 1.0, {}};
  const double lo = mu;
  const double hi = mu + 10.0;
  const std::size_t points = 4097;
  const tw::AepLookup aep([&](double z) { return m.annual_exceedance_rate(z); }, lo, hi, points);
  const double step = (hi - lo) / static_cast<double>(points - 1);
  const double bound = step * step / 8.0 * xi / (sigma * sigma);
  double worst = 0.0;
  for (double z = lo; z <= hi; z += 0.000731) {
    const double got = aep.rate_per_yr(z);
    const double want = m.annual_exceedance_rate(z);
    worst = std::max(worst, std::abs(std::log(got / want)));
  }
  EXPECT_LE(worst, bound * 1.0001 + 1e-14);
  EXPECT_GT(worst, 0.0);  // the check can fail: it does see interpolation error
}

TEST(Inundation, RisingRateFunctionIsRefused) {
  EXPECT_THROW(tw::AepLookup([](double z) { return z; }, 0.0, 1.0, 11),
               tidewright::ComputationError);
}

TEST(Inundation, FirstYearFollowsGumbelCriticalLevels) {
  // N_t(z) = N_0(z - D_t) with a Gumbel N_0 (mu 1.2 m, sigma 0.15 m) and rises D_t of 0.1,
  // 0.3, 0.6 m: P_t(T) >= p* exactly when T <= c_t = mu + D_t - sigma ln(-ln(1 - p*)).
  const double mu = 1.2;
  const double sigma = 0.15;
  const double p = 0.01;
  const std::vector<std::pair<int, double>> rises{{2030, 0.1}, {2050, 0.3}, {2100, 0.6}};
  std::vector<tw::YearlyRate> years;
  for (const auto& [year, rise] : rises) {
    years.push_back({year, [=](double z) { return std::exp(-(z - rise - mu) / sigma); }});
  }
  const tw::FirstPassingYear first(years, p, -2.0, 6.0);
  const double base = mu - sigma * std::log(-std::log1p(-p));
  for (std::size_t i = 0; i < rises.size(); ++i) {
    EXPECT_NEAR(first.critical_levels_m()[i], base + rises[i].second, 2e-9);
  }
  EXPECT_EQ(first(static_cast<float>(base + 0.05)), 2030);
  EXPECT_EQ(first(static_cast<float>(base + 0.2)), 2050);
  EXPECT_EQ(first(static_cast<float>(base + 0.5)), 2100);
  EXPECT_EQ(first(static_cast<float>(base + 0.7)), tw::FirstPassingYear::never);
  EXPECT_EQ(first(inf_f), tw::FirstPassingYear::never);
  EXPECT_EQ(first(-inf_f), tw::FirstPassingYear::nodata);
  EXPECT_EQ(first(nan_f), tw::FirstPassingYear::nodata);
  // With today's rate (no rise), cells at or below c_0 = base pass already today (code 1),
  // those between c_0 and c_2030 in 2030.
  const tw::FirstPassingYear with_today(years, p, -2.0, 6.0,
                                        [=](double z) { return std::exp(-(z - mu) / sigma); });
  EXPECT_EQ(with_today(static_cast<float>(base - 0.01)), tw::FirstPassingYear::already_today);
  EXPECT_EQ(with_today(static_cast<float>(base + 0.05)), 2030);
  EXPECT_EQ(with_today(static_cast<float>(base + 0.7)), tw::FirstPassingYear::never);
}

TEST(Inundation, FirstYearRefusesBadRequests) {
  const auto rate = [](double) { return 1.0; };
  EXPECT_THROW(tw::FirstPassingYear({{2050, rate}}, 1.0, 0.0, 1.0), tidewright::InputError);
  EXPECT_THROW(tw::FirstPassingYear({{2050, rate}, {2040, rate}}, 0.1, 0.0, 1.0),
               tidewright::InputError);
  EXPECT_THROW(tw::FirstPassingYear({}, 0.1, 0.0, 1.0), tidewright::InputError);
}
