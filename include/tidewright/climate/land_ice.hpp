// Semi-empirical land-ice and land-water contributions to global mean sea level, each driven by
// the global surface warming path T(t) (K relative to pre-industrial) at annual points, linear
// between them. Each function returns the cumulative contribution in metres of sea-level
// equivalent (SLE), zero at the first year of the path. Floating ice adds nothing.
//
// Glossary (code name -> symbol)
//   warming_k                   T       global surface warming, K
//   volume_m / volume_2019_m    V, V_19 remaining glacier volume, m SLE (in 2019)
//   sensitivity_m_per_yr_k      a_g     glacier loss rate per K of warming at today's volume
//   quadratic_m_per_yr_k2       q_g     its growth with the square of warming
//   equilibrium_warming_k       T_g0    warming at which glaciers would be in balance
//   volume_exponent             n       rate scales as (V/V_19)^n (area-volume scaling)
//   smb_m_per_yr_k2             s_G     Greenland surface-mass-balance loss per K^2
//   discharge_m_per_yr_k        d_G,d_A ice discharge increase per K
//   accumulation_m_per_yr       P_A     present Antarctic snowfall, m SLE per year
//   snowfall_increase_per_k     c_A     fractional snowfall increase per K of Antarctic warming
//   ocean_k                     T_d     warming of the deep ocean layer (energy_balance.hpp)
//
// The constants marked "calibrated" below were set so that the ensemble's 2100 medians and likely
// ranges on the three built-in pathways reproduce those of IPCC AR6 WG1 Table 9.9 for the
// comparable SSPs (docs/methods-climate.md, section 4 and 6). Those values are then not an
// independent check. The satellite-era budget (AR6 Table 9.5) was not tuned to, but it shaped
// the glacier form (the quadratic term), so for glaciers it is only partly independent.
#pragma once

#include <vector>

namespace tidewright::climate {

// Ice that can be lost at all, m SLE: no term may exceed its inventory, however extreme the
// forcing (a stress test of 2000 W m-2 once gave 6 km from Greenland). Greenland 7.42 m
// (Morlighem et al. 2017, BedMachine Greenland v3) and Antarctica 57.9 m (Morlighem et al. 2020,
// BedMachine Antarctica), both from memory; glaciers are limited by their own volume V_19.
inline constexpr double greenland_inventory_m = 7.42;
inline constexpr double antarctica_inventory_m = 57.9;

// Glaciers: dS/dt = g(T - T_g0) (V/V_19)^n, g(x) = a_g x + q_g x|x|, V = V_19 - (S - S_19) -- a
// warming-driven loss rate limited by the remaining volume (form after the volume-limited
// semi-empirical glacier models, e.g. Wigley & Raper 2005, from memory). The quadratic term is
// there because a loss linear in warming cannot give both the observed rate of the satellite era
// and AR6's twice larger loss under SSP5-8.5 than under SSP1-2.6 (docs/methods-climate.md, 4).
struct GlacierParameters {
  double volume_2019_m = 0.32;        // Farinotti et al. (2019) Nat. Geosci. 12:168, 0.32 +- 0.08 m (confirmed)
  double sensitivity_m_per_yr_k = 2.6e-4;   // calibrated (see above)
  double quadratic_m_per_yr_k2 = 1.74e-4;   // calibrated
  double factor = 1.0;                      // ensemble multiplier of both terms
  double equilibrium_warming_k = -0.2;      // glaciers already retreating in the late 19th century (from memory)
  double volume_exponent = 1.0 / 1.375;     // area ~ V^(1/1.375), Bahr et al. (1997) JGR 102:20355 (from memory)
  int volume_year = 2019;
};
// With u = V^(1-n), du/dt = -(1-n) V_19^-n g(T - T_g0), so
// V(t)^(1-n) = V_19^(1-n) - (1-n) V_19^-n int_{2019}^t g(T - T_g0) dt, V >= 0; the integral is
// Simpson's rule in each step, exact for T linear in the step while T - T_g0 keeps its sign.
[[nodiscard]] std::vector<double> glacier_rise_m(const GlacierParameters& p, const std::vector<int>& years,
                                                 const std::vector<double>& warming_k);

// Greenland: dS/dt = s_G T|T| + d_G T -- surface mass balance loss growing with the square of
// warming (melt-albedo and elevation feedbacks, e.g. Fettweis et al. 2013, from memory) plus a
// discharge increase linear in warming. The calibrated constants put most of today's loss in the
// linear term (about 85 % at 0.9 K): a fit to AR6's scenario spread, not a physical partition.
struct GreenlandParameters {
  double smb_m_per_yr_k2 = 0.55e-4;        // calibrated
  double discharge_m_per_yr_k = 2.8e-4;    // calibrated
  double factor = 1.0;                    // ensemble multiplier of both terms
};
// The cumulative loss is capped at greenland_inventory_m.
[[nodiscard]] std::vector<double> greenland_rise_m(const GreenlandParameters& p, const std::vector<int>& years,
                                                   const std::vector<double>& warming_k);

// Antarctica: dS/dt = -P_A c_A r_A T + f_A d_A T_d -- snowfall that grows with surface warming
// by Clausius-Clapeyron scaling (Frieler et al. 2015, Nat. Clim. Change 5:348: about 5 % per K of
// Antarctic warming, from memory) lowers sea level; dynamic discharge raises it, driven by the
// warming of the deep ocean layer T_d, the subsurface water that melts the ice shelves from below
// (the ocean-driven response of e.g. Levermann et al. 2020, Earth Syst. Dyn. 11:35, from memory),
// with a skewed multiplier f_A (log-normal in the ensemble). T_d lags the surface by decades to
// centuries, which makes the 2100 loss nearly independent of the scenario, as in AR6 Table 9.9.
struct AntarcticParameters {
  double accumulation_m_per_yr = 5.8e-3;   // about 2100 Gt/yr at 362.5 Gt per mm SLE (from memory)
  double snowfall_increase_per_k = 0.05;   // Frieler et al. (2015), from memory
  double antarctic_warming_ratio = 1.0;    // Antarctic over global warming (from memory)
  double discharge_m_per_yr_k = 3.3e-3;    // per K of deep-layer warming; calibrated
  double discharge_factor = 1.0;           // ensemble multiplier (log-normal)
};
// The cumulative loss is capped at antarctica_inventory_m. `ocean_k` is T_d on the same years
// (trapezoid within a step: T_d is smooth on the scale of a year).
[[nodiscard]] std::vector<double> antarctic_rise_m(const AntarcticParameters& p, const std::vector<int>& years,
                                                   const std::vector<double>& warming_k,
                                                   const std::vector<double>& ocean_k);

// Land-water storage: a prescribed constant rate (groundwater depletion minus reservoir
// impoundment), calibrated to the AR6 SSP2-4.5 median of 0.03 m over 1995-2014 -> 2100.
struct LandWaterParameters {
  double rate_m_per_yr = 0.03 / 95.5;  // calibrated: 0.03 m over 2004.5 -> 2100
  double factor = 1.0;                 // ensemble multiplier
};
[[nodiscard]] std::vector<double> land_water_rise_m(const LandWaterParameters& p, const std::vector<int>& years);

}  // namespace tidewright::climate
