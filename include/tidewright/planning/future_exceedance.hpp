// The planning core: N_t(z) = E_Delta[ N_0(z - Delta_t) ] (docs/design.md), the expected
// number of exceedances of level z per year in year t. Every product (allowance,
// amplification, return-period shift, emergence, design-life risk) calls node_rates,
// future_exceedance_rate or future_exceedance_rate_derivatives below and nothing else
// evaluates N_t.
//
// Glossary: z level (m above the record's datum); N_0 present-day rate (per yr, from
// extremes::StillWaterModel); Delta_t local relative rise in year t (m); delta_i, w_i the
// nodes and weights of Delta_t; mu location, sigma scale of the extreme model (m); u GPD
// threshold (m); dmu storminess shift of the location (m); s storminess factor on the scale;
// T warming (K).
#pragma once

#include <span>
#include <vector>

#include "tidewright/extremes/still_water_model.hpp"
#include "tidewright/local/quantile_table.hpp"
#include "tidewright/local/rise_ensemble.hpp"
#include "tidewright/planning/monte_carlo_error.hpp"
#include "tidewright/planning/rise_distribution.hpp"

namespace tidewright::planning {

// Optional change in storminess, a scenario assumption applied to the extreme model before
// Delta: location mu + dmu and scale s * sigma with
//   dmu = location_m_per_yr (t - reference_year) + location_m_per_k T
//   s   = 1 + scale_fraction_per_yr (t - reference_year) + scale_fraction_per_k T.
// Both shift and stretch the whole distribution about its location (GEV, Gumbel) or about its
// threshold (GPD, whose threshold moves with dmu); the empirical rate curve below a GPD
// threshold moves with dmu and keeps its shape. T is each member's warming since the
// projection's reference. All zero by default (no change: the usual assumption).
struct StorminessChange {
  double location_m_per_yr = 0.0;
  double scale_fraction_per_yr = 0.0;
  double location_m_per_k = 0.0;
  double scale_fraction_per_k = 0.0;
  int reference_year = 0;  // year in which the per-year change is zero

  [[nodiscard]] bool active() const {
    return location_m_per_yr != 0.0 || scale_fraction_per_yr != 0.0 || location_m_per_k != 0.0 ||
           scale_fraction_per_k != 0.0;
  }
  [[nodiscard]] bool needs_warming() const {
    return location_m_per_k != 0.0 || scale_fraction_per_k != 0.0;
  }
};

// Everything that makes year t differ from today: Delta_t and the storminess change.
struct YearConditions {
  int year = 0;
  RiseDistribution rise;
  StorminessChange storminess;
};

// Year t of an ensemble: its members (linear between listed years, RiseEnsemble::rise_in),
// with the members' warming when the ensemble carries it. Throws InputError outside the span,
// or when the storminess change needs warming the ensemble does not carry.
[[nodiscard]] YearConditions conditions_in_year(const local::RiseEnsemble& ensemble, int year,
                                                const StorminessChange& storminess = {});
// Years first..last inclusive, one YearConditions each (node i = member i in every year).
[[nodiscard]] std::vector<YearConditions> conditions_over_years(const local::RiseEnsemble& ensemble,
                                                                int first_year, int last_year,
                                                                const StorminessChange& storminess = {});

// Year t of a published projection table as a continuous distribution (local::
// distribution_in_year), integrated by Gauss-Hermite in normal-score space. The nodes are the
// same scores in every year, so node k of each year lies on one comonotone path and
// design_life_risk can use a span of these. No warming: a per-kelvin storminess change throws.
[[nodiscard]] YearConditions conditions_in_year(const local::QuantileTable& table, int year,
                                                const StorminessChange& storminess = {}, int nodes = 20);
[[nodiscard]] std::vector<YearConditions> conditions_over_years(const local::QuantileTable& table,
                                                                int first_year, int last_year,
                                                                const StorminessChange& storminess = {},
                                                                int nodes = 20);

// N_0 of the storm-adjusted model at z - delta_i for every node i (per yr), written to `out`
// (size = conditions.rise.size()). The one place where N_0 meets Delta.
void node_rates(const extremes::StillWaterModel& present, const YearConditions& conditions,
                double level_m, std::span<double> out);

// N_t(z) = sum_i w_i N_0(z - delta_i), with the storminess change applied first.
[[nodiscard]] double future_exceedance_rate(const extremes::StillWaterModel& present,
                                            const YearConditions& conditions, double level_m);

// N_t(z) with dN_t/dz and d2N_t/dz2 (the weighted sums of the node derivatives of N_0, through
// the storminess change), for Newton-type solves in z.
[[nodiscard]] extremes::RateDerivatives future_exceedance_rate_derivatives(const extremes::StillWaterModel& present,
                                                                           const YearConditions& conditions,
                                                                           double level_m);

// The Monte Carlo error of N_t(z) as a weighted mean over equal-weight members
// (monte_carlo_error.hpp), from batch sums: S = sum w r with its slope dS/dz, Q = sum w r^2
// through StillWaterModel::squared_rates, the heaviest member at the largest rise (N_0 is
// non-increasing); SE(S) = sqrt((Q - S^2)/(n - 1)). `standard_error` is that of S divided by
// |dS/dz|, the error of a level found by a root of S (the allowance); scale it by 1/N_0 for a
// factor. Member by member when the storminess changes. Not sampled for quadrature nodes.
[[nodiscard]] MonteCarloError rate_mean_error(const extremes::StillWaterModel& present,
                                              const YearConditions& conditions, double level_m);
// Its standard error of S itself (per yr), for a factor N_t/N_0.
[[nodiscard]] MonteCarloError rate_mean_error_of_rate(const extremes::StillWaterModel& present,
                                                      const YearConditions& conditions, double level_m);

// The weight of the nodes whose rise takes z below the lower end point of an annual-maxima
// model with xi > 0, where N_0(z - delta_i) is infinite: from the support, 1 + xi (z - delta -
// mu)/sigma <= 0, without evaluating rates (node by node when the storminess changes).
[[nodiscard]] double beyond_range_share(const extremes::StillWaterModel& present, const YearConditions& conditions,
                                        double level_m);

// Annual exceedance probability from a rate, 1 - exp(-N) under Poisson occurrence
// (Coles 2001, §4.4), by expm1 so that small rates keep their digits.
[[nodiscard]] double annual_exceedance_probability(double rate_per_yr);

// Today's T-year level z_T with N_0(z_T) = 1/T (T as an average recurrence interval).
// Throws InputError for T <= 1 or not finite.
[[nodiscard]] double present_return_level(const extremes::StillWaterModel& present, double return_period_yr);

}  // namespace tidewright::planning
