// Radiative forcing: CO2 concentration to effective radiative forcing, and the smooth
// historical forcing ramp that the energy balance is spun up with.
//
// Glossary (code name -> symbol in the sources)
//   co2_ppm                C      CO2 concentration, ppm
//   reference_co2_ppm      C0     pre-industrial CO2 concentration, ppm
//   n2o_ppb                N      N2O concentration, ppb (Meinshausen et al. 2020 only)
//   forcing_w_m2           dF     effective radiative forcing relative to 1750, W m-2
#pragma once

#include <string_view>

namespace tidewright::climate {

// Myhre et al. (1998) GRL 25:2715, Table 3: dF = 5.35 ln(C/C0).
inline constexpr double myhre1998_coefficient_w_m2 = 5.35;
// Pre-industrial CO2 of Meinshausen et al. (2020) and IPCC AR6 WG1 Table 7.SM.1 (secondary,
// docs/references.md); used as C0 for both formulas unless the caller gives another.
inline constexpr double preindustrial_co2_ppm = 277.15;
// Pre-industrial N2O for the Meinshausen et al. (2020) CO2 formula: 273.87 ppb (from memory).
inline constexpr double preindustrial_n2o_ppb = 273.87;

// Effective radiative forcing of doubled CO2 as IPCC AR6 assessed it, 3.93 +- 0.47 W m-2 (AR6
// WG1 sec. 7.3.2.1; confirmed): the convention of the built-in pathways' effective forcings,
// so the sensitivity they imply is 3.93/lambda, not 3.71/lambda (docs/methods-climate.md 2.2).
inline constexpr double ar6_co2_doubling_erf_w_m2 = 3.93;

enum class Co2ForcingFormula {
  myhre1998,        // dF = 5.35 ln(C/C0)
  meinshausen2020,  // dF = (alpha' + c1 sqrt(N)) ln(C/C0), AR6 WG1 Table 7.SM.1 (secondary)
};

// CO2 forcing in W m-2. Throws InputError when a concentration is not positive and finite.
[[nodiscard]] double co2_forcing_w_m2(double co2_ppm, Co2ForcingFormula formula = Co2ForcingFormula::myhre1998,
                                      double reference_co2_ppm = preindustrial_co2_ppm,
                                      double n2o_ppb = preindustrial_n2o_ppb);

// "myhre1998" or "meinshausen2020"; throws InputError(where, ...) for any other name.
[[nodiscard]] Co2ForcingFormula co2_forcing_formula_from_name(std::string_view name, std::string_view where);

// The historical forcing ramp used to spin up the energy balance (docs/methods-climate.md,
// "Spin-up"): F(t) = F_2019 (exp(k (t - 1850)) - 1) / (exp(k 169) - 1) for 1850 <= t <= 2019,
// 0 before 1850. F_2019 = 2.72 W m-2 (IPCC AR6 WG1 ch. 7, total anthropogenic ERF 1750-2019,
// confirmed); k = 0.025 per year, this project's choice: the projection's central member warms
// 1.11 K over 1850-1900 -> 2011-2020 (AR6 SPM A.1.2: 1.09 [0.95-1.20] K, confirmed) -- a smooth
// stand-in for the real forcing history, without volcanic years.
inline constexpr double forcing_2019_w_m2 = 2.72;
inline constexpr double historical_ramp_rate_per_yr = 0.025;
inline constexpr int historical_ramp_start_year = 1850;
inline constexpr int historical_ramp_end_year = 2019;
[[nodiscard]] double historical_forcing_w_m2(double year);
// dF/dt of the ramp at 2019, W m-2 per year; the built-in pathways start with this slope.
[[nodiscard]] double historical_forcing_slope_2019_w_m2_per_yr();

}  // namespace tidewright::climate
