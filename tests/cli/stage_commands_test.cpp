// project, allowance and amplify from the command line: files passed between commands, the JSON
// contracts of issues 4 and 5, closed-form checks through the whole command chain, and bad
// inputs with one-line messages and exit code 2.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cstdio>
#include <sstream>

#include <cmath>
#include <nlohmann/json.hpp>

#include "support/run_cli.hpp"
#include "terrain/terrain_fixtures.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/extremes/still_water_model.hpp"
#include "tidewright/local/rise_ensemble.hpp"
#include "tidewright/study/stage_files.hpp"

using tidewright::testing::count_lines;
using tidewright::testing::expect_one_line_error;
using tidewright::testing::read_all;
using tidewright::testing::run_cli;
using tidewright::testing::shell_quote;
using tidewright::testing::TempDir;
using ::testing::HasSubstr;
using ::testing::StartsWith;

namespace {

// A Gumbel fit JSON and members drawn as mu + sigma * z for fixed normal scores, so the
// allowance has Hunter's closed form over the members: A = lambda ln mean(exp(Delta_i/lambda)).
struct GumbelCase {
  TempDir dir;
  std::string fit, members;
  double lambda = 0.1;
  std::vector<double> delta;
  GumbelCase() {
    nlohmann::ordered_json j;
    j["model"] = "gumbel";
    j["datum"] = "test datum";
    j["reference_epoch"] = nullptr;
    j["parameters"] = {{"location", 2.0}, {"scale", lambda}};
    j["covariance"] = {{1e-4, 0.0}, {0.0, 1e-4}};
    j["present_day_model"] = tidewright::study::still_water_model_json(
        {tidewright::extremes::Family::gumbel, 2.0, lambda, 0.0, 0.0, 1.0, {}});
    fit = (dir / "fit.json").string();
    tidewright::write_json_file(fit, j, false);
    tidewright::local::RiseEnsemble e;
    e.years = {2020, 2100};
    e.reference = "2020";
    e.scenario = "closed form";
    const int n = 201;
    e.rise_m.resize(n, 2);
    for (int i = 0; i < n; ++i) {
      const double z = -3.0 + 6.0 * i / (n - 1);
      e.rise_m(i, 0) = 0.0;
      e.rise_m(i, 1) = 0.5 + 0.1 * z;
      delta.push_back(e.rise_m(i, 1));
    }
    members = (dir / "members.csv").string();
    tidewright::study::write_members_csv(members, e, false);
  }
  // mean_i exp(Delta_i / lambda): the Gumbel expectation both closed forms rest on.
  [[nodiscard]] double mean_exp() const {
    double m = 0.0;
    for (double d : delta) m += std::exp(d / lambda) / static_cast<double>(delta.size());
    return m;
  }
};
}  // namespace

// Hunter (2012), Climatic Change 113:239, eq. for Gumbel: A = lambda ln E[exp(Delta/lambda)],
// here the expectation over the members exactly as the planning stage takes it.
TEST(StageCommands, AllowanceThroughTheCommandsMatchesHunterOverMembers) {
  GumbelCase c;
  const auto json = (c.dir / "a.json").string();
  const auto r = run_cli("allowance --fit " + shell_quote(c.fit) + " --members " + shell_quote(c.members) +
                         " --years 2100 --return-periods 10,100 --json " + shell_quote(json) + " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const double expected = c.lambda * std::log(c.mean_exp());
  const auto j = nlohmann::json::parse(read_all(json));
  ASSERT_EQ(j["allowances"].size(), 2U);
  for (const auto& a : j["allowances"]) {
    EXPECT_EQ(a["year"], 2100);
    EXPECT_NEAR(a["allowance_m"].get<double>(), expected, 1e-6);  // Gumbel: same for every return period
    EXPECT_NEAR(a["mean_rise_m"].get<double>(), 0.5, 1e-12);
  }
}

// Amplification of a level under Gumbel with members Delta_i: mean_i exp(Delta_i/lambda)
// (IPCC AR5 WG1 ch. 13 definition, over the members).
TEST(StageCommands, AmplifyThroughTheCommandsMatchesClosedForm) {
  GumbelCase c;
  const auto json = (c.dir / "am.json").string();
  const auto r = run_cli("amplify --fit " + shell_quote(c.fit) + " --members " + shell_quote(c.members) +
                         " --years 2100 --return-periods 100,10000 --json " + shell_quote(json) + " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const double mean_exp = c.mean_exp();  // about 245
  const auto j = nlohmann::json::parse(read_all(json));
  ASSERT_EQ(j["rows"].size(), 2U);
  // 10,000 years: every member's N_0(z - Delta_i) = 1e-4 exp(Delta_i/lambda) is at most 0.3 a
  // year, inside what an annual-maxima model can count: AF = mean exp(Delta/lambda) exactly.
  const auto& inside = j["rows"][1];
  EXPECT_FALSE(inside["beyond_annual_maxima_range"].get<bool>());
  EXPECT_NEAR(inside["amplification_factor"].get<double>() / mean_exp, 1.0, 1e-9);
  EXPECT_NEAR(inside["present_return_period"].get<double>(), 10000.0, 1e-4);
  EXPECT_NEAR(inside["future_return_period"].get<double>(), 10000.0 / mean_exp, 1e-6);
  // 100 years: members with 0.01 exp(Delta_i/lambda) > 1 a year can only be counted as at
  // least one exceedance a year, so the row gives bounds from L = mean min(0.01 exp(Delta_i/lambda), 1).
  double bound = 0.0;
  for (double d : c.delta) bound += std::min(0.01 * std::exp(d / c.lambda), 1.0) / static_cast<double>(c.delta.size());
  const auto& beyond = j["rows"][0];
  EXPECT_TRUE(beyond["beyond_annual_maxima_range"].get<bool>());
  EXPECT_TRUE(beyond["amplification_factor"].is_null());
  EXPECT_NEAR(beyond["amplification_factor_above"].get<double>(), bound / 0.01, 1e-6);
  EXPECT_TRUE(beyond["future_return_period"].is_null());
  EXPECT_NEAR(beyond["future_return_period_below"].get<double>(), 1.0 / bound, 1e-9);
  EXPECT_DOUBLE_EQ(beyond["members_beyond_model_range_fraction"].get<double>(), 0.0);
}

TEST(StageCommands, ProjectWritesContractAndMembersThatAllowanceReads) {
  TempDir dir;
  const auto json = (dir / "p.json").string();
  const auto members = (dir / "m.csv").string();
  const auto csv = (dir / "p.csv").string();
  const auto r = run_cli("project --pathway midway --samples 200 --last-year 2100 --json " + shell_quote(json) +
                         " --members " + shell_quote(members) + " --csv " + shell_quote(csv) + " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto j = nlohmann::json::parse(read_all(json));
  for (const char* k : {"reference", "years", "total", "components", "global_surface_temperature_K",
                        "ocean_heat_content_change_YJ"}) {
    EXPECT_TRUE(j.contains(k)) << k;
  }
  for (const char* k : {"thermal_expansion", "glaciers", "greenland", "antarctica", "land_water", "vertical_land_motion"}) {
    EXPECT_TRUE(j["components"].contains(k)) << k;
  }
  const auto& p50 = j["total"]["p50"];
  const auto& p05 = j["total"]["p05"];
  const auto& p95 = j["total"]["p95"];
  ASSERT_EQ(p50.size(), j["years"].size());
  for (std::size_t i = 0; i < p50.size(); ++i) {
    EXPECT_LE(p05[i].get<double>(), p50[i].get<double>());
    EXPECT_LE(p50[i].get<double>(), p95[i].get<double>());
  }
  EXPECT_TRUE(j["illustrative"].get<bool>());
  // The members' expansion efficiency (thermal expansion over ocean heat) is the drawn
  // N(0.12, 0.01) m per YJ (projection.hpp): 5/50/95 % at 0.1036, 0.12, 0.1364,
  // within the sampling error of quantiles of 200 members (about 0.0015; 3 of them allowed).
  const auto& eff = j["expansion_efficiency_m_per_YJ"];
  EXPECT_EQ(eff["members_used"].get<int>(), 200);
  EXPECT_NEAR(eff["p50"].get<double>(), 0.12, 0.0045);
  EXPECT_NEAR(eff["p05"].get<double>(), 0.12 - 1.6449 * 0.01, 0.0045);
  EXPECT_NEAR(eff["p95"].get<double>(), 0.12 + 1.6449 * 0.01, 0.0045);
  const auto e = tidewright::study::read_members_csv(members);
  EXPECT_EQ(e.member_count(), 200);
  EXPECT_EQ(e.years.front(), 2020);
  EXPECT_EQ(e.years.back(), 2100);
  const auto plot = (dir / "fan.svg").string();
  ASSERT_EQ(run_cli("project --pathway midway --samples 50 --last-year 2100 --quiet --plot " + shell_quote(plot)).exit_code, 0);
  EXPECT_THAT(read_all(plot), HasSubstr("Total (median)"));
  // The same seed gives the same bytes.
  const auto members2 = (dir / "m2.csv").string();
  ASSERT_EQ(run_cli("project --pathway midway --samples 200 --last-year 2100 --members " + shell_quote(members2) +
                    " --quiet").exit_code, 0);
  EXPECT_EQ(read_all(members), read_all(members2));
}

TEST(StageCommands, BadInputsAreOneLineExitTwo) {
  GumbelCase c;
  auto write = [&](const std::string& name, const std::string& text) {
    tidewright::write_text_file(c.dir / name, text, true);
    return shell_quote((c.dir / name).string());
  };
  expect_one_line_error(run_cli("project --pathway nowhere"), "nowhere");
  expect_one_line_error(run_cli("project --pathway midway --samples -5"), "--samples");
  expect_one_line_error(run_cli("project --forcing " + write("gap.csv", "year,forcing_w_m2\n2019,2.7\n2021,2.8\n")),
                        "gap.csv:3");
  expect_one_line_error(run_cli("project --forcing " + write("unsorted.csv", "year,forcing_w_m2\n2019,2.7\n2018,2.8\n")),
                        "unsorted.csv:3");
  expect_one_line_error(run_cli("project --table " + write("q.csv", "year,p05,p50,p95\n2050,0.3,0.2,0.4\n")), "q.csv");
  expect_one_line_error(run_cli("project --pathway midway --table " + write("q2.csv", "year,p50\n2050,0.2\n")),
                        "usage");
  const std::string base = "allowance --fit " + shell_quote(c.fit) + " --members " + shell_quote(c.members);
  expect_one_line_error(run_cli(base + " --return-periods 1"), "return period of 1 year or less");
  expect_one_line_error(run_cli(base + " --years 2200"), "year 2200");
  expect_one_line_error(run_cli("allowance --fit " + write("bad.json", "{") + " --members " + shell_quote(c.members)),
                        "bad.json");
  expect_one_line_error(run_cli("amplify --fit " + shell_quote(c.fit) + " --members " + shell_quote(c.members) +
                                " --return-periods 0.5"),
                        "return period of 1 year or less");
}

// Issue 5: refuse a record epoch that the projection cannot be joined to.
TEST(StageCommands, EpochThatDoesNotFitIsRefused) {
  GumbelCase c;
  auto j = nlohmann::json::parse(read_all(c.fit));
  j["reference_epoch"] = 1960.0;
  tidewright::write_text_file(c.fit, j.dump(), true);
  expect_one_line_error(run_cli("allowance --fit " + shell_quote(c.fit) + " --members " + shell_quote(c.members)),
                        "does not fit the record's epoch 1960.0");
  EXPECT_EQ(run_cli("allowance --fit " + shell_quote(c.fit) + " --members " + shell_quote(c.members) +
                    " --epoch-offset 0.1 --quiet")
                .exit_code,
            0);
}

// Issue 14: a forcing of 2000 W/m2 gave 6 km of Greenland melt by 2100 and a land motion of
// 1e300 mm/yr printed 60-digit numbers. Both are refused (docs/bad-inputs.md rows 87-88); a
// stress test runs on purpose with --accept-extreme, and a forcing just inside the range runs.
TEST(StageCommands, ProjectionInputsOutsideThePhysicalRangeNeedAcceptExtreme) {
  TempDir tmp;
  const auto csv = tmp / "forcing.csv";
  // Annual rows 1850-2150, a linear ramp from 0 to `end_w_m2` (an invented stress scenario).
  const auto ramp = [](double end_w_m2) {
    std::string text = "year,forcing_w_m2\n";
    for (int y = 1850; y <= 2150; ++y) {
      text += std::to_string(y) + "," + std::to_string(end_w_m2 * (y - 1850) / 300.0) + "\n";
    }
    return text;
  };
  tidewright::write_text_file(csv, ramp(16.0), false);
  const std::string base = "project --forcing " + shell_quote(csv.string()) + " --samples 20 --quiet --json ";
  const auto refused = run_cli(base + shell_quote((tmp / "a.json").string()));
  EXPECT_EQ(refused.exit_code, 2);
  EXPECT_THAT(refused.err, HasSubstr("outside the physical range -15 to 15 W/m2"));
  EXPECT_FALSE(std::filesystem::exists(tmp / "a.json"));
  const auto accepted = run_cli(base + shell_quote((tmp / "b.json").string()) + " --accept-extreme");
  EXPECT_EQ(accepted.exit_code, 0) << accepted.err;
  tidewright::write_text_file(csv, ramp(14.9), true);
  const auto inside = run_cli(base + shell_quote((tmp / "c.json").string()));
  EXPECT_EQ(inside.exit_code, 0) << inside.err;
}

// "-" sends a data output to standard output, the summary then goes to standard error; two
// outputs cannot both be "-".
TEST(StageCommands, DashWritesADataOutputToStandardOutput) {
  GumbelCase c;
  const std::string base = "allowance --fit " + shell_quote(c.fit) + " --members " + shell_quote(c.members) +
                           " --years 2100 --return-periods 100";
  const auto csv = run_cli(base + " --csv -");
  ASSERT_EQ(csv.exit_code, 0) << csv.err;
  EXPECT_THAT(csv.out, ::testing::StartsWith("kind,year,first_year,last_year,return_period_yr,present_level_m,allowance_m,"));
  EXPECT_EQ(count_lines(csv.out), 2U);
  EXPECT_THAT(csv.err, HasSubstr("tidewright allowance:"));
  const auto json = run_cli(base + " --json - --quiet");
  ASSERT_EQ(json.exit_code, 0) << json.err;
  EXPECT_NEAR(nlohmann::json::parse(json.out)["allowances"][0]["allowance_m"].get<double>(),
              c.lambda * std::log(c.mean_exp()), 1e-9);
  expect_one_line_error(run_cli(base + " --json - --csv -"), "--csv: sends a second output to standard output");
}

// The high-end ice-sheet storyline: a labelled variant whose `unchecked` 2100 95th percentile
// is about 2 m (AR6 WG1 SPM B.5.3: "approaching 2 m by 2100 ... cannot be ruled out" under
// SSP5-8.5; confirmed; climate::high_end_antarctic_multiplier), against 1.35 m assessed.
// The label reaches the JSON and the members file; a table source refuses it.
TEST(StageCommands, HighEndIceStorylineIsLabelledAndReachesAboutTwoMetres) {
  TempDir dir;
  const auto json = (dir / "p.json").string();
  const auto members = (dir / "m.csv").string();
  const auto r = run_cli("project --pathway unchecked --storyline high-end-ice --last-year 2100 --json " +
                         shell_quote(json) + " --members " + shell_quote(members) + " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto j = nlohmann::json::parse(read_all(json));
  EXPECT_THAT(j["scenario"].get<std::string>(), HasSubstr("high-end ice-sheet storyline"));
  EXPECT_THAT(j["notes"].dump(), HasSubstr("do not read its percentiles as likely ranges"));
  EXPECT_THAT(read_all(members), HasSubstr("high-end ice-sheet storyline"));
  const double p95 = j["total"]["p95"].back().get<double>();
  EXPECT_NEAR(p95, 2.0, 0.1);
  const auto assessed = run_cli("project --pathway unchecked --last-year 2100 --json - --quiet");
  ASSERT_EQ(assessed.exit_code, 0) << assessed.err;
  EXPECT_LT(nlohmann::json::parse(assessed.out)["total"]["p95"].back().get<double>(), p95 - 0.3);
  tidewright::write_text_file(dir / "q.csv", "year,p05,p50,p95\n2050,0.1,0.2,0.3\n2100,0.3,0.5,0.9\n", false);
  expect_one_line_error(run_cli("project --table " + shell_quote((dir / "q.csv").string()) +
                                " --storyline high-end-ice"),
                        "--storyline: applies to forcing-driven projections");
}

// In a study, library errors name the site-file keys the user wrote, not command flags they
// never typed: detrending set on annual maxima, and a land motion beyond the physical range
// (with the site file's way to accept it on purpose).
TEST(StageCommands, StudyErrorsNameTheSiteFileKeys) {
  TempDir dir;
  const std::string portpirie = std::string(TIDEWRIGHT_SOURCE_DIR) + "/tests/reference/data/portpirie.csv";
  const auto site = [&](const std::string& record_extra, const std::string& tail) {
    tidewright::write_text_file(dir / "site.toml",
                                "[site]\nname = \"Test\"\nwater_level_datum = \"test datum\"\n\n[record]\npath = \"" +
                                    portpirie + "\"\nkind = \"annual-maxima\"\nlevel_column = \"level_m\"\n" +
                                    record_extra + "\n[[scenario]]\nname = \"mid\"\npathway = \"midway\"\n" + tail,
                                true);
    return "study " + shell_quote((dir / "site.toml").string()) + " --quiet --out " + shell_quote((dir / "out").string());
  };
  expect_one_line_error(run_cli(site("detrend = \"linear\"\n", "")),
                        "site.toml: record.detrend: removes a mean-sea-level trend from a water-level series");
  const auto motion = run_cli(site("detrend = \"none\"\n", "\n[local]\nland_motion_mm_per_yr = 1e300\n"));
  expect_one_line_error(motion, "site.toml: local.land_motion_mm_per_yr: is 1e+300 mm/yr");
  EXPECT_THAT(motion.err, HasSubstr("set projection.accept_extreme = true to run it on purpose"));
  EXPECT_THAT(motion.err, ::testing::Not(HasSubstr("--")));
  // The map stage's inputs are named by their keys too: a DEM without a CRS asks for
  // map.dem_crs, a sea spread over all the land names map.sea_spread_to_m.
  std::vector<double> z;
  for (int r = 0; r < 3; ++r) z.insert(z.end(), {0.0, 0.5, 3.0, 1.0, 2.0});
  const auto dem = (dir / "dem.tif").string();
  tidewright::testing::write_raster(dem, 5, 3, tidewright::testing::utm_10m, 0, z);
  const std::string map = "\n[map]\ndem = \"" + dem + "\"\nsame_datum = true\n";
  const auto no_crs = run_cli(site("detrend = \"none\"\n", map));
  expect_one_line_error(no_crs, "the DEM has no coordinate reference system");
  EXPECT_THAT(no_crs.err, HasSubstr("give one with map.dem_crs"));
  EXPECT_THAT(no_crs.err, ::testing::Not(HasSubstr("--")));
  tidewright::testing::write_raster(dem, 5, 3, tidewright::testing::utm_10m, 32633, z);
  const auto sea = (dir / "sea.tif").string();
  std::vector<double> mask;
  for (int r = 0; r < 3; ++r) mask.insert(mask.end(), {1.0, 0.0, 0.0, 0.0, 0.0});
  tidewright::testing::write_raster(sea, 5, 3, tidewright::testing::utm_10m, 32633, mask);
  const auto spread =
      run_cli(site("detrend = \"none\"\n", map + "sea = \"" + sea + "\"\nsea_spread_to_m = 3.5\n"));
  expect_one_line_error(spread, "site.toml: map.sea_spread_to_m: the sea spread to 3.5 m covers all the land");
  EXPECT_THAT(spread.err, ::testing::Not(HasSubstr("--")));
}

// allowance --csv holds the design-life allowance, the risks of the given heights and the
// target height as rows of their own kind, numbers only: the risk row's probability equals
// the JSON's, and the target row's height has the target probability.
TEST(StageCommands, AllowanceCsvCarriesTheDesignLife) {
  GumbelCase c;
  const std::string base = "allowance --fit " + shell_quote(c.fit) + " --members " + shell_quote(c.members) +
                           " --years 2100 --return-periods 100 --design-life 2030-2100 --heights 3.5 --target-risk 0.1";
  const auto csv = run_cli(base + " --csv - --quiet");
  ASSERT_EQ(csv.exit_code, 0) << csv.err;
  std::istringstream lines(csv.out);
  std::string line;
  std::vector<std::string> kinds;
  std::getline(lines, line);  // header
  while (std::getline(lines, line)) {
    kinds.push_back(line.substr(0, line.find(',')));
    EXPECT_THAT(line, ::testing::Not(HasSubstr("inf"))) << line;
  }
  EXPECT_EQ(kinds, (std::vector<std::string>{"allowance", "design_life_allowance", "design_life_risk",
                                             "design_life_target"}));
  const auto json = run_cli(base + " --json - --quiet");
  ASSERT_EQ(json.exit_code, 0) << json.err;
  const auto j = nlohmann::json::parse(json.out);
  char p[32];
  std::snprintf(p, sizeof p, ",%.8f,", j["design_life"]["risks"][0]["probability"].get<double>());
  EXPECT_THAT(csv.out, HasSubstr(p));
  EXPECT_THAT(csv.out, HasSubstr(",0.10000000,"));
}
