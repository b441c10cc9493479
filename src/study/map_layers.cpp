#include "tidewright/study/map_layers.hpp"

#include <memory>

#include "tidewright/planning/allowance.hpp"
#include "tidewright/report/text_table.hpp"

namespace tidewright::study {
namespace {

// Conditions are shared by the rate closures; a closure is called once per lookup node.
std::shared_ptr<const planning::YearConditions> conditions(const local::RiseEnsemble& rise, int year,
                                                          const planning::StorminessChange& storminess) {
  return std::make_shared<const planning::YearConditions>(planning::conditions_in_year(rise, year, storminess));
}

terrain::RateFunction future_rate(const extremes::StillWaterModel& present,
                                  std::shared_ptr<const planning::YearConditions> cond) {
  return [present, cond = std::move(cond)](double z) { return planning::future_exceedance_rate(present, *cond, z); };
}

}  // namespace

void add_present_levels(terrain::MapRequest& m, const extremes::StillWaterModel& present,
                        const std::vector<double>& return_periods_yr) {
  for (double t : return_periods_yr) {
    m.levels.push_back({planning::present_return_level(present, t), std::nullopt, "present day", t});
  }
}

void add_future_levels(terrain::MapRequest& m, const extremes::StillWaterModel& present,
                       const local::RiseEnsemble& rise, const planning::StorminessChange& storminess,
                       const std::vector<int>& years, const std::vector<double>& return_periods_yr,
                       const std::string& scenario) {
  for (int y : years) {
    const auto cond = planning::conditions_in_year(rise, y, storminess);
    for (const auto& a : planning::allowances(present, cond, return_periods_yr)) {
      m.levels.push_back({a.present_level_m + a.allowance_m, y, scenario, a.return_period_yr});
    }
  }
}

void add_present_aep(terrain::MapRequest& m, const extremes::StillWaterModel& present) {
  m.aep.push_back({[present](double z) { return present.annual_exceedance_rate(z); }, "present-day AEP",
                   std::nullopt, "present day"});
}

void add_future_aep(terrain::MapRequest& m, const extremes::StillWaterModel& present, const local::RiseEnsemble& rise,
                    const planning::StorminessChange& storminess, const std::vector<int>& years,
                    const std::string& scenario) {
  for (int y : years) {
    m.aep.push_back({future_rate(present, conditions(rise, y, storminess)),
                     "AEP in " + std::to_string(y) + ", scenario " + scenario, y, scenario});
  }
}

terrain::FirstYearLayer first_year_layer(const extremes::StillWaterModel& present, const local::RiseEnsemble& rise,
                                         const planning::StorminessChange& storminess, const std::vector<int>& years,
                                         double aep, const std::string& scenario) {
  terrain::FirstYearLayer fy;
  fy.aep = aep;
  fy.scenario = scenario;
  fy.description = "first year the AEP passes " + report::fixed(aep, 3) + ", scenario " + scenario;
  for (int y : years) fy.years.push_back({y, future_rate(present, conditions(rise, y, storminess))});
  fy.today = [present](double z) { return present.annual_exceedance_rate(z); };
  return fy;
}

std::vector<int> projection_years(const local::RiseEnsemble& rise, int step) {
  std::vector<int> years;
  for (int y = rise.years.front(); y <= rise.years.back(); y += step) years.push_back(y);
  return years;
}

}  // namespace tidewright::study
