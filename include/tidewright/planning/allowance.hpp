// Sea-level rise allowance (Hunter 2012, Climatic Change 113:239): the height A by which to
// raise an asset so that the expected number of exceedances per year in year t equals today's,
//   N_t(z + A) = N_0(z),
// and its design-life form over years t1..t2 (keep the expected number of exceedances over
// the span equal to today's over a span of the same length):
//   sum_{t=t1..t2} N_t(z + A) = (t2 - t1 + 1) N_0(z).
// For a Gumbel model (scale lambda) and no storminess change this is closed:
//   A = lambda ln( (1/n) sum_t E[exp(Delta_t / lambda)] )            (Hunter 2012)
// which for one year and normal Delta ~ N(mu, sigma) is A = mu + sigma^2 / (2 lambda).
// Otherwise A depends on z, i.e. on the return period (Buchanan et al. 2016, Climatic Change;
// arXiv 1510.08550), and is found as the root of ln N_t(z + A) - ln N_0(z): Halley steps with
// the analytic derivatives of N_0 inside the bracket [min Delta, max Delta], TOMS748 as the
// safeguard (and alone when storminess changes).
//
// Glossary: z level (m); z_T today's T-year level, N_0(z_T) = 1/T; A allowance (m);
// lambda Gumbel scale (m); mu, sigma mean and sd of Delta (m); n years in the design life.
#pragma once

#include <span>
#include <string>
#include <vector>

#include "tidewright/extremes/still_water_model.hpp"
#include "tidewright/planning/future_exceedance.hpp"
#include "tidewright/planning/monte_carlo_error.hpp"

namespace tidewright::planning {

struct AllowanceOptions {
  bool use_closed_form = true;  // Gumbel without storminess: the exact closed form
  double tolerance_m = 1e-9;    // root bracket width; far below any survey precision
};

struct Allowance {
  int first_year = 0;          // t (or t1)
  int last_year = 0;           // t (or t2)
  double return_period_yr = 0.0;  // T of the level (0 when a level was given directly)
  double present_level_m = 0.0;   // z
  double allowance_m = 0.0;       // A
  double mean_rise_m = 0.0;       // mean of Delta over nodes (and years)
  double sd_rise_m = 0.0;         // sd of Delta over nodes (pooled over years)
  std::string method;             // "hunter2012_gumbel_closed_form" or "root_toms748"
  int evaluations = 0;            // N_t evaluations spent by the root solve (0 for closed form)
  // Of the allowance (m), from the members' rates at z + A carried through the root:
  // SE(A) = SE(sum_t N_t) / |d/dA sum_t N_t| (monte_carlo_error.hpp).
  MonteCarloError monte_carlo;
  // Share of members (member-years over a design life) whose rise takes today's level below
  // the lower end point of an annual-maxima model with xi > 0 (N_0 infinite): the root then has
  // to lift every such member back into the model's range, so they, not the rest, set A.
  double beyond_range_fraction = 0.0;
};

// Hunter (2012) closed form for Gumbel scale lambda and normal Delta: mu + sigma^2/(2 lambda).
[[nodiscard]] double hunter_allowance_gumbel_normal(double scale_m, double mean_m, double sd_m);

// Allowance for today's T-year level in one year.
[[nodiscard]] Allowance allowance(const extremes::StillWaterModel& present, const YearConditions& conditions,
                                  double return_period_yr, const AllowanceOptions& options = {});
// Allowances for several return periods in one year, each the same as allowance() gives;
// the pass over the nodes that pools Delta's statistics is made once for all of them.
[[nodiscard]] std::vector<Allowance> allowances(const extremes::StillWaterModel& present,
                                                const YearConditions& conditions,
                                                std::span<const double> return_periods_yr,
                                                const AllowanceOptions& options = {});
// Allowance for a given level z in one year.
[[nodiscard]] Allowance allowance_at_level(const extremes::StillWaterModel& present,
                                           const YearConditions& conditions, double level_m,
                                           const AllowanceOptions& options = {});
// Design-life allowance over the listed years (consecutive years t1..t2, e.g. from
// conditions_over_years) for today's T-year level.
[[nodiscard]] Allowance design_life_allowance(const extremes::StillWaterModel& present,
                                              std::span<const YearConditions> years,
                                              double return_period_yr, const AllowanceOptions& options = {});
// The same for a given level z.
[[nodiscard]] Allowance design_life_allowance_at_level(const extremes::StillWaterModel& present,
                                                       std::span<const YearConditions> years, double level_m,
                                                       const AllowanceOptions& options = {});

}  // namespace tidewright::planning
