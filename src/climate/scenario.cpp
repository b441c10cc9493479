// Glossary: see include/tidewright/climate/scenario.hpp.
#include "tidewright/climate/scenario.hpp"

#include <array>
#include <cmath>
#include <string>
#include <utility>

#include "tidewright/common/error.hpp"

namespace tidewright::climate {

namespace {

void check_columns(std::string_view where, const std::vector<int>& years, std::size_t value_count,
                   const char* value_name) {
  const std::string w(where);
  if (years.empty()) throw InputError(w, "the scenario has no years", "give at least one year");
  if (value_count != years.size()) {
    throw InputError(w, std::string(value_name) + " has " + std::to_string(value_count) + " values for " +
                            std::to_string(years.size()) + " years",
                     "give one value per year");
  }
  for (std::size_t i = 1; i < years.size(); ++i) {
    if (years[i] <= years[i - 1]) {
      throw InputError(w, "year " + std::to_string(years[i]) + " follows " + std::to_string(years[i - 1]),
                       "sort the years in ascending order without repeats");
    }
    if (years[i] != years[i - 1] + 1) {
      throw InputError(w, "gap between years " + std::to_string(years[i - 1]) + " and " + std::to_string(years[i]),
                       "give every year (the energy balance steps one year at a time)");
    }
  }
}

void check_finite(std::string_view where, const std::vector<int>& years, const std::vector<double>& v,
                  const char* value_name) {
  for (std::size_t i = 0; i < v.size(); ++i) {
    if (!std::isfinite(v[i])) {
      throw InputError(std::string(where), std::string(value_name) + " in " + std::to_string(years[i]) + " is not a number",
                       "give a finite value for every year");
    }
  }
}

// A pathway is a list of knots (year, forcing, slope) joined by cubic Hermite segments
// (Hermite interpolation: e.g. Burden & Faires, Numerical Analysis, sec. 3.5), then held.
struct Knot {
  double year;
  double forcing_w_m2;
  double slope_w_m2_per_yr;
};

struct PathwayDefinition {
  const char* name;
  const char* summary;
  const char* comparable;
  std::array<Knot, 3> knots;  // knots[0] is 2019; unused trailing knots repeat the last one
  int knot_count;
};

std::array<PathwayDefinition, 3> definitions() {
  const double f0 = forcing_2019_w_m2;
  const double s0 = historical_forcing_slope_2019_w_m2_per_yr();
  return {{
      {"restrained", "illustrative: forcing peaks at 3.6 W m-2 in 2050, eases to 3.2 W m-2 in 2100, then holds",
       "SSP1-2.6 (its assessed warming of 1.8 K in 2081-2100)",
       {{{2019, f0, s0}, {2050, 3.6, 0.0}, {2100, 3.2, 0.0}}}, 3},
      {"midway", "illustrative: forcing rises smoothly to 5.2 W m-2 in 2100, then holds",
       "SSP2-4.5 (its assessed warming of 2.7 K in 2081-2100)", {{{2019, f0, s0}, {2100, 5.2, 0.0}, {2100, 5.2, 0.0}}}, 2},
      {"unchecked", "illustrative: forcing rises smoothly to 9.0 W m-2 in 2100, then holds",
       "SSP5-8.5 (its assessed warming of 4.4 K in 2081-2100)", {{{2019, f0, s0}, {2100, 9.0, 0.0}, {2100, 9.0, 0.0}}}, 2},
  }};
}

const PathwayDefinition& find_pathway(std::string_view name) {
  static const std::array<PathwayDefinition, 3> defs = definitions();
  for (const auto& d : defs) {
    if (name == d.name) return d;
  }
  std::string known;
  for (const auto& d : defs) known += (known.empty() ? "" : ", ") + std::string(d.name);
  throw InputError("scenario", "unknown built-in pathway '" + std::string(name) + "'", "use one of: " + known);
}

double hermite(const Knot& a, const Knot& b, double year) {
  const double h = b.year - a.year;
  const double x = (year - a.year) / h;
  const double x2 = x * x;
  const double x3 = x2 * x;
  // Cubic Hermite basis h00, h10, h01, h11 on [0, 1].
  return (2 * x3 - 3 * x2 + 1) * a.forcing_w_m2 + (x3 - 2 * x2 + x) * h * a.slope_w_m2_per_yr +
         (-2 * x3 + 3 * x2) * b.forcing_w_m2 + (x3 - x2) * h * b.slope_w_m2_per_yr;
}

}  // namespace

double Scenario::value_in(int year) const {
  if (years.empty() || year < years.front() || year > years.back()) {
    throw InputError("year " + std::to_string(year), "lies outside the scenario '" + label + "'",
                     "give a scenario that covers the years asked for");
  }
  return values[static_cast<std::size_t>(year - years.front())];
}

Scenario forcing_scenario(std::string label, std::vector<int> years, std::vector<double> forcing_w_m2,
                          std::string_view where) {
  check_columns(where, years, forcing_w_m2.size(), "forcing");
  check_finite(where, years, forcing_w_m2, "forcing");
  return {std::move(label), false, ScenarioDriver::forcing, std::move(years), std::move(forcing_w_m2)};
}

Scenario co2_scenario(std::string label, std::vector<int> years, const std::vector<double>& co2_ppm,
                      const std::vector<double>& non_co2_forcing_w_m2, Co2ForcingFormula formula,
                      std::string_view where) {
  check_columns(where, years, co2_ppm.size(), "CO2 concentration");
  if (!non_co2_forcing_w_m2.empty()) check_columns(where, years, non_co2_forcing_w_m2.size(), "non-CO2 forcing");
  check_finite(where, years, co2_ppm, "CO2 concentration");
  check_finite(where, years, non_co2_forcing_w_m2, "non-CO2 forcing");
  std::vector<double> forcing(years.size());
  for (std::size_t i = 0; i < years.size(); ++i) {
    if (co2_ppm[i] <= 0.0) {
      throw InputError(std::string(where), "CO2 concentration in " + std::to_string(years[i]) + " is not positive",
                       "give CO2 in ppm");
    }
    forcing[i] = co2_forcing_w_m2(co2_ppm[i], formula) + (non_co2_forcing_w_m2.empty() ? 0.0 : non_co2_forcing_w_m2[i]);
  }
  return {std::move(label), false, ScenarioDriver::forcing, std::move(years), std::move(forcing)};
}

Scenario surface_warming_scenario(std::string label, std::vector<int> years, std::vector<double> warming_k,
                                  std::string_view where) {
  check_columns(where, years, warming_k.size(), "surface warming");
  check_finite(where, years, warming_k, "surface warming");
  return {std::move(label), false, ScenarioDriver::surface_warming, std::move(years), std::move(warming_k)};
}

std::vector<PathwayDescription> builtin_pathways() {
  std::vector<PathwayDescription> out;
  for (const auto& d : definitions()) {
    out.push_back({d.name, d.summary, d.knots[static_cast<std::size_t>(d.knot_count - 1)].forcing_w_m2, d.comparable});
  }
  return out;
}

double builtin_pathway_forcing_w_m2(std::string_view name, double year) {
  const PathwayDefinition& d = find_pathway(name);
  if (!(year >= d.knots[0].year)) {
    throw InputError("year " + std::to_string(year), "lies before the start of pathway '" + std::string(name) + "' (2019)",
                     "years before 2019 follow the historical ramp");
  }
  const auto knots = static_cast<std::size_t>(d.knot_count);
  for (std::size_t i = 0; i + 1 < knots; ++i) {
    const Knot& a = d.knots[i];
    const Knot& b = d.knots[i + 1];
    if (year <= b.year) return hermite(a, b, year);
  }
  return d.knots[static_cast<std::size_t>(d.knot_count - 1)].forcing_w_m2;  // held after the last knot
}

Scenario builtin_pathway(std::string_view name, int last_year) {
  const PathwayDefinition& d = find_pathway(name);
  if (last_year < 2100) {
    throw InputError("last year " + std::to_string(last_year), "is before 2100", "the built-in pathways run to 2100 or later");
  }
  Scenario s;
  s.label = std::string(d.name) + " (illustrative pathway, not official scenario data)";
  s.illustrative = true;
  s.driver = ScenarioDriver::forcing;
  for (int y = 2019; y <= last_year; ++y) {
    s.years.push_back(y);
    s.values.push_back(builtin_pathway_forcing_w_m2(name, y));
  }
  return s;
}

}  // namespace tidewright::climate
