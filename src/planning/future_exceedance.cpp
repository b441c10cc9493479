// Glossary: see include/tidewright/planning/future_exceedance.hpp.
#include "tidewright/planning/future_exceedance.hpp"

#include <cmath>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::planning {
namespace {

void check_conditions(const YearConditions& c) {
  const auto& d = c.rise;
  if (d.rise_m.empty() || d.weight.size() != d.rise_m.size()) {
    throw InputError("year " + std::to_string(c.year), "the rise distribution has no nodes or mismatched weights",
                     "build it with RiseDistribution::members or ::normal_score");
  }
  if (c.storminess.needs_warming() && d.warming_k.size() != d.rise_m.size()) {
    throw InputError("storminess change", "is given per kelvin but the projection carries no warming per member",
                     "give the change per year instead, or a projection with warming");
  }
  if ((c.storminess.location_m_per_yr != 0.0 || c.storminess.scale_fraction_per_yr != 0.0) &&
      c.storminess.reference_year == 0) {
    throw InputError("storminess change", "is given per year but has no reference year",
                     "state the year in which the change is zero");
  }
}

// Calls f(i, N_0 of the storm-adjusted model at z - delta_i, dx/dz) for every node i, where x
// is the level at which the fitted model is evaluated (dx/dz = 1/s in the scaled part, else 1);
// `eval` gives N_0 (or N_0 with its derivatives) of the fitted model at x.
template <class Eval, class F>
void visit_node_rates(const extremes::StillWaterModel& m, const YearConditions& c, double level_m, Eval&& eval,
                      F&& f) {
  const auto& d = c.rise;
  const std::size_t n = d.rise_m.size();
  if (!c.storminess.active()) {
    // N_t(z) = E[N_0(z - Delta_t)] (docs/design.md; Hunter 2012).
    for (std::size_t i = 0; i < n; ++i) f(i, eval(level_m - d.rise_m[i]), 1.0);
    return;
  }
  const StorminessChange& sc = c.storminess;
  const double years_on = static_cast<double>(c.year - sc.reference_year);
  const bool gpd = m.family == extremes::Family::gpd;
  const double pivot_m = gpd ? m.threshold_m : m.location_m;
  for (std::size_t i = 0; i < n; ++i) {
    const double warming_k = d.warming_k.empty() ? 0.0 : d.warming_k[i];
    // Scenario assumption, linear in time and warming (docs/methods-planning.md, "Storminess").
    const double dmu_m = sc.location_m_per_yr * years_on + sc.location_m_per_k * warming_k;
    const double s = 1.0 + sc.scale_fraction_per_yr * years_on + sc.scale_fraction_per_k * warming_k;
    if (!(s > 0.0)) {
      throw ComputationError("storminess change", "makes the extreme model's scale factor " + std::to_string(s) +
                                 " in year " + std::to_string(c.year),
                             "use a smaller scale change or a shorter span");
    }
    // The model with location mu + dmu and scale s sigma, evaluated at x, equals the fitted
    // model at mu + (x - dmu - mu)/s (location-scale family; Coles 2001, §3.1.3 and §4.2).
    const double x1 = level_m - d.rise_m[i] - dmu_m;
    const bool scaled = !gpd || x1 >= pivot_m;
    const double x2 = scaled ? pivot_m + (x1 - pivot_m) / s : x1;
    f(i, eval(x2), scaled ? 1.0 / s : 1.0);
  }
}

}  // namespace

YearConditions conditions_in_year(const local::RiseEnsemble& ensemble, int year, const StorminessChange& storminess) {
  YearConditions c;
  c.year = year;
  c.storminess = storminess;
  c.rise = RiseDistribution::members(ensemble.rise_in(year), ensemble.warming_in(year));
  check_conditions(c);
  return c;
}

std::vector<YearConditions> conditions_over_years(const local::RiseEnsemble& ensemble, int first_year,
                                                  int last_year, const StorminessChange& storminess) {
  if (last_year < first_year) {
    throw InputError("years " + std::to_string(first_year) + "-" + std::to_string(last_year),
                     "the last year comes before the first", "give the span as first..last");
  }
  std::vector<YearConditions> out;
  out.reserve(static_cast<std::size_t>(last_year - first_year) + 1);
  for (int t = first_year; t <= last_year; ++t) out.push_back(conditions_in_year(ensemble, t, storminess));
  return out;
}

YearConditions conditions_in_year(const local::QuantileTable& table, int year, const StorminessChange& storminess,
                                  int nodes) {
  const local::QuantileDistribution d = local::distribution_in_year(table, year);
  YearConditions c;
  c.year = year;
  c.storminess = storminess;
  c.rise = RiseDistribution::normal_score([&](double s) { return d.rise_at_score(s); }, nodes);
  check_conditions(c);
  return c;
}

std::vector<YearConditions> conditions_over_years(const local::QuantileTable& table, int first_year, int last_year,
                                                  const StorminessChange& storminess, int nodes) {
  if (last_year < first_year) {
    throw InputError("years " + std::to_string(first_year) + "-" + std::to_string(last_year),
                     "the last year comes before the first", "give the span as first..last");
  }
  std::vector<YearConditions> out;
  for (int t = first_year; t <= last_year; ++t) out.push_back(conditions_in_year(table, t, storminess, nodes));
  return out;
}

void node_rates(const extremes::StillWaterModel& present, const YearConditions& conditions, double level_m,
                std::span<double> out) {
  check_conditions(conditions);
  if (out.size() != conditions.rise.size()) {
    throw InputError("node rates", "output has " + std::to_string(out.size()) + " places for " +
                                       std::to_string(conditions.rise.size()) + " nodes",
                     "size the output to the rise distribution");
  }
  visit_node_rates(
      present, conditions, level_m, [&](double x) { return present.annual_exceedance_rate(x); },
      [&](std::size_t i, double r, double /*dx_dz*/) { out[i] = r; });
}

double future_exceedance_rate(const extremes::StillWaterModel& present, const YearConditions& conditions,
                              double level_m) {
  check_conditions(conditions);
  const auto& w = conditions.rise.weight;
  // Weighted mean over members or quadrature nodes: E_Delta[N_0(z - Delta_t)].
  if (!conditions.storminess.active()) {
    return present.weighted_shifted_rates(level_m, conditions.rise.rise_m, w, false).rate;
  }
  double sum = 0.0;
  visit_node_rates(
      present, conditions, level_m, [&](double x) { return present.annual_exceedance_rate(x); },
      [&](std::size_t i, double r, double /*dx_dz*/) {
        if (w[i] > 0.0) sum += w[i] * r;
      });
  return sum;
}

extremes::RateDerivatives future_exceedance_rate_derivatives(const extremes::StillWaterModel& present,
                                                             const YearConditions& conditions, double level_m) {
  check_conditions(conditions);
  const auto& w = conditions.rise.weight;
  if (!conditions.storminess.active()) {
    return present.weighted_shifted_rates(level_m, conditions.rise.rise_m, w, true);
  }
  // Chain rule through x(z): d/dz N_0(x) = N_0'(x) dx/dz, d2/dz2 = N_0''(x) (dx/dz)^2.
  extremes::RateDerivatives sum;
  visit_node_rates(
      present, conditions, level_m, [&](double x) { return present.annual_exceedance_rate_derivatives(x); },
      [&](std::size_t i, const extremes::RateDerivatives& r, double dx_dz) {
        if (!(w[i] > 0.0)) return;
        sum.rate += w[i] * r.rate;
        sum.first += w[i] * r.first * dx_dz;
        sum.second += w[i] * r.second * dx_dz * dx_dz;
      });
  return sum;
}

namespace {

// S, dS/dz and SE(S) of the members' mean rate; member by member under a storminess change.
struct RateMean {
  MonteCarloError error;  // standard_error: of S
  double slope = 0.0;
};

RateMean rate_mean(const extremes::StillWaterModel& present, const YearConditions& c, double level_m,
                   bool slope = true) {
  RateMean out;
  const RiseDistribution& rise = c.rise;
  out.error.sampled = rise.kind == "members";
  if (!out.error.sampled || rise.size() < 2) return out;
  if (c.storminess.active()) {
    std::vector<double> rates(rise.size());
    node_rates(present, c, level_m, rates);
    out.error = weighted_mean_error(rates, rise.weight, true);
    out.slope = future_exceedance_rate_derivatives(present, c, level_m).first;
    return out;
  }
  const extremes::RateDerivatives s = present.weighted_shifted_rates(level_m, rise.rise_m, rise.weight, slope);
  const double q = present.squared_rates().weighted_shifted_rates(level_m, rise.rise_m, rise.weight, false).rate;
  out.slope = s.first;
  if (!(s.rate > 0.0) || !std::isfinite(s.rate) || !std::isfinite(q)) return out;
  const auto n = static_cast<double>(rise.size());
  // Equal weights 1/n: sum c = S, sum c^2 = Q/n, SE(S)^2 = (Q - S^2)/(n - 1) (monte_carlo_error.hpp).
  out.error.standard_error = std::sqrt(std::max(0.0, q - s.rate * s.rate) / (n - 1.0));
  out.error.effective_sample_size = n * s.rate * s.rate / q;
  out.error.heaviest_share = present.annual_exceedance_rate(level_m - rise.max_m()) / (n * s.rate);
  return out;
}

}  // namespace

MonteCarloError rate_mean_error(const extremes::StillWaterModel& present, const YearConditions& conditions,
                                double level_m) {
  const RateMean m = rate_mean(present, conditions, level_m);
  return through_root(m.error, m.slope);
}

MonteCarloError rate_mean_error_of_rate(const extremes::StillWaterModel& present, const YearConditions& conditions,
                                        double level_m) {
  return rate_mean(present, conditions, level_m, false).error;
}

double beyond_range_share(const extremes::StillWaterModel& present, const YearConditions& conditions, double level_m) {
  const RiseDistribution& rise = conditions.rise;
  if (conditions.storminess.active()) {
    std::vector<double> rates(rise.size());
    node_rates(present, conditions, level_m, rates);
    double share = 0.0;
    for (std::size_t i = 0; i < rates.size(); ++i) {
      if (!std::isfinite(rates[i])) share += rise.weight[i];
    }
    return share;
  }
  if (present.family != extremes::Family::gev || !(present.shape > 0.0)) return 0.0;
  // 1 + xi (z - delta - mu)/sigma <= 0  <=>  delta >= z - mu + sigma/xi (xi > 0).
  const double cut = level_m - present.location_m + present.scale_m / present.shape;
  double share = 0.0;
  for (std::size_t i = 0; i < rise.size(); ++i) share += rise.rise_m[i] >= cut ? rise.weight[i] : 0.0;
  return share;
}

double annual_exceedance_probability(double rate_per_yr) {
  // P(at least one event in a year) = 1 - exp(-N) for Poisson occurrence (Coles 2001, §4.4).
  return -std::expm1(-rate_per_yr);
}

double present_return_level(const extremes::StillWaterModel& present, double return_period_yr) {
  if (!std::isfinite(return_period_yr) || return_period_yr <= 1.0) {
    throw InputError("return period " + std::to_string(return_period_yr),
                     "must be a finite number of years greater than 1", "ask for a return period above 1 year");
  }
  return present.level_for_rate(1.0 / return_period_yr);
}

}  // namespace tidewright::planning
