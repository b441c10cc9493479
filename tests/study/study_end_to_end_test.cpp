// The study adds nothing and loses nothing: its JSON agrees with the stage commands run one by
// one on the same inputs (issue 7). Runs the small demo variant (invented data).
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <set>
#include <sstream>

#include "support/run_cli.hpp"
#include "tidewright/common/atomic_output.hpp"

using tidewright::testing::count_lines;
using tidewright::testing::read_all;
using tidewright::testing::run_cli;
using tidewright::testing::shell_quote;
using tidewright::testing::TempDir;
using ::testing::HasSubstr;
namespace fs = std::filesystem;

namespace {
class SmallDemo : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    dir_ = new TempDir();
    const auto r = run_cli("demo --small --quiet --out " + shell_quote((dir_->path() / "demo").string()));
    ASSERT_EQ(r.exit_code, 0) << r.err;
  }
  static void TearDownTestSuite() {
    delete dir_;
    dir_ = nullptr;
  }
  static fs::path demo() { return dir_->path() / "demo"; }
  static TempDir* dir_;
};
TempDir* SmallDemo::dir_ = nullptr;
// The demo site file's record settings (demo_coast/site.toml, small variant), as fit's options.
tidewright::testing::CliResult fit_demo_record(const fs::path& in, const nlohmann::json& results,
                                               const std::string& fit_json) {
  return run_cli("fit " + shell_quote((in / "quillhaven_tide_gauge.csv").string()) +
                 " --level-column level_m --sentinel -99 --min-completeness 0.8 --year-start-month 7"
                 " --detrend linear --epoch 2024 --datum " +
                 shell_quote(results["site"]["datum"].get<std::string>()) + " --json " + shell_quote(fit_json) +
                 " --quiet");
}

// Scenario 2 of the site file ("midway"), which draws with seed + 1 (docs/site-file.md).
tidewright::testing::CliResult project_demo_midway(const nlohmann::json& results, const std::string& members) {
  const auto seed = results["seed"].get<unsigned long long>() + 1;
  return run_cli("project --pathway midway --label midway --samples 300 --first-year 2020 --last-year 2150"
                 " --land-motion -0.5 --land-motion-sd 0.3 --seed " + std::to_string(seed) + " --members " +
                 shell_quote(members) + " --quiet");
}
}  // namespace

TEST_F(SmallDemo, WritesTheReportFolder) {
  const auto study = demo() / "study";
  for (const char* f : {"report.html", "results.json", "site.toml", "tables/design_heights.csv",
                        "plots/return_levels.svg", "plots/return_levels.png", "maps/threshold.tif", "maps/extent.tif",
                        "maps/aep.tif"}) {
    EXPECT_TRUE(fs::exists(study / f)) << f;
  }
  const std::string html = read_all(study / "report.html");
  EXPECT_THAT(html, HasSubstr("licensed coastal engineer"));
  EXPECT_THAT(html, HasSubstr("invented"));
  EXPECT_EQ(html.find("http://"), std::string::npos);
  EXPECT_EQ(html.find("https://"), std::string::npos);
  // The site file's map.sea_spread_to_m (mean high water springs, 3.70 m) reaches the map and the
  // report's assumptions.
  const auto maps = nlohmann::json::parse(read_all(study / "maps" / "summary.json"));
  EXPECT_THAT(maps["sea"].get<std::string>(), HasSubstr("cells it reaches at or below 3.7 m"));
  EXPECT_THAT(html, HasSubstr("at or below 3.70 m above"));
}

TEST_F(SmallDemo, FitAndAllowancesEqualTheStageCommands) {
  const auto in = demo() / "inputs";
  const auto results = nlohmann::json::parse(read_all(demo() / "study" / "results.json"));
  TempDir work;
  const auto fit_json = (work / "fit.json").string();
  // The demo site file's record settings (demo_coast/site.toml, small variant), as options.
  auto r = fit_demo_record(in, results, fit_json);
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto fit = nlohmann::json::parse(read_all(fit_json));
  for (const char* p : {"location", "scale", "shape"}) {
    EXPECT_EQ(fit["parameters"][p].get<double>(), results["fit"]["parameters"][p].get<double>()) << p;
  }
  EXPECT_EQ(fit["log_likelihood"].get<double>(), results["fit"]["log_likelihood"].get<double>());
  // Scenario 2 of the site file ("midway") draws with seed + 1 (docs/site-file.md).
  const auto members = (work / "m.csv").string();
  r = project_demo_midway(results, members);
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto allowance_json = (work / "a.json").string();
  r = run_cli("allowance --fit " + shell_quote(fit_json) + " --members " + shell_quote(members) +
              " --years 2050,2100 --return-periods 10,100,200 --json " + shell_quote(allowance_json) + " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto a = nlohmann::json::parse(read_all(allowance_json));
  const auto& study_rows = results["scenarios"][1]["allowances"];
  ASSERT_EQ(results["scenarios"][1]["name"], "midway");
  ASSERT_EQ(a["allowances"].size(), study_rows.size());
  for (std::size_t i = 0; i < study_rows.size(); ++i) {
    EXPECT_EQ(a["allowances"][i]["year"], study_rows[i]["year"]);
    EXPECT_NEAR(a["allowances"][i]["allowance_m"].get<double>(), study_rows[i]["allowance_m"].get<double>(), 1e-9);
    EXPECT_NEAR(a["allowances"][i]["present_level_m"].get<double>(), study_rows[i]["present_level_m"].get<double>(),
                1e-12);
  }
}

TEST_F(SmallDemo, SameInputsAndSeedGiveTheSameNumbers) {
  TempDir again;
  const auto out = again / "study";
  const auto r = run_cli("study " + shell_quote((demo() / "inputs" / "site.toml").string()) + " --quiet --out " +
                         shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(read_all(out / "results.json"), read_all(demo() / "study" / "results.json"));
  EXPECT_EQ(read_all(out / "tables" / "design_heights.csv"), read_all(demo() / "study" / "tables" / "design_heights.csv"));
}

TEST(StudyCommand, BadSiteFilesLeaveNoFolder) {
  TempDir dir;
  const auto out = dir / "out";
  auto check = [&](const std::string& text, const std::string& part) {
    tidewright::write_text_file(dir / "site.toml", text, true);
    const auto r = run_cli("study " + shell_quote((dir / "site.toml").string()) + " --quiet --out " +
                           shell_quote(out.string()));
    EXPECT_EQ(r.exit_code, 2) << r.err;
    EXPECT_THAT(r.err, HasSubstr(part));
    EXPECT_EQ(count_lines(r.err), 1U) << r.err;
    EXPECT_FALSE(fs::exists(out));
  };
  const std::string ok = "[site]\nname = \"t\"\nwater_level_datum = \"d\"\n[record]\npath = \"absent.csv\"\n"
                         "[[scenario]]\nname = \"m\"\npathway = \"midway\"\n";
  check(ok, "absent.csv");
  check(ok + "[extremes]\nmodle = \"gev\"\n", "extremes.modle: unknown key");
  check(ok + "[projection]\nmembers = \"x\"\n", "projection.members: must be a whole number");
}

TEST(StudyCommand, ExistingFolderIsRefusedWithoutForce) {
  TempDir dir;
  fs::create_directory(dir / "out");
  tidewright::write_text_file(dir / "out" / "notes.txt", "the user's own notes", false);
  tidewright::write_text_file(dir / "site.toml",
                              "[site]\nname = \"t\"\nwater_level_datum = \"d\"\n[record]\npath = \"a.csv\"\n"
                              "[[scenario]]\nname = \"m\"\npathway = \"midway\"\n",
                              true);
  const auto r = run_cli("study " + shell_quote((dir / "site.toml").string()) + " --out " + shell_quote((dir / "out").string()));
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_THAT(r.err, HasSubstr("already exists and is not empty; choose another folder or pass --force"));
  // Issue 14: --force replaces a previous run's output only, never a user's file.
  const auto forced = run_cli("study " + shell_quote((dir / "site.toml").string()) + " --out " +
                              shell_quote((dir / "out").string()) + " --force");
  EXPECT_EQ(forced.exit_code, 2);
  EXPECT_THAT(forced.err, HasSubstr("holds files this command did not write (notes.txt)"));
  EXPECT_TRUE(fs::exists(dir / "out" / "notes.txt"));
}

// Issue 7: the report loads in headless Chromium (Debian `chromium`) with no missing resource
// and no script error, and renders to a PNG (flags from ../shared/testing-tips.md).
TEST_F(SmallDemo, ReportRendersInChromium) {
  TempDir work;
  const auto png = work / "report.png";
  const auto log = work / "chromium.log";
  const std::string cmd =
      "chromium --headless --no-sandbox --disable-gpu --disable-quic --no-first-run "
      "--disable-background-networking --disable-component-update --disable-sync --enable-logging=stderr --v=0 "
      "--user-data-dir=" + shell_quote((work / "profile").string()) + " --window-size=1280,2000 --screenshot=" +
      shell_quote(png.string()) + " " + shell_quote("file://" + (demo() / "study" / "report.html").string()) + " >" +
      shell_quote(log.string()) + " 2>&1";
  ASSERT_EQ(std::system(cmd.c_str()), 0) << read_all(log);
  const std::string png_bytes = read_all(png);
  ASSERT_GT(png_bytes.size(), 10000U);
  EXPECT_EQ(png_bytes.substr(1, 3), "PNG");
  const std::string messages = read_all(log);
  EXPECT_EQ(messages.find("Failed to load resource"), std::string::npos) << messages;
  EXPECT_EQ(messages.find("Uncaught"), std::string::npos) << messages;
  EXPECT_EQ(messages.find("net::ERR_"), std::string::npos) << messages;
}

namespace {
// RFC 4180 fields of one line (the study's tables hold no line breaks inside fields).
std::vector<std::string> csv_fields(const std::string& line) {
  std::vector<std::string> out(1);
  bool quoted = false;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char ch = line[i];
    if (quoted && ch == '"' && i + 1 < line.size() && line[i + 1] == '"') {
      out.back() += '"';
      ++i;
    } else if (ch == '"') {
      quoted = !quoted;
    } else if (ch == ',' && !quoted) {
      out.emplace_back();
    } else {
      out.back() += ch;
    }
  }
  return out;
}
}  // namespace

// Issue 14: a script reads every table: snake_case headers, numbers (or true/false flags, or
// an empty cell) in every column but the names; no "< 1", "> 10", "inf" or "not shown".
TEST_F(SmallDemo, TableCsvsHoldNumbersOnly) {
  const std::set<std::string> text_columns{"scenario", "parameter"};
  int tables = 0;
  for (const auto& entry : fs::directory_iterator(demo() / "study" / "tables")) {
    ++tables;
    std::istringstream in(read_all(entry.path()));
    std::string line;
    ASSERT_TRUE(std::getline(in, line));
    const auto header = csv_fields(line);
    for (const auto& h : header) {
      EXPECT_TRUE(std::all_of(h.begin(), h.end(), [](char ch) { return std::islower(ch) || std::isdigit(ch) || ch == '_'; }))
          << entry.path().filename() << ": " << h;
    }
    int row = 0;
    while (std::getline(in, line)) {
      ++row;
      const auto cells = csv_fields(line);
      ASSERT_EQ(cells.size(), header.size()) << entry.path().filename() << " row " << row;
      for (std::size_t i = 0; i < cells.size(); ++i) {
        const auto& v = cells[i];
        if (text_columns.count(header[i]) != 0 || v.empty() || v == "true" || v == "false") continue;
        std::size_t used = 0;
        double x = std::nan("");
        try {
          x = std::stod(v, &used);
        } catch (const std::exception&) {
          used = 0;
        }
        EXPECT_TRUE(used == v.size() && std::isfinite(x))
            << entry.path().filename() << " row " << row << " column " << header[i] << ": '" << v << "'";
      }
    }
  }
  EXPECT_GE(tables, 10);
  EXPECT_TRUE(fs::exists(demo() / "study" / "tables" / "design_height_matrix_midway.csv"));
}

// Issue 14: the report says what shaped its numbers, with file names relative to the site file.
TEST_F(SmallDemo, ReportListsWhatShapedItsNumbers) {
  const std::string html = read_all(demo() / "study" / "report.html");
  for (const char* s : {"Design life", "2030-2080", "Heights of interest", "5.20, 6.00, 6.30 m above", "Epoch offset",
                        "Storminess change", "Fingerprint factors", "quillhaven_defences.geojson, crest attribute",
                        "features, crests", "water level = DEM elevation + 0.000 m", "Design heights, scenario midway",
                        "Low ground cut off from the sea", "Thermal expansion (median)"}) {
    EXPECT_THAT(html, HasSubstr(s)) << s;
  }
  EXPECT_EQ(html.find(demo().string()), std::string::npos) << "an absolute path in the report";
  const auto results = nlohmann::json::parse(read_all(demo() / "study" / "results.json"));
  EXPECT_EQ(results["fit"]["source"], "quillhaven_tide_gauge.csv");
  // The maps record the inputs as the site file names them too (issue 15).
  const auto maps = nlohmann::json::parse(read_all(demo() / "study" / "maps" / "summary.json"));
  EXPECT_THAT(maps["dem"].get<std::string>(), ::testing::StartsWith("quillhaven_dem.tif band 1"));
  EXPECT_THAT(maps["sea"].get<std::string>(), HasSubstr("sea polygons quillhaven_sea.geojson layer"));
  EXPECT_THAT(maps["defences"].get<std::string>(), ::testing::StartsWith("quillhaven_defences.geojson ("));
}

// One function per planning answer: the study's design-life, emergence and amplification JSON
// are the `allowance` and `amplify` commands' own, on the same fit and members.
TEST_F(SmallDemo, DesignLifeEmergenceAndAmplificationAreTheCommandsOwn) {
  const auto in = demo() / "inputs";
  const auto results = nlohmann::json::parse(read_all(demo() / "study" / "results.json"));
  TempDir work;
  const auto fit_json = (work / "fit.json").string();
  auto r = fit_demo_record(in, results, fit_json);
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto members = (work / "m.csv").string();
  r = project_demo_midway(results, members);
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto& study = results["scenarios"][1];
  ASSERT_EQ(study["name"], "midway");
  // demo_coast/site.toml: design life 2030-2080, target 0.1, heights 5.2, 6.0, 6.3.
  const auto a_json = (work / "a.json").string();
  r = run_cli("allowance --fit " + shell_quote(fit_json) + " --members " + shell_quote(members) +
              " --design-life 2030-2080 --heights 5.2,6.0,6.3 --target-risk 0.1 --json " + shell_quote(a_json) +
              " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto a = nlohmann::json::parse(read_all(a_json));
  EXPECT_EQ(a["design_life"]["risks"], study["design_life"]["risks"]);
  EXPECT_EQ(a["design_life"]["target"], study["design_life"]["target"]);
  EXPECT_EQ(study["design_life"].count("allowances"), 0U) << "the study asks for no design-life allowance";
  // The study follows today's 10-, 100- and 200-year levels and the heights of interest.
  const auto m_json = (work / "m.json").string();
  r = run_cli("amplify --fit " + shell_quote(fit_json) + " --members " + shell_quote(members) +
              " --years 2050,2100 --return-periods 10,100,200 --levels 5.2,6.0,6.3 --json " + shell_quote(m_json) +
              " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto m = nlohmann::json::parse(read_all(m_json));
  EXPECT_EQ(m["emergence"], study["emergence"]);
  EXPECT_EQ(m["rows"], study["amplification"]);
  ASSERT_EQ(study["emergence"].size(), 6U);
}

// The study's choices are site-file keys: the first-year raster's scenario and the figures' span.
TEST_F(SmallDemo, FirstYearScenarioAndFigureSpanAreSiteFileKeys) {
  TempDir work;
  fs::copy(demo() / "inputs", work / "inputs");
  const auto site = work / "inputs" / "site.toml";
  std::string text = read_all(site);
  const auto at = text.find("[map]\n");
  ASSERT_NE(at, std::string::npos);
  text.insert(at + 6, "first_year_scenario = \"restrained\"\n");
  text += "\n[figures]\nplot_last_year = 2100\nplot_step_yr = 10\n";
  tidewright::write_text_file(site, text, true);
  const auto r = run_cli("study " + shell_quote(site.string()) + " --quiet --out " + shell_quote((work / "s").string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const std::string html = read_all(work / "s" / "report.html");
  EXPECT_THAT(html, HasSubstr("% (scenario restrained)"));
  EXPECT_THAT(read_all(demo() / "study" / "report.html"), HasSubstr("% (scenario unchecked)"));
  // The design-height figure's years: 2020 to 2100 every 10 years, 9 points per scenario line,
  // where the defaults give 2020 to 2150 every 5 years, 27 points.
  const auto points = [](const std::string& svg) {
    const auto from = svg.find("class=\"series\" d=\"");
    const auto to = svg.find('"', from + 19);
    return std::count(svg.begin() + static_cast<std::ptrdiff_t>(from), svg.begin() + static_cast<std::ptrdiff_t>(to), 'L') + 1;
  };
  EXPECT_EQ(points(read_all(work / "s" / "plots" / "design_heights.svg")), 9);
  EXPECT_EQ(points(read_all(demo() / "study" / "plots" / "design_heights.svg")), 27);
}
