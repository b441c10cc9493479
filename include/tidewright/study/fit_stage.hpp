// The fit stage: from a tide-gauge file to a fitted extreme still-water model with return
// levels, intervals and diagnostics. `tidewright fit` and the study both call it; the
// command only parses options and prints.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "tidewright/extremes/diagnostics.hpp"
#include "tidewright/extremes/fit.hpp"
#include "tidewright/extremes/return_levels.hpp"
#include "tidewright/record/annual_maxima.hpp"
#include "tidewright/record/block_maxima.hpp"
#include "tidewright/record/peaks_over_threshold.hpp"
#include "tidewright/record/read_options.hpp"
#include "tidewright/report/plots.hpp"
#include "tidewright/study/stage_files.hpp"

namespace tidewright::study {

enum class RecordKind { detect, series, annual_maxima };

// run_fit_stage throws InputError for options the record would ignore: detrending or an epoch
// for a file of annual maxima, an epoch without detrending (and, through the record module, an
// epoch more than record::max_epoch_outside_record_yr years outside the record).

// How a water-level series becomes the values a model is fitted to, stated once for annual
// maxima and for peaks over a threshold (maxima_options and peaks_options hand it on).
struct SeriesSettings {
  double min_completeness = record::default_min_completeness;  // Slangen et al. (2017)
  int year_start_month = 1;                                    // 1: calendar years
  record::DetrendMethod detrend = record::DetrendMethod::none;
  std::optional<double> epoch_yr;  // empty: the record's mid-point
  // Peaks over a threshold: a level or a quantile of the levels (neither:
  // record::default_threshold_quantile), and the declustering separation.
  std::optional<double> threshold_m;
  std::optional<double> threshold_quantile;
  double separation_h = record::default_separation_h;  // common practice
};

[[nodiscard]] record::AnnualMaximaOptions maxima_options(const SeriesSettings& s);
[[nodiscard]] record::PeaksOptions peaks_options(const SeriesSettings& s);

// One request, filled by `fit` from its options and by the site file's [record] and
// [extremes] tables (site_config.hpp), so the command and the study fit alike.
struct FitRequest {
  std::filesystem::path input;
  RecordKind kind = RecordKind::detect;  // detect: a series if the file has the time column
  record::ReadOptions read;
  std::string model = "gev";  // gumbel, gev, gpd, rlargest, auto
  std::vector<double> return_periods_yr = extremes::standard_return_periods_yr;
  SeriesSettings series;  // series only
  std::size_t r_largest = 0;           // rlargest: values per year kept (0: all given)
  std::size_t bootstrap_samples = 0;   // 0: no bootstrap
  unsigned long long seed = 20261201ULL;
  // Where the detrending options came from, for messages (the flags, or the site-file keys),
  // and whether detrending was asked for rather than defaulted: options that would be ignored
  // (detrending annual maxima, an epoch without detrending) are refused, defaults are not.
  std::string detrend_input = "--detrend";
  std::string epoch_input = "--epoch";
  std::string r_columns_input = "--r-columns";  // named in hints
  std::string model_input = "--model";          // where a bad model name is
  std::string gev_choice = "--model gev";       // how to ask for a GEV instead, in hints
  bool detrend_given = false;
};

struct FitStageResult {
  std::string model;  // the family fitted ("gev", "gumbel", "gpd", "rlargest")
  extremes::FitResult fit;
  std::optional<extremes::DevianceTest> deviance_test;  // auto, or gumbel/gev on maxima
  std::vector<extremes::ReturnLevel> delta;
  std::vector<extremes::ReturnLevel> profile;
  std::optional<extremes::BootstrapResult> bootstrap;
  double anderson_darling = 0.0;
  double aic = 0.0;
  std::vector<extremes::PlotPoint> plot_points;
  extremes::StillWaterModel present_day;  // N_0(z); a GPD carries the rate curve below u
  std::string datum;
  std::optional<double> reference_epoch;  // set when a trend was removed
  double trend_mm_per_yr = 0.0;
  std::string data_summary;  // what cleaning did, for the terminal and the report
  std::vector<std::string> warnings;
  std::string source;
};

[[nodiscard]] FitStageResult run_fit_stage(const FitRequest& request);

// What later stages take from a fit: the same as read_fit_json gives from the fit's JSON.
[[nodiscard]] FitSummary fit_summary(const FitStageResult& result);

// Above this GEV/GPD shape a still-water fit gets a caution: fitted shapes of tide-gauge
// extremes mostly lie between about -0.2 and 0.2, so a heavier tail more often means mixed
// populations, outliers or a short record than a real tail (common practice; from memory).
inline constexpr double still_water_shape_caution = 0.2;

// True when the delta-method lower bound of level i lies below the point estimate of a shorter
// return period in the fit: a symmetric interval that has left the data's support; such a bound
// is not printed (the profile interval is the answer, the delta interval an approximation).
[[nodiscard]] bool delta_lower_below_shorter_level(const FitStageResult& r, std::size_t i);

// Warnings a fit's numbers need beside them: a very heavy tail (above still_water_shape_caution
// and above 0.5), a shape where the likelihood is not regular, the largest value at the fitted
// upper end point.
[[nodiscard]] std::vector<std::string> numerical_warnings(const extremes::FitResult& fit);

// The return-level plot of a fit: the profile band where every period has one, else the delta
// method's (`band_method` says which).
[[nodiscard]] report::ReturnLevelPlotInput return_level_plot_input(const FitStageResult& result,
                                                                   std::string* band_method = nullptr);

// The JSON of `tidewright fit --json` (docs/file-formats.md).
[[nodiscard]] nlohmann::ordered_json fit_result_json(const FitStageResult& result);

}  // namespace tidewright::study
