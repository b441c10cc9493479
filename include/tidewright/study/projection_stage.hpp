// The projection stage: a scenario (built-in pathway, forcing, CO2 or warming CSV, or a
// published quantile table) to local relative sea-level rise members. `tidewright project`
// and the study both call it.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "tidewright/climate/component_ensemble.hpp"
#include "tidewright/climate/projection.hpp"
#include "tidewright/local/relative_sea_level.hpp"
#include "tidewright/local/rise_ensemble.hpp"
#include "tidewright/report/plots.hpp"

namespace tidewright::study {

enum class ScenarioSource { pathway, forcing_csv, co2_csv, temperature_csv, table };

struct ProjectionRequest {
  std::string label;  // scenario label; default: the pathway name or the file name
  ScenarioSource source = ScenarioSource::pathway;
  std::string pathway;                // source pathway
  std::filesystem::path path;         // the CSV for the other sources
  climate::Co2ForcingFormula co2_formula = climate::Co2ForcingFormula::myhre1998;
  int first_year = 2020;
  int last_year = 2150;
  long long members = 2000;
  unsigned long long seed = 20261201ULL;
  climate::YearSpan reference{1995, 2014};  // AR6 WG1 baseline
  local::LocalTerms local;                  // fingerprints, land motion, ocean dynamics
  bool local_terms_given = false;           // refused with a table source
};

struct ProjectionStageResult {
  std::optional<climate::ComponentEnsemble> global;  // absent for a table source
  local::LocalRise local;                            // local.total is what planning uses
  std::vector<std::string> cautions;                 // local-stage cautions and labels
};

[[nodiscard]] ProjectionStageResult run_projection_stage(const ProjectionRequest& request);

// The scenario of a request (a built-in pathway, or a forcing, CO2 or warming CSV read and
// checked), without projecting it; `label` names it. InputError for a bad file.
[[nodiscard]] climate::Scenario load_scenario(const ProjectionRequest& request, const std::string& label);

// Per-year quantiles, type 7 (Hyndman & Fan 1996), of a members x years matrix.
[[nodiscard]] std::vector<double> year_quantiles(const Eigen::MatrixXd& members_by_year, double p);

inline const std::vector<double> summary_probabilities{0.05, 0.17, 0.50, 0.83, 0.95, 0.99};

[[nodiscard]] nlohmann::ordered_json projection_json(const ProjectionStageResult& r);

// Fan chart of the total (5/17/50/83/95 %) with the component medians. `total` may be a
// re-referenced copy of r.local.total (the study measures rise from the record's epoch).
[[nodiscard]] report::FanChartInput fan_chart_input(const ProjectionStageResult& r, const local::RiseEnsemble& total);
// "year,p05,p17,p50,p83,p95,p99,<component>_p50,..." one row per year.
[[nodiscard]] std::string projection_csv(const ProjectionStageResult& r);

}  // namespace tidewright::study
