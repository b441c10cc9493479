// tidewright fit: a tide-gauge record in, a fitted extreme still-water model out.
#include <iostream>
#include <sstream>

#include "command.hpp"
#include "tidewright/study/option_names.hpp"
#include "plot_output.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/record/mean_sea_level_trend.hpp"
#include "tidewright/report/text_table.hpp"
#include "tidewright/study/fit_stage.hpp"

namespace tidewright::cli {
namespace {

struct FitArgs {
  std::string input;
  std::string kind = "detect";
  std::string model = "gev";
  std::string time_column = "time", year_column = "year", level_column = "level";
  std::vector<std::string> r_columns;
  std::string units = "m";
  std::string datum = "unstated datum";
  std::vector<std::string> missing;
  std::vector<double> sentinels;
  double min_completeness = record::default_min_completeness;
  int year_start_month = 1;
  std::string detrend = "none";
  bool accept_implausible = false;
  std::optional<double> epoch;
  std::optional<double> threshold_m;
  std::optional<double> threshold_quantile;
  double separation_h = record::default_separation_h;
  std::size_t r = 0;
  std::vector<double> periods = extremes::standard_return_periods_yr;
  std::size_t bootstrap = 0;
  unsigned long long seed = default_seed;
  std::string json, plot;
};

std::string interval_text(const extremes::ReturnLevel& l) {
  if (std::isnan(l.lower_m) || std::isnan(l.upper_m)) return "not available";
  const auto end = [](double v) { return std::isfinite(v) ? report::fixed(v, 3) : std::string("unbounded"); };
  return "[" + end(l.lower_m) + ", " + end(l.upper_m) + "]";
}

void print_result(const study::FitStageResult& r, const FitArgs& a, std::ostream& out) {
  std::ostringstream o;
  o << "tidewright fit: " << r.source << "\n";
  std::istringstream summary(r.data_summary);
  for (std::string line; std::getline(summary, line);) o << "  " << line << "\n";
  o << "\nModel: " << r.model << " (maximum likelihood, " << r.fit.n << " values, log-likelihood "
    << report::fixed(r.fit.log_likelihood, 3) << ", AIC " << report::fixed(r.aic, 2) << ")\n";
  report::TextTable params({"parameter", "estimate", "standard error"});
  for (std::size_t i = 0; i < r.fit.parameter_names.size(); ++i) {
    const auto k = static_cast<Eigen::Index>(i);
    params.add_row({r.fit.parameter_names[i], report::fixed(r.fit.estimate(k), 4),
                    report::fixed(r.fit.standard_error(k), 4)});
  }
  if (r.model == "gpd") {
    params.add_row({"threshold (m)", report::fixed(r.fit.threshold_m, 3), "fixed"});
    params.add_row({"events per year", report::fixed(r.fit.rate_per_yr, 3),
                    report::fixed(r.fit.rate_standard_error_per_yr, 3)});
  }
  o << params.render();
  if (r.deviance_test) {
    o << "Gumbel against GEV: deviance " << report::fixed(r.deviance_test->deviance, 3) << ", p = "
      << report::fixed(r.deviance_test->p_value, 3) << " (the test prefers "
      << extremes::family_name(r.deviance_test->chosen) << " at 5%)\n";
  }
  o << "Anderson-Darling A2 = " << report::fixed(r.anderson_darling, 3) << "\n\n";
  o << "Return levels (m above " << r.datum << ") with 95% intervals; " << extremes::return_period_definition
    << ":\n";
  std::vector<std::string> head{"return period (yr)", "AEP (%)", "level (m)", "95% interval (profile likelihood)",
                                "delta method (approximate)"};
  if (r.bootstrap) head.emplace_back("bootstrap");
  report::TextTable levels(head);
  bool clipped = false;
  for (std::size_t i = 0; i < r.profile.size(); ++i) {
    const double t = r.profile[i].return_period_yr;
    std::string delta = interval_text(r.delta[i]);
    if (study::delta_lower_below_shorter_level(r, i)) {
      delta = "[*, " + report::fixed(r.delta[i].upper_m, 3) + "]";
      clipped = true;
    }
    std::vector<std::string> row{report::fixed(t, 0), report::fixed(100.0 * extremes::annual_exceedance_probability_of_period(t), 3),
                                 report::fixed(r.profile[i].level_m, 3), interval_text(r.profile[i]), delta};
    if (r.bootstrap) row.push_back(interval_text(r.bootstrap->levels[i]));
    levels.add_row(row);
  }
  o << levels.render();
  if (clipped) {
    o << "* the delta method's lower bound falls below a shorter return period's level: not shown (use the profile "
         "interval)\n";
  }
  if (r.reference_epoch) {
    o << "Levels are relative to mean sea level at epoch " << report::fixed(*r.reference_epoch, 2)
      << " (trend removed: " << report::fixed(r.trend_mm_per_yr, 2) << " mm/yr).\n";
  }
  for (const auto& w : r.warnings) o << "warning: " << w << "\n";
  o << "Planning estimates of still water only; a licensed coastal engineer must review them "
       "against local codes and datums (tidewright --help lists the cautions).\n";
  if (!a.json.empty() && a.json != stdout_name) o << "Wrote " << a.json << "\n";
  if (!a.plot.empty()) o << "Wrote " << a.plot << "\n";
  out << o.str();
}

void configure(CLI::App& app, CommonOptions& common) {
  auto args = std::make_shared<FitArgs>();
  app.add_option("INPUT", args->input, "Tide-gauge CSV: a water-level series or annual maxima")->required();
  app.add_option("--kind", args->kind, "What the file holds: detect (by its columns), series, annual-maxima")
      ->check(CLI::IsMember(study::names_of(study::record_kind_names())))
      ->default_str("detect");
  app.add_option("--model", args->model, "gumbel, gev, gpd (peaks over threshold), rlargest, or auto (deviance test)")
      ->check(CLI::IsMember({"gumbel", "gev", "gpd", "rlargest", "auto"}))
      ->default_str("gev");
  app.add_option("--time-column", args->time_column, "Column of ISO 8601 timestamps (series)")->default_str("time");
  app.add_option("--year-column", args->year_column, "Column of years (annual maxima)")->default_str("year");
  app.add_option("--level-column", args->level_column, "Column of levels")->default_str("level");
  app.add_option("--r-columns", args->r_columns, "Columns of the 2nd, 3rd, ... largest values of each year")
      ->delimiter(',');
  app.add_option("--units", args->units, "Unit of the levels in the file: m, cm, mm, ft")->default_str("m");
  app.add_option("--datum", args->datum, "Label of the water-level datum, carried into every output");
  app.add_option("--missing", args->missing, "Further cells meaning 'no value' (besides empty, NA, NaN)")
      ->delimiter(',');
  app.add_option("--sentinel", args->sentinels, "Numeric no-data values such as -99 (repeatable)")->delimiter(',');
  app.add_option("--min-completeness", args->min_completeness,
                 "Series: least fraction of a year's samples for its maximum to count (Slangen et al. 2017)")
      ->check(CLI::Range(0.0, 1.0))
      ->default_val(record::default_min_completeness);
  app.add_option("--year-start-month", args->year_start_month, "Series: month in which a year starts (1-12)")
      ->check(CLI::Range(1, 12))
      ->default_val(1);
  app.add_flag("--accept-implausible-levels", args->accept_implausible,
               "Read levels over 20 m from the record's median, or a column named in another unit, on purpose");
  app.add_option("--detrend", args->detrend, "Series: remove the mean-sea-level trend: none, annual-mean, linear")
      ->check(CLI::IsMember(study::names_of(study::detrend_names())))
      ->default_str("none");
  app.add_option("--epoch", args->epoch, "Series: decimal year the detrended levels refer to (default: record middle)");
  auto* thr = app.add_option("--threshold", args->threshold_m, "GPD: threshold level in metres");
  app.add_option("--threshold-quantile", args->threshold_quantile,
                 "GPD: threshold as a quantile of the levels (default 0.997, IPCC AR6)")
      ->excludes(thr);
  app.add_option("--separation-hours", args->separation_h,
                 "GPD: least time between independent events (72 h: common practice)")
      ->default_val(record::default_separation_h);
  app.add_option("--r", args->r, "r-largest: values per year to use (default: all given)");
  app.add_option("--return-periods", args->periods, "Return periods in years")->delimiter(',')
      ->default_str("2,5,10,20,50,100,200,500,1000");
  app.add_option("--bootstrap", args->bootstrap, "Parametric bootstrap samples for a third interval (0: none)");
  add_seed_option(app, args->seed);
  add_json_option(app, args->json);
  app.add_option("--plot", args->plot, "Write a return-level plot (.svg or .png)")->type_name("FILE");
  add_force_flag(app, common);
  add_quiet_flag(app, common);

  app.callback([args, &common] {
    const FitArgs& a = *args;
    const std::vector<DataOutput> outputs{{a.json, "--json"}};
    check_data_outputs(outputs, common.force);
    if (!a.plot.empty()) check_plot_path(a.plot, common.force);
    study::FitRequest req;
    req.input = a.input;
    req.kind = study::value_named(study::record_kind_names(), a.kind, "--kind");
    req.model = a.model;
    req.read.time_column = a.time_column;
    req.read.year_column = a.year_column;
    req.read.level_column = a.level_column;
    req.read.r_largest_columns = a.r_columns;
    req.read.unit = a.units;
    req.read.datum = a.datum;
    for (const auto& m : a.missing) req.read.missing.markers.push_back(m);
    req.read.missing.sentinels = a.sentinels;
    req.read.accept_implausible_levels = a.accept_implausible;
    req.series.min_completeness = a.min_completeness;
    req.series.year_start_month = a.year_start_month;
    req.series.detrend = study::value_named(study::detrend_names(), a.detrend, "--detrend");
    req.series.epoch_yr = a.epoch;
    req.detrend_given = a.detrend != "none";
    req.series.threshold_m = a.threshold_m;
    req.series.threshold_quantile = a.threshold_quantile;
    req.series.separation_h = a.separation_h;
    req.r_largest = a.r;
    req.return_periods_yr = a.periods;
    req.bootstrap_samples = a.bootstrap;
    req.seed = a.seed;
    const auto result = study::run_fit_stage(req);
    if (!a.json.empty()) write_data_output(outputs[0], study::fit_result_json(result), common.force);
    if (!a.plot.empty()) write_plot(report::return_level_plot(study::return_level_plot_input(result)), a.plot, common.force);
    if (!common.quiet) print_result(result, a, summary_stream(outputs));
  });
}

const bool registered = register_command(
    {"fit", "Fit an extreme still-water model (Gumbel, GEV, GPD, r-largest) to a tide-gauge record", 10, configure});

}  // namespace
}  // namespace tidewright::cli
