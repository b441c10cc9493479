// Options shared by `allowance` and `amplify`: the fit, the projection members, the epoch
// adjustment and the storminess change, and how they become PlanningInputs.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <optional>
#include <string>

#include "tidewright/study/planning_stage.hpp"

namespace tidewright::cli {

struct PlanningArgs {
  std::string fit_json;
  std::string members;
  std::optional<double> epoch_offset_m;
  double storminess_scale_per_yr = 0.0;
  double storminess_location_m_per_yr = 0.0;
  int storminess_from = 2020;
};

// `required`: --fit and --members must be given (allowance, amplify); map takes them optionally.
void add_planning_options(CLI::App& app, PlanningArgs& args, bool required = true);
[[nodiscard]] study::PlanningInputs load_planning_inputs(const PlanningArgs& args);
// "2030-2100" -> {2030, 2100}; InputError naming `option` otherwise.
[[nodiscard]] std::pair<int, int> parse_year_span(const std::string& text, const std::string& option);

}  // namespace tidewright::cli
