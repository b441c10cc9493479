// tidewright project: a scenario to local relative sea-level rise members and their summary.
#include <iostream>
#include <sstream>

#include "command.hpp"
#include "tidewright/study/option_names.hpp"
#include "plot_output.hpp"
#include "tidewright/climate/scenario.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/report/text_table.hpp"
#include "tidewright/study/projection_stage.hpp"
#include "tidewright/study/stage_files.hpp"

namespace tidewright::cli {
namespace {

struct ProjectArgs {
  std::string pathway, forcing, co2, warming, table;
  std::string co2_formula = "myhre1998";
  std::string label;
  int first_year = 2020, last_year = 2150;
  long long samples = 2000;
  std::string reference = "1995-2014";
  std::vector<std::string> fingerprints;
  double land_motion = 0.0, land_motion_sd = 0.0;
  bool list = false;
  bool accept_extreme = false;
  std::string storyline = "assessed";
  unsigned long long seed = default_seed;
  std::string json, csv, members, plot;
};

void print_result(const study::ProjectionStageResult& r, std::ostream& out) {
  const auto& t = r.local.total;
  std::ostringstream o;
  o << "tidewright project: scenario '" << t.scenario << "'" << (t.illustrative ? " (illustrative)" : "") << ", "
    << t.member_count() << " members, rise relative to " << t.reference << "\n";
  std::vector<std::string> head{"year", "5%", "17%", "median", "83%", "95%"};
  for (const auto& c : r.local.component_names) head.push_back(c + " (median)");
  report::TextTable table(head);
  const std::vector<double> ps{0.05, 0.17, 0.5, 0.83, 0.95};
  const std::vector<std::vector<double>> q = study::year_quantiles(t.rise_m, ps);
  std::vector<std::vector<double>> comp;
  for (const auto& m : r.local.contribution_m) comp.push_back(study::year_quantiles(m, 0.5));
  for (std::size_t y = 0; y < t.years.size(); ++y) {
    if (t.years[y] % 10 != 0 && y + 1 != t.years.size()) continue;
    std::vector<std::string> row{std::to_string(t.years[y])};
    for (const auto& col : q) row.push_back(report::fixed(col[y], 3));
    for (const auto& col : comp) row.push_back(report::fixed(col[y], 3));
    table.add_row(row);
  }
  o << "Local relative sea-level rise (m):\n" << table.render();
  for (const auto& c : r.cautions) o << "note: " << c << "\n";
  o << "Planning estimates; a licensed coastal engineer must review them against local codes and datums.\n";
  out << o.str();
}

void run(const ProjectArgs* a, const CommonOptions& common) {
  if (a->list) {
    report::TextTable t({"pathway", "forcing 2100 (W/m2)", "comparable assessed scenario", "what it is"});
    for (const auto& p : climate::builtin_pathways()) {
      t.add_row({p.name, report::fixed(p.forcing_2100_w_m2, 1), p.comparable_assessed, p.summary});
    }
    std::cout << "Built-in illustrative pathways (not official scenario data):\n" << t.render();
    return;
  }
  const std::vector<DataOutput> outputs{{a->json, "--json"}, {a->csv, "--csv"}};
  check_data_outputs(outputs, common.force);
  if (!a->members.empty()) check_output_path(a->members, common.force, "--members");
  if (!a->plot.empty()) check_plot_path(a->plot, common.force);
  study::ProjectionRequest r;
  r.label = a->label;
  if (!a->pathway.empty()) {
    r.source = study::ScenarioSource::pathway;
    r.pathway = a->pathway;
  } else if (!a->forcing.empty()) {
    r.source = study::ScenarioSource::forcing_csv;
    r.path = a->forcing;
  } else if (!a->co2.empty()) {
    r.source = study::ScenarioSource::co2_csv;
    r.path = a->co2;
  } else if (!a->warming.empty()) {
    r.source = study::ScenarioSource::temperature_csv;
    r.path = a->warming;
  } else {
    r.source = study::ScenarioSource::table;
    r.path = a->table;
  }
  r.co2_formula = a->co2_formula == "meinshausen2020" ? climate::Co2ForcingFormula::meinshausen2020
                                                      : climate::Co2ForcingFormula::myhre1998;
  r.first_year = a->first_year;
  r.last_year = a->last_year;
  r.members = a->samples;
  r.accept_extreme_inputs = a->accept_extreme;
  r.storyline = study::value_named(study::storyline_names(), a->storyline, "--storyline");
  r.seed = a->seed;
  r.reference = climate::parse_year_span(a->reference, "--reference");
  for (const auto& f : a->fingerprints) {
    const auto eq = f.find('=');
    const auto v = eq == std::string::npos ? std::nullopt : parse_finite_double(f.substr(eq + 1));
    if (!v) throw InputError("--fingerprint", "is '" + f + "'", "give component=factor, e.g. greenland=0.8");
    r.local.fingerprint[f.substr(0, eq)] = *v;
  }
  r.local.land_motion.uplift_mm_per_yr = a->land_motion;
  r.local.land_motion.uplift_sd_mm_per_yr = a->land_motion_sd;
  r.local_terms_given = !a->fingerprints.empty() || a->land_motion != 0.0 || a->land_motion_sd != 0.0;
  const auto result = study::run_projection_stage(r);
  if (!a->json.empty()) write_data_output(outputs[0], study::projection_json(result), common.force);
  if (!a->csv.empty()) write_data_output(outputs[1], study::projection_csv(result), common.force);
  if (!a->members.empty()) study::write_members_csv(a->members, result.local.total, common.force);
  if (!a->plot.empty()) {
    write_plot(report::projection_fan_chart(study::fan_chart_input(result, result.local.total)), a->plot, common.force);
  }
  if (!common.quiet) print_result(result, summary_stream(outputs));
}

void configure(CLI::App& app, CommonOptions& common) {
  auto a = std::make_shared<ProjectArgs>();
  std::string pathways;
  for (const auto& p : climate::builtin_pathways()) pathways += (pathways.empty() ? "" : ", ") + p.name;
  auto* g = app.add_option_group("scenario", "Where the future comes from (give exactly one)");
  g->add_option("--pathway", a->pathway, "A built-in illustrative pathway: " + pathways);
  g->add_option("--forcing", a->forcing, "CSV of year, forcing_w_m2 (effective radiative forcing)")->type_name("FILE");
  g->add_option("--co2", a->co2, "CSV of year, co2_ppm [, non_co2_forcing_w_m2]")->type_name("FILE");
  g->add_option("--warming", a->warming, "CSV of year, warming_k (global surface warming vs 1850-1900)")->type_name("FILE");
  g->add_option("--table", a->table, "CSV of published quantiles of local rise by year (docs/methods-local.md)")
      ->type_name("FILE");
  g->add_flag("--list-pathways", a->list, "List the built-in pathways and exit");
  g->require_option(1);
  app.add_option("--co2-formula", a->co2_formula, "CO2 forcing: myhre1998 or meinshausen2020")
      ->check(CLI::IsMember({"myhre1998", "meinshausen2020"}))
      ->default_str("myhre1998");
  app.add_option("--label", a->label, "Scenario label in every output");
  app.add_option("--first-year", a->first_year, "First projected year")->default_val(2020);
  app.add_option("--last-year", a->last_year, "Last projected year")->default_val(2150);
  app.add_option("--storyline", a->storyline,
                 "Ice sheets: assessed (the likely-range calibration) or high-end-ice (a low-likelihood, high-impact "
                 "variant for testing a design)")
      ->check(CLI::IsMember(study::names_of(study::storyline_names())))
      ->default_str("assessed");
  app.add_option("--samples", a->samples, "Monte Carlo members (at most 200,000)")->default_val(2000);
  app.add_flag("--accept-extreme", a->accept_extreme,
               "Run a forcing, warming or land motion outside the physical ranges on purpose "
               "(a stress test)");
  app.add_option("--reference", a->reference, "Rise measured from this year or period (AR6 baseline 1995-2014)")
      ->default_str("1995-2014");
  app.add_option("--fingerprint", a->fingerprints,
                 "Local factor of a component, e.g. greenland=0.8 (repeatable; default 1)")
      ->delimiter(',');
  app.add_option("--land-motion", a->land_motion, "Vertical land motion, mm/yr, positive = uplift");
  app.add_option("--land-motion-sd", a->land_motion_sd, "Its standard deviation, mm/yr")->check(CLI::NonNegativeNumber);
  add_seed_option(app, a->seed);
  add_json_option(app, a->json);
  add_csv_option(app, a->csv);
  app.add_option("--members", a->members, "Write every member's path (CSV, docs/file-formats.md)")->type_name("FILE");
  app.add_option("--plot", a->plot, "Write a fan chart of the total with the components (.svg or .png)")
      ->type_name("FILE");
  add_force_flag(app, common);
  add_quiet_flag(app, common);

  app.callback([a, &common] { run(a.get(), common); });
}

const bool registered = register_command(
    {"project", "Project local relative sea-level rise from a scenario or a published table", 20, configure});

}  // namespace
}  // namespace tidewright::cli
