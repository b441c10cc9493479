#include "tidewright/climate/thermal_expansion.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "tidewright/climate/projection.hpp"
#include "tidewright/climate/seawater.hpp"
#include "tidewright/common/error.hpp"

using namespace tidewright::climate;

// Calorimetry: a layer built for a box holds f_ocean C s_yr A_earth per kelvin of its own warming.
TEST(ClimateThermalExpansion, LayersMatchBoxHeatCapacities) {
  const TwoLayerParameters p{};
  const LayeredOcean o = layered_ocean_for(p);
  const double per_k_upper = seawater_rho_cp_j_m3_k * ocean_surface_area_m2 * o.upper.thickness_m;
  EXPECT_NEAR(per_k_upper, ocean_heat_j(p.upper_heat_capacity_w_yr_m2_k), 1e-9 * per_k_upper);
  EXPECT_NEAR(o.deep.thickness_m / o.upper.thickness_m, 109.0 / 8.2, 1e-12);
  EXPECT_GT(o.deep.mid_pressure_dbar, o.upper.thickness_m);
}

// Small heat: rise -> alpha(S, Theta, p) Q / (rho c_p A_ocean), the linear limit of the layer formula.
TEST(ClimateThermalExpansion, LayerRiseHasLinearLimit) {
  const LayeredOcean o = layered_ocean_for(TwoLayerParameters{});
  const double q = 1e18;  // J: warms the upper layer by about 2e-5 K
  const double expected = thermal_expansion_per_k(o.upper.absolute_salinity_g_kg, o.upper.conservative_temperature_c,
                                                  o.upper.mid_pressure_dbar) *
                          q / (seawater_rho_cp_j_m3_k * ocean_surface_area_m2);
  EXPECT_NEAR(layer_expansion_m(o.upper, q), expected, 1e-6 * expected);
  EXPECT_THROW((void)layer_expansion_m(o.upper, 1e30), tidewright::ComputationError);  // would boil the layer
}

// The two routes on the central member of the built-in "midway" pathway: the layered TEOS-10
// calculation must lie within 2 standard deviations of the expansion-efficiency route, whose
// efficiency is 0.12 +- 0.01 m per YJ (the sd of Kuhlbrodt & Gregory 2012, secondary, around a
// calibrated mean), and its implied efficiency must fall in Kuhlbrodt & Gregory's 0.11 +- 0.02:
// the layered route is not calibrated.
TEST(ClimateThermalExpansion, TwoRoutesAgreeWithinUncertainty) {
  ProjectionOptions o;
  o.first_year = 1850;
  o.last_year = 2150;
  const MemberPath p = simulate_member(builtin_pathway("midway"), o.central, o);
  for (int year : {2050, 2100, 2150}) {
    SCOPED_TRACE(year);
    const auto i = static_cast<std::size_t>(year - 1850);
    const double heat_yj = p.ocean_heat_j[i] * 1e-24;
    const double by_efficiency = p.thermal_efficiency_m[i];
    const double layered = p.thermal_layered_m[i];
    EXPECT_NEAR(by_efficiency, o.central.expansion_efficiency_m_per_yj * heat_yj, 1e-12);
    EXPECT_NEAR(layered, by_efficiency, 2.0 * 0.01 * heat_yj);
    const double implied = layered / heat_yj;
    EXPECT_GT(implied, 0.09);
    EXPECT_LT(implied, 0.13);
    std::printf("%d: ocean heat %.3f YJ, expansion by efficiency %.4f m, layered %.4f m (implied %.4f m/YJ)\n", year,
                heat_yj, by_efficiency, layered, implied);
  }
}
