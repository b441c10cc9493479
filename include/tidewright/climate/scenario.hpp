// A forcing scenario for the climate stage: effective radiative forcing by year, or global
// surface warming by year (which skips the energy balance), built from caller-supplied
// columns (the command line reads the file) or from a built-in illustrative pathway.
//
// Glossary
//   forcing_w_m2   F      effective radiative forcing relative to 1750, W m-2
//   warming_k      T      global surface air temperature anomaly relative to 1850-1900, K
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "tidewright/climate/forcing.hpp"

namespace tidewright::climate {

enum class ScenarioDriver {
  forcing,          // values are effective radiative forcing, W m-2
  surface_warming,  // values are global surface warming relative to 1850-1900, K
};

struct Scenario {
  std::string label;            // carried into every output
  bool illustrative = false;    // true for the built-in pathways: not official scenario data
  ScenarioDriver driver = ScenarioDriver::forcing;
  std::vector<int> years;       // consecutive, ascending
  std::vector<double> values;   // one per year: forcing_w_m2 or warming_k (see driver)

  [[nodiscard]] int first_year() const { return years.front(); }
  [[nodiscard]] int last_year() const { return years.back(); }
  // Value in `year` (must lie inside the scenario).
  [[nodiscard]] double value_in(int year) const;
};

// Builders. `where` names the input in error messages (a file name, an option). Each throws
// InputError when the years are empty, unsorted, repeated or not consecutive (annual steps),
// when the columns differ in length, or when a value is not finite.
[[nodiscard]] Scenario forcing_scenario(std::string label, std::vector<int> years,
                                        std::vector<double> forcing_w_m2, std::string_view where);
// Forcing = CO2 forcing (formula as chosen) + the optional non-CO2 column (empty = none).
[[nodiscard]] Scenario co2_scenario(std::string label, std::vector<int> years, const std::vector<double>& co2_ppm,
                                    const std::vector<double>& non_co2_forcing_w_m2, Co2ForcingFormula formula,
                                    std::string_view where);
[[nodiscard]] Scenario surface_warming_scenario(std::string label, std::vector<int> years,
                                                std::vector<double> warming_k, std::string_view where);

// The built-in illustrative pathways (docs/methods-climate.md, "Built-in pathways"). Each
// starts in 2019 at the AR6 forcing of 2.72 W m-2 with the slope of the historical ramp and
// follows cubic Hermite segments to its stated level in 2100, then holds that level.
struct PathwayDescription {
  std::string name;
  std::string summary;              // one line for help texts and reports
  double forcing_2100_w_m2 = 0.0;
  std::string comparable_assessed;  // the AR6 scenario whose assessed warming its level is calibrated to
};
[[nodiscard]] std::vector<PathwayDescription> builtin_pathways();
// Forcing of a built-in pathway from 2019 to last_year (>= 2100). Throws InputError for an
// unknown name (listing the known ones) or a last_year before 2100.
[[nodiscard]] Scenario builtin_pathway(std::string_view name, int last_year = 2300);
// Forcing of a built-in pathway in one (fractional) year >= 2019.
[[nodiscard]] double builtin_pathway_forcing_w_m2(std::string_view name, double year);

}  // namespace tidewright::climate
