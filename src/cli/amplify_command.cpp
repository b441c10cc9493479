// tidewright amplify: how much more often today's levels will be exceeded, their future
// return periods, and the year in which they are reached once a year (or at a given rate).
#include <iostream>
#include <sstream>

#include "command.hpp"
#include "plot_output.hpp"
#include "tidewright/report/plots.hpp"
#include "planning_options.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/report/cautions.hpp"
#include "tidewright/report/text_table.hpp"
#include "tidewright/study/planning_answers.hpp"

namespace tidewright::cli {
namespace {

struct AmplifyArgs {
  PlanningArgs planning;
  std::vector<int> years{2050, 2100};
  std::vector<double> periods;
  std::vector<double> levels;
  double frequency = 1.0;
  std::string json, csv, plot;
};

void run(const AmplifyArgs* a, const CommonOptions& common) {
  const std::vector<DataOutput> outputs{{a->json, "--json"}, {a->csv, "--csv"}};
  check_data_outputs(outputs, common.force);
  if (!a->plot.empty()) check_plot_path(a->plot, common.force);
  std::vector<double> periods = a->periods;
  if (periods.empty() && a->levels.empty()) periods = {10.0, 100.0};
  for (double t : periods) {
    if (!(t > 1.0)) {
      throw InputError("--return-periods", "holds " + report::fixed(t, 3) + ", a return period of 1 year or less",
                       "give return periods above 1 year");
    }
  }
  const auto in = load_planning_inputs(a->planning);
  struct Target {
    double level_m;
    double period_yr;  // 0 when given as a level
  };
  std::vector<Target> targets;
  for (double t : periods) targets.push_back({planning::present_return_level(in.fit.model, t), t});
  for (double z : a->levels) targets.push_back({z, 0.0});

  nlohmann::ordered_json j = study::planning_context_json(in);
  nlohmann::ordered_json rows = nlohmann::ordered_json::array();
  std::ostringstream csv;
  // Numeric columns hold numbers only: a bound goes to its own column, an empty cell where
  // there is no number (docs/file-formats.md).
  csv << "year,level_m";
  for (const auto& name : study::amplification_csv_columns()) csv << ',' << name;
  csv << '\n';
  const std::string datum = in.fit.datum.empty() ? "datum" : in.fit.datum;
  report::TextTable t({"year", "level (m, " + datum + ")", "today's return period (yr)",
                       "future return period (yr)", "amplification factor", "members beyond the model (%)"});
  std::vector<double> levels;
  for (const auto& target : targets) levels.push_back(target.level_m);
  bool any_beyond = false;
  for (const auto& row : study::amplification_rows(in, a->years, levels)) {
    const auto& am = row.result;
    const auto text = study::amplification_text(am);
    any_beyond = any_beyond || am.beyond_annual_maxima_range;
    t.add_row({std::to_string(row.year), report::fixed(row.level_m, 3),
               study::return_period_text(am.present_return_period_yr), text.future_return_period, text.factor,
               report::fixed(100.0 * am.beyond_range_fraction, 1)});
    rows.push_back(study::amplification_json(am));
    csv << row.year << ',' << report::fixed(row.level_m, 4);
    for (const auto& cell : study::amplification_csv_cells(am)) csv << ',' << cell;
    csv << '\n';
  }
  j["rows"] = rows;
  nlohmann::ordered_json em = nlohmann::ordered_json::array();
  report::TextTable e({"level (m)", "today's return period (yr)", "first year exceeded " +
                                                                        report::fixed(a->frequency, 2) + " times a year"});
  for (const auto& r : study::emergence_rows(in, levels, a->frequency)) {
    e.add_row({report::fixed(r.emergence.level_m, 3), study::return_period_text(r.present_return_period_yr),
               r.emergence.year ? std::to_string(*r.emergence.year) : "not by " + std::to_string(in.rise.years.back())});
    em.push_back(study::emergence_json(r));
  }
  j["emergence"] = em;
  j["cautions"] = report::safety_cautions();
  std::ostringstream o;
  o << "tidewright amplify: scenario '" << in.rise.scenario << "'" << (in.rise.illustrative ? " (illustrative)" : "")
    << ", " << in.rise.member_count() << " members\n"
    << t.render()
    << (any_beyond ? "'< 1' and '> x': the level would be passed more than once a year, beyond what a model of "
                     "annual maxima can count; fit peaks over a threshold (--model gpd) where frequent levels "
                     "matter.\n"
                   : "")
    << "\nEmergence:\n"
    << e.render();
  for (const auto& n : in.notes) o << "note: " << n << "\n";
  o << "Planning estimates of still water only; a licensed coastal engineer must review them against local codes "
       "and datums.\n";
  write_data_output(outputs[0], j, common.force);
  write_data_output(outputs[1], csv.str(), common.force);
  if (!a->plot.empty()) {
    std::vector<int> years;
    for (int y = in.rise.years.front(); y <= in.rise.years.back(); ++y) years.push_back(y);
    std::vector<report::NamedSeries> series;
    for (const auto& target : targets) {
      series.push_back({target.period_yr > 0 ? "today's " + report::fixed(target.period_yr, 0) + "-year level"
                                             : report::fixed(target.level_m, 2) + " m",
                        study::factor_path(in, years, target.level_m)});
    }
    write_plot(report::amplification_plot(std::vector<double>(years.begin(), years.end()), series), a->plot, common.force);
  }
  if (!common.quiet) summary_stream(outputs) << o.str();
}

void configure(CLI::App& app, CommonOptions& common) {
  auto a = std::make_shared<AmplifyArgs>();
  add_planning_options(app, a->planning);
  app.add_option("--years", a->years, "Years")->delimiter(',')->default_str("2050,2100");
  app.add_option("--return-periods", a->periods, "Today's T-year levels to follow, years")->delimiter(',');
  app.add_option("--levels", a->levels, "Levels to follow, m above the datum")->delimiter(',');
  app.add_option("--frequency", a->frequency, "Emergence: the year a level is exceeded this often per year")
      ->default_val(1.0)
      ->check(CLI::PositiveNumber);
  add_json_option(app, a->json);
  add_csv_option(app, a->csv);
  app.add_option("--plot", a->plot, "Write the amplification factor of each level against year (.svg or .png)")
      ->type_name("FILE");
  add_force_flag(app, common);
  add_quiet_flag(app, common);

  app.callback([a, &common] { run(a.get(), common); });
}

const bool registered = register_command(
    {"amplify", "Amplification factors, future return periods and emergence years of today's levels", 40, configure});

}  // namespace
}  // namespace tidewright::cli
