#include "planning_options.hpp"

#include <cstdio>

#include "tidewright/common/error.hpp"

namespace tidewright::cli {

void add_planning_options(CLI::App& app, PlanningArgs& a, bool required) {
  app.add_option("--fit", a.fit_json, "The JSON written by 'tidewright fit --json'")->required(required)->type_name("FILE");
  app.add_option("--members", a.members, "The members written by 'tidewright project --members'")
      ->required(required)
      ->type_name("FILE");
  app.add_option("--epoch-offset", a.epoch_offset_m,
                 "Rise (m) from the record's epoch to the projection's reference, when neither covers the other");
  app.add_option("--storminess-scale-per-yr", a.storminess_scale_per_yr,
                 "Scenario assumption: relative change of the extreme model's scale per year (e.g. 0.001)");
  app.add_option("--storminess-location-per-yr", a.storminess_location_m_per_yr,
                 "Scenario assumption: change of the extreme model's location, m per year");
  app.add_option("--storminess-from", a.storminess_from, "Year from which the storminess change applies")
      ->default_val(2020);
}

study::PlanningInputs load_planning_inputs(const PlanningArgs& a) {
  auto fit = study::read_fit_json(a.fit_json);
  auto rise = study::read_members_csv(a.members);
  planning::StorminessChange s;
  s.scale_fraction_per_yr = a.storminess_scale_per_yr;
  s.location_m_per_yr = a.storminess_location_m_per_yr;
  s.reference_year = a.storminess_from;
  auto in = study::join_fit_and_projection(std::move(fit), std::move(rise), a.epoch_offset_m, s);
  if (s.active()) {
    in.notes.push_back("storminess change applied as a scenario assumption from " + std::to_string(s.reference_year));
  }
  return in;
}

std::pair<int, int> parse_year_span(const std::string& text, const std::string& option) {
  int a = 0, b = 0;
  char extra = 0;
  if (std::sscanf(text.c_str(), "%d-%d%c", &a, &b, &extra) != 2 || b < a) {
    throw InputError(option, "is '" + text + "'", "give a span of years such as 2030-2100");
  }
  return {a, b};
}

}  // namespace tidewright::cli
