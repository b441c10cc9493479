// Glossary: see include/tidewright/climate/projection.hpp.
#include "tidewright/climate/projection.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <optional>
#include <random>
#include <string>

#include "tidewright/climate/thermal_expansion.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::climate {

namespace {

double draw(std::mt19937_64& rng, const TruncatedNormal& d) {
  if (d.sd <= 0.0) return d.mean;
  std::normal_distribution<double> normal(d.mean, d.sd);
  for (int attempt = 0; attempt < 1000; ++attempt) {
    const double x = normal(rng);
    if (x >= d.lower && x <= d.upper) return x;
  }
  throw ComputationError("parameter distribution", "truncation bounds reject nearly every draw",
                         "widen the bounds around the mean");
}

int last_needed_year(const ProjectionOptions& o) {
  return std::max({o.last_year, o.reference.last_year, o.warming_reference.last_year});
}

// Driving series on the model years spinup..last: forcing (forcing scenarios; the historical
// ramp before the scenario starts) or given warming (with the ramp-driven energy balance before
// the scenario starts).
struct Drive {
  std::vector<int> years;
  std::vector<double> forcing_w_m2;  // every year (ramp where the scenario gives warming)
  std::vector<double> warming_k;     // given warming, or empty
  std::size_t first_given = 0;       // index of the first year with given warming
};

Drive build_drive(const Scenario& s, const ProjectionOptions& o) {
  Drive d;
  const int last = last_needed_year(o);
  for (int y = o.spinup_start_year; y <= last; ++y) {
    d.years.push_back(y);
    const bool in_scenario = y >= s.first_year() && y <= s.last_year();
    if (s.driver == ScenarioDriver::forcing) {
      d.forcing_w_m2.push_back(in_scenario ? s.value_in(y) : historical_forcing_w_m2(y));
    } else {
      d.forcing_w_m2.push_back(historical_forcing_w_m2(std::min(y, historical_ramp_end_year)));
    }
  }
  if (s.driver == ScenarioDriver::surface_warming) {
    d.first_given = static_cast<std::size_t>(std::max(0, s.first_year() - o.spinup_start_year));
    d.warming_k.resize(d.years.size(), 0.0);
    for (std::size_t i = d.first_given; i < d.years.size(); ++i) d.warming_k[i] = s.value_in(d.years[i]);
  }
  return d;
}

void simulate(const Drive& d, const MemberParameters& m, const ProjectionOptions& o, bool both_routes, MemberPath& p) {
  const std::size_t n = d.years.size();
  const TwoLayerParameters& eb = m.energy_balance;
  const TwoLayerPropagator prop(eb);
  p.years = d.years;
  p.surface_k.resize(n);
  p.deep_k.resize(n);
  p.toa_imbalance_w_m2.assign(n, 0.0);
  TwoLayerState x{};  // equilibrium at the spin-up start (docs/methods-climate.md, "Spin-up")
  const bool given = !d.warming_k.empty();
  const double gamma_over_cd = eb.heat_exchange_w_m2_k / eb.deep_heat_capacity_w_yr_m2_k;
  for (std::size_t i = 0; i < n; ++i) {
    if (i > 0) {
      if (given && i >= d.first_given) {
        const double t_start = i == d.first_given ? d.warming_k[i] : d.warming_k[i - 1];
        x.deep_k = deep_step_for_given_surface(x.deep_k, t_start, d.warming_k[i], gamma_over_cd);
        x.surface_k = d.warming_k[i];
      } else {
        x = prop.step(x, d.forcing_w_m2[i - 1], d.forcing_w_m2[i]);
      }
    } else if (given && d.first_given == 0) {
      x.surface_k = d.warming_k[0];
    }
    p.surface_k[i] = x.surface_k;
    p.deep_k[i] = x.deep_k;
    if (!given || i < d.first_given) {
      // Geoffroy et al. (2013) Part II eq. 2.
      p.toa_imbalance_w_m2[i] = d.forcing_w_m2[i] - eb.feedback_w_m2_k * x.surface_k -
                                (eb.efficacy - 1.0) * eb.heat_exchange_w_m2_k * (x.surface_k - x.deep_k);
    }
  }
  p.upper_heat_w_yr_m2.resize(n);
  p.deep_heat_w_yr_m2.resize(n);
  p.ocean_heat_j.resize(n);
  p.thermal_efficiency_m.resize(n);
  const bool layered = both_routes || o.thermal_route == ThermalExpansionRoute::layered;
  p.thermal_layered_m.assign(layered ? n : 0, 0.0);
  const LayeredOcean ocean = layered ? layered_ocean_for(eb) : LayeredOcean{};
  for (std::size_t i = 0; i < n; ++i) {
    p.upper_heat_w_yr_m2[i] = eb.upper_heat_capacity_w_yr_m2_k * p.surface_k[i];
    p.deep_heat_w_yr_m2[i] = eb.deep_heat_capacity_w_yr_m2_k * p.deep_k[i];
    p.ocean_heat_j[i] = ocean_heat_j(p.upper_heat_w_yr_m2[i] + p.deep_heat_w_yr_m2[i]);
    p.thermal_efficiency_m[i] = expansion_by_efficiency_m(p.ocean_heat_j[i], m.expansion_efficiency_m_per_yj);
    if (layered) p.thermal_layered_m[i] = expansion_layered_m(ocean, p.upper_heat_w_yr_m2[i], p.deep_heat_w_yr_m2[i]);
  }
  p.glaciers_m = glacier_rise_m(m.glaciers, p.years, p.surface_k);
  p.greenland_m = greenland_rise_m(m.greenland, p.years, p.surface_k);
  p.antarctica_m = antarctic_rise_m(m.antarctica, p.years, p.surface_k, p.deep_k);
  p.land_water_m = land_water_rise_m(m.land_water, p.years);
}

double span_mean(const std::vector<double>& v, const std::vector<int>& years, const YearSpan& span) {
  double sum = 0.0;
  for (int y = span.first_year; y <= span.last_year; ++y) sum += v[static_cast<std::size_t>(y - years.front())];
  return sum / static_cast<double>(span.last_year - span.first_year + 1);
}

void check_span(const YearSpan& s, int lo, int hi, const std::string& option) {
  if (s.first_year > s.last_year || s.first_year < lo || s.last_year > hi) {
    throw InputError(option, "years " + s.label() + " lie outside the run " + std::to_string(lo) + "-" + std::to_string(hi),
                     "choose years inside the run (first <= last)");
  }
}

}  // namespace

std::string YearSpan::label() const {
  if (first_year == last_year) return std::to_string(first_year);
  return std::to_string(first_year) + "-" + std::to_string(last_year) + " mean";
}

YearSpan parse_year_span(const std::string& text, const std::string& where) {
  // One or two years of 1-4 digits, "YYYY" or "YYYY-YYYY": no sign, no overflow, no trailing text.
  const auto year_at = [&](std::size_t& k) -> std::optional<int> {
    int value = 0;
    std::size_t digits = 0;
    while (k < text.size() && text[k] >= '0' && text[k] <= '9' && digits < 5) {
      value = 10 * value + (text[k] - '0');
      ++k;
      ++digits;
    }
    if (digits == 0 || digits > 4) return std::nullopt;
    return value;
  };
  std::size_t k = 0;
  const auto first = year_at(k);
  std::optional<int> last = first;
  if (first && k < text.size() && text[k] == '-') {
    ++k;
    last = year_at(k);
  }
  if (!first || !last || k != text.size() || *last < *first) {
    throw InputError(where, "is '" + text + "'", "give a year (2020) or a period (1995-2014)");
  }
  return {*first, *last};
}

std::string YearSpan::text() const {
  if (first_year == last_year) return std::to_string(first_year);
  return std::to_string(first_year) + "-" + std::to_string(last_year);
}

void validate(const Scenario& s, const ProjectionOptions& o) {
  if (s.years.empty() || s.values.size() != s.years.size()) {
    throw InputError("scenario", "has no years or mismatched values", "build it with the scenario functions");
  }
  for (std::size_t i = 1; i < s.years.size(); ++i) {
    if (s.years[i] != s.years[i - 1] + 1) {
      throw InputError("scenario", "years are not consecutive at " + std::to_string(s.years[i]),
                       "build it with the scenario functions, which check the years");
    }
  }
  if (o.member_count <= 0) {
    throw InputError(o.input_names.members, "sample count must be positive, got " + std::to_string(o.member_count),
                     "give a positive number of members");
  }
  if (o.spinup_start_year != historical_ramp_start_year) {
    throw InputError("spin-up start", "must be " + std::to_string(historical_ramp_start_year),
                     "the historical forcing ramp starts from equilibrium in 1850");
  }
  if (o.first_year > o.last_year) {
    throw InputError(o.input_names.years, "first year " + std::to_string(o.first_year) + " is after last year " +
                                    std::to_string(o.last_year), "give first <= last");
  }
  if (o.first_year < o.spinup_start_year) {
    throw InputError(o.input_names.years, "first year " + std::to_string(o.first_year) + " is before " +
                                    std::to_string(o.spinup_start_year), "the model starts in 1850");
  }
  const int last = last_needed_year(o);
  if (last > s.last_year()) {
    throw InputError(o.input_names.years, "year " + std::to_string(last) + " lies outside the scenario '" + s.label + "' (" +
                                    std::to_string(s.first_year()) + "-" + std::to_string(s.last_year()) + ")",
                     "ask for years the scenario covers or extend the scenario");
  }
  if (s.driver == ScenarioDriver::forcing && s.first_year() > historical_ramp_end_year + 1) {
    throw InputError("scenario", "forcing starts in " + std::to_string(s.first_year()) + ", after " +
                                     std::to_string(historical_ramp_end_year + 1),
                     "give forcing from 2020 or earlier (the historical ramp ends in 2019)");
  }
  check_span(o.reference, o.spinup_start_year, last, o.input_names.reference);
  check_span(o.warming_reference, o.spinup_start_year, last, "warming reference");
  validate(o.central.energy_balance);
}

std::vector<MemberParameters> draw_members(const ProjectionOptions& o) {
  std::mt19937_64 rng(o.seed);
  const ParameterDistributions& d = o.distributions;
  std::vector<MemberParameters> out(static_cast<std::size_t>(std::max(0LL, o.member_count)), o.central);
  for (MemberParameters& m : out) {
    // Fixed order of draws per member, so that a member's parameters depend only on the seed
    // and its index.
    m.energy_balance.feedback_w_m2_k = draw(rng, d.feedback_w_m2_k);
    m.energy_balance.heat_exchange_w_m2_k = draw(rng, d.heat_exchange_w_m2_k);
    m.energy_balance.efficacy = draw(rng, d.efficacy);
    m.expansion_efficiency_m_per_yj = draw(rng, d.expansion_efficiency_m_per_yj);
    m.glaciers.volume_2019_m = draw(rng, d.glacier_volume_2019_m);
    m.glaciers.factor = draw(rng, d.glacier_sensitivity_factor);
    m.greenland.factor = draw(rng, d.greenland_factor);
    m.antarctica.snowfall_increase_per_k = draw(rng, d.antarctic_snowfall_increase_per_k);
    const double bound = d.antarctic_discharge_log_bound_sd;
    m.antarctica.discharge_factor = std::exp(d.antarctic_discharge_log_sd * draw(rng, {0.0, 1.0, -bound, bound}));
    if (o.storyline == IceStoryline::high_end_ice) m.antarctica.discharge_factor *= high_end_antarctic_multiplier;
    m.land_water.factor = draw(rng, d.land_water_factor);
  }
  return out;
}

MemberPath simulate_member(const Scenario& s, const MemberParameters& m, const ProjectionOptions& o) {
  validate(s, o);
  MemberPath p;
  simulate(build_drive(s, o), m, o, true, p);
  return p;
}

ComponentEnsemble project_global_components(const Scenario& s, const ProjectionOptions& o) {
  validate(s, o);
  const Drive drive = build_drive(s, o);
  const std::vector<MemberParameters> members = draw_members(o);
  ComponentEnsemble e;
  for (int y = o.first_year; y <= o.last_year; ++y) e.years.push_back(y);
  e.component_names = {thermal_expansion, glaciers, greenland, antarctica, land_water};
  const auto rows = static_cast<Eigen::Index>(members.size());
  const auto cols = static_cast<Eigen::Index>(e.years.size());
  e.rise_m.assign(e.component_names.size(), Eigen::MatrixXd(rows, cols));
  e.surface_warming_k.resize(rows, cols);
  e.ocean_heat_content_change_yj.resize(rows, cols);
  e.reference = "sea level and ocean heat: " + o.reference.label() + "; surface warming: " + o.warming_reference.label();
  e.reference_period = o.reference;
  e.scenario = s.label;
  e.illustrative = s.illustrative;
  e.seed = o.seed;
  const std::size_t offset = static_cast<std::size_t>(o.first_year - o.spinup_start_year);
  // Members are simulated in blocks and written column by column, so that the writes into the
  // column-major members x years matrices stay contiguous (a member-by-member write strides by
  // the member count and misses the cache on every element).
  constexpr Eigen::Index block = 64;
  std::vector<MemberPath> paths(static_cast<std::size_t>(block));
  for (Eigen::Index r0 = 0; r0 < rows; r0 += block) {
    const Eigen::Index nb = std::min(block, rows - r0);
    for (Eigen::Index b = 0; b < nb; ++b) {
      MemberPath& p = paths[static_cast<std::size_t>(b)];
      simulate(drive, members[static_cast<std::size_t>(r0 + b)], o, false, p);
      std::vector<double>& thermal =
          o.thermal_route == ThermalExpansionRoute::layered ? p.thermal_layered_m : p.thermal_efficiency_m;
      // Reference every series of the member to its own mean over the reference span.
      for (std::vector<double>* v : {&thermal, &p.glaciers_m, &p.greenland_m, &p.antarctica_m, &p.land_water_m,
                                     &p.ocean_heat_j}) {
        const double base = span_mean(*v, p.years, o.reference);
        for (double& x : *v) x -= base;
      }
      const double t_base = span_mean(p.surface_k, p.years, o.warming_reference);
      for (double& x : p.surface_k) x -= t_base;
    }
    for (Eigen::Index j = 0; j < cols; ++j) {
      const std::size_t k = offset + static_cast<std::size_t>(j);
      for (Eigen::Index b = 0; b < nb; ++b) {
        const MemberPath& p = paths[static_cast<std::size_t>(b)];
        const Eigen::Index r = r0 + b;
        e.rise_m[0](r, j) = o.thermal_route == ThermalExpansionRoute::layered ? p.thermal_layered_m[k]
                                                                              : p.thermal_efficiency_m[k];
        e.rise_m[1](r, j) = p.glaciers_m[k];
        e.rise_m[2](r, j) = p.greenland_m[k];
        e.rise_m[3](r, j) = p.antarctica_m[k];
        e.rise_m[4](r, j) = p.land_water_m[k];
        e.surface_warming_k(r, j) = p.surface_k[k];
        e.ocean_heat_content_change_yj(r, j) = p.ocean_heat_j[k] * 1e-24;
      }
    }
  }
  return e;
}

}  // namespace tidewright::climate
