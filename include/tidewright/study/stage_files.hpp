// Files that pass results from one command to the next: the projection's members (CSV) and
// the fit's present-day model (the JSON of `tidewright fit`). Formats in docs/file-formats.md.
#pragma once

#include <filesystem>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include <Eigen/Dense>
#include <nlohmann/json.hpp>

#include "tidewright/extremes/still_water_model.hpp"
#include "tidewright/local/rise_ensemble.hpp"

namespace tidewright::study {

// Members CSV: '#' metadata lines (key: value; the reference period as "reference_period:
// 1995-2014" when there is one), then "member,<year>,<year>,..." and one row
// per member of rise in metres.
void write_members_csv(const std::filesystem::path& file, const local::RiseEnsemble& ensemble,
                       bool force);
[[nodiscard]] local::RiseEnsemble read_members_csv(const std::filesystem::path& file);

// The parts of a fit JSON that later stages use.
struct FitSummary {
  extremes::StillWaterModel model;
  std::string datum;
  std::optional<double> reference_epoch;  // decimal year the levels are referred to
  std::vector<std::string> parameter_names;
  std::vector<double> estimates;
  std::optional<Eigen::MatrixXd> covariance;  // absent when the fit gave none
  std::string source;                         // the file it came from
};

// {"first_year": 1995, "last_year": 2014}, or null when there is no period.
[[nodiscard]] nlohmann::ordered_json reference_period_json(
    const std::optional<climate::YearSpan>& period);

[[nodiscard]] nlohmann::ordered_json still_water_model_json(const extremes::StillWaterModel& m);
// Its inverse, the one decoder of a still-water model (a fit's present_day_model, map's
// --model-json): family gumbel, gev or gpd; the numbers each family needs; a positive scale,
// finite parameters, a positive GPD rate. InputError names the key through `field`.
[[nodiscard]] extremes::StillWaterModel still_water_model_from_json(
    const nlohmann::json& j, const std::function<std::string(const std::string&)>& field);
[[nodiscard]] FitSummary read_fit_json(const std::filesystem::path& file);

}  // namespace tidewright::study
