// The planning stage as the commands and the study use it: a present-day model (from a fit)
// and local rise members (from a projection), made consistent with each other (datum, the
// record's epoch against the projection's reference), then allowances, amplification
// factors, emergence years and design-life risk from planning's one N_t(z).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "tidewright/local/rise_ensemble.hpp"
#include "tidewright/planning/allowance.hpp"
#include "tidewright/planning/amplification.hpp"
#include "tidewright/planning/design_life_risk.hpp"
#include "tidewright/planning/future_exceedance.hpp"
#include "tidewright/planning/parameter_range.hpp"
#include "tidewright/study/stage_files.hpp"

namespace tidewright::study {

struct PlanningInputs {
  FitSummary fit;
  local::RiseEnsemble rise;  // re-referenced to the record's epoch where needed
  planning::StorminessChange storminess;
  std::vector<std::string> notes;  // how the two were joined; printed and kept in the JSON
  // The projected year whose rise every member had subtracted (the record's epoch), so that
  // the projection's components can be measured from the same year as the total.
  std::optional<int> rise_zero_year;
};

// Joins a fit and a projection. With a fit epoch E: if E lies inside the projected years,
// every member is re-referenced to its own rise in E; if E lies inside the projection's
// structured reference period (RiseEnsemble::reference_period), the rise at E is taken as zero
// (it is by construction, to within the period's own change; a note says by how much);
// otherwise `epoch_offset_m` (the rise from E to the projection's reference) must be given,
// or this throws InputError whose hint names `epoch_offset_input` (the caller's flag or
// site-file key). A given offset is applied in every case.
[[nodiscard]] PlanningInputs join_fit_and_projection(
    FitSummary fit, local::RiseEnsemble rise, std::optional<double> epoch_offset_m,
    const planning::StorminessChange& storminess = {},
    const std::string& epoch_offset_input = "--epoch-offset");

struct AllowanceRow {
  planning::Allowance allowance;
  std::optional<planning::ParameterRange> range;  // over the fit's parameter uncertainty
  // Tail sensitivity: the allowance with the year's rise cut at its 99.9th and 99th
  // percentiles (planning::cut_at_quantile), so a reader sees how much of it is the top tail.
  double cut_at_p999_m = 0.0;
  double cut_at_p99_m = 0.0;
};

// Allowances for each year and return period (Hunter 2012), with ranges over `draws`
// parameter draws from the fit's covariance when draws > 0.
[[nodiscard]] std::vector<AllowanceRow> allowance_table(const PlanningInputs& in, const std::vector<int>& years,
                                                        const std::vector<double>& return_periods_yr,
                                                        int draws, unsigned long long seed);

// Models drawn from the fit's normal approximation N(theta_hat, covariance) (Coles 2001,
// §2.6.4); draws outside the parameter space are redrawn.
[[nodiscard]] std::vector<extremes::StillWaterModel> parameter_draws(const FitSummary& fit, int draws,
                                                                     unsigned long long seed);

[[nodiscard]] std::vector<planning::YearConditions> year_span(const PlanningInputs& in, int first, int last);

[[nodiscard]] nlohmann::ordered_json planning_context_json(const PlanningInputs& in);
// {"standard_error", "effective_sample_size", "heaviest_member_share"}, or null for quadrature
// nodes (no sampling error); `unit` names the standard error's key suffix ("m", "" for a ratio).
[[nodiscard]] nlohmann::ordered_json monte_carlo_json(const planning::MonteCarloError& e, const std::string& unit);
// One amplification row as JSON, the same shape in `amplify` and the study: return periods and
// factor as numbers or null (never inf), the annual-maxima bound flags, the factor's bound and
// Monte Carlo error, the share of members beyond the model's range.
[[nodiscard]] nlohmann::ordered_json amplification_json(const planning::Amplification& a);
// A return period as printed: "never" when infinite, "> 1,000,000" beyond, 0 or 2 decimals.
[[nodiscard]] std::string return_period_text(double t_yr);
// The printed future return period and factor of a row, with the bounds spelled out.
struct AmplificationText {
  std::string future_return_period;
  std::string factor;
};
[[nodiscard]] AmplificationText amplification_text(const planning::Amplification& a);
// The same row for a CSV, numbers only (docs/file-formats.md): beyond the annual-maxima range
// the future return period and factor are empty and the factor's lower bound has its own column.
// Columns: amplification_csv_columns(), after the caller's own (year, level, ...).
[[nodiscard]] std::vector<std::string> amplification_csv_columns();
[[nodiscard]] std::vector<std::string> amplification_csv_cells(const planning::Amplification& a);

// One design-life risk row as JSON: probability (with its Monte Carlo error), the expected
// number of years with an exceedance, the expected exceedances (null where a member takes the
// height beyond an annual-maxima model's range) and the share of member-years beyond it.
[[nodiscard]] nlohmann::ordered_json design_life_risk_json(const planning::DesignLifeRisk& r);
// The column a design-life table shows for a model: "expected years with an exceedance" for
// annual maxima (which cannot count a second exceedance in a year), "expected exceedances"
// for peaks over threshold; and its value for one row.
[[nodiscard]] std::string expected_count_heading(const extremes::StillWaterModel& m);
[[nodiscard]] double expected_count(const extremes::StillWaterModel& m, const planning::DesignLifeRisk& r);

// The warning for a figure resting on few effective members (monte_carlo_error.hpp), or "";
// `members_input` names where the member count is set (the command's flag or a site-file key).
[[nodiscard]] std::string few_members_warning(const std::string& figure, const planning::MonteCarloError& e,
                                              const std::string& members_input);
[[nodiscard]] nlohmann::ordered_json allowance_json(const PlanningInputs& in, const std::vector<AllowanceRow>& rows,
                                                    const std::string& members_input = "project --samples");

}  // namespace tidewright::study
