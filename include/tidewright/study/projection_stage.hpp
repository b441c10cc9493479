// The projection stage: a scenario (built-in pathway, forcing, CO2 or warming CSV, or a
// published quantile table) to local relative sea-level rise members. `tidewright project`
// and the study both call it.
#pragma once

#include <filesystem>
#include <optional>
#include <span>
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
  // Inputs outside the physical ranges of check_projection_inputs are refused unless this is
  // set (the command's --accept-extreme): a deliberate stress test, not a typing slip.
  bool accept_extreme_inputs = false;
  // The high-end ice-sheet storyline instead of the assessed calibration (physics sources
  // only; the label says so in every output). `storyline_input` names the caller's option.
  climate::IceStoryline storyline = climate::IceStoryline::assessed;
  std::string storyline_input = "--storyline";
  // How the caller names these inputs in messages: the command's flags by default, the site
  // file's keys in a study.
  struct InputNames {
    std::string members = "--samples";
    std::string years = "--first-year/--last-year";
    std::string reference = "--reference";
    std::string land_motion = "--land-motion";
    std::string land_motion_sd = "--land-motion-sd";
    std::string accept_extreme = "pass --accept-extreme";
  } input_names;
};

// Physical ranges of projection inputs (docs/bad-inputs.md states them with their sources).
// The member limit keeps the ensemble's arrays within a few GiB: about ten arrays of
// members x years doubles, 131 years by default, is 2.1 GB at 200,000 members.
inline constexpr long long max_members = 200000;
// SSP5-8.5's extension reaches about 12 W/m2 by 2300 and the largest eruptions of the last
// millennium about -10 W/m2 in their peak year (AR6 WG1 Ch. 7 and Annex III; from memory).
inline constexpr double max_abs_forcing_w_m2 = 15.0;
// Warming relative to 1850-1900: -5 K (a glacial climate) to 15 K, beyond every assessed
// scenario's 2300 range (AR6 WG1 Ch. 4; from memory).
inline constexpr double min_warming_k = -5.0;
inline constexpr double max_warming_k = 15.0;
// The fastest measured land subsidence, in sinking coastal cities, is of the order of
// 100-250 mm/yr (from memory); post-glacial uplift is at most about 25 mm/yr.
inline constexpr double max_abs_land_motion_mm_per_yr = 300.0;

// InputError (exit 2) for a member count above max_members (before any allocation) and, unless
// accept_extreme_inputs, a scenario value or land motion outside the ranges above.
void check_projection_inputs(const ProjectionRequest& request, const climate::Scenario* scenario);

struct ProjectionStageResult {
  std::optional<climate::ComponentEnsemble> global;  // absent for a table source
  local::LocalRise local;                            // local.total is what planning uses
  std::vector<std::string> cautions;                 // local-stage cautions and labels
};

[[nodiscard]] ProjectionStageResult run_projection_stage(const ProjectionRequest& request);

// The scenario of a request (a built-in pathway, or a forcing, CO2 or warming CSV read and
// checked), without projecting it; `label` names it. InputError for a bad file.
[[nodiscard]] climate::Scenario load_scenario(const ProjectionRequest& request, const std::string& label);

// Per-year quantiles, type 7 (Hyndman & Fan 1996, common/sample_quantile.hpp), of a members x
// years matrix: one vector per probability, each column sorted once for all of them.
[[nodiscard]] std::vector<std::vector<double>> year_quantiles(const Eigen::MatrixXd& members_by_year,
                                                              std::span<const double> ps);
[[nodiscard]] std::vector<double> year_quantiles(const Eigen::MatrixXd& members_by_year, double p);

inline const std::vector<double> summary_probabilities{0.05, 0.17, 0.50, 0.83, 0.95, 0.99};

[[nodiscard]] nlohmann::ordered_json projection_json(const ProjectionStageResult& r);

// Fan chart of the total (5/17/50/83/95 %) with the component medians. `total` may be a
// re-referenced copy of r.local.total (the study measures rise from the record's epoch).
// `total` may be re-referenced (PlanningInputs::rise); with `zero_year` each component is
// measured from that year too, member by member, so the lines share the total's reference.
// Components get readable names ("Thermal expansion").
[[nodiscard]] report::FanChartInput fan_chart_input(const ProjectionStageResult& r, const local::RiseEnsemble& total,
                                                    std::optional<int> zero_year = std::nullopt);
// "thermal_expansion" -> "Thermal expansion", for legends and tables.
[[nodiscard]] std::string component_display_name(const std::string& name);
// "year,p05,p17,p50,p83,p95,p99,<component>_p50,..." one row per year.
[[nodiscard]] std::string projection_csv(const ProjectionStageResult& r);

}  // namespace tidewright::study
