// Seawater specific volume and thermal expansion coefficient consistent with TEOS-10, from the
// 75-term polynomial of Roquet et al. (2015), Ocean Modelling 90:29-43, "Accurate polynomial
// expressions for the density and specific volume of seawater using the TEOS-10 standard".
//
// Glossary (code name -> TEOS-10 symbol)
//   absolute_salinity_g_kg           S_A    Absolute Salinity, g/kg
//   conservative_temperature_c       Theta  Conservative Temperature, deg C
//   sea_pressure_dbar                p      sea pressure (absolute minus 10.1325 dbar), dbar
//   specific_volume_m3_kg            v      specific volume, m3/kg
//   thermal_expansion_per_k          alpha  alpha = (1/v) dv/dTheta at constant S_A, p, 1/K
//
// Accuracy: the polynomial is fitted inside the "oceanographic funnel" (McDougall et al. 2003);
// tests/reference/climate_seawater_gsw_test.cpp checks alpha against Debian's python3-gsw.
#pragma once

namespace tidewright::climate {

[[nodiscard]] double specific_volume_m3_kg(double absolute_salinity_g_kg, double conservative_temperature_c,
                                           double sea_pressure_dbar);
[[nodiscard]] double thermal_expansion_per_k(double absolute_salinity_g_kg, double conservative_temperature_c,
                                             double sea_pressure_dbar);

}  // namespace tidewright::climate
