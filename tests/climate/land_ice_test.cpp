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

// The glacier ODE dS/dt = g(T - T0) (V/V_19)^n, g(x) = a x + q x|x|, V = V_19 - (S - S_19),
// integrated by fine RK4 from 2019 to `to_year` (forward or backward) along the warming
// `warming_at(year)`: an independent check of the closed form in land_ice.cpp.
template <typename Warming>
double rk4_glacier_volume(const GlacierParameters& p, Warming warming_at, double to_year, int steps) {
  const auto dv = [&](double year, double vol) {
    const double x = warming_at(year) - p.equilibrium_warming_k;
    return vol <= 0.0 ? 0.0 : -p.factor * (p.sensitivity_m_per_yr_k * x + p.quadratic_m_per_yr_k2 * x * std::fabs(x)) *
                                  std::pow(vol / p.volume_2019_m, p.volume_exponent);
  };
  double v = p.volume_2019_m;
  const double h = (to_year - 2019.0) / steps;
  for (int i = 0; i < steps; ++i) {
    const double t = 2019.0 + i * h;
    const double k1 = dv(t, v), k2 = dv(t + 0.5 * h, v + 0.5 * h * k1), k3 = dv(t + 0.5 * h, v + 0.5 * h * k2),
                 k4 = dv(t + h, v + h * k3);
    v += h / 6.0 * (k1 + 2 * k2 + 2 * k3 + k4);
  }
  return v;
}

}  // namespace

TEST(ClimateLandIce, GlacierClosedFormMatchesRk4AndIsVolumeLimited) {
  GlacierParameters p;
  p.sensitivity_m_per_yr_k = 1e-3;
  p.factor = 1.3;
  const std::vector<int> years = years_from(1900, 2400);
  const std::vector<double> warming(years.size(), 2.0);
  const std::vector<double> s = glacier_rise_m(p, years, warming);
  const std::size_t i2019 = 2019 - 1900;
  for (int year : {1950, 2100, 2200}) {
    const auto i = static_cast<std::size_t>(year - 1900);
    const double volume_rk4 = rk4_glacier_volume(p, [](double) { return 2.0; }, year, 20000);
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
  // Surface T = 0.02 (t - 2000) and deep-layer T_d = 0.01 (t - 2000): Antarctica's rate
  // d_A T_d - P_A c_A r_A T accumulates to (0.5 d_A - P_A c_A r_A) 0.01 t^2.
  std::vector<double> ramp;
  std::vector<double> deep;
  for (int y : years) {
    ramp.push_back(0.02 * (y - 2000));
    deep.push_back(0.01 * (y - 2000));
  }
  const AntarcticParameters a;
  const double snow = a.accumulation_m_per_yr * a.snowfall_increase_per_k * a.antarctic_warming_ratio;
  EXPECT_NEAR(antarctic_rise_m(a, years, ramp, deep).back(), (0.5 * a.discharge_m_per_yr_k - snow) * 0.01 * 100.0 * 100.0,
              1e-12);
  // Snowfall gain alone lowers sea level; discharge follows the deep layer, not the surface.
  AntarcticParameters snow_only = a;
  snow_only.discharge_factor = 0.0;
  EXPECT_LT(antarctic_rise_m(snow_only, years, warming, warming).back(), 0.0);
  const std::vector<double> cold(years.size(), 0.0);
  EXPECT_NEAR(antarctic_rise_m(a, years, cold, warming).back(), 100.0 * 2.0 * a.discharge_m_per_yr_k, 1e-12);
  const LandWaterParameters w;
  EXPECT_NEAR(land_water_rise_m(w, years).back(), 100.0 * w.rate_m_per_yr, 1e-15);
  EXPECT_THROW((void)greenland_rise_m(g, years, {1.0}), tidewright::InputError);
  EXPECT_THROW((void)glacier_rise_m(GlacierParameters{}, years_from(2030, 2040), std::vector<double>(11, 1.0)),
               tidewright::InputError);
}

// A drift guard, not a check against the outside: the central member (every distribution at its
// mean) on "midway" in 2100, relative to 1995-2014, as calibrated (docs/methods-climate.md
// section 4). The ensemble's calibration test allows 10 % on the medians; this catches a change
// of a few millimetres in any calibrated constant or in the physics that carries it.
TEST(ClimateLandIce, CentralMemberIsStable) {
  ProjectionOptions o;
  o.first_year = 1850;
  o.last_year = 2100;
  const MemberPath p = simulate_member(builtin_pathway("midway"), o.central, o);
  auto rel_2100 = [&](const std::vector<double>& v) {
    double base = 0.0;
    for (int y = 1995; y <= 2014; ++y) base += v[static_cast<std::size_t>(y - 1850)] / 20.0;
    return v[2100 - 1850] - base;
  };
  EXPECT_NEAR(rel_2100(p.thermal_efficiency_m), 0.1949, 0.0005);
  EXPECT_NEAR(rel_2100(p.glaciers_m), 0.1241, 0.0005);
  EXPECT_NEAR(rel_2100(p.greenland_m), 0.0775, 0.0005);
  EXPECT_NEAR(rel_2100(p.antarctica_m), 0.1134, 0.0005);
  EXPECT_NEAR(rel_2100(p.land_water_m), 0.0300, 0.0005);
}

// The glacier closed form on a warming ramp that crosses T_g0 (-0.2 K): from -1 K in 1900 to
// 3 K in 2300 in straight steps, against fine RK4 on the same piecewise-linear path. Simpson's
// rule is exact within a year where T - T_g0 keeps its sign; the one year that crosses it is
// where the two may differ, by far less than a millimetre.
TEST(ClimateLandIce, GlacierClosedFormFollowsAWarmingRampAcrossItsThreshold) {
  GlacierParameters p;
  p.factor = 0.8;
  const std::vector<int> years = years_from(1900, 2300);
  const auto t_at = [](double year) { return -1.0 + 4.0 * (year - 1900.0) / 400.0 + 0.013; };  // crosses T_g0 in 1978-79
  std::vector<double> warming;
  warming.reserve(years.size());
  for (int y : years) warming.push_back(t_at(y));
  const std::vector<double> s = glacier_rise_m(p, years, warming);
  const std::size_t i2019 = 2019 - 1900;
  for (int year : {1950, 2100, 2300}) {
    const auto i = static_cast<std::size_t>(year - 1900);
    EXPECT_NEAR(p.volume_2019_m - (s[i] - s[i2019]), rk4_glacier_volume(p, t_at, year, 40000), 1e-6) << year;
  }
}

// However extreme the warming, no ice sheet gives more than its inventory (7.42 m Greenland,
// 57.9 m Antarctica; land_ice.hpp): 40 K for 300 years would otherwise give hundreds of metres.
TEST(ClimateLandIce, IceSheetsGiveNoMoreThanTheirInventory) {
  const std::vector<int> years = years_from(1850, 2150);
  const std::vector<double> hot(years.size(), 40.0);
  const auto g = greenland_rise_m(GreenlandParameters{}, years, hot);
  AntarcticParameters a;
  a.discharge_factor = 7.4;
  const auto s = antarctic_rise_m(a, years, hot, hot);
  EXPECT_DOUBLE_EQ(g.back(), greenland_inventory_m);
  EXPECT_DOUBLE_EQ(s.back(), antarctica_inventory_m);
  EXPECT_TRUE(std::is_sorted(g.begin(), g.end()));
  // An ordinary path stays far below the caps, untouched.
  const std::vector<double> mild(years.size(), 2.0);
  EXPECT_LT(greenland_rise_m(GreenlandParameters{}, years, mild).back(), 0.2 * greenland_inventory_m);
}
