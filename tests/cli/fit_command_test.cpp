// tidewright fit from the command line: the published Port Pirie example end to end, the JSON
// contract of issue 3, and bad inputs with one-line messages and exit code 2.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <sstream>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "support/run_cli.hpp"
#include "tidewright/common/atomic_output.hpp"

using tidewright::testing::count_lines;
using tidewright::testing::expect_one_line_error;
using tidewright::testing::read_all;
using tidewright::testing::run_cli;
using tidewright::testing::shell_quote;
using tidewright::testing::TempDir;
using ::testing::HasSubstr;
using ::testing::StartsWith;

namespace {
const std::string portpirie = std::string(TIDEWRIGHT_SOURCE_DIR) + "/tests/reference/data/portpirie.csv";

}  // namespace

// Coles (2001) §3.4.1, Port Pirie annual maxima 1923-1987: mu 3.87, sigma 0.198, xi -0.050,
// 100-year level 4.69 with delta-method interval [4.38, 5.00] and profile about [4.49, 5.26]
// (docs/references.md: secondary, confirmed against evd::fgev 3.8748, 0.19805, -0.05012).
TEST(FitCommand, PortPirieJsonMatchesColes) {
  TempDir dir;
  const auto json = dir / "fit.json";
  const auto r = run_cli("fit " + shell_quote(portpirie) + " --level-column level_m --datum 'gauge datum' --json " +
                         shell_quote(json.string()) + " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_TRUE(r.out.empty());
  const auto j = nlohmann::json::parse(read_all(json));
  EXPECT_EQ(j["model"], "gev");
  EXPECT_EQ(j["n"], 65);
  EXPECT_NEAR(j["parameters"]["location"].get<double>(), 3.8748, 5e-4);
  EXPECT_NEAR(j["parameters"]["scale"].get<double>(), 0.19805, 5e-5);
  EXPECT_NEAR(j["parameters"]["shape"].get<double>(), -0.05012, 5e-4);
  EXPECT_NEAR(j["log_likelihood"].get<double>(), 4.34, 5e-3);
  EXPECT_NEAR(j["standard_errors"]["shape"].get<double>(), 0.098, 1e-3);
  EXPECT_EQ(j["covariance"].size(), 3U);
  // One meaning of T (N_0 = 1/T), stated in the JSON with each level's AEP 1 - exp(-1/T); Coles'
  // F = 1 - 1/T puts his 100-year level 0.8 mm lower, inside the tolerance below.
  EXPECT_THAT(j["return_period_definition"].get<std::string>(), HasSubstr("exceeded on average once in T years"));
  bool saw_profile_100 = false, saw_delta_100 = false;
  for (const auto& l : j["return_levels"]) {
    const double t = l["return_period"].get<double>();
    EXPECT_NEAR(l["annual_exceedance_probability"].get<double>(), -std::expm1(-1.0 / t), 1e-15);
    if (l["method"] == "delta") {
      EXPECT_TRUE(l["approximate"].get<bool>());
    }
    if (l["return_period"] != 100) continue;
    EXPECT_NEAR(l["level"].get<double>(), 4.69, 5e-3);
    if (l["method"] == "profile") {
      saw_profile_100 = true;
      EXPECT_NEAR(l["lower"].get<double>(), 4.49, 1e-2);
      EXPECT_NEAR(l["upper"].get<double>(), 5.26, 1e-2);
    }
    if (l["method"] == "delta") {
      saw_delta_100 = true;
      EXPECT_NEAR(l["lower"].get<double>(), 4.38, 5e-3);
      EXPECT_NEAR(l["upper"].get<double>(), 5.00, 5e-3);
    }
  }
  EXPECT_TRUE(saw_profile_100 && saw_delta_100);
  EXPECT_EQ(j["present_day_model"]["family"], "gev");
  EXPECT_EQ(j["datum"], "gauge datum");
}

TEST(FitCommand, PrintsReadableSummaryWithCaution) {
  const auto r = run_cli("fit " + shell_quote(portpirie) + " --level-column level_m --model gumbel");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("Model: gumbel"));
  EXPECT_THAT(r.out, HasSubstr("return period (yr)"));
  EXPECT_THAT(r.out, HasSubstr("licensed coastal engineer"));
}

TEST(FitCommand, RefusesToOverwriteWithoutForce) {
  TempDir dir;
  const auto json = dir / "fit.json";
  tidewright::write_text_file(json, "{}", false);
  const auto args = "fit " + shell_quote(portpirie) + " --level-column level_m --quiet --json " + shell_quote(json.string());
  expect_one_line_error(run_cli(args), "already exists; choose another name or pass --force");
  EXPECT_EQ(read_all(json), "{}");
  EXPECT_EQ(run_cli(args + " --force").exit_code, 0);
}

TEST(FitCommand, BadInputsAreOneLineExitTwo) {
  TempDir dir;
  auto write = [&](const std::string& name, const std::string& text) {
    tidewright::write_text_file(dir / name, text, true);
    return shell_quote((dir / name).string());
  };
  expect_one_line_error(run_cli("fit " + shell_quote(portpirie)), "has no column 'level'");
  expect_one_line_error(run_cli("fit " + write("few.csv", "year,level\n2000,1.1\n2001,1.3\n2002,1.2\n")),
                        "few.csv");
  expect_one_line_error(run_cli("fit " + write("twice.csv", "year,level\n2000,1.1\n2001,1.3\n2001,1.2\n")),
                        "twice.csv:4");
  expect_one_line_error(run_cli("fit " + write("bad.csv", "year,level\n2000,1.1\n2001,x\n")), "bad.csv:3");
  expect_one_line_error(run_cli("fit " + write("times.csv", "time,level\n2020-01-01T00:00Z,1\n2019-13-01T00:00Z,2\n")),
                        "times.csv:3");
  expect_one_line_error(run_cli("fit " + shell_quote((dir / "absent.csv").string())), "absent.csv");
  expect_one_line_error(run_cli("fit " + shell_quote(portpirie) + " --level-column level_m --model weibull"), "--model");
  expect_one_line_error(run_cli("fit " + shell_quote(portpirie) + " --level-column level_m --return-periods 1,100"),
                        "return period of 1 year or less");
  expect_one_line_error(run_cli("fit " + shell_quote(portpirie) + " --level-column level_m --model gpd"),
                        "needs a water-level series");
}

TEST(FitCommand, PlotIsWrittenAsSvgOrPng) {
  TempDir dir;
  const auto base = "fit " + shell_quote(portpirie) + " --level-column level_m --quiet --plot ";
  ASSERT_EQ(run_cli(base + shell_quote((dir / "rl.png").string())).exit_code, 0);
  EXPECT_EQ(read_all(dir / "rl.png").substr(1, 3), "PNG");
  ASSERT_EQ(run_cli(base + shell_quote((dir / "rl.svg").string())).exit_code, 0);
  const auto svg = read_all(dir / "rl.svg");
  EXPECT_THAT(svg, HasSubstr("<svg"));
  EXPECT_THAT(svg, HasSubstr("Return period (years)"));
  expect_one_line_error(run_cli(base + shell_quote((dir / "rl.pdf").string())), "neither a .svg nor a .png");
  EXPECT_FALSE(std::filesystem::exists(dir / "rl.pdf"));
}

// Options that the record would ignore are refused with the option's name, exit 2: detrending
// or an epoch on annual maxima, an epoch without detrending, an epoch more than 10 years
// outside the record (record::max_epoch_outside_record_yr). Inside those bounds they run.
TEST(FitCommand, OptionsTheRecordWouldIgnoreAreRefused) {
  TempDir dir;
  const std::string am = shell_quote(portpirie) + " --level-column level_m";
  expect_one_line_error(run_cli("fit " + am + " --detrend linear"), "--detrend: removes a mean-sea-level trend");
  expect_one_line_error(run_cli("fit " + am + " --epoch 1950"), "--epoch: refers detrended series levels");
  EXPECT_EQ(run_cli("fit " + am + " --detrend none -q").exit_code, 0);
  // An invented six-hourly series of 2000-2011 (a tide-like sine), for the series rules.
  std::string text = "time,level\n";
  for (int y = 2000; y <= 2011; ++y) {
    for (int d = 1; d <= 28; ++d) {
      for (int m = 1; m <= 12; ++m) {
        for (int h = 0; h < 24; h += 6) {
          char line[64];
          std::snprintf(line, sizeof line, "%04d-%02d-%02dT%02d:00Z,%.3f\n", y, m, d, h,
                        1.0 + 0.5 * std::sin(0.5 * (d * 24 + h) + m + y));
          text += line;
        }
      }
    }
  }
  // Rows are grouped by day-of-month: sort them into time order.
  std::vector<std::string> rows;
  std::istringstream in(text.substr(text.find('\n') + 1));
  for (std::string line; std::getline(in, line);) rows.push_back(line);
  std::sort(rows.begin(), rows.end());
  std::string sorted = "time,level\n";
  for (const auto& r : rows) sorted += r + "\n";
  tidewright::write_text_file(dir / "series.csv", sorted, true);
  const std::string series = shell_quote((dir / "series.csv").string()) + " --model gumbel -q";
  expect_one_line_error(run_cli("fit " + series + " --epoch 2003"), "--epoch: sets the epoch of detrended levels");
  expect_one_line_error(run_cli("fit " + series + " --detrend linear --epoch 1980"),
                        "lies more than 10 years outside the record (2000-2011)");
  EXPECT_EQ(run_cli("fit " + series + " --detrend linear --epoch 2020").exit_code, 0);
  EXPECT_EQ(run_cli("fit " + series + " --detrend annual-mean --epoch 2003").exit_code, 0);
}

// A GEV shape above 0.2 gets a caution (study::still_water_shape_caution); Port Pirie's -0.05
// (Coles 2001, §3.4.1) does not. The heavy-tailed record is invented: Frechet-like maxima
// mu + sigma (E^-xi - 1)/xi with xi = 0.45 at evenly spaced plotting positions.
TEST(FitCommand, HeavyTailedStillWaterFitGetsACaution) {
  TempDir dir;
  std::string text = "year,level\n";
  const int n = 60;
  for (int i = 1; i <= n; ++i) {
    const double p = (i - 0.44) / (n + 0.12);  // Gringorten
    const double level = 2.0 + 0.2 * (std::pow(-std::log(p), -0.45) - 1.0) / 0.45;
    text += std::to_string(1950 + i) + "," + std::to_string(level) + "\n";
  }
  tidewright::write_text_file(dir / "heavy.csv", text, true);
  const auto heavy = run_cli("fit " + shell_quote((dir / "heavy.csv").string()) + " --model gev");
  EXPECT_EQ(heavy.exit_code, 0) << heavy.err;
  EXPECT_THAT(heavy.out, HasSubstr("above 0.200: still-water extremes are rarely this heavy-tailed"));
  const auto light = run_cli("fit " + shell_quote(portpirie) + " --level-column level_m");
  EXPECT_THAT(light.out, ::testing::Not(HasSubstr("rarely this heavy-tailed")));
}
