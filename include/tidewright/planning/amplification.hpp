// Amplification factor, future return period and emergence year, all from N_t(z).
//   amplification factor of z in year t:     AF = N_t(z) / N_0(z)  (IPCC AR5 WG1 ch. 13;
//                                             Buchanan et al. 2017, Environ. Res. Lett.)
//   future return period of today's z_T:      T_t = 1 / N_t(z_T)
//   emergence year of z at frequency f:       first listed t with N_t(z) >= f (f = 1 per yr:
//                                             "reached once a year on average")
// For Gumbel scale lambda and a known rise Delta, AF = exp(Delta / lambda); with normal
// Delta ~ N(mu, sigma), AF = exp(mu/lambda + sigma^2/(2 lambda^2)) (lognormal mean).
//
// Glossary: z level (m); z_T today's T-year level; N_0, N_t rates (per yr); f frequency (per yr).
#pragma once

#include <optional>
#include <span>

#include "tidewright/extremes/still_water_model.hpp"
#include "tidewright/planning/future_exceedance.hpp"
#include "tidewright/planning/monte_carlo_error.hpp"

namespace tidewright::planning {

struct Amplification {
  int year = 0;
  double level_m = 0.0;
  double present_rate_per_yr = 0.0;     // N_0(z)
  double future_rate_per_yr = 0.0;      // N_t(z)
  double present_return_period_yr = 0.0;  // 1 / N_0(z)  (+inf when N_0 = 0)
  double future_return_period_yr = 0.0;   // 1 / N_t(z)  (+inf when N_t = 0)
  double amplification_factor = 0.0;      // N_t / N_0; +inf when only N_0 = 0, NaN when both
  // True when z lies above the fitted distribution's upper end point today (N_0 = 0), so the
  // factor is not a finite number; say so rather than print it.
  bool present_rate_is_zero = false;
  // An annual-maxima model (Gumbel, GEV) states how likely a year's highest level is to pass z,
  // not how many times a year z is passed. Where a member's N_0(z - delta_i) exceeds 1 a year
  // (infinite where its rise takes z below the model's lower end point), its count is known only
  // to be at least 1, so only bounds are honest: N_t >= L = sum_i w_i min(N_0(z - delta_i), 1),
  // a future return period under 1/L and a factor above L/N_0. The one place this rule lives.
  bool beyond_annual_maxima_range = false;
  double beyond_range_fraction = 0.0;  // weight of the members with N_0(z - delta_i) infinite
  double rate_lower_bound_per_yr = 0.0;  // L (= N_t when inside the range)
  // AEP in year t, sum_i w_i (1 - exp(-N_0(z - delta_i))): the expected share of years with an
  // exceedance, finite for every model; and today's, 1 - exp(-N_0(z)).
  double future_aep = 0.0;
  double present_aep = 0.0;
  // The factor to quote and plot: N_t/N_0, or its bound L/N_0 beyond the annual-maxima range
  // (so a table's "> 10" and a figure's 10 agree); NaN where N_0 = 0.
  [[nodiscard]] double quotable_factor() const;
  MonteCarloError monte_carlo;  // of amplification_factor (N_t's error / N_0)
};

struct AmplificationOptions {
  // Compute future_aep, a pass member by member (about 10 ms for 10,000 members; left NaN when
  // false, as the bulk tables do).
  bool future_aep = true;
};
[[nodiscard]] Amplification amplification(const extremes::StillWaterModel& present,
                                          const YearConditions& conditions, double level_m,
                                          const AmplificationOptions& options = {});
// The same for today's T-year level z_T (present_return_period_yr = T).
[[nodiscard]] Amplification amplification_of_return_level(const extremes::StillWaterModel& present,
                                                          const YearConditions& conditions,
                                                          double return_period_yr,
                                                          const AmplificationOptions& options = {});

struct Emergence {
  double level_m = 0.0;
  double frequency_per_yr = 1.0;
  std::optional<int> year;           // first listed year with N_t(z) >= f; empty if none
  double rate_in_year_per_yr = 0.0;  // N_t(z) in that year (or in the last year if none)
};

// `years` ascending. frequency_per_yr default 1 (once a year on average; common practice,
// the "historical centennial event becomes an annual event" framing of IPCC SROCC ch. 4,
// from memory).
[[nodiscard]] Emergence emergence_year(const extremes::StillWaterModel& present,
                                       std::span<const YearConditions> years, double level_m,
                                       double frequency_per_yr = 1.0);

}  // namespace tidewright::planning
