#include "tidewright/study/projection_stage.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <sstream>

#include "tidewright/climate/scenario.hpp"
#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/common/sample_quantile.hpp"
#include "tidewright/local/quantile_table.hpp"
#include "tidewright/record/peaks_over_threshold.hpp"
#include "tidewright/report/cautions.hpp"
#include "tidewright/study/stage_files.hpp"

namespace tidewright::study {
namespace {

struct Columns {
  std::vector<int> years;
  std::vector<std::vector<double>> values;  // one vector per requested column
};

// Reads a year column and named value columns; optional columns may be absent (empty vector).
Columns read_year_columns(const std::filesystem::path& path, const std::vector<std::string>& required,
                          const std::vector<std::string>& optional) {
  const CsvTable t = CsvTable::read(path);
  Columns out;
  const std::size_t year_col = t.column("year");
  std::vector<std::optional<std::size_t>> cols;
  for (const auto& name : required) cols.emplace_back(t.column(name));
  for (const auto& name : optional) cols.push_back(t.find_column(name));
  out.values.resize(cols.size());
  MissingValues none;
  none.markers = {};
  for (const auto& row : t.rows()) {
    const auto y = whole_year(t.number(row, year_col, none));
    if (!y) {
      throw InputError(t.where(row), "the year '" + row.cells[year_col] + "' is not a whole number",
                       "give whole years");
    }
    out.years.push_back(*y);
    for (std::size_t c = 0; c < cols.size(); ++c) {
      if (!cols[c]) continue;
      const auto v = t.number(row, *cols[c], none);
      if (!v) throw InputError(t.where(row), "an empty value in column '" + t.header()[*cols[c]] + "'", "fill every year");
      out.values[c].push_back(*v);
    }
  }
  if (out.years.empty()) throw InputError(path.string(), "has no rows", "give one row per year");
  for (std::size_t i = 1; i < out.years.size(); ++i) {
    if (out.years[i] <= out.years[i - 1]) {
      throw InputError(t.where(t.rows()[i]), "year " + std::to_string(out.years[i]) + " does not follow " +
                                                 std::to_string(out.years[i - 1]),
                       "sort the years ascending without repeats");
    }
    if (out.years[i] != out.years[i - 1] + 1) {
      throw InputError(t.where(t.rows()[i]), "years jump from " + std::to_string(out.years[i - 1]) + " to " +
                                                 std::to_string(out.years[i]),
                       "give every year (annual steps, no gaps)");
    }
  }
  return out;
}

std::string p_key(double p) {
  char buf[8];
  std::snprintf(buf, sizeof buf, "p%02d", static_cast<int>(std::lround(p * 100)));
  return buf;
}

nlohmann::ordered_json quantile_block(const Eigen::MatrixXd& m, const std::vector<double>& ps) {
  nlohmann::ordered_json j;
  const std::vector<std::vector<double>> q = year_quantiles(m, ps);
  for (std::size_t k = 0; k < ps.size(); ++k) j[p_key(ps[k])] = q[k];
  return j;
}

// The members' expansion efficiency of heat in the last year, thermal expansion over ocean heat
// (both from the reference period; Kuhlbrodt & Gregory 2012, eq. 1): the drawn e for the
// efficiency route, the effective one for the layered route. For checking the expansion term.
nlohmann::ordered_json expansion_efficiency_json(const climate::ComponentEnsemble& g) {
  const Eigen::Index last = g.ocean_heat_content_change_yj.cols() - 1;
  std::vector<double> e;
  for (Eigen::Index m = 0; m < g.ocean_heat_content_change_yj.rows(); ++m) {
    const double heat_yj = g.ocean_heat_content_change_yj(m, last);
    if (std::abs(heat_yj) > 1e-3) e.push_back(g.rise_m[0](m, last) / heat_yj);  // component 0: thermal expansion
  }
  const std::vector<double> ps{0.05, 0.5, 0.95};
  const std::vector<double> q = sample_quantiles(e, ps);
  nlohmann::ordered_json j;
  j["year"] = g.years.back();
  j["members_used"] = e.size();
  for (std::size_t k = 0; k < ps.size(); ++k) j[p_key(ps[k])] = q[k];
  return j;
}

}  // namespace

climate::Scenario load_scenario(const ProjectionRequest& r, const std::string& label) {
  const std::string where = r.path.string();
  switch (r.source) {
    case ScenarioSource::pathway: {
      auto s = climate::builtin_pathway(r.pathway, std::max(2100, r.last_year));
      if (!r.label.empty()) s.label = r.label;
      return s;
    }
    case ScenarioSource::forcing_csv: {
      auto c = read_year_columns(r.path, {"forcing_w_m2"}, {});
      return climate::forcing_scenario(label, c.years, c.values[0], where);
    }
    case ScenarioSource::co2_csv: {
      auto c = read_year_columns(r.path, {"co2_ppm"}, {"non_co2_forcing_w_m2"});
      return climate::co2_scenario(label, c.years, c.values[0], c.values[1], r.co2_formula, where);
    }
    case ScenarioSource::temperature_csv: {
      auto c = read_year_columns(r.path, {"warming_k"}, {});
      return climate::surface_warming_scenario(label, c.years, c.values[0], where);
    }
    case ScenarioSource::table: break;
  }
  throw InputError(where, "is not a scenario file", "use a pathway, forcing, CO2 or warming CSV");
}

std::vector<std::vector<double>> year_quantiles(const Eigen::MatrixXd& members_by_year, std::span<const double> ps) {
  std::vector<std::vector<double>> out(ps.size());
  for (auto& row : out) row.reserve(static_cast<std::size_t>(members_by_year.cols()));
  std::vector<double> column(static_cast<std::size_t>(members_by_year.rows()));
  for (Eigen::Index c = 0; c < members_by_year.cols(); ++c) {
    // Columns are contiguous in Eigen's column-major storage: copy, sort once, read every p.
    const double* first = members_by_year.col(c).data();
    column.assign(first, first + members_by_year.rows());
    std::sort(column.begin(), column.end());
    for (std::size_t k = 0; k < ps.size(); ++k) out[k].push_back(quantile_of_sorted(column, ps[k]));
  }
  return out;
}

std::vector<double> year_quantiles(const Eigen::MatrixXd& members_by_year, double p) {
  return year_quantiles(members_by_year, std::span<const double>(&p, 1)).front();
}

namespace {
// A number for a message: six significant digits, never sixty.
std::string short_number(double v) {
  std::array<char, 32> buf{};
  std::snprintf(buf.data(), buf.size(), "%.6g", v);
  return buf.data();
}
}  // namespace

void check_projection_inputs(const ProjectionRequest& r, const climate::Scenario* scenario) {
  const auto& names = r.input_names;
  if (r.members <= 0) {
    throw InputError(names.members, "is " + std::to_string(r.members) + ", not a positive count",
                     "give the number of Monte Carlo members, e.g. 2000");
  }
  if (r.members > max_members) {
    throw InputError(names.members,
                     "is " + std::to_string(r.members) + ", above the limit of " +
                         std::to_string(max_members) + " members (memory grows with members x years)",
                     "give fewer members (the default is 2,000)");
  }
  if (r.accept_extreme_inputs) return;
  const std::string accept = " or " + names.accept_extreme + " to run it on purpose";
  const auto& lm = r.local.land_motion;
  for (const double v : {lm.uplift_mm_per_yr, lm.uplift_sd_mm_per_yr}) {
    if (!std::isfinite(v) || std::abs(v) > max_abs_land_motion_mm_per_yr) {
      throw InputError(v == lm.uplift_mm_per_yr ? names.land_motion : names.land_motion_sd,
                       "is " + short_number(v) + " mm/yr, beyond any measured vertical land motion (" +
                           short_number(max_abs_land_motion_mm_per_yr) + " mm/yr at most)",
                       "give the rate in mm/yr (positive = uplift)" + accept);
    }
  }
  if (scenario == nullptr) return;
  const bool forcing = scenario->driver == climate::ScenarioDriver::forcing;
  const double lo = forcing ? -max_abs_forcing_w_m2 : min_warming_k;
  const double hi = forcing ? max_abs_forcing_w_m2 : max_warming_k;
  for (std::size_t i = 0; i < scenario->values.size(); ++i) {
    const double v = scenario->values[i];
    if (v < lo || v > hi) {
      const std::string what = forcing ? "forcing" : "surface warming";
      const std::string unit = forcing ? " W/m2" : " K";
      throw InputError(r.path.empty() ? r.pathway : r.path.string(),
                       "the " + what + " in " + std::to_string(scenario->years[i]) + " is " +
                           short_number(v) + unit + ", outside the physical range " +
                           short_number(lo) + " to " + short_number(hi) + unit,
                       "check the column's unit (forcing in W/m2, CO2 in ppm, warming in K)" + accept);
    }
  }
}

ProjectionStageResult run_projection_stage(const ProjectionRequest& r) {
  check_projection_inputs(r, nullptr);
  if (r.last_year <= r.first_year) {
    throw InputError(r.input_names.years, "the last year is not after the first", "give a span such as 2020-2150");
  }
  ProjectionStageResult out;
  const bool high_end = r.storyline == climate::IceStoryline::high_end_ice;
  const std::string base_label = !r.label.empty()                      ? r.label
                                 : r.source == ScenarioSource::pathway ? r.pathway
                                                                       : r.path.stem().string();
  const std::string& label = base_label;
  if (high_end && (r.source == ScenarioSource::table || r.source == ScenarioSource::temperature_csv)) {
    // A table carries its own tail; given warming skips nothing the storyline changes, but the
    // storyline is calibrated on forcing pathways only.
    throw InputError(r.storyline_input, "applies to forcing-driven projections (a pathway, forcing or CO2)",
                     "use it with a pathway, --forcing or --co2, or drop it");
  }
  if (r.source == ScenarioSource::table) {
    if (r.local_terms_given) {
      throw InputError(r.path.string(),
                       "a published projection table is taken as local relative rise; fingerprints, land motion "
                       "and ocean-dynamic terms apply only to a physics projection",
                       "drop the local options, or use a scenario instead of a table");
    }
    auto table = local::read_quantile_table(r.path);
    if (table.reference.empty()) {
      table.reference = table.reference_period
                            ? table.reference_period->label() + " (as published in " +
                                  r.path.filename().string() + ")"
                            : "as published in " + r.path.filename().string();
    }
    local::TableSampling sampling;
    sampling.members = r.members;
    sampling.seed = r.seed;
    for (int y = r.first_year; y <= r.last_year; ++y) {
      if (y >= table.years.front() && y <= table.years.back()) sampling.years.push_back(y);
    }
    if (sampling.years.empty()) {
      throw InputError(r.path.string(), "covers none of the years asked for", "ask for years inside the table");
    }
    out.local.total = local::sample_quantile_table(table, sampling);
    out.local.total.scenario = label;
    out.local.component_names = {};
    out.cautions.push_back("rise sampled from the published quantiles of " + r.path.filename().string() +
                           " (tails beyond the outer quantiles extrapolated; see docs/methods-local.md)");
    return out;
  }
  climate::Scenario scenario = load_scenario(r, label);
  if (high_end) scenario.label += ", " + std::string(climate::high_end_label);
  check_projection_inputs(r, &scenario);
  climate::ProjectionOptions options;
  options.first_year = r.first_year;
  options.last_year = r.last_year;
  options.member_count = r.members;
  options.seed = r.seed;
  options.reference = r.reference;
  options.input_names = {r.input_names.members, r.input_names.years, r.input_names.reference};
  options.storyline = r.storyline;
  climate::validate(scenario, options);
  out.global = climate::project_global_components(scenario, options);
  local::LocalTerms terms = r.local;
  terms.seed = r.seed;
  if (!terms.land_motion.reference_year) {
    // Land motion counts from the middle of the reference period: the mean of a linear motion
    // over the period is zero there, as the rise's is by construction.
    terms.land_motion.reference_year = 0.5 * (r.reference.first_year + r.reference.last_year);
  }
  out.local = local::local_relative_rise(*out.global, terms);
  if (high_end) {
    out.cautions.push_back(std::string("this ensemble is the ") + climate::high_end_label +
                           ": Antarctic discharge raised for deep uncertainty in ice-sheet processes, to test a "
                           "design's robustness; do not read its percentiles as likely ranges");
  }
  // The per-component "defaulted to 1" cautions, said once with the components listed.
  std::vector<std::string> defaulted;
  for (const auto& c : out.local.cautions) {
    const std::string head = "The fingerprint factor for ";
    const auto end = c.find(" defaulted to 1");
    if (c.rfind(head, 0) == 0 && end != std::string::npos) defaulted.push_back(c.substr(head.size(), end - head.size()));
    else out.cautions.push_back(c);
  }
  if (!defaulted.empty()) {
    std::string list;
    for (const auto& d : defaulted) list += (list.empty() ? "" : ", ") + d;
    out.cautions.push_back("fingerprint factors defaulted to 1 for " + list +
                           ": this ignores the gravitational, rotational and deformational pattern of sea-level "
                           "change; use site-specific values");
  }
  if (scenario.illustrative) {
    out.cautions.insert(out.cautions.begin(),
                        "scenario '" + scenario.label + "' is a built-in illustrative pathway, not official scenario data");
  }
  return out;
}

nlohmann::ordered_json projection_json(const ProjectionStageResult& r) {
  const auto& total = r.local.total;
  nlohmann::ordered_json j;
  j["scenario"] = total.scenario;
  j["illustrative"] = total.illustrative;
  j["reference"] = total.reference;
  j["reference_period"] = reference_period_json(total.reference_period);
  j["members"] = total.member_count();
  if (r.global) j["seed"] = r.global->seed;
  j["years"] = total.years;
  j["units"] = "m";
  j["total"] = quantile_block(total.rise_m, summary_probabilities);
  nlohmann::ordered_json comps = nlohmann::ordered_json::object();
  for (std::size_t c = 0; c < r.local.component_names.size(); ++c) {
    comps[r.local.component_names[c]] = quantile_block(r.local.contribution_m[c], {0.05, 0.17, 0.5, 0.83, 0.95});
  }
  j["components"] = comps;
  if (!r.local.fingerprint_used.empty()) j["fingerprints"] = r.local.fingerprint_used;
  if (r.global) {
    j["global_surface_temperature_K"] = quantile_block(r.global->surface_warming_k, {0.05, 0.5, 0.95});
    j["ocean_heat_content_change_YJ"] = quantile_block(r.global->ocean_heat_content_change_yj, {0.05, 0.5, 0.95});
    j["global_mean_total"] = quantile_block(r.global->total_m(), {0.05, 0.17, 0.5, 0.83, 0.95});
    j["expansion_efficiency_m_per_YJ"] = expansion_efficiency_json(*r.global);
  }
  j["notes"] = r.cautions;
  j["cautions"] = report::safety_cautions();
  return j;
}

std::string component_display_name(const std::string& name) {
  std::string s = name;
  for (auto& ch : s) {
    if (ch == '_') ch = ' ';
  }
  if (!s.empty()) s[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(s[0])));
  return s;
}

report::FanChartInput fan_chart_input(const ProjectionStageResult& r, const local::RiseEnsemble& t,
                                      std::optional<int> zero_year) {
  report::FanChartInput fan;
  fan.title = "Relative sea-level rise, " + t.scenario;
  fan.baseline = "since " + t.reference;
  for (int y : t.years) fan.years.push_back(y);
  const std::vector<double> ps{0.05, 0.17, 0.50, 0.83, 0.95};
  auto q = year_quantiles(t.rise_m, ps);
  fan.q05_m = std::move(q[0]);
  fan.q17_m = std::move(q[1]);
  fan.q50_m = std::move(q[2]);
  fan.q83_m = std::move(q[3]);
  fan.q95_m = std::move(q[4]);
  const auto& years = r.local.total.years;
  const auto zero_at = zero_year ? std::find(years.begin(), years.end(), *zero_year) : years.end();
  for (std::size_t k = 0; k < r.local.component_names.size(); ++k) {
    const std::string name = component_display_name(r.local.component_names[k]);
    if (zero_at == years.end()) {
      fan.component_medians_m.push_back({name, year_quantiles(r.local.contribution_m[k], 0.5)});
      continue;
    }
    Eigen::MatrixXd shifted = r.local.contribution_m[k];
    const Eigen::VectorXd at_zero = shifted.col(static_cast<Eigen::Index>(zero_at - years.begin()));
    shifted.colwise() -= at_zero;
    fan.component_medians_m.push_back({name, year_quantiles(shifted, 0.5)});
  }
  return fan;
}

std::string projection_csv(const ProjectionStageResult& r) {
  const auto& total = r.local.total;
  std::vector<std::vector<double>> cols;
  std::ostringstream o;
  o << "year";
  for (double p : summary_probabilities) {
    o << ",total_" << p_key(p) << "_m";
    cols.push_back(year_quantiles(total.rise_m, p));
  }
  for (std::size_t c = 0; c < r.local.component_names.size(); ++c) {
    o << ',' << r.local.component_names[c] << "_p50_m";
    cols.push_back(year_quantiles(r.local.contribution_m[c], 0.5));
  }
  o << '\n';
  for (std::size_t y = 0; y < total.years.size(); ++y) {
    o << total.years[y];
    for (const auto& col : cols) {
      char buf[32];
      std::snprintf(buf, sizeof buf, ",%.4f", col[y]);
      o << buf;
    }
    o << '\n';
  }
  return o.str();
}

}  // namespace tidewright::study
