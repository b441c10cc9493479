// How much the spread of each prior in climate::ParameterDistributions (and the glaciers' T_g0)
// moves the 2100 allowance, for the table in docs/methods-climate.md (5.1, "Sensitivity of the
// allowance to the priors"): the test recomputes every row and refuses a table that has drifted
// from the code.
// Setting: pathway midway, 10,000 members, seed 20261201, rise from 1995-2014, a Gumbel
// present-day model of scale 0.127 m (an invented, typical tide-gauge scale), today's 100-year
// level; each prior's spread halved and raised by half, the same seed for all (common random
// numbers, so the differences carry less Monte Carlo error than the allowances).
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <fstream>
#include <functional>
#include <sstream>
#include <string>
#include <vector>

#include "tidewright/climate/projection.hpp"
#include "tidewright/climate/scenario.hpp"
#include "tidewright/local/relative_sea_level.hpp"
#include "tidewright/planning/allowance.hpp"
#include "tidewright/planning/future_exceedance.hpp"

namespace tc = tidewright::climate;
namespace tp = tidewright::planning;

namespace {

struct Variant {
  std::string prior;  // as the doc's first column names it
  std::string value;  // as the doc's second column writes it
  std::function<void(tc::ProjectionOptions&)> apply;
};

struct Result {
  double allowance_m = 0.0;
  double standard_error_m = 0.0;
};

Result allowance_2100(const tc::ProjectionOptions& o) {
  const tc::Scenario s = tc::builtin_pathway("midway");
  const tc::ComponentEnsemble global = tc::project_global_components(s, o);
  tidewright::local::LocalTerms terms;
  for (const auto& name : global.component_names) terms.fingerprint[name] = 1.0;
  const auto local = tidewright::local::local_relative_rise(global, terms);
  tidewright::extremes::StillWaterModel gumbel;
  gumbel.family = tidewright::extremes::Family::gumbel;
  gumbel.location_m = 2.0;
  gumbel.scale_m = 0.127;
  const auto a = tp::allowance(gumbel, tp::conditions_in_year(local.total, 2100), 100.0);
  return {a.allowance_m, a.monte_carlo.standard_error};
}

tc::ProjectionOptions base_options() {
  tc::ProjectionOptions o;
  o.first_year = 2020;
  o.last_year = 2100;
  o.member_count = 10000;
  o.seed = 20261201;
  return o;
}

std::string number(double x) {
  std::ostringstream text;
  text << x;
  return text.str();
}

std::vector<Variant> variants() {
  std::vector<Variant> v;
  v.push_back({"all as used", "-", [](tc::ProjectionOptions&) {}});
  const tc::ParameterDistributions used;
  for (double s : {0.4, 1.2}) {
    v.push_back({"Antarctic discharge factor f_A, log-sd " + number(used.antarctic_discharge_log_sd),
                 "log-sd " + number(s), [s](tc::ProjectionOptions& o) { o.distributions.antarctic_discharge_log_sd = s; }});
  }
  for (double b : {2.0, 3.0}) {
    v.push_back({"bound of ln f_A, " + number(used.antarctic_discharge_log_bound_sd) + " sd", number(b) + " sd",
                 [b](tc::ProjectionOptions& o) { o.distributions.antarctic_discharge_log_bound_sd = b; }});
  }
  const auto spread = [&](const std::string& name, tc::TruncatedNormal tc::ParameterDistributions::*member) {
    const double sd = (used.*member).sd;
    for (double f : {0.5, 1.5}) {
      v.push_back({name + ", sd " + number(sd), "sd " + number(sd * f),
                   [member, f](tc::ProjectionOptions& o) { (o.distributions.*member).sd *= f; }});
    }
  };
  spread("heat exchange γ", &tc::ParameterDistributions::heat_exchange_w_m2_k);
  spread("efficacy ε", &tc::ParameterDistributions::efficacy);
  spread("glacier multiplier", &tc::ParameterDistributions::glacier_sensitivity_factor);
  spread("Greenland multiplier", &tc::ParameterDistributions::greenland_factor);
  spread("land-water multiplier", &tc::ParameterDistributions::land_water_factor);
  for (double t : {-0.4, 0.0}) {
    v.push_back({"glaciers' T_g0, " + number(tc::MemberParameters{}.glaciers.equilibrium_warming_k) + " K",
                 number(t) + " K", [t](tc::ProjectionOptions& o) { o.central.glaciers.equilibrium_warming_k = t; }});
  }
  return v;
}

std::vector<std::string> cells_of(const std::string& row) {
  std::vector<std::string> cells;
  std::istringstream in(row);
  std::string cell;
  std::getline(in, cell, '|');  // before the first bar
  while (std::getline(in, cell, '|')) {
    const auto first = cell.find_first_not_of(' ');
    const auto last = cell.find_last_not_of(' ');
    cells.push_back(first == std::string::npos ? "" : cell.substr(first, last - first + 1));
  }
  if (!cells.empty() && cells.back().empty()) cells.pop_back();
  return cells;
}

// The doc's rows between the markers, by their first two cells.
std::vector<std::vector<std::string>> doc_rows() {
  std::ifstream in(std::string(TIDEWRIGHT_SOURCE_DIR) + "/docs/methods-climate.md");
  std::vector<std::vector<std::string>> rows;
  bool inside = false;
  for (std::string line; std::getline(in, line);) {
    if (line == "<!-- prior-sensitivity -->") inside = true;
    else if (line == "<!-- /prior-sensitivity -->") inside = false;
    else if (inside && line.rfind("| ", 0) == 0 && line.find("---") == std::string::npos) rows.push_back(cells_of(line));
  }
  return rows;
}

}  // namespace

// Every row of the table equals the code's, to its printed 3 decimals (a tolerance of 0.0006 m
// for a last digit that rounds the other way in another build); a row the code no longer
// gives, or a row missing from the table, fails too.
TEST(PriorSensitivity, TableMatchesTheCode) {
  const auto rows = doc_rows();
  const auto vs = variants();
  EXPECT_EQ(rows.size(), vs.size() + 1) << "the table's rows (with its header) against the variants";
  std::vector<std::string> printed;
  double base = 0.0;
  for (std::size_t i = 0; i < vs.size(); ++i) {
    auto o = base_options();
    vs[i].apply(o);
    const Result r = allowance_2100(o);
    if (i == 0) base = r.allowance_m;
    char line[256];
    std::snprintf(line, sizeof line, "| %s | %s | %.3f ± %.3f | %+.3f |", vs[i].prior.c_str(), vs[i].value.c_str(),
                  r.allowance_m, r.standard_error_m, r.allowance_m - base);
    printed.emplace_back(line);
    if (i + 1 >= rows.size() || rows[i + 1].size() != 4U) {
      ADD_FAILURE() << "the table has no row " << i + 1 << " of four cells";
      continue;
    }
    const auto& row = rows[i + 1];
    EXPECT_EQ(row[0], vs[i].prior) << "row " << i + 1 << "; the code's row: " << line;
    EXPECT_EQ(row[1], vs[i].value) << line;
    double allowance = 0.0, se = 0.0, change = 0.0;
    EXPECT_EQ(std::sscanf(row[2].c_str(), "%lf ± %lf", &allowance, &se), 2) << row[2];
    EXPECT_EQ(std::sscanf(row[3].c_str(), "%lf", &change), 1) << row[3];
    EXPECT_NEAR(allowance, r.allowance_m, 6e-4) << line;
    EXPECT_NEAR(se, r.standard_error_m, 6e-4) << line;
    EXPECT_NEAR(change, r.allowance_m - base, 6e-4) << line;
  }
  if (HasFailure()) {
    std::string all;
    for (const auto& p : printed) all += p + "\n";
    ADD_FAILURE() << "the code's table:\n" << all;
  }
}
