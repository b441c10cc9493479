// Glossary: see include/tidewright/planning/design_life_risk.hpp.
#include "tidewright/planning/design_life_risk.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "tidewright/common/error.hpp"
#include "tidewright/planning/monotone_root.hpp"

namespace tidewright::planning {
namespace {

void check_paths(std::span<const YearConditions> years) {
  if (years.empty()) throw InputError("design life", "no years given", "give the years t1..t2");
  const auto& w0 = years.front().rise.weight;
  for (std::size_t k = 0; k < years.size(); ++k) {
    const auto& c = years[k];
    if (k > 0 && c.year != years[k - 1].year + 1) {
      throw InputError("design life", "years are not consecutive at " + std::to_string(c.year),
                       "give every year from t1 to t2 (conditions_over_years)");
    }
    if (c.rise.weight != w0) {
      throw InputError("design life", "year " + std::to_string(c.year) + " has other nodes than year " +
                                          std::to_string(years.front().year),
                       "use the same members (paths) in every year");
    }
  }
}

}  // namespace

DesignLifeRisk design_life_risk(const extremes::StillWaterModel& present, std::span<const YearConditions> years,
                                double level_m) {
  check_paths(years);
  const std::size_t n = years.front().rise.size();
  std::vector<double> path_sum(n, 0.0);
  std::vector<double> years_with(n, 0.0);
  std::vector<double> beyond(n, 0.0);
  std::vector<double> rates(n);
  for (const auto& c : years) {
    node_rates(present, c, level_m, rates);
    for (std::size_t i = 0; i < n; ++i) {
      path_sum[i] += rates[i];
      years_with[i] += -std::expm1(-rates[i]);  // P(at least one exceedance in the year), 1 when N is infinite
      if (!std::isfinite(rates[i])) beyond[i] += 1.0;
    }
  }
  const auto& w = years.front().rise.weight;
  DesignLifeRisk r;
  r.first_year = years.front().year;
  r.last_year = years.back().year;
  r.level_m = level_m;
  double p = 0.0;
  double q = 0.0;
  double expected = 0.0;
  double expected_years = 0.0;
  double beyond_share = 0.0;
  std::vector<double> member_p(n);
  for (std::size_t i = 0; i < n; ++i) {
    // P = 1 - E[exp(-S)] (docs/design.md); -expm1(-S) keeps the digits of small P.
    member_p[i] = -std::expm1(-path_sum[i]);
    p += w[i] * member_p[i];
    q += w[i] * std::exp(-path_sum[i]);
    expected += w[i] * path_sum[i];
    expected_years += w[i] * years_with[i];
    beyond_share += w[i] * beyond[i];
  }
  r.expected_years_with_exceedance = expected_years;
  r.beyond_range_fraction = beyond_share / static_cast<double>(years.size());
  r.monte_carlo = weighted_mean_error(member_p, w, years.front().rise.kind == "members");
  r.probability = std::min(p, 1.0);
  r.probability_none = q;
  r.expected_exceedances = expected;
  r.rounds_to_one = r.probability >= 1.0 || q < 0.5 * std::numeric_limits<double>::epsilon();
  return r;
}

DesignLifeLevel level_for_design_life_risk(const extremes::StillWaterModel& present,
                                           std::span<const YearConditions> years, double target_probability,
                                           double tolerance_m) {
  if (!(target_probability > 0.0 && target_probability < 1.0)) {
    throw InputError("target probability " + std::to_string(target_probability), "must lie strictly between 0 and 1",
                     "give a probability such as 0.1");
  }
  check_paths(years);
  const double n = static_cast<double>(years.size());
  double mean_rise = 0.0;
  for (const auto& c : years) mean_rise += c.rise.mean_m() / n;
  // Start where a constant mean rise would meet the target: n N_0(H - mean) = -ln(1 - p).
  double guess = 0.0;
  try {
    guess = present.level_for_rate(-std::log1p(-target_probability) / n) + mean_rise;
  } catch (const ComputationError&) {
    guess = present.threshold_m + mean_rise;
  }
  if (!std::isfinite(guess)) guess = present.location_m + mean_rise;
  const bool use_complement = target_probability >= 0.5;
  const double log_target = use_complement ? std::log1p(-target_probability) : std::log(target_probability);
  const auto f = [&](double level_m) {
    const DesignLifeRisk r = design_life_risk(present, years, level_m);
    // Both forms decrease as H rises; the complement keeps digits for targets near 1.
    return use_complement ? log_target - std::log(r.probability_none) : std::log(r.probability) - log_target;
  };
  const MonotoneRoot root = solve_non_increasing(f, guess - present.scale_m, guess + present.scale_m, tolerance_m,
                                                 "design-life level");
  DesignLifeLevel out;
  out.target_probability = target_probability;
  out.level_m = root.x;
  out.risk = design_life_risk(present, years, root.x);
  out.evaluations = root.evaluations;
  return out;
}

}  // namespace tidewright::planning
