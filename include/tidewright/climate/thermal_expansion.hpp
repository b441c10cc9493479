// Thermal expansion of the ocean from the heat it takes up, two ways:
//  (a) expansion efficiency of heat: rise = e * Q_ocean (Kuhlbrodt & Gregory 2012, GRL 39:L18608);
//  (b) layered: the ocean heat of each box of the two-layer model warms a layer of seawater
//      whose thickness matches the box's heat capacity; its rise is the layer's thermal
//      expansion alpha(S_A, Theta, p) (TEOS-10, seawater.hpp) times warming times thickness.
//
// Glossary (code name -> symbol)
//   heat_content_w_yr_m2     H      heat stored in a box per m2 of Earth's surface, W yr m-2
//   ocean_heat_j             Q      heat taken up by the ocean, J (= f_ocean H s_yr A_earth)
//   ocean_heat_fraction      f_ocean fraction of the climate system's heat gain held by the ocean
//   efficiency_m_per_yj      e      expansion efficiency of heat, m per 10^24 J
//   thickness_m              d      layer thickness over the ocean's area, m
//   rho_cp_j_m3_k            rho c_p  volumetric heat capacity of seawater, J m-3 K-1
#pragma once

#include "tidewright/climate/energy_balance.hpp"

namespace tidewright::climate {

// Earth's surface area 5.10e14 m2 (NASA Earth Fact Sheet: 510,072,000 km2; from memory).
inline constexpr double earth_surface_area_m2 = 5.10e14;
// Ocean surface area 3.61e14 m2 (about 71 % of Earth's surface; from memory).
inline constexpr double ocean_surface_area_m2 = 3.61e14;
// Julian year of 365.25 days (IAU), s.
inline constexpr double seconds_per_year = 365.25 * 86400.0;
// Ocean warming holds about 91 % of the heat gained by the climate system (IPCC AR6 WG1 ch. 7,
// Box 7.2 energy inventory; from memory).
inline constexpr double ocean_heat_fraction = 0.91;
// TEOS-10 heat capacity for Conservative Temperature, c_p0 = 3991.86795711963 J kg-1 K-1
// (IOC, SCOR & IAPSO 2010), times a reference density of 1025 kg m-3 (common practice).
inline constexpr double seawater_rho_cp_j_m3_k = 1025.0 * 3991.86795711963;
// Expansion efficiency of heat, CMIP5 mean and spread: 0.11 +- 0.01 m per YJ
// (Kuhlbrodt & Gregory 2012; secondary, docs/references.md). The literature value: the
// projection draws its own, calibrated mean (projection.hpp), and always passes it.
inline constexpr double expansion_efficiency_m_per_yj = 0.11;
inline constexpr double expansion_efficiency_sd_m_per_yj = 0.01;

// Ocean heat in J from a box's heat content per m2 of Earth's surface.
[[nodiscard]] inline double ocean_heat_j(double heat_content_w_yr_m2, double fraction = ocean_heat_fraction) {
  return fraction * heat_content_w_yr_m2 * seconds_per_year * earth_surface_area_m2;
}

// (a) rise = e Q (Kuhlbrodt & Gregory 2012, eq. 1 with e in m per YJ).
[[nodiscard]] inline double expansion_by_efficiency_m(double ocean_heat_j_value,
                                                      double efficiency_m_per_yj = expansion_efficiency_m_per_yj) {
  return efficiency_m_per_yj * ocean_heat_j_value * 1e-24;
}

// One seawater layer of the layered calculation (b): its thickness over the ocean's area and
// its unperturbed (pre-industrial) state at mid-depth.
struct OceanLayer {
  double thickness_m = 0.0;
  double absolute_salinity_g_kg = 35.0;
  double conservative_temperature_c = 0.0;
  double mid_pressure_dbar = 0.0;  // 1 dbar per metre of depth (common practice)
};
struct LayeredOcean {
  OceanLayer upper;
  OceanLayer deep;
};
// Layers matching the boxes of `p`: thickness = f_ocean C s_yr A_earth / (rho c_p A_ocean), so
// that the ocean's share of the box's heat warms the layer by the box temperature; the deep layer sits
// under the upper one. Representative states (from memory of the World Ocean Atlas climatology,
// not an oracle): upper layer Theta 17 C, S_A 35.2 g/kg; deep layer Theta 7 C, S_A 35.0 g/kg.
[[nodiscard]] LayeredOcean layered_ocean_for(const TwoLayerParameters& p);

// Rise of one layer that has taken up `layer_heat_j`: warming dT = Q / (rho c_p A_ocean d);
// rise = alpha(S_A, Theta + dT/2, p) dT d (midpoint rule for the integral of alpha over the
// warming). Throws ComputationError when the layer would leave the ocean's range (Theta > 40 C).
[[nodiscard]] double layer_expansion_m(const OceanLayer& layer, double layer_heat_j);

// (b) for both boxes: heat contents per m2 of Earth's surface of each box (C T and C_d T_d).
[[nodiscard]] double expansion_layered_m(const LayeredOcean& ocean, double upper_heat_w_yr_m2, double deep_heat_w_yr_m2,
                                         double fraction = ocean_heat_fraction);

}  // namespace tidewright::climate
