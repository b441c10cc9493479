#include "tidewright/study/planning_answers.hpp"

namespace tidewright::study {

using Json = nlohmann::ordered_json;

std::vector<AmplificationRow> amplification_rows(const PlanningInputs& in, const std::vector<int>& years,
                                                 const std::vector<double>& levels_m) {
  std::vector<AmplificationRow> rows;
  rows.reserve(years.size() * levels_m.size());
  for (int y : years) {
    const auto cond = planning::conditions_in_year(in.rise, y, in.storminess);
    for (double z : levels_m) rows.push_back({y, z, planning::amplification(in.fit.model, cond, z)});
  }
  return rows;
}

std::vector<EmergenceRow> emergence_rows(const PlanningInputs& in, const std::vector<double>& levels_m,
                                         double frequency_per_yr) {
  const auto span = year_span(in, in.rise.years.front(), in.rise.years.back());
  std::vector<EmergenceRow> rows;
  rows.reserve(levels_m.size());
  for (double z : levels_m) {
    rows.push_back({1.0 / in.fit.model.annual_exceedance_rate(z),
                    planning::emergence_year(in.fit.model, span, z, frequency_per_yr)});
  }
  return rows;
}

Json emergence_json(const EmergenceRow& row) {
  const auto& e = row.emergence;
  return {{"level", e.level_m},
          {"frequency_per_yr", e.frequency_per_yr},
          {"year", e.year ? Json(*e.year) : Json(nullptr)}};
}

DesignLifeAnswers design_life_answers(const PlanningInputs& in, int first_year, int last_year,
                                      const std::vector<double>& return_periods_yr, const std::vector<double>& heights_m,
                                      std::optional<double> target_probability) {
  const auto span = year_span(in, first_year, last_year);
  DesignLifeAnswers d;
  d.first_year = first_year;
  d.last_year = last_year;
  for (double period : return_periods_yr) d.allowances.push_back(planning::design_life_allowance(in.fit.model, span, period));
  for (double h : heights_m) d.risks.push_back(planning::design_life_risk(in.fit.model, span, h));
  if (target_probability) d.target = planning::level_for_design_life_risk(in.fit.model, span, *target_probability);
  return d;
}

Json design_life_json(const DesignLifeAnswers& d) {
  Json life;
  life["first_year"] = d.first_year;
  life["last_year"] = d.last_year;
  if (!d.allowances.empty()) {
    Json rows = Json::array();
    for (const auto& al : d.allowances) {
      rows.push_back({{"return_period", al.return_period_yr}, {"present_level_m", al.present_level_m},
                      {"allowance_m", al.allowance_m}, {"monte_carlo", monte_carlo_json(al.monte_carlo, "m")},
                      {"members_beyond_model_range_fraction", al.beyond_range_fraction}, {"method", al.method}});
    }
    life["allowances"] = rows;
  }
  Json risks = Json::array();
  for (const auto& r : d.risks) risks.push_back(design_life_risk_json(r));
  life["risks"] = risks;
  if (d.target) life["target"] = {{"probability", d.target->target_probability}, {"height_m", d.target->level_m}};
  return life;
}

std::vector<double> factor_path(const PlanningInputs& in, const std::vector<int>& years, double level_m) {
  std::vector<double> path;
  path.reserve(years.size());
  for (int y : years) {
    const auto cond = planning::conditions_in_year(in.rise, y, in.storminess);
    path.push_back(planning::amplification(in.fit.model, cond, level_m).quotable_factor());
  }
  return path;
}

}  // namespace tidewright::study
