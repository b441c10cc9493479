// Glossary: see include/tidewright/climate/thermal_expansion.hpp.
#include "tidewright/climate/thermal_expansion.hpp"

#include <cmath>
#include <string>

#include "tidewright/climate/seawater.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::climate {

LayeredOcean layered_ocean_for(const TwoLayerParameters& p) {
  validate(p);
  // Thickness of seawater whose heat capacity over the ocean equals f_ocean C over the Earth.
  const double per_box = ocean_heat_fraction * seconds_per_year * earth_surface_area_m2 /
                         (seawater_rho_cp_j_m3_k * ocean_surface_area_m2);
  LayeredOcean o;
  o.upper.thickness_m = per_box * p.upper_heat_capacity_w_yr_m2_k;
  o.deep.thickness_m = per_box * p.deep_heat_capacity_w_yr_m2_k;
  o.upper.absolute_salinity_g_kg = 35.2;   // from memory (WOA climatology, upper ocean)
  o.upper.conservative_temperature_c = 17.0;
  o.upper.mid_pressure_dbar = 0.5 * o.upper.thickness_m;
  o.deep.absolute_salinity_g_kg = 35.0;    // from memory (WOA climatology, thermocline)
  o.deep.conservative_temperature_c = 7.0;
  o.deep.mid_pressure_dbar = o.upper.thickness_m + 0.5 * o.deep.thickness_m;
  return o;
}

double layer_expansion_m(const OceanLayer& layer, double layer_heat_j) {
  if (!(layer.thickness_m > 0.0)) {
    throw InputError("ocean layer", "thickness must be positive", "derive layers with layered_ocean_for");
  }
  // Uniform warming of the layer by its heat (calorimetry, dT = Q / (rho c_p V)).
  const double warming_k = layer_heat_j / (seawater_rho_cp_j_m3_k * ocean_surface_area_m2 * layer.thickness_m);
  const double theta_mid = layer.conservative_temperature_c + 0.5 * warming_k;
  if (!std::isfinite(theta_mid) || theta_mid > 40.0 || theta_mid < -2.0) {
    throw ComputationError("thermal expansion", "layer temperature " + std::to_string(theta_mid) +
                                                    " C lies outside the TEOS-10 polynomial's range",
                           "use the expansion-efficiency route for such extreme warming");
  }
  // Rise of a column of thickness d: dh = alpha dT d (linear thermal expansion of the column).
  return thermal_expansion_per_k(layer.absolute_salinity_g_kg, theta_mid, layer.mid_pressure_dbar) * warming_k *
         layer.thickness_m;
}

double expansion_layered_m(const LayeredOcean& ocean, double upper_heat_w_yr_m2, double deep_heat_w_yr_m2,
                           double fraction) {
  return layer_expansion_m(ocean.upper, ocean_heat_j(upper_heat_w_yr_m2, fraction)) +
         layer_expansion_m(ocean.deep, ocean_heat_j(deep_heat_w_yr_m2, fraction));
}

}  // namespace tidewright::climate
