#include "tidewright/climate/land_ice.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <vector>

#include "tidewright/climate/projection.hpp"
#include "tidewright/common/error.hpp"

using namespace tidewright::climate;

namespace {

std::vector<int> years_from(int first, int last) {
  std::vector<int> y;
  for (int t = first; t <= last; ++t) y.push_back(t);
  return y;
}

// The glacier ODE dS/dt = a (T - T0) (V/V_19)^n, V = V_19 - (S - S_19), integrated by fine RK4
// from 2019 forward and backward: an independent check of the closed form in land_ice.cpp.
double rk4_glacier_volume(const GlacierParameters& p, double warming_k, double years) {
  double v = p.volume_2019_m;
  const int steps = 20000;
  const double h = years / steps;
  auto dv = [&](double vol) {
    return vol <= 0.0 ? 0.0 : -p.sensitivity_m_per_yr_k * (warming_k - p.equilibrium_warming_k) *
                                  std::pow(vol / p.volume_2019_m, p.volume_exponent);
  };
  for (int i = 0; i < steps; ++i) {
    const double k1 = dv(v), k2 = dv(v + 0.5 * h * k1), k3 = dv(v + 0.5 * h * k2), k4 = dv(v + h * k3);
    v += h / 6.0 * (k1 + 2 * k2 + 2 * k3 + k4);
  }
  return v;
}

}  // namespace

TEST(ClimateLandIce, GlacierClosedFormMatchesRk4AndIsVolumeLimited) {
  GlacierParameters p;
  p.sensitivity_m_per_yr_k = 1e-3;
  const std::vector<int> years = years_from(1900, 2400);
  const std::vector<double> warming(years.size(), 2.0);
  const std::vector<double> s = glacier_rise_m(p, years, warming);
  const std::size_t i2019 = 2019 - 1900;
  for (int year : {1950, 2100, 2200}) {
    const auto i = static_cast<std::size_t>(year - 1900);
    const double volume_rk4 = rk4_glacier_volume(p, 2.0, year - 2019.0);
    EXPECT_NEAR(p.volume_2019_m - (s[i] - s[i2019]), volume_rk4, 1e-9) << year;
  }
  // Volume limit: the total loss after 2019 never exceeds the 2019 volume, and the loss rate falls.
  EXPECT_LE(s.back() - s[i2019], p.volume_2019_m + 1e-12);
  EXPECT_LT(s[400] - s[399], s[200] - s[199]);
  EXPECT_GT(s[200] - s[199], 0.0);
}

TEST(ClimateLandIce, GreenlandAntarcticaAndLandWaterFollowTheirRates) {
  const std::vector<int> years = years_from(2000, 2100);
  const std::vector<double> warming(years.size(), 2.0);
  const GreenlandParameters g;
  // Constant T: linear growth at s T^2 + d T per year.
  EXPECT_NEAR(greenland_rise_m(g, years, warming).back(), 100.0 * (g.smb_m_per_yr_k2 * 4.0 + g.discharge_m_per_yr_k * 2.0),
              1e-12);
  // Linear T = 0.02 (t - 2000): cumulative k 0.01 t^2 for Antarctica's linear rate k T.
  std::vector<double> ramp;
  ramp.reserve(years.size());
  for (int y : years) ramp.push_back(0.02 * (y - 2000));
  const AntarcticParameters a;
  const double k = a.discharge_m_per_yr_k - a.accumulation_m_per_yr * a.snowfall_increase_per_k * a.antarctic_warming_ratio;
  EXPECT_NEAR(antarctic_rise_m(a, years, ramp).back(), k * 0.01 * 100.0 * 100.0, 1e-12);
  // Snowfall gain alone lowers sea level.
  AntarcticParameters snow_only = a;
  snow_only.discharge_factor = 0.0;
  EXPECT_LT(antarctic_rise_m(snow_only, years, warming).back(), 0.0);
  const LandWaterParameters w;
  EXPECT_NEAR(land_water_rise_m(w, years).back(), 100.0 * w.rate_m_per_yr, 1e-15);
  EXPECT_THROW((void)greenland_rise_m(g, years, {1.0}), tidewright::InputError);
  EXPECT_THROW((void)glacier_rise_m(GlacierParameters{}, years_from(2030, 2040), std::vector<double>(11, 1.0)),
               tidewright::InputError);
}

// Calibration, not an independent check: the central member on "midway" gives the IPCC AR6 WG1
// Table 9.9 SSP2-4.5 medians for 2100 relative to 1995-2014 (secondary): glaciers 0.12,
// Greenland 0.08, Antarctica 0.11, land water 0.03 m. This guards the calibrated constants
// against drift when the physics changes; re-calibrate (docs/methods-climate.md) if it fails.
TEST(ClimateLandIce, CalibrationReproducesAr6MediansForMidway) {
  ProjectionOptions o;
  o.first_year = 1850;
  o.last_year = 2100;
  const MemberPath p = simulate_member(builtin_pathway("midway"), o.central, o);
  auto rel_2100 = [&](const std::vector<double>& v) {
    double base = 0.0;
    for (int y = 1995; y <= 2014; ++y) base += v[static_cast<std::size_t>(y - 1850)] / 20.0;
    return v[2100 - 1850] - base;
  };
  EXPECT_NEAR(rel_2100(p.glaciers_m), 0.12, 0.003);
  EXPECT_NEAR(rel_2100(p.greenland_m), 0.08, 0.003);
  EXPECT_NEAR(rel_2100(p.antarctica_m), 0.11, 0.003);
  EXPECT_NEAR(rel_2100(p.land_water_m), 0.03, 0.001);
}

// However extreme the warming, no ice sheet gives more than its inventory (7.42 m Greenland,
// 57.9 m Antarctica; land_ice.hpp): 40 K for 300 years would otherwise give hundreds of metres.
TEST(ClimateLandIce, IceSheetsGiveNoMoreThanTheirInventory) {
  const std::vector<int> years = years_from(1850, 2150);
  const std::vector<double> hot(years.size(), 40.0);
  const auto g = greenland_rise_m(GreenlandParameters{}, years, hot);
  AntarcticParameters a;
  a.discharge_factor = 7.4;
  const auto s = antarctic_rise_m(a, years, hot);
  EXPECT_DOUBLE_EQ(g.back(), greenland_inventory_m);
  EXPECT_DOUBLE_EQ(s.back(), antarctica_inventory_m);
  EXPECT_TRUE(std::is_sorted(g.begin(), g.end()));
  // An ordinary path stays far below the caps, untouched.
  const std::vector<double> mild(years.size(), 2.0);
  EXPECT_LT(greenland_rise_m(GreenlandParameters{}, years, mild).back(), 0.2 * greenland_inventory_m);
}
