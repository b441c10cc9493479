// The planning answers that `amplify`, `allowance` and the study all give, each computed by one
// function here from joined planning inputs (planning_stage.hpp), with one JSON shape each:
// amplification rows, emergence years, the design-life allowances, risks and target height,
// and the yearly paths the figures draw.
#pragma once

#include <optional>
#include <vector>

#include <nlohmann/json.hpp>

#include "tidewright/planning/allowance.hpp"
#include "tidewright/planning/amplification.hpp"
#include "tidewright/planning/design_life_risk.hpp"
#include "tidewright/study/planning_stage.hpp"

namespace tidewright::study {

struct AmplificationRow {
  int year = 0;
  double level_m = 0.0;
  planning::Amplification result{};
};

// Each level followed through each year: rows year by year, levels in the given order.
[[nodiscard]] std::vector<AmplificationRow> amplification_rows(const PlanningInputs& in, const std::vector<int>& years,
                                                               const std::vector<double>& levels_m);

struct EmergenceRow {
  double present_return_period_yr = 0.0;  // 1 / N_0(z); infinite above a bounded model's end
  planning::Emergence emergence{};        // its level, frequency and first year
};

// The first projected year in which each level is expected to be exceeded `frequency_per_yr`
// times a year, over every year of the projection.
[[nodiscard]] std::vector<EmergenceRow> emergence_rows(const PlanningInputs& in, const std::vector<double>& levels_m,
                                                       double frequency_per_yr);
// {"level", "frequency_per_yr", "year" (null when not reached)}.
[[nodiscard]] nlohmann::ordered_json emergence_json(const EmergenceRow& row);

struct DesignLifeAnswers {
  int first_year = 0;
  int last_year = 0;
  std::vector<planning::Allowance> allowances{};  // one per return period asked for
  std::vector<planning::DesignLifeRisk> risks{};  // one per height asked for
  std::optional<planning::DesignLifeLevel> target{};  // when a target probability is asked for
};

// Over the design life first..last: the design-life allowance of today's T-year level for each
// return period (Hunter 2012 over the years), the probability of at least one exceedance of each
// height, and the height with the target probability.
[[nodiscard]] DesignLifeAnswers design_life_answers(const PlanningInputs& in, int first_year, int last_year,
                                                    const std::vector<double>& return_periods_yr,
                                                    const std::vector<double>& heights_m,
                                                    std::optional<double> target_probability);
// {"first_year", "last_year", "allowances" (when any were asked for), "risks", "target"
// ({"probability", "height_m"}, when asked for)}.
[[nodiscard]] nlohmann::ordered_json design_life_json(const DesignLifeAnswers& d);

// The quotable amplification factor (planning::Amplification::quotable_factor) of one level in
// each of `years`, as the figures draw it.
[[nodiscard]] std::vector<double> factor_path(const PlanningInputs& in, const std::vector<int>& years, double level_m);

}  // namespace tidewright::study
