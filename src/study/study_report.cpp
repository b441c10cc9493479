// The study's results in words: results.json, the report's tables, figures and notes, and the
// terminal's headline, all read from StudyResults (the stages computed every number).
#include <algorithm>
#include <cctype>
#include <cmath>
#include <sstream>

#include "tidewright/common/error.hpp"
#include "tidewright/report/cautions.hpp"
#include "tidewright/report/plots.hpp"
#include "tidewright/report/text_table.hpp"
#include "tidewright/study/option_names.hpp"
#include "tidewright/study/study_results.hpp"
#include "tidewright/version.hpp"

namespace tidewright::study {
namespace {

using report::fixed;
using Json = nlohmann::ordered_json;

std::string sentence_case(std::string s) {
  if (!s.empty()) s[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(s[0])));
  return s;
}

// A metre figure for a CSV: 4 decimals, empty where there is no number.
std::string csv_m(double v) { return std::isfinite(v) ? fixed(v, 4) : std::string(); }

template <typename T>
std::string joined(const std::vector<T>& values, int decimals) {
  std::string out;
  for (const auto& v : values) out += (out.empty() ? "" : ", ") + fixed(static_cast<double>(v), decimals);
  return out;
}

std::string level_unit(const SiteConfig& c) { return "m above " + c.site.datum; }

// The answer at a glance for one scenario: return periods down, today and the design years
// across, each design height with the allowance's Monte Carlo standard error.
report::Table design_height_matrix(const ScenarioRun& run, const PlanningSettings& p, const std::string& datum) {
  const std::string scenario = display_name(run.settings);
  report::Table t{"design_height_matrix_" + scenario_file_stem(run.settings.name),
                  "Design heights, scenario " + scenario + ", in m above " + datum +
                      ": today's T-year still-water level, and in each design year the level with the same expected "
                      "number of exceedances (Hunter 2012), \u00b1 its Monte Carlo standard error.",
                  {{"Return period", "years"}, {"Today", "m"}},
                  {}};
  t.csv_columns = {"return_period_yr", "today_m"};
  for (int y : p.design_years) {
    t.columns.push_back({std::to_string(y), "m"});
    t.csv_columns.push_back("design_height_" + std::to_string(y) + "_m");
    t.csv_columns.push_back("monte_carlo_error_" + std::to_string(y) + "_m");
  }
  for (double period : p.return_periods_yr) {
    std::vector<std::string> cells{fixed(period, 0)};
    std::vector<std::string> csv{fixed(period, 0)};
    for (int y : p.design_years) {
      const auto row = std::find_if(run.allowances.begin(), run.allowances.end(), [&](const AllowanceRow& r) {
        return r.allowance.first_year == y && r.allowance.return_period_yr == period;
      });
      if (row == run.allowances.end()) {
        throw ComputationError("design-height table", "a design year's allowance is missing", "report this as a bug");
      }
      const auto& a = row->allowance;
      if (cells.size() == 1) {
        cells.push_back(fixed(a.present_level_m, 2));
        csv.push_back(csv_m(a.present_level_m));
      }
      const double height = a.present_level_m + a.allowance_m;
      const double se = a.monte_carlo.sampled ? a.monte_carlo.standard_error : 0.0;
      cells.push_back(fixed(height, 2) + (a.monte_carlo.sampled ? " \u00b1 " + fixed(se, 3) : std::string()));
      csv.push_back(csv_m(height));
      csv.push_back(a.monte_carlo.sampled ? csv_m(se) : std::string());
    }
    t.add_row(std::move(cells));
    t.add_csv_row(std::move(csv));
  }
  return t;
}

// Everything that shaped the numbers, as the report's inputs table lists it: files relative to
// the site file, and the settings a reader would otherwise have to look up in it.
std::vector<report::InputItem> report_inputs(const SiteConfig& c, const std::optional<terrain::DefenceBurn>& defences) {
  const auto name = [&](const std::filesystem::path& p) { return path_as_written(p, c); };
  const auto& p = c.planning;
  const std::string& datum = c.site.datum;
  std::vector<report::InputItem> in{
      {"Site file", c.file.filename().string()},
      {"Record", name(c.fit.input) + " (" + name_of(record_kind_names(), c.fit.kind) + ", units " + c.fit.read.unit + ")"},
      {"Water-level datum", datum},
      {"Extreme model", c.fit.model},
      {"Projection", std::to_string(c.projection.members) + " members, " + std::to_string(c.projection.start_year) +
                         "-" + std::to_string(c.projection.end_year) + ", reference " + c.projection.reference},
      {"Seed", std::to_string(c.seed)}};
  for (const auto& s : c.scenarios) {
    in.push_back({"Scenario " + display_name(s),
                  s.source == ScenarioSource::pathway ? "built-in pathway " + s.pathway
                                                      : name_of(scenario_source_names(), s.source) + " " + name(*s.path)});
  }
  in.push_back({"Design years", joined(p.design_years, 0)});
  in.push_back({"Return periods", joined(p.return_periods_yr, 0) + " years (" + extremes::return_period_definition + ")"});
  in.push_back({"Design life", std::to_string(p.design_life_start) + "-" + std::to_string(p.design_life_end) +
                                   ", target probability of at least one exceedance " + fixed(p.target_risk, 3)});
  in.push_back({"Heights of interest", p.levels_of_interest_m.empty() ? std::string("none")
                                                                      : joined(p.levels_of_interest_m, 2) + " m above " + datum});
  in.push_back({"Epoch offset", p.epoch_offset_m ? fixed(*p.epoch_offset_m, 3) +
                                                       " m, the stated rise from the record's epoch to the projection's reference"
                                                 : std::string("none stated")});
  in.push_back({"Storminess change", fixed(p.storminess_scale_per_yr, 4) + " of the extreme scale per year"});
  std::string prints;
  for (const auto& [component, factor] : c.local.fingerprints) {
    prints += (prints.empty() ? "" : ", ") + component + " " + fixed(factor, 3);
  }
  in.push_back({"Fingerprint factors", prints.empty() ? std::string("none given (1 for every component)")
                                                       : prints + "; 1 for components not listed"});
  in.push_back({"Vertical land motion", fixed(c.local.land_motion_mm_per_yr, 2) + " ± " +
                                            fixed(c.local.land_motion_sd_mm_per_yr, 2) + " mm/yr (positive = uplift)"});
  if (c.local.ocean_dynamic_offset_m != 0.0 || c.local.ocean_dynamic_sd_m != 0.0) {
    in.push_back({"Ocean dynamic offset", fixed(c.local.ocean_dynamic_offset_m, 3) + " ± " +
                                              fixed(c.local.ocean_dynamic_sd_m, 3) + " m in " +
                                              std::to_string(c.local.ocean_dynamic_year) + ", a ramp from the start"});
  }
  if (!c.map.enabled) return in;
  in.push_back({"DEM", name(c.map.dem) + "; " + (c.map.same_datum ? std::string("same vertical datum as the water levels")
                                                                   : "water level = DEM elevation + " +
                                                                         fixed(c.map.dem_offset_m.value_or(0.0), 3) + " m")});
  if (c.map.sea) in.push_back({"Sea", name(*c.map.sea)});
  if (c.map.defences) {
    std::string d = name(*c.map.defences) + ", crest attribute '" + c.map.crest_attribute + "'";
    if (defences) {
      d += ": " + std::to_string(defences->features) + " features, crests " + joined(defences->crests_m, 2) + " m above " +
           datum + ", " + std::to_string(defences->cells_raised) + " DEM cells raised";
    }
    in.push_back({"Defences", d});
  }
  in.push_back({"Mapped", "today's and the future " + joined(c.map.return_periods_yr, 0) + "-year levels in " +
                              joined(c.map.years, 0) + "; first year with an AEP of " + fixed(100.0 * c.map.aep_passing, 2) +
                              " % (scenario " + display_name(first_year_scenario(c)) + ")"});
  return in;
}

report::Table allowance_detail_table(const StudyResults& r, const SiteConfig& c) {
  const std::string unit = level_unit(c);
  report::Table heights{"design_heights",
                        "Still-water design heights: today's T-year level plus the allowance that keeps the expected "
                        "number of exceedances per year at today's (Hunter 2012), per scenario and year. Monte Carlo "
                        "error: the allowance's standard error over the ensemble's members; effective members: how "
                        "many members it rests on (Kish); the last column is the allowance with the year's rise cut "
                        "at its 99th percentile, to show how much of it comes from the top 1 % of the rise.",
                        {{"Scenario", ""}, {"Year", ""}, {"Return period", "years"}, {"Today's level", unit},
                         {"Allowance", "m"}, {"Monte Carlo error", "m"}, {"Effective members", ""},
                         {"Design height", unit}, {"Mean rise", "m"}, {"Rise sd", "m"},
                         {"Allowance, rise cut at 99%", "m"}},
                        {}};
  heights.csv_columns = {"scenario",           "year",           "return_period_yr",     "present_level_m",
                         "allowance_m",        "monte_carlo_error_m", "effective_members", "design_height_m",
                         "mean_rise_m",        "rise_sd_m",      "allowance_rise_cut_p99_m"};
  for (const auto& run : r.runs) {
    for (const auto& row : run.allowances) {
      const auto& a = row.allowance;
      const auto& mc = a.monte_carlo;
      heights.add_row({display_name(run.settings), std::to_string(a.first_year), fixed(a.return_period_yr, 0),
                       fixed(a.present_level_m, 2), fixed(a.allowance_m, 2), mc.sampled ? fixed(mc.standard_error, 3) : "-",
                       mc.sampled ? fixed(mc.effective_sample_size, 0) : "-", fixed(a.present_level_m + a.allowance_m, 2),
                       fixed(a.mean_rise_m, 2), fixed(a.sd_rise_m, 2), fixed(row.cut_at_p99_m, 2)});
      heights.add_csv_row({run.settings.name, std::to_string(a.first_year), fixed(a.return_period_yr, 0),
                           csv_m(a.present_level_m), csv_m(a.allowance_m), mc.sampled ? csv_m(mc.standard_error) : "",
                           mc.sampled ? fixed(mc.effective_sample_size, 1) : "", csv_m(a.present_level_m + a.allowance_m),
                           csv_m(a.mean_rise_m), csv_m(a.sd_rise_m), csv_m(row.cut_at_p99_m)});
    }
  }
  return heights;
}

// One line per scenario and kind (the JSON keeps one warning per row).
std::vector<std::string> ensemble_warnings(const StudyResults& r) {
  std::vector<std::string> out;
  for (const auto& run : r.runs) {
    std::string few;
    std::string beyond;
    for (const auto& row : run.allowances) {
      const auto& a = row.allowance;
      const std::string label = fixed(a.return_period_yr, 0) + "-year in " + std::to_string(a.first_year);
      if (a.monte_carlo.few_effective_members()) {
        few += (few.empty() ? "" : ", ") + label + " (" + fixed(a.monte_carlo.effective_sample_size, 0) + ")";
      }
      if (a.beyond_range_fraction > 0.0) {
        beyond += (beyond.empty() ? "" : ", ") + label + " (" + fixed(100.0 * a.beyond_range_fraction, 1) + " %)";
      }
    }
    if (!few.empty()) {
      out.push_back(display_name(run.settings) +
                    ": allowances that rest on fewer than 100 effective members (their Monte Carlo "
                    "error is in the table): " + few + "; more members (projection.members) settle them");
    }
    if (!beyond.empty()) {
      out.push_back(display_name(run.settings) +
                    ": allowances set by members whose rise takes today's level below the fitted "
                    "model's lower end point (share of members): " + beyond +
                    "; such an allowance can exceed a longer return period's, and a peaks-over-threshold "
                    "fit answers for frequent levels");
    }
  }
  return out;
}

report::Table shift_table(const StudyResults& r, const SiteConfig& c) {
  const std::string unit = level_unit(c);
  report::Table shifts{"return_period_shifts",
                       "How often today's levels will be exceeded: future return period and amplification factor "
                       "N_t(z)/N_0(z), per scenario and year. '< 1' and '> x': the level would be passed more than "
                       "once a year, beyond what a model of annual maxima can count (the figure draws the bound x); a "
                       "peaks-over-threshold fit answers for frequent levels. Members beyond the model: the share of "
                       "members whose rise takes the level below the fitted lower end point.",
                       {{"Scenario", ""}, {"Year", ""}, {"Level", unit}, {"Today's return period", "years"},
                        {"Future return period", "years"}, {"Amplification factor", ""},
                        {"Members beyond the model", "%"}},
                       {}};
  shifts.csv_columns = {"scenario", "year", "level_m"};
  for (const auto& name : amplification_csv_columns()) shifts.csv_columns.push_back(name);
  for (const auto& run : r.runs) {
    for (const auto& row : run.amplification) {
      const auto& am = row.result;
      const auto text = amplification_text(am);
      shifts.add_row({display_name(run.settings), std::to_string(row.year), fixed(row.level_m, 2),
                      return_period_text(am.present_return_period_yr), text.future_return_period, text.factor,
                      fixed(100.0 * am.beyond_range_fraction, 1)});
      std::vector<std::string> csv{run.settings.name, std::to_string(row.year), csv_m(row.level_m)};
      for (auto& cell : amplification_csv_cells(am)) csv.push_back(std::move(cell));
      shifts.add_csv_row(std::move(csv));
    }
  }
  return shifts;
}

report::Table emergence_table(const StudyResults& r, const SiteConfig& c) {
  report::Table emergence{"emergence_years",
                          "First year in which today's level is expected to be exceeded at least once a year.",
                          {{"Scenario", ""}, {"Level", level_unit(c)}, {"Today's return period", "years"},
                           {"First year exceeded yearly", ""}},
                          {}};
  emergence.csv_columns = {"scenario", "level_m", "present_return_period_yr", "first_year_exceeded_yearly"};
  for (const auto& run : r.runs) {
    for (const auto& row : run.emergence) {
      const auto& e = row.emergence;
      const double period = row.present_return_period_yr;
      emergence.add_row({display_name(run.settings), fixed(e.level_m, 2), return_period_text(period),
                         e.year ? std::to_string(*e.year) : "not by " + std::to_string(run.inputs.rise.years.back())});
      emergence.add_csv_row({run.settings.name, csv_m(e.level_m), std::isfinite(period) ? fixed(period, 6) : "",
                             e.year ? std::to_string(*e.year) : ""});
    }
  }
  return emergence;
}

report::Table design_life_table(const StudyResults& r, const SiteConfig& c) {
  const auto& model = r.fit.present_day;
  report::Table risk{"design_life_risk",
                     "Probability of at least one exceedance over the design life " +
                         std::to_string(c.planning.design_life_start) + "-" + std::to_string(c.planning.design_life_end) +
                         ", from the ensemble members (year-to-year correlation kept), with its Monte Carlo error; the "
                         "expected count (years with an exceedance for a model of annual maxima, which cannot count a "
                         "second exceedance in a year); and the share of member-years in which the rise takes the "
                         "height below the fitted model's lower end point (exceeded for certain in that year).",
                     {{"Scenario", ""}, {"Height", level_unit(c)}, {"Probability of exceedance", ""},
                      {"Monte Carlo error", ""}, {sentence_case(expected_count_heading(model)), ""},
                      {"Member-years beyond the model", "%"}},
                     {}};
  risk.csv_columns = {"scenario",          "height_m",       "probability", "rounds_to_one", "monte_carlo_error",
                      "expected_count", "member_years_beyond_model_fraction"};
  for (const auto& run : r.runs) {
    for (const auto& x : run.design_life.risks) {
      risk.add_row({display_name(run.settings), fixed(x.level_m, 2), report::probability_text(x.probability, x.rounds_to_one),
                    x.monte_carlo.sampled ? fixed(x.monte_carlo.standard_error, 4) : "-",
                    fixed(expected_count(model, x), 3), fixed(100.0 * x.beyond_range_fraction, 2)});
      risk.add_csv_row({run.settings.name, csv_m(x.level_m), fixed(x.probability, 8), x.rounds_to_one ? "true" : "false",
                        x.monte_carlo.sampled ? fixed(x.monte_carlo.standard_error, 8) : "",
                        fixed(expected_count(model, x), 6), fixed(x.beyond_range_fraction, 6)});
    }
  }
  return risk;
}

report::Table target_table(const StudyResults& r, const SiteConfig& c) {
  report::Table target{"target_heights",
                       "Height with the target probability of at least one exceedance over the design life.",
                       {{"Scenario", ""}, {"Design life", ""}, {"Target probability", ""}, {"Height", level_unit(c)}},
                       {}};
  target.csv_columns = {"scenario", "design_life_first_year", "design_life_last_year", "target_probability", "height_m"};
  for (const auto& run : r.runs) {
    const auto& d = run.design_life;
    const auto& t = *d.target;
    target.add_row({display_name(run.settings), std::to_string(d.first_year) + "-" + std::to_string(d.last_year),
                    fixed(t.target_probability, 3), fixed(t.level_m, 2)});
    target.add_csv_row({run.settings.name, std::to_string(d.first_year), std::to_string(d.last_year),
                        fixed(t.target_probability, 6), csv_m(t.level_m)});
  }
  return target;
}

report::Section answers_section(const StudyResults& r, const SiteConfig& c) {
  const std::string& datum = c.site.datum;
  const double design_rp = r.design_return_period_yr;
  const double z_design = planning::present_return_level(r.fit.present_day, design_rp);
  const std::vector<double> years(r.plot_years.begin(), r.plot_years.end());
  std::vector<report::NamedSeries> heights, factors, risk_curves;
  for (const auto& run : r.runs) {
    heights.push_back({display_name(run.settings), run.height_path_m});
    factors.push_back({display_name(run.settings) + ", today's " + fixed(design_rp, 0) + "-year level", run.factor_path});
    risk_curves.push_back({display_name(run.settings), run.risk_curve});
  }
  report::Section answers{"Answers", {}};
  answers.blocks.emplace_back(report::Paragraph{"Design heights keep the expected number of exceedances per year in the "
                                                "design year equal to today's (Hunter 2012). They are still-water levels: "
                                                "add waves, freeboard and local code requirements."});
  for (const auto& run : r.runs) answers.blocks.emplace_back(design_height_matrix(run, c.planning, datum));
  for (const auto& w : ensemble_warnings(r)) answers.blocks.emplace_back(report::Paragraph{"Warning: " + w + "."});
  answers.blocks.emplace_back(report::Figure{"design_heights", "Design height of today's " + fixed(design_rp, 0) +
                                                                   "-year level by year, per scenario.",
                                             report::design_height_plot(years, heights, datum, z_design,
                                                                        "today's " + fixed(design_rp, 0) + "-year level")});
  answers.blocks.emplace_back(shift_table(r, c));
  answers.blocks.emplace_back(report::Figure{"amplification", "Amplification of the exceedance frequency of today's " +
                                                                  fixed(design_rp, 0) + "-year level.",
                                             report::amplification_plot(years, factors)});
  answers.blocks.emplace_back(emergence_table(r, c));
  answers.blocks.emplace_back(design_life_table(r, c));
  answers.blocks.emplace_back(target_table(r, c));
  const std::string life = std::to_string(c.planning.design_life_start) + "-" + std::to_string(c.planning.design_life_end);
  answers.blocks.emplace_back(report::Figure{"design_life_risk", "Probability of at least one exceedance over the design life.",
                                             report::design_life_risk_plot(r.risk_curve_heights_m, risk_curves, datum, life,
                                                                           c.planning.target_risk)});
  return answers;
}

void add_fit_evidence(report::Section& evidence, const FitStageResult& fit, const SiteConfig& c) {
  evidence.blocks.emplace_back(report::Subheading{"The record"});
  report::BulletList lines;
  std::istringstream in(fit.data_summary);
  for (std::string line; std::getline(in, line);) lines.items.push_back(line);
  evidence.blocks.emplace_back(lines);
  evidence.blocks.emplace_back(report::Subheading{"Extreme-value fit"});
  report::Table params{"fit_parameters", "Maximum-likelihood estimates with standard errors from the observed information.",
                       {{"Parameter", ""}, {"Estimate", ""}, {"Standard error", ""}}, {}};
  params.csv_columns = {"parameter", "estimate", "standard_error"};
  for (std::size_t i = 0; i < fit.fit.parameter_names.size(); ++i) {
    const auto k = static_cast<Eigen::Index>(i);
    params.add_row({fit.fit.parameter_names[i], fixed(fit.fit.estimate(k), 4), fixed(fit.fit.standard_error(k), 4)});
    params.add_csv_row({fit.fit.parameter_names[i], fixed(fit.fit.estimate(k), 8), fixed(fit.fit.standard_error(k), 8)});
  }
  evidence.blocks.emplace_back(params);
  std::string diag = "Model " + fit.model + ", " + std::to_string(fit.fit.n) + " values, log-likelihood " +
                     fixed(fit.fit.log_likelihood, 2) + ", AIC " + fixed(fit.aic, 2) + ", Anderson-Darling A² " +
                     fixed(fit.anderson_darling, 3) + ".";
  if (fit.deviance_test) {
    diag += " Deviance test of Gumbel against GEV: D = " + fixed(fit.deviance_test->deviance, 2) + ", p = " +
            fixed(fit.deviance_test->p_value, 3) + ".";
  }
  if (fit.reference_epoch) {
    diag += " Levels are relative to mean sea level at " + fixed(*fit.reference_epoch, 1) + " (trend removed: " +
            fixed(fit.trend_mm_per_yr, 2) + " mm/yr).";
  }
  evidence.blocks.emplace_back(report::Paragraph{diag});
  const std::string unit = level_unit(c);
  report::Table rl{"return_levels",
                   std::string("Present-day return levels with 95% profile-likelihood intervals (the interval to "
                               "quote) and, as an approximation, delta-method intervals; a delta lower bound below a "
                               "shorter return period's level is not shown. ") +
                       extremes::return_period_definition + ".",
                   {{"Return period", "years"}, {"AEP", "%"}, {"Level", unit}, {"Profile lower", unit},
                    {"Profile upper", unit}, {"Delta lower (approx.)", unit},
                    {"Delta upper (approx.)", unit}},
                   {}};
  rl.csv_columns = {"return_period_yr", "aep_percent", "level_m", "profile_lower_m", "profile_upper_m",
                    "delta_lower_approx_m", "delta_upper_approx_m"};
  for (std::size_t i = 0; i < fit.profile.size(); ++i) {
    const auto& p = fit.profile[i];
    const auto& d = fit.delta[i];
    const auto end = [](double v) {
      return std::isnan(v) ? std::string("not available") : std::isfinite(v) ? fixed(v, 2) : std::string("unbounded");
    };
    rl.add_row({fixed(p.return_period_yr, 0),
                fixed(100.0 * extremes::annual_exceedance_probability_of_period(p.return_period_yr), 3),
                fixed(p.level_m, 2), end(p.lower_m), end(p.upper_m),
                delta_lower_below_shorter_level(fit, i) ? std::string("not shown") : end(d.lower_m), end(d.upper_m)});
    rl.add_csv_row({fixed(p.return_period_yr, 6),
                    fixed(100.0 * extremes::annual_exceedance_probability_of_period(p.return_period_yr), 6),
                    csv_m(p.level_m), csv_m(p.lower_m), csv_m(p.upper_m),
                    delta_lower_below_shorter_level(fit, i) ? std::string() : csv_m(d.lower_m), csv_m(d.upper_m)});
  }
  std::string band_method;
  const report::ReturnLevelPlotInput rlp = return_level_plot_input(fit, &band_method);
  evidence.blocks.emplace_back(rl);
  for (const auto& w : fit.warnings) evidence.blocks.emplace_back(report::Paragraph{"Warning: " + w + "."});
  evidence.blocks.emplace_back(report::Figure{"return_levels",
                                              std::string("Annual maxima at Gringorten plotting positions, the fitted curve "
                                                          "and its 95% ") +
                                                  band_method + " band.",
                                              report::return_level_plot(rlp)});
}

report::Table map_table(const StudyMaps& maps, const SiteConfig& c) {
  report::Table t{"flooded_areas",
                  "Land reached by the sea (connected) and low ground below the level it does not reach (cut off), per mapped level.",
                  {{"Level", level_unit(c)}, {"Year", ""}, {"Scenario", ""}, {"Flooded area", "ha"},
                   {"Cut-off low ground", "ha"}, {"Largest depth", "m"}},
                  {}};
  t.csv_columns = {"level_m", "year", "scenario", "flooded_area_ha", "cut_off_area_ha", "max_depth_m"};
  for (const auto& l : maps.summary.levels) {
    t.add_row({fixed(l.level.level_m, 2), l.level.year ? std::to_string(*l.level.year) : "today", l.level.scenario,
               fixed(l.flooded_area_m2 / 1e4, 2), fixed(l.cut_off_area_m2 / 1e4, 2), fixed(l.max_depth_m, 2)});
    t.add_csv_row({csv_m(l.level.level_m), l.level.year ? std::to_string(*l.level.year) : "", l.level.scenario,
                   fixed(l.flooded_area_m2 / 1e4, 4), fixed(l.cut_off_area_m2 / 1e4, 4), csv_m(l.max_depth_m)});
  }
  return t;
}

void add_map_evidence(report::Section& evidence, const StudyMaps& maps, const SiteConfig& c) {
  evidence.blocks.emplace_back(report::Subheading{"Maps"});
  evidence.blocks.emplace_back(map_table(maps, c));
  if (maps.extent) {
    report::CategoricalMapInput cm;
    cm.title = "Flood extent";
    if (maps.highest) {
      const auto& last = *maps.highest;
      cm.title = "Flood extent at " + fixed(last.level_m, 2) + " m (" + last.scenario +
                 (last.year ? ", " + std::to_string(*last.year) : std::string()) + ")";
    }
    cm.raster = *maps.extent;
    evidence.blocks.emplace_back(report::Figure{"map_extent", "Extent at the highest mapped level (band of extent.tif).",
                                                report::categorical_map(cm)});
  }
  if (maps.aep) {
    report::CategoricalMapInput am;
    am.title = "Annual exceedance probability, present day";
    am.raster = report::aep_classes(*maps.aep);
    am.categories = report::aep_categories();
    am.legend_title = "Chance of flooding in any year";
    evidence.blocks.emplace_back(report::Figure{
        "map_aep", "Present-day annual exceedance probability per cell (aep.tif band 1), in bands; sea and nodata blank.",
        report::categorical_map(am)});
  }
}

report::Section evidence_section(const StudyResults& r, const SiteConfig& c) {
  report::Section evidence{"Evidence", {}};
  add_fit_evidence(evidence, r.fit, c);
  evidence.blocks.emplace_back(report::Subheading{"Sea-level projections"});
  for (const auto& run : r.runs) {
    const auto& t = run.inputs.rise;
    report::FanChartInput fan = fan_chart_input(run.projection, t, run.inputs.rise_zero_year);
    fan.title = "Relative sea-level rise, " + display_name(run.settings);
    const std::string name = "projection_" + scenario_file_stem(run.settings.name);
    evidence.blocks.emplace_back(report::Figure{name, "Scenario " + display_name(run.settings) + ": median, 17-83% and 5-95% of " +
                                                          std::to_string(t.member_count()) + " members, with component medians.",
                                                report::projection_fan_chart(fan)});
    report::BulletList notes;
    for (const auto& n : run.projection.cautions) notes.items.push_back(n);
    for (const auto& n : run.inputs.notes) notes.items.push_back(n);
    evidence.blocks.emplace_back(notes);
  }
  evidence.blocks.emplace_back(report::Subheading{"Allowances in detail"});
  evidence.blocks.emplace_back(allowance_detail_table(r, c));
  std::vector<report::NamedSeries> allowances;
  for (const auto& run : r.runs) allowances.push_back({display_name(run.settings), run.allowance_path_m});
  evidence.blocks.emplace_back(report::Figure{"allowances", "Allowance for today's " + fixed(r.design_return_period_yr, 0) +
                                                                "-year level by year, per scenario.",
                                              report::allowance_plot(std::vector<double>(r.plot_years.begin(), r.plot_years.end()),
                                                                     allowances)});
  if (r.maps) add_map_evidence(evidence, *r.maps, c);
  return evidence;
}

std::vector<std::string> assumptions(const SiteConfig& c) {
  std::vector<std::string> a{
      "Still water only: tide plus surge, no waves.",
      "Storm statistics stay as today's unless a storminess change is given (here: " +
          fixed(c.planning.storminess_scale_per_yr, 4) + " of the scale per year).",
      c.local.fingerprints.empty()
          ? "No fingerprint factors given: every component's global rise is taken locally unchanged "
            "(factor 1), which ignores regional patterns of sea-level change."
          : "Fingerprint factors as listed in the inputs; components not listed take 1.",
      "Vertical land motion " + fixed(c.local.land_motion_mm_per_yr, 2) + " ± " +
          fixed(c.local.land_motion_sd_mm_per_yr, 2) + " mm/yr (positive = uplift)."};
  if (c.map.enabled && c.map.sea_spread_to_m) {
    a.push_back("Maps: ground the sea reaches at or below " + fixed(*c.map.sea_spread_to_m, 2) + " " + level_unit(c) +
                " is today's water (sea), not flooded land: it counts in no flooded area or depth and "
                "has no AEP in the maps.");
  }
  return a;
}

std::vector<report::MethodReference> methods() {
  return {{"Extreme-value fit", "GEV, Gumbel or GPD by maximum likelihood with profile-likelihood intervals",
           "Coles, S. (2001) An Introduction to Statistical Modeling of Extreme Values. Springer."},
          {"Plotting positions", "Gringorten positions of the annual maxima", "Gringorten, I. I. (1963) J. Geophys. Res. 68(3):813."},
          {"Energy balance", "Two-layer model with deep-ocean heat-uptake efficacy",
           "Held et al. (2010) J. Climate 23:2418; Geoffroy et al. (2013) J. Climate 26:1841, 1859."},
          {"Projection calibration",
           "Built-in pathways, each component and the warming calibrated to the assessed medians and likely ranges "
           "for 2100 (ECS 3 K); checked against the observed 1993-2018 budget",
           "IPCC AR6 WG1 (2021): Fox-Kemper et al., ch. 9, Tables 9.5 and 9.9; ch. 4, Table 4.5."},
          {"Thermal expansion", "Expansion efficiency of heat and TEOS-10 seawater expansion",
           "Kuhlbrodt & Gregory (2012) GRL; IOC, SCOR & IAPSO (2010) TEOS-10; Roquet et al. (2015) Ocean Modelling."},
          {"Allowance", "Height that keeps the expected number of exceedances", "Hunter, J. (2012) Climatic Change 113:239-252."},
          {"Allowance under GEV/GPD", "Numerical allowance depending on return period", "Buchanan et al. (2016) Climatic Change."},
          {"Flood threshold", "Priority-flood from the sea", "Barnes, Lehman & Mulla (2014) Computers & Geosciences 62:117."}};
}

}  // namespace

std::string display_name(const ScenarioSettings& s) {
  return s.storyline == climate::IceStoryline::high_end_ice ? s.name + " [high-end ice storyline]" : s.name;
}

Json study_results_json(const StudyResults& r, const SiteConfig& c) {
  Json all;
  all["site"] = {{"name", c.site.name}, {"datum", c.site.datum}, {"crs", c.site.crs}, {"x", c.site.x}, {"y", c.site.y},
                 {"invented", c.site.invented}};
  all["tool"] = std::string("tidewright ") + version_string;
  all["seed"] = c.seed;
  all["fit"] = fit_result_json(r.fit);
  Json scenarios = Json::array();
  for (const auto& run : r.runs) {
    Json sj;
    sj["name"] = run.settings.name;
    sj["storyline"] = name_of(storyline_names(), run.settings.storyline);
    sj["projection"] = projection_json(run.projection);
    const Json allowances = allowance_json(run.inputs, run.allowances, "projection.members");
    sj["allowances"] = allowances["allowances"];
    sj["warnings"] = allowances["warnings"];
    sj["notes"] = run.inputs.notes;
    Json rows = Json::array();
    for (const auto& row : run.amplification) rows.push_back(amplification_json(row.result));
    sj["amplification"] = rows;
    Json em = Json::array();
    for (const auto& row : run.emergence) em.push_back(emergence_json(row));
    sj["emergence"] = em;
    sj["design_life"] = design_life_json(run.design_life);
    scenarios.push_back(sj);
  }
  all["scenarios"] = scenarios;
  if (r.maps) {
    const auto& ms = r.maps->summary;
    Json levels = Json::array();
    for (const auto& l : ms.levels) levels.push_back(terrain::level_summary_json(l));
    all["maps"] = {{"files", ms.files}, {"area_method", ms.area_method}, {"levels", levels}};
  }
  all["cautions"] = report::safety_cautions();
  return all;
}

report::ReportDocument study_report(const StudyResults& r, const SiteConfig& c, const std::string& date) {
  report::ReportDocument doc;
  const std::string invented = c.site.invented ? " (invented data)" : "";
  doc.title = "Sea-level planning report" + invented;
  doc.site_name = c.site.name;
  doc.date = date;
  doc.tool_version = std::string("tidewright ") + version_string;
  doc.summary = "Still-water design heights, return-period shifts, amplification factors and design-life risk for " +
                c.site.name + ", from the tide-gauge record " + c.fit.input.filename().string() + " and " +
                std::to_string(r.runs.size()) + " sea-level scenario(s). Levels are in metres above " + c.site.datum + "." +
                (c.site.invented ? " All data in this report are invented for a demonstration." : "");
  doc.sections.push_back(answers_section(r, c));
  doc.sections.push_back(evidence_section(r, c));
  doc.inputs = report_inputs(c, r.maps ? r.maps->summary.defences : std::nullopt);
  doc.assumptions = assumptions(c);
  doc.methods = methods();
  if (c.site.invented) doc.extra_cautions.push_back("Every number in this report comes from invented data; it describes no real place.");
  return doc;
}

std::vector<std::string> study_headline(const StudyResults& r, const SiteConfig& c) {
  std::vector<std::string> lines;
  for (const auto& run : r.runs) {
    for (const auto& row : run.allowances) {
      const auto& a = row.allowance;
      if (a.first_year == c.planning.design_years.back() && a.return_period_yr == r.design_return_period_yr) {
        lines.push_back("scenario " + display_name(run.settings) + ": " + fixed(r.design_return_period_yr, 0) +
                        "-year still-water level " + fixed(a.present_level_m, 2) + " m today, design height " +
                        fixed(a.present_level_m + a.allowance_m, 2) + " m in " + std::to_string(a.first_year) +
                        " (m above " + c.site.datum + ")");
      }
    }
  }
  return lines;
}

}  // namespace tidewright::study
