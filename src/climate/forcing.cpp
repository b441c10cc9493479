// Glossary: see include/tidewright/climate/forcing.hpp.
#include "tidewright/climate/forcing.hpp"

#include <cmath>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::climate {

namespace {

// Meinshausen et al. (2020) GMD 13:3571, Table 3, as quoted in IPCC AR6 WG1 Table 7.SM.1
// (secondary, docs/references.md): coefficients of the CO2 forcing fit.
constexpr double meinshausen_a1 = -2.4785e-7;  // W m-2 ppm-1
constexpr double meinshausen_b1 = 7.5906e-4;   // W m-2 ppm-1
constexpr double meinshausen_c1 = -2.1492e-3;  // W m-2 ppb-1/2
constexpr double meinshausen_d1 = 5.2488;      // W m-2

void require_positive(double value, const char* what) {
  if (!std::isfinite(value) || value <= 0.0) {
    throw InputError(what, "must be a positive number, got " + std::to_string(value),
                     "give concentrations in ppm (CO2) or ppb (N2O)");
  }
}

}  // namespace

double co2_forcing_w_m2(double co2_ppm, Co2ForcingFormula formula, double reference_co2_ppm, double n2o_ppb) {
  require_positive(co2_ppm, "CO2 concentration");
  require_positive(reference_co2_ppm, "reference CO2 concentration");
  const double log_ratio = std::log(co2_ppm / reference_co2_ppm);
  if (formula == Co2ForcingFormula::myhre1998) {
    return myhre1998_coefficient_w_m2 * log_ratio;  // Myhre et al. (1998) Table 3
  }
  require_positive(n2o_ppb, "N2O concentration");
  // Meinshausen et al. (2020) eq. in Table 3 / AR6 Table 7.SM.1: alpha' by concentration band.
  const double c_alpha_max = reference_co2_ppm - meinshausen_b1 / (2.0 * meinshausen_a1);
  double alpha_prime = meinshausen_d1;  // C <= C0
  if (co2_ppm > c_alpha_max) {
    alpha_prime = meinshausen_d1 - meinshausen_b1 * meinshausen_b1 / (4.0 * meinshausen_a1);
  } else if (co2_ppm > reference_co2_ppm) {
    const double d = co2_ppm - reference_co2_ppm;
    alpha_prime = meinshausen_d1 + meinshausen_a1 * d * d + meinshausen_b1 * d;
  }
  const double alpha_n2o = meinshausen_c1 * std::sqrt(n2o_ppb);
  return (alpha_prime + alpha_n2o) * log_ratio;
}

Co2ForcingFormula co2_forcing_formula_from_name(std::string_view name, std::string_view where) {
  if (name == "myhre1998") return Co2ForcingFormula::myhre1998;
  if (name == "meinshausen2020") return Co2ForcingFormula::meinshausen2020;
  throw InputError(std::string(where), "unknown CO2 forcing formula '" + std::string(name) + "'",
                   "use myhre1998 or meinshausen2020");
}

double historical_forcing_w_m2(double year) {
  if (year <= historical_ramp_start_year) return 0.0;
  const double span = historical_ramp_end_year - historical_ramp_start_year;
  // Smooth exponential ramp through 0 in 1850 and 2.72 W m-2 in 2019 (docs/methods-climate.md).
  return forcing_2019_w_m2 * std::expm1(historical_ramp_rate_per_yr * (year - historical_ramp_start_year)) /
         std::expm1(historical_ramp_rate_per_yr * span);
}

double historical_forcing_slope_2019_w_m2_per_yr() {
  const double span = historical_ramp_end_year - historical_ramp_start_year;
  const double k = historical_ramp_rate_per_yr;
  return forcing_2019_w_m2 * k * std::exp(k * span) / std::expm1(k * span);
}

}  // namespace tidewright::climate
