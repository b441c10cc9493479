#include "tidewright/study/fit_stage.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <span>

#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/record/water_level_series.hpp"
#include "tidewright/report/cautions.hpp"
#include "tidewright/report/text_table.hpp"
#include "tidewright/study/stage_files.hpp"

namespace tidewright::study {
namespace {

std::string report_period(double years) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%g", years);
  return buf;
}

RecordKind detect_kind(const FitRequest& r) {
  if (r.kind != RecordKind::detect) return r.kind;
  const CsvTable head = CsvTable::read(r.input, r.read.csv);
  if (head.find_column(r.read.time_column)) return RecordKind::series;
  if (head.find_column(r.read.year_column)) return RecordKind::annual_maxima;
  throw InputError(location(r.input.string(), head.header_line()),
                   "has neither a time column '" + r.read.time_column + "' nor a year column '" +
                       r.read.year_column + "'",
                   "name the columns with --time-column or --year-column");
}

nlohmann::ordered_json number_or_null(double v) {
  return std::isfinite(v) ? nlohmann::ordered_json(v) : nlohmann::ordered_json(nullptr);
}

void fill_intervals(FitStageResult& out, const FitRequest& request) {
  out.delta = extremes::return_levels_delta(out.fit, request.return_periods_yr);
  // Period by period, so that one profile that cannot be maximised (a short record with a
  // heavy tail) costs that period's profile interval, said in a warning, not the whole fit.
  for (std::size_t i = 0; i < request.return_periods_yr.size(); ++i) {
    const double t = request.return_periods_yr[i];
    try {
      out.profile.push_back(extremes::return_levels_profile(out.fit, std::span<const double>(&t, 1)).front());
    } catch (const ComputationError& e) {
      extremes::ReturnLevel failed = out.delta[i];
      failed.method = extremes::IntervalMethod::profile;
      failed.lower_m = std::numeric_limits<double>::quiet_NaN();
      failed.upper_m = std::numeric_limits<double>::quiet_NaN();
      out.profile.push_back(failed);
      out.warnings.push_back("no profile-likelihood interval for the " + report_period(t) +
                             "-year level (" + e.problem() + "); the delta-method interval is the only one given");
    }
  }
  if (request.bootstrap_samples > 0) {
    extremes::BootstrapOptions b;
    b.samples = request.bootstrap_samples;
    b.seed = request.seed;
    out.bootstrap = extremes::return_levels_bootstrap(out.fit, request.return_periods_yr, b);
  }
  for (const auto& p : out.profile) {
    if (std::isinf(p.lower_m) || std::isinf(p.upper_m)) {
      out.warnings.push_back("the profile likelihood does not bound the " +
                             report_period(p.return_period_yr) +
                             "-year level on one side: the data cannot say how high (or low) it may be");
    }
  }
}

// Options that would change nothing are refused, so that nobody believes a trend was removed.
void refuse_ignored_options(const FitRequest& r, RecordKind kind) {
  const bool detrends = r.series.detrend != record::DetrendMethod::none;
  const std::optional<double>& epoch = r.series.epoch_yr;
  if (kind != RecordKind::series) {
    if (detrends && r.detrend_given) {
      throw InputError(r.detrend_input, "removes a mean-sea-level trend from a water-level series, but " +
                                            r.input.string() + " holds annual maxima, where it would be ignored",
                       "remove it, or give the series the maxima came from");
    }
    if (epoch) {
      throw InputError(r.epoch_input, "refers detrended series levels to an epoch, but " + r.input.string() +
                                          " holds annual maxima, where it would be ignored",
                       "remove it, or give the series the maxima came from with a detrending method");
    }
  } else if (epoch && !detrends) {
    throw InputError(r.epoch_input, "sets the epoch of detrended levels, but no trend is removed, so it would be ignored",
                     "choose a detrending method (annual-mean or linear) or remove the epoch");
  }
}

}  // namespace

namespace {
// The settings annual maxima and peaks share, into either's options.
template <typename Options>
Options year_options(const SeriesSettings& s) {
  Options o;
  o.min_completeness = s.min_completeness;
  o.year_start_month = s.year_start_month;
  o.detrend = s.detrend;
  o.epoch_yr = s.epoch_yr;
  return o;
}
}  // namespace

record::AnnualMaximaOptions maxima_options(const SeriesSettings& s) {
  return year_options<record::AnnualMaximaOptions>(s);
}

record::PeaksOptions peaks_options(const SeriesSettings& s) {
  auto o = year_options<record::PeaksOptions>(s);
  o.threshold_m = s.threshold_m;
  o.threshold_quantile = s.threshold_quantile;
  o.separation_h = s.separation_h;
  return o;
}

FitStageResult run_fit_stage(const FitRequest& request) {
  for (double t : request.return_periods_yr) {
    if (!(t > 1.0)) {
      throw InputError("--return-periods", "holds " + std::to_string(t) + ", a return period of 1 year or less",
                       "give return periods above 1 year");
    }
  }
  FitStageResult out;
  out.source = request.read.recorded_as.empty() ? request.input.string() : request.read.recorded_as;
  const RecordKind kind = detect_kind(request);
  refuse_ignored_options(request, kind);
  const std::string& model = request.model;
  if (model == "gpd") {
    if (kind != RecordKind::series) {
      throw InputError(request.input.string(), "a GPD fit needs a water-level series, not annual maxima",
                       "give a timestamped series, or choose " + request.gev_choice);
    }
    const auto series = record::read_water_level_series(request.input, request.read);
    const auto peaks = record::peaks_over_threshold(series, peaks_options(request.series));
    record::require_minimum_maxima(peaks.size(), "gpd", record::minimum_exceedances_gpd, out.source);
    out.fit = extremes::fit_gpd(peaks.level_m, peaks.threshold_m, peaks.effective_years);
    out.present_day = out.fit.model();
    out.present_day.below_threshold = peaks.below_threshold;
    out.datum = peaks.datum;
    out.data_summary = series.summary() + "\n" + peaks.summary();
    if (peaks.detrend) {
      out.reference_epoch = peaks.detrend->epoch_yr;
      out.trend_mm_per_yr = peaks.detrend->trend_mm_per_yr;
    }
    out.model = "gpd";
  } else {
    record::AnnualMaxima maxima;
    if (kind == RecordKind::series) {
      if (model == "rlargest") {
        throw InputError(request.input.string(),
                         "an r-largest fit needs an annual-maxima file with the r largest values of each year",
                         "give such a file (with " + request.r_columns_input + "), or choose " + request.gev_choice);
      }
      const auto series = record::read_water_level_series(request.input, request.read);
      maxima = record::annual_maxima_from_series(series, maxima_options(request.series));
      out.data_summary = series.summary() + "\n" + maxima.summary();
    } else {
      maxima = record::read_annual_maxima(request.input, request.read);
      out.data_summary = maxima.summary();
    }
    out.datum = maxima.datum;
    if (maxima.detrend) {
      out.reference_epoch = maxima.detrend->epoch_yr;
      out.trend_mm_per_yr = maxima.detrend->trend_mm_per_yr;
    }
    if (model == "gumbel") {
      record::require_minimum_maxima(maxima.size(), "gumbel", record::minimum_maxima_gumbel, out.source);
      out.fit = extremes::fit_gumbel(maxima.level_m);
      out.model = "gumbel";
    } else if (model == "gev") {
      record::require_minimum_maxima(maxima.size(), "gev", record::minimum_maxima_gev, out.source);
      out.fit = extremes::fit_gev(maxima.level_m);
      out.deviance_test = extremes::gumbel_against_gev(extremes::fit_gumbel(maxima.level_m), out.fit);
      out.model = "gev";
    } else if (model == "auto") {
      record::require_minimum_maxima(maxima.size(), "gev", record::minimum_maxima_gev, out.source);
      auto chosen = extremes::fit_annual_maxima_auto(maxima.level_m);
      out.fit = std::move(chosen.fit);
      out.deviance_test = chosen.test;
      out.model = std::string(extremes::family_name(out.fit.family));
    } else if (model == "rlargest") {
      if (maxima.r_largest_m.empty()) {
        throw InputError(request.input.string(), "has no r-largest columns",
                         "name them with " + request.r_columns_input + ", or choose " + request.gev_choice);
      }
      record::require_minimum_maxima(maxima.size(), "rlargest", record::minimum_maxima_gev, out.source);
      out.fit = extremes::fit_gev_r_largest(maxima.r_largest_m, request.r_largest);
      out.model = "rlargest";
    } else {
      throw InputError(request.model_input, "is '" + model + "'", "use gumbel, gev, gpd, rlargest or auto");
    }
    out.present_day = out.fit.model();
  }
  fill_intervals(out, request);
  out.anderson_darling = extremes::anderson_darling(out.fit);
  out.aic = extremes::aic(out.fit);
  out.plot_points = extremes::diagnostic_plot_points(out.fit);
  for (auto& w : numerical_warnings(out.fit)) out.warnings.push_back(std::move(w));
  return out;
}

bool delta_lower_below_shorter_level(const FitStageResult& r, std::size_t i) {
  if (i >= r.delta.size()) return false;
  const extremes::ReturnLevel& l = r.delta[i];
  for (const auto& other : r.delta) {
    if (other.return_period_yr < l.return_period_yr && l.lower_m < other.level_m) return true;
  }
  return false;
}

std::vector<std::string> numerical_warnings(const extremes::FitResult& fit) {
  std::vector<std::string> w;
  if (fit.family == extremes::Family::gumbel) return w;
  const double xi = fit.shape();
  const auto num = [](double v) { return report::fixed(v, 3); };
  if (xi > 0.5) {
    w.push_back("the fitted shape is " + num(xi) + ", above 0.5: a very heavy tail; long return levels are unreliable");
  } else if (xi > still_water_shape_caution) {
    w.push_back("the fitted shape is " + num(xi) + ", above " + num(still_water_shape_caution) +
                ": still-water extremes are rarely this heavy-tailed; check the record for mixed populations "
                "(e.g. surges of different storm types), outliers or too short a span before using long return levels");
  }
  // Smith (1985, Biometrika 72:67): for xi <= -0.5 the maximum-likelihood estimator is not
  // regular, so its standard errors (and delta-method intervals) cannot be trusted.
  if (xi <= -0.5) {
    w.push_back("the fitted shape is " + num(xi) +
                ", at most -0.5, where the likelihood is not regular (Smith 1985): standard errors and "
                "delta-method intervals are not valid; use the profile or bootstrap intervals");
  }
  if (xi < 0.0 && !fit.data.empty()) {
    // Upper end point mu - sigma/xi (Coles 2001, sec. 3.1.1; for the GPD u - sigma/xi, sec. 4.2.2).
    const double end_m = fit.location() - fit.scale() / xi;
    const double largest_m = *std::max_element(fit.data.begin(), fit.data.end());
    if (end_m - largest_m < 0.01 * fit.scale()) {
      w.push_back("the largest value (" + num(largest_m) + " m) lies at the fitted upper end point (" + num(end_m) +
                  " m): the fit sits on the edge of its support, and the model gives no chance of any higher level");
    }
  }
  return w;
}

FitSummary fit_summary(const FitStageResult& result) {
  FitSummary s;
  s.model = result.present_day;
  s.datum = result.datum;
  s.reference_epoch = result.reference_epoch;
  s.parameter_names = result.fit.parameter_names;
  for (Eigen::Index i = 0; i < result.fit.estimate.size(); ++i) s.estimates.push_back(result.fit.estimate(i));
  s.covariance = Eigen::MatrixXd(result.fit.covariance);
  s.source = result.source;
  return s;
}

report::ReturnLevelPlotInput return_level_plot_input(const FitStageResult& fit, std::string* band_method) {
  // One method for the whole band: the profile where every period has one, else the delta method.
  const bool profile_complete = std::all_of(fit.profile.begin(), fit.profile.end(), [](const extremes::ReturnLevel& l) {
    return !std::isnan(l.lower_m) && !std::isnan(l.upper_m);
  });
  if (band_method) *band_method = profile_complete ? "profile-likelihood" : "delta-method";
  report::ReturnLevelPlotInput rlp;
  rlp.datum = fit.datum;
  const std::string family = fit.model == "gumbel" ? "Gumbel" : fit.model == "gev" ? "GEV" : fit.model == "gpd" ? "GPD"
                             : fit.model == "rlargest"                                        ? "r-largest GEV"
                                                                                              : fit.model;
  rlp.model_name = family + " fit";
  if (fit.model != "gpd") {
    for (const auto& p : fit.plot_points) rlp.annual_maxima_m.push_back(p.level_m);
  }
  for (std::size_t i = 0; i < fit.profile.size(); ++i) {
    const auto& band = profile_complete ? fit.profile[i] : fit.delta[i];
    rlp.return_period_yr.push_back(fit.profile[i].return_period_yr);
    rlp.level_m.push_back(fit.profile[i].level_m);
    rlp.lower_m.push_back(std::isfinite(band.lower_m) ? band.lower_m : std::numeric_limits<double>::quiet_NaN());
    rlp.upper_m.push_back(std::isfinite(band.upper_m) ? band.upper_m : std::numeric_limits<double>::quiet_NaN());
  }
  return rlp;
}

nlohmann::ordered_json fit_result_json(const FitStageResult& r) {
  nlohmann::ordered_json j;
  j["model"] = r.model;
  j["n"] = r.fit.n;
  j["datum"] = r.datum;
  j["source"] = r.source;
  j["reference_epoch"] = r.reference_epoch ? nlohmann::ordered_json(*r.reference_epoch) : nlohmann::ordered_json(nullptr);
  if (r.reference_epoch) j["trend_removed_mm_per_yr"] = r.trend_mm_per_yr;
  nlohmann::ordered_json params, ses;
  for (std::size_t i = 0; i < r.fit.parameter_names.size(); ++i) {
    params[r.fit.parameter_names[i]] = r.fit.estimate(static_cast<Eigen::Index>(i));
    ses[r.fit.parameter_names[i]] = r.fit.standard_error(static_cast<Eigen::Index>(i));
  }
  j["parameters"] = params;
  j["standard_errors"] = ses;
  nlohmann::ordered_json cov = nlohmann::ordered_json::array();
  for (Eigen::Index a = 0; a < r.fit.covariance.rows(); ++a) {
    nlohmann::ordered_json row = nlohmann::ordered_json::array();
    for (Eigen::Index b = 0; b < r.fit.covariance.cols(); ++b) row.push_back(r.fit.covariance(a, b));
    cov.push_back(row);
  }
  j["covariance"] = cov;
  j["log_likelihood"] = r.fit.log_likelihood;
  if (r.model == "gpd") {
    j["threshold"] = r.fit.threshold_m;
    j["rate_per_yr"] = r.fit.rate_per_yr;
    j["rate_standard_error_per_yr"] = r.fit.rate_standard_error_per_yr;
    j["years_of_record"] = r.fit.years_of_record;
  }
  nlohmann::ordered_json levels = nlohmann::ordered_json::array();
  auto add = [&](const std::vector<extremes::ReturnLevel>& v) {
    for (std::size_t i = 0; i < v.size(); ++i) {
      const auto& l = v[i];
      nlohmann::ordered_json e{{"return_period", l.return_period_yr},
                               {"annual_exceedance_probability",
                                extremes::annual_exceedance_probability_of_period(l.return_period_yr)},
                               {"level", l.level_m},
                               {"lower", number_or_null(l.lower_m)},
                               {"upper", number_or_null(l.upper_m)},
                               {"method", extremes::interval_method_name(l.method)}};
      if (l.method == extremes::IntervalMethod::delta) {
        e["approximate"] = true;
        e["lower_below_shorter_period_level"] = delta_lower_below_shorter_level(r, i);
      }
      levels.push_back(e);
    }
  };
  add(r.profile);
  add(r.delta);
  if (r.bootstrap) add(r.bootstrap->levels);
  j["return_period_definition"] = extremes::return_period_definition;
  j["return_levels"] = levels;
  j["confidence"] = 0.95;
  nlohmann::ordered_json diag;
  diag["aic"] = r.aic;
  diag["anderson_darling"] = r.anderson_darling;
  if (r.deviance_test) {
    diag["deviance_gumbel_vs_gev"] = r.deviance_test->deviance;
    diag["deviance_p_value"] = r.deviance_test->p_value;
    diag["aic_gumbel"] = r.deviance_test->aic_gumbel;
    diag["aic_gev"] = r.deviance_test->aic_gev;
    diag["deviance_choice"] = std::string(extremes::family_name(r.deviance_test->chosen));
  }
  if (r.bootstrap) {
    diag["bootstrap_samples"] = r.bootstrap->samples_used;
    diag["bootstrap_failed_fits"] = r.bootstrap->failed_fits;
  }
  j["diagnostics"] = diag;
  nlohmann::ordered_json pts = nlohmann::ordered_json::array();
  for (const auto& p : r.plot_points) {
    pts.push_back({{"level", p.level_m},
                   {"plotting_position", p.plotting_position},
                   {"model_probability", p.model_probability},
                   {"model_level", p.model_level_m},
                   {"return_period", p.return_period_yr}});
  }
  j["plot_points"] = pts;
  j["present_day_model"] = still_water_model_json(r.present_day);
  j["warnings"] = r.warnings;
  j["cautions"] = report::safety_cautions();
  return j;
}

}  // namespace tidewright::study
