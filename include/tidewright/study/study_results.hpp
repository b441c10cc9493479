// What a study computed, as one model: the stages fill it (run_study), and results.json
// and the report read it without computing anything of their own.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "tidewright/report/document.hpp"
#include "tidewright/report/plots.hpp"
#include "tidewright/study/fit_stage.hpp"
#include "tidewright/study/planning_answers.hpp"
#include "tidewright/study/planning_stage.hpp"
#include "tidewright/study/projection_stage.hpp"
#include "tidewright/study/site_config.hpp"
#include "tidewright/terrain/flood_map.hpp"

namespace tidewright::study {

// One scenario's projection and every planning answer the study gives for it.
struct ScenarioRun {
  ScenarioSettings settings{};
  ProjectionStageResult projection{};
  PlanningInputs inputs{};
  std::vector<AllowanceRow> allowances{};         // design years x return periods
  std::vector<AmplificationRow> amplification{};  // design years x followed levels
  std::vector<EmergenceRow> emergence{};          // followed levels, once a year
  DesignLifeAnswers design_life{};                // heights of interest and the target height
  std::vector<double> risk_curve{};               // probability at StudyResults::risk_curve_heights_m
  // Over StudyResults::plot_years, for today's design-return-period level:
  std::vector<double> factor_path{};
  std::vector<double> allowance_path_m{};
  std::vector<double> height_path_m{};
};

struct StudyMaps {
  terrain::MapSummary summary{};
  std::optional<terrain::MapLevel> highest{};  // the last level mapped, as the extent figure shows it
  std::optional<report::RasterView> extent{};  // the extent's last band, for the report's map
  std::optional<report::RasterView> aep{};     // present-day AEP band
};

struct StudyResults {
  FitStageResult fit{};
  std::vector<double> follow_levels_m{};       // today's T-year levels, then the heights of interest
  std::vector<double> risk_curve_heights_m{};  // the design-life risk figure's heights
  std::vector<int> plot_years{};
  double design_return_period_yr = 0.0;        // the largest of planning.return_periods (read sorted)
  std::vector<ScenarioRun> runs{};
  std::optional<StudyMaps> maps{};
};

// The scenario as tables, figures and warnings name it: a high-end storyline says so there too.
[[nodiscard]] std::string display_name(const ScenarioSettings& s);

// results.json (docs/file-formats.md).
[[nodiscard]] nlohmann::ordered_json study_results_json(const StudyResults& r, const SiteConfig& c);

// The report's document: tables, figures, inputs, assumptions and methods, in words only.
[[nodiscard]] report::ReportDocument study_report(const StudyResults& r, const SiteConfig& c, const std::string& date);

// The terminal's few lines of answers: each scenario's design height of the longest return
// period in the last design year.
[[nodiscard]] std::vector<std::string> study_headline(const StudyResults& r, const SiteConfig& c);

}  // namespace tidewright::study
