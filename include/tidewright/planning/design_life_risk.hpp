// Design-life risk: the probability that height H is exceeded at least once in years t1..t2,
//   P = 1 - E_paths[ exp( - sum_{t=t1..t2} N_0(H - Delta_t) ) ]        (docs/design.md)
// with Poisson occurrence in each year given the path (Coles 2001, §4.4) and the expectation
// over whole paths, so the year-to-year correlation of Delta is kept (node i of every year is
// path i: ensemble member i, or quadrature node i of a comonotone distribution). Both P and
// 1 - P are computed directly (expm1), so neither loses its digits near 0.
// The inverse: the height H for which P equals a target probability.
//
// Glossary: H height (m); t1, t2 first and last year of the design life; S_i = sum_t N_0(H -
// delta_ti) expected exceedances along path i; w_i path weight; P, Q = 1 - P probabilities.
#pragma once

#include <span>

#include "tidewright/extremes/still_water_model.hpp"
#include "tidewright/planning/future_exceedance.hpp"
#include "tidewright/planning/monte_carlo_error.hpp"

namespace tidewright::planning {

struct DesignLifeRisk {
  int first_year = 0;
  int last_year = 0;
  double level_m = 0.0;
  double probability = 0.0;           // P, at least one exceedance
  double probability_none = 1.0;      // Q = 1 - P, computed as E[exp(-S)]
  double expected_exceedances = 0.0;  // E[S], sum over the years of N_t(H); +inf when a member
                                      // takes H beyond an annual-maxima model's range
  // E[sum_t (1 - exp(-N_t(H)))]: the expected number of years with at least one exceedance,
  // what an annual-maxima model can state (it cannot count a second exceedance in a year).
  double expected_years_with_exceedance = 0.0;
  // Share of member-years in which H lies below the lower end point of an annual-maxima model
  // with xi > 0 after the rise (N_0 infinite: exceeded for certain that year).
  double beyond_range_fraction = 0.0;
  MonteCarloError monte_carlo;  // of `probability`
  // True when P rounds to 1 in double precision (Q below half an ulp of 1): quote
  // "P > 1 - probability_none" or probability_none itself, never a bare 1.
  bool rounds_to_one = false;
};

// `years`: consecutive years t1..t2 that share node count and weights (conditions_over_years).
[[nodiscard]] DesignLifeRisk design_life_risk(const extremes::StillWaterModel& present,
                                              std::span<const YearConditions> years, double level_m);

struct DesignLifeLevel {
  double target_probability = 0.0;
  double level_m = 0.0;  // H with P(H) = target
  DesignLifeRisk risk;   // the risk at that level, as a check
  int evaluations = 0;
};

// H for a target probability in (0, 1), to within tolerance_m (default 1e-6 m: well below
// survey precision, common practice).
[[nodiscard]] DesignLifeLevel level_for_design_life_risk(const extremes::StillWaterModel& present,
                                                         std::span<const YearConditions> years,
                                                         double target_probability, double tolerance_m = 1e-6);

}  // namespace tidewright::planning
