// tidewright allowance: how much to raise an asset so that it is exceeded no more often than
// today (Hunter 2012), and the design-life risk of given heights.
#include <array>
#include <cmath>
#include <iostream>
#include <sstream>

#include "command.hpp"
#include "planning_options.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/report/text_table.hpp"
#include "tidewright/study/planning_answers.hpp"

namespace tidewright::cli {
namespace {

struct AllowanceArgs {
  PlanningArgs planning;
  std::vector<int> years{2050, 2100};
  std::vector<double> periods{10, 100};
  std::string design_life;
  std::vector<double> heights;
  std::optional<double> target_risk;
  int draws = 0;
  unsigned long long seed = default_seed;
  std::string json, csv;
};

// allowance --csv: one table for every kind of row (a year's allowance, a design-life
// allowance, a design-life risk, the target height), the same columns for all, a cell empty
// where a row has no such number (docs/file-formats.md).
constexpr const char* csv_header =
    "kind,year,first_year,last_year,return_period_yr,present_level_m,allowance_m,allowance_se_m,effective_members,"
    "heaviest_member_share,design_level_m,mean_rise_m,sd_rise_m,allowance_rise_cut_p99_9_m,allowance_rise_cut_p99_m,"
    "members_beyond_model_range_fraction,height_m,probability,probability_se,expected_years_with_exceedance,method\n";
enum CsvColumn : std::size_t {
  kind, year, first_year, last_year, return_period, present_level, allowance_m, allowance_se, effective, heaviest,
  design_level, mean_rise, sd_rise, cut_999, cut_99, beyond, height, probability, probability_se, expected_years,
  method, column_count
};
using CsvCells = std::array<std::string, column_count>;

std::string csv_line(const CsvCells& cells) {
  std::string line;
  for (std::size_t i = 0; i < cells.size(); ++i) line += (i == 0 ? "" : ",") + cells[i];
  return line + "\n";
}

std::string number(double v, int decimals = 4) { return std::isfinite(v) ? report::fixed(v, decimals) : std::string(); }

// The cells an allowance fills, for a year's row and a design life's.
void put_allowance(CsvCells& c, const planning::Allowance& al) {
  const auto& mc = al.monte_carlo;
  c[return_period] = number(al.return_period_yr, 6);
  c[present_level] = number(al.present_level_m);
  c[allowance_m] = number(al.allowance_m);
  if (mc.sampled) {
    c[allowance_se] = number(mc.standard_error);
    c[effective] = number(mc.effective_sample_size, 1);
    c[heaviest] = number(mc.heaviest_share);
  }
  c[design_level] = number(al.present_level_m + al.allowance_m);
  c[mean_rise] = number(al.mean_rise_m);
  c[sd_rise] = number(al.sd_rise_m);
  c[beyond] = number(al.beyond_range_fraction, 6);
  c[method] = al.method;
}

// The design-life allowances, risks and target height: printed, as CSV rows and as JSON.
nlohmann::ordered_json design_life_output(const AllowanceArgs* a, const study::PlanningInputs& in, std::ostream& o,
                                          std::ostream& csv) {
  const auto [first, last] = parse_year_span(a->design_life, "--design-life");
  // A CSV row of one design-life kind, its span filled in.
  const auto life_row = [first = first, last = last](const char* row_kind) {
    CsvCells cells;
    cells[kind] = row_kind;
    cells[first_year] = std::to_string(first);
    cells[last_year] = std::to_string(last);
    return cells;
  };
  const auto life = study::design_life_answers(in, first, last, a->periods, a->heights, a->target_risk);
  o << "\nDesign life " << first << "-" << last << ":\n";
  report::TextTable d({"return period (yr)", "today's level (m)", "design-life allowance (m)"});
  for (const auto& al : life.allowances) {
    d.add_row({report::fixed(al.return_period_yr, 0), report::fixed(al.present_level_m, 3),
               report::fixed(al.allowance_m, 3)});
    CsvCells cells = life_row("design_life_allowance");
    put_allowance(cells, al);
    csv << csv_line(cells);
  }
  o << d.render();
  if (!life.risks.empty()) {
    report::TextTable rt({"height (m)", "P(at least one exceedance)", "Monte Carlo error",
                          study::expected_count_heading(in.fit.model), "member-years beyond the model (%)"});
    for (const auto& r : life.risks) {
      rt.add_row({report::fixed(r.level_m, 3), report::probability_text(r.probability, r.rounds_to_one),
                  r.monte_carlo.sampled ? report::fixed(r.monte_carlo.standard_error, 4) : "-",
                  report::fixed(study::expected_count(in.fit.model, r), 3),
                  report::fixed(100.0 * r.beyond_range_fraction, 2)});
      CsvCells cells = life_row("design_life_risk");
      cells[height] = number(r.level_m);
      cells[probability] = number(r.probability, 8);
      if (r.monte_carlo.sampled) cells[probability_se] = number(r.monte_carlo.standard_error, 8);
      cells[expected_years] = number(r.expected_years_with_exceedance, 6);
      cells[beyond] = number(r.beyond_range_fraction, 6);
      csv << csv_line(cells);
    }
    o << rt.render();
  }
  if (life.target) {
    const auto& h = *life.target;
    o << "Height with a " << report::fixed(h.target_probability * 100, 1) << "% chance of at least one exceedance in "
      << first << "-" << last << ": " << report::fixed(h.level_m, 3) << " m\n";
    CsvCells cells = life_row("design_life_target");
    cells[height] = number(h.level_m);
    cells[probability] = number(h.target_probability, 8);
    csv << csv_line(cells);
  }
  return study::design_life_json(life);
}

void run(const AllowanceArgs* a, const CommonOptions& common) {
  const std::vector<DataOutput> outputs{{a->json, "--json"}, {a->csv, "--csv"}};
  check_data_outputs(outputs, common.force);
  if ((!a->heights.empty() || a->target_risk) && a->design_life.empty()) {
    throw InputError("--heights/--target-risk", "need a design life", "add --design-life FIRST-LAST");
  }
  const auto in = load_planning_inputs(a->planning);
  const auto rows = study::allowance_table(in, a->years, a->periods, a->draws, a->seed);
  auto j = study::allowance_json(in, rows);
  std::ostringstream o;
  const std::string datum = in.fit.datum.empty() ? "datum" : in.fit.datum;
  o << "tidewright allowance: scenario '" << in.rise.scenario << "'" << (in.rise.illustrative ? " (illustrative)" : "")
    << ", " << in.rise.member_count() << " members; levels in m above " << datum << "\n";
  std::vector<std::string> head{"year", "return period (yr)", "today's level (m)", "allowance (m)",
                                "Monte Carlo error (m)", "design level (m)", "mean rise (m)", "sd rise (m)"};
  if (a->draws > 0) head.emplace_back("allowance 5-95% over parameters (m)");
  report::TextTable t(head);
  std::ostringstream csv;
  csv << csv_header;
  for (const auto& r : rows) {
    const auto& al = r.allowance;
    const auto& mc = al.monte_carlo;
    std::vector<std::string> row{std::to_string(al.first_year), report::fixed(al.return_period_yr, 0),
                                 report::fixed(al.present_level_m, 3), report::fixed(al.allowance_m, 3),
                                 mc.sampled ? report::fixed(mc.standard_error, 3) : "-",
                                 report::fixed(al.present_level_m + al.allowance_m, 3),
                                 report::fixed(al.mean_rise_m, 3), report::fixed(al.sd_rise_m, 3)};
    if (r.range) row.push_back(report::fixed(r.range->lower, 3) + " to " + report::fixed(r.range->upper, 3));
    t.add_row(row);
    CsvCells cells;
    cells[kind] = "allowance";
    cells[year] = std::to_string(al.first_year);
    put_allowance(cells, al);
    cells[cut_999] = number(r.cut_at_p999_m);
    cells[cut_99] = number(r.cut_at_p99_m);
    csv << csv_line(cells);
  }
  o << t.render();
  o << "\nHow much is the top of the rise distribution (allowance with the rise cut at a percentile):\n";
  report::TextTable tail({"year", "return period (yr)", "allowance (m)", "cut at 99.9% (m)", "cut at 99% (m)"});
  for (const auto& r : rows) {
    tail.add_row({std::to_string(r.allowance.first_year), report::fixed(r.allowance.return_period_yr, 0),
                  report::fixed(r.allowance.allowance_m, 3), report::fixed(r.cut_at_p999_m, 3),
                  report::fixed(r.cut_at_p99_m, 3)});
  }
  o << tail.render();
  if (!a->design_life.empty()) j["design_life"] = design_life_output(a, in, o, csv);
  for (const auto& n : in.notes) o << "note: " << n << "\n";
  for (const auto& w : j["warnings"]) std::cerr << "tidewright: warning: " << w.get<std::string>() << "\n";
  o << "Planning estimates of still water only; a licensed coastal engineer must review them against local codes "
       "and datums.\n";
  write_data_output(outputs[0], j, common.force);
  write_data_output(outputs[1], csv.str(), common.force);
  if (!common.quiet) summary_stream(outputs) << o.str();
}

void configure(CLI::App& app, CommonOptions& common) {
  auto a = std::make_shared<AllowanceArgs>();
  add_planning_options(app, a->planning);
  app.add_option("--years", a->years, "Design years")->delimiter(',')->default_str("2050,2100");
  app.add_option("--return-periods", a->periods, "Return periods of today's levels, years")
      ->delimiter(',')
      ->default_str("10,100");
  app.add_option("--design-life", a->design_life, "Span of years, e.g. 2030-2100: design-life allowance and risk");
  app.add_option("--heights", a->heights, "Design-life risk of these heights (m above the datum)")->delimiter(',');
  app.add_option("--target-risk", a->target_risk, "Height whose design-life exceedance probability is this")
      ->check(CLI::Range(1e-9, 1.0 - 1e-9));
  app.add_option("--parameter-draws", a->draws,
                 "Draws from the fit's covariance for a range over parameter uncertainty (0: none)")
      ->check(CLI::Range(0, 100000));
  add_seed_option(app, a->seed);
  add_json_option(app, a->json);
  add_csv_option(app, a->csv);
  add_force_flag(app, common);
  add_quiet_flag(app, common);

  app.callback([a, &common] { run(a.get(), common); });
}

const bool registered = register_command(
    {"allowance", "Sea-level allowances (Hunter 2012) and design-life exceedance risk", 30, configure});

}  // namespace
}  // namespace tidewright::cli
