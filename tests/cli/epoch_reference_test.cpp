// Issue 12: the commonest study (an hourly record detrended to its middle, a built-in pathway
// measured from 1995-2014) runs by default, as a study and as fit -> project -> allowance; an
// epoch outside both the reference period and the projected years is still refused with a
// hint naming the input the user can set. Records here are generated test data (a
// semi-diurnal tide plus an AR(1) surge), not measurements.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <nlohmann/json.hpp>
#include <random>
#include <string>

#include "support/run_cli.hpp"
#include "tidewright/common/atomic_output.hpp"

using ::testing::HasSubstr;
using tidewright::testing::expect_one_line_error;
using tidewright::testing::read_all;
using tidewright::testing::run_cli;
using tidewright::testing::shell_quote;
using tidewright::testing::TempDir;

namespace {

bool is_leap(int y) { return (y % 4 == 0 && y % 100 != 0) || y % 400 == 0; }

// Hourly levels from 1 January `first_year` to 31 December `last_year`, UTC, seeded.
std::string hourly_record(int first_year, int last_year) {
  std::mt19937_64 rng(20261201);
  std::normal_distribution<double> noise(0.0, 0.05);
  std::string out = "time,level_m\n";
  out.reserve(static_cast<std::size_t>(last_year - first_year + 1) * 8784 * 30);
  static constexpr int days_in[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  double surge = 0.0;
  long long hour = 0;
  char line[64];
  for (int y = first_year; y <= last_year; ++y) {
    for (int m = 1; m <= 12; ++m) {
      const int days = days_in[m - 1] + (m == 2 && is_leap(y) ? 1 : 0);
      for (int d = 1; d <= days; ++d) {
        for (int h = 0; h < 24; ++h, ++hour) {
          surge = 0.97 * surge + noise(rng);
          const auto t = static_cast<double>(hour);
          const double level = 2.5 + 0.003 * t / 8766.0 + 1.2 * std::cos(2.0 * M_PI * t / 12.4206) +
                               0.4 * std::cos(2.0 * M_PI * t / 12.0) + surge;
          std::snprintf(line, sizeof line, "%04d-%02d-%02dT%02d:00:00Z,%.3f\n", y, m, d, h, level);
          out += line;
        }
      }
    }
  }
  return out;
}

// The smallest site file docs/site-file.md allows: a site, a detrended hourly record, one pathway.
std::string minimal_site(const std::string& extra = "") {
  return "[site]\nname = \"Test harbour (generated)\"\nwater_level_datum = \"test datum\"\n\n"
         "[record]\npath = \"gauge.csv\"\nlevel_column = \"level_m\"\ndetrend = \"linear\"\n\n"
         "[[scenario]]\nname = \"midway\"\npathway = \"midway\"\n" +
         extra;
}

nlohmann::json notes_of_first_scenario(const std::filesystem::path& results) {
  const auto j = nlohmann::json::parse(read_all(results));
  return j.at("scenarios").at(0).at("notes");
}

}  // namespace

TEST(EpochAndReference, MinimalStudyWithAnHourlyRecordRuns) {
  TempDir dir;
  tidewright::write_text_file(dir / "gauge.csv", hourly_record(1990, 2019), false);
  tidewright::write_text_file(dir / "site.toml", minimal_site(), false);
  const auto r = run_cli("study " + shell_quote((dir / "site.toml").string()) + " --out " +
                         shell_quote((dir / "out").string()) + " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto j = nlohmann::json::parse(read_all(dir / "out" / "results.json"));
  // The record's middle: 1990.0 to 2020.0 (the fit's epoch, to within the missing last hour).
  EXPECT_NEAR(j["fit"]["reference_epoch"].get<double>(), 2005.0, 0.01);
  const auto& scenario = j["scenarios"][0];
  EXPECT_EQ(scenario["projection"]["reference_period"],
            (nlohmann::json{{"first_year", 1995}, {"last_year", 2014}}));
  EXPECT_THAT(scenario["notes"][0].get<std::string>(),
              HasSubstr("lies in the projection's reference period 1995-2014 mean"));
  EXPECT_THAT(read_all(dir / "out" / "report.html"), HasSubstr("reference period 1995-2014 mean"));
}

TEST(EpochAndReference, FitProjectAllowanceInARow) {
  TempDir dir;
  const auto q = [&](const std::string& name) { return shell_quote((dir / name).string()); };
  tidewright::write_text_file(dir / "gauge.csv", hourly_record(1990, 2019), false);
  const auto fit =
      run_cli("fit " + q("gauge.csv") + " --level-column level_m --detrend linear --json " +
              q("f.json") + " --quiet");
  ASSERT_EQ(fit.exit_code, 0) << fit.err;
  const auto project =
      run_cli("project --pathway midway --samples 200 --last-year 2100 --members " + q("m.csv") +
              " --json " + q("p.json") + " --quiet");
  ASSERT_EQ(project.exit_code, 0) << project.err;
  EXPECT_THAT(read_all(dir / "m.csv"), HasSubstr("\n# reference_period: 1995-2014\n"));
  EXPECT_EQ(nlohmann::json::parse(read_all(dir / "p.json"))["reference_period"],
            (nlohmann::json{{"first_year", 1995}, {"last_year", 2014}}));
  const auto allowance =
      run_cli("allowance --fit " + q("f.json") + " --members " + q("m.csv") +
              " --years 2100 --return-periods 100 --json " + q("a.json") + " --quiet");
  ASSERT_EQ(allowance.exit_code, 0) << allowance.err;
  const auto a = nlohmann::json::parse(read_all(dir / "a.json"));
  EXPECT_THAT(a.dump(),
              HasSubstr(R"("projection_reference_period":{"first_year":1995,"last_year":2014})"));
  EXPECT_THAT(a.dump(), HasSubstr("lies in the projection's reference period 1995-2014 mean"));
}

// A record of 1960-1989 has its epoch at 1975.0: outside 1995-2014 and before 2020.
TEST(EpochAndReference, EpochOutsideBothIsRefusedUntilTheOffsetIsStated) {
  TempDir dir;
  const auto q = [&](const std::string& name) { return shell_quote((dir / name).string()); };
  tidewright::write_text_file(dir / "gauge.csv", hourly_record(1960, 1989), false);
  tidewright::write_text_file(dir / "site.toml", minimal_site(), false);
  const auto refused = run_cli("study " + q("site.toml") + " --out " + q("out") + " --quiet");
  expect_one_line_error(
      refused, "lies neither in the projected years 2020-2150 nor in the reference period");
  EXPECT_THAT(refused.err, HasSubstr("site.toml: planning.epoch_offset_m"));
  EXPECT_FALSE(std::filesystem::exists(dir / "out")) << "nothing half-written";

  // The offset stated in the site file: the study runs and says what it did.
  tidewright::write_text_file(dir / "offset.toml",
                              minimal_site("\n[planning]\nepoch_offset_m = 0.075\n"), false);
  const auto r = run_cli("study " + q("offset.toml") + " --out " + q("out") + " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(notes_of_first_scenario(dir / "out" / "results.json")[0].get<std::string>(),
              HasSubstr("rise shifted by 0.075 m"));

  // The same through the commands: refused, then accepted with --epoch-offset.
  ASSERT_EQ(run_cli("fit " + q("gauge.csv") + " --level-column level_m --detrend linear --json " +
                    q("f.json") + " --quiet")
                .exit_code,
            0);
  ASSERT_EQ(run_cli("project --pathway midway --samples 100 --last-year 2100 --members " +
                    q("m.csv") + " --quiet")
                .exit_code,
            0);
  const std::string allowance =
      "allowance --fit " + q("f.json") + " --members " + q("m.csv") + " --years 2100";
  const auto cmd_refused = run_cli(allowance);
  expect_one_line_error(cmd_refused, "does not fit the record's epoch 1975.0");
  EXPECT_THAT(cmd_refused.err, HasSubstr("with --epoch-offset"));
  EXPECT_EQ(run_cli(allowance + " --epoch-offset 0.075 --quiet").exit_code, 0);
}
