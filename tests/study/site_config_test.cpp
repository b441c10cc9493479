// The site file: keys read strictly, errors with key path and line, paths relative to the file.
#include "tidewright/study/site_config.hpp"

#include "tidewright/study/fit_stage.hpp"
#include "tidewright/study/option_names.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <filesystem>

#include "support/run_cli.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"

using tidewright::InputError;
using tidewright::study::load_site_file;
using tidewright::testing::TempDir;
using ::testing::HasSubstr;

namespace {
const char* minimal = R"(# a minimal site
[site]
name = "Test harbour"
water_level_datum = "test datum"

[record]
path = "data/gauge.csv"

[[scenario]]
name = "medium"
pathway = "middle-road"
)";

std::string error_for(const TempDir& dir, const std::string& text) {
  tidewright::write_text_file(dir / "site.toml", text, true);
  try {
    (void)load_site_file(dir / "site.toml");
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

// The minimal site file reading `csv` as annual maxima with r-largest columns, and asking for the
// r-largest model.
std::string r_largest_site(const std::string& csv) {
  std::string text = minimal;
  text.replace(text.find("path = \"data/gauge.csv\""), 23,
               "path = \"" + csv + "\"\nkind = \"annual-maxima\"\nr_largest_columns = [\"second\", \"third\"]");
  return text + "\n[extremes]\nmodel = \"rlargest\"\n";
}
}  // namespace

TEST(SiteConfig, MinimalFileGetsDocumentedDefaults) {
  TempDir dir;
  tidewright::write_text_file(dir / "site.toml", minimal, false);
  const auto c = load_site_file(dir / "site.toml");
  EXPECT_EQ(c.site.name, "Test harbour");
  EXPECT_EQ(c.fit.input, (dir / "data/gauge.csv").lexically_normal());
  EXPECT_EQ(c.fit.kind, tidewright::study::RecordKind::series);
  EXPECT_EQ(c.fit.series.detrend, tidewright::record::DetrendMethod::linear);
  EXPECT_EQ(c.figures.plot_last_year, 2150);
  EXPECT_EQ(c.local.ocean_dynamic_year, 2100);
  EXPECT_TRUE(c.map.first_year_scenario.empty());
  EXPECT_TRUE(c.notes.empty());
  EXPECT_DOUBLE_EQ(c.fit.series.min_completeness, 0.75);
  EXPECT_DOUBLE_EQ(c.fit.series.separation_h, 72.0);
  ASSERT_EQ(c.scenarios.size(), 1U);
  EXPECT_EQ(c.scenarios[0].pathway, "middle-road");
  EXPECT_FALSE(c.map.enabled);
}

TEST(SiteConfig, UnknownKeyNamesPathAndLine) {
  TempDir dir;
  const auto m = error_for(dir, std::string(minimal) + "\n[planning]\ndesign_yeers = [2100]\n");
  EXPECT_THAT(m, HasSubstr("site.toml:14: planning.design_yeers: unknown key"));
}

TEST(SiteConfig, MissingRequiredKeyIsNamed) {
  TempDir dir;
  const auto m = error_for(dir, "[site]\nname = \"x\"\n[record]\npath = \"a.csv\"\n");
  EXPECT_THAT(m, HasSubstr("site.water_level_datum: required key is missing"));
}

TEST(SiteConfig, WrongTypeAndBadChoiceAreNamed) {
  TempDir dir;
  auto m = error_for(dir, std::string(minimal) + "[extremes]\nmodel = \"weibull\"\n");
  EXPECT_THAT(m, HasSubstr("site.toml:13: extremes.model: is 'weibull'; use one of: gumbel, gev, gpd, rlargest, auto"));
  m = error_for(dir, std::string(minimal) + "[projection]\nmembers = \"many\"\n");
  EXPECT_THAT(m, HasSubstr("projection.members: must be a whole number"));
}

TEST(SiteConfig, SyntaxErrorNamesLine) {
  TempDir dir;
  const auto m = error_for(dir, "[site]\nname = \"x\n");
  EXPECT_THAT(m, HasSubstr("site.toml:2: not valid TOML"));
}

TEST(SiteConfig, MapNeedsDatumRelation) {
  TempDir dir;
  const auto m = error_for(dir, std::string(minimal) + "[map]\ndem = \"dem.tif\"\n");
  EXPECT_THAT(m, HasSubstr("map.dem: the relation between the DEM's datum and the water-level datum is not given"));
}

TEST(SiteConfig, ImpossibleValuesAreRefused) {
  TempDir dir;
  EXPECT_THAT(error_for(dir, std::string(minimal) + "[planning]\ndesign_life = [2100, 2030]\n"),
              HasSubstr("planning.design_life: ends before it starts"));
  EXPECT_THAT(error_for(dir, std::string(minimal) + "[planning]\ntarget_risk = 1.5\n"),
              HasSubstr("planning.target_risk: must lie in (0, 1)"));
  EXPECT_THAT(error_for(dir, std::string(minimal) + "[local.fingerprints]\nice = 1.1\n"),
              HasSubstr("local.fingerprints.ice: unknown component"));
}

TEST(SiteConfig, SeaSpreadLevelIsReadAndMustBeFinite) {
  TempDir dir;
  const std::string map = "[map]\ndem = \"dem.tif\"\nsame_datum = true\nsea = \"sea.geojson\"\n";
  tidewright::write_text_file(dir / "site.toml",
                              std::string(minimal) + map + "sea_spread_to_m = 1.1\n", false);
  const auto c = load_site_file(dir / "site.toml");
  ASSERT_TRUE(c.map.sea_spread_to_m);
  EXPECT_DOUBLE_EQ(*c.map.sea_spread_to_m, 1.1);
  EXPECT_THAT(error_for(dir, std::string(minimal) + map + "sea_spread_to_m = nan\n"),
              HasSubstr("map.sea_spread_to_m"));
}

TEST(SiteConfig, MapWindowAndSeaLayerAreRead) {
  TempDir dir;
  const std::string map = "[map]\ndem = \"dem.tif\"\nsame_datum = true\nsea = \"sea.gpkg\"\n";
  tidewright::write_text_file(dir / "site.toml",
                              std::string(minimal) + map +
                                  "sea_layer = \"sea\"\nsea_where = \"kind = 'sea'\"\nwindow = [0.0, 10.0, 5.0, 2.0]\n",
                              false);
  const auto c = load_site_file(dir / "site.toml");
  EXPECT_EQ(c.map.sea_layer, "sea");
  EXPECT_EQ(c.map.sea_where, "kind = 'sea'");
  ASSERT_TRUE(c.map.window);
  EXPECT_EQ(*c.map.window, (std::array<double, 4>{0.0, 10.0, 5.0, 2.0}));
  EXPECT_THAT(error_for(dir, std::string(minimal) + map + "window = [0.0, 1.0]\n"), HasSubstr("map.window"));
}

TEST(SiteConfig, ValuesTakeTheCommandLinesSpellingAndTheOlderOneWithANote) {
  TempDir dir;
  const std::string with_record = std::string(minimal) + "";
  // The command line's spelling (fit --kind annual-maxima, --detrend annual-mean).
  std::string text = with_record;
  text.replace(text.find("path = \"data/gauge.csv\"\n"), 24,
               "path = \"data/gauge.csv\"\nkind = \"annual-maxima\"\ndetrend = \"annual-mean\"\n");
  tidewright::write_text_file(dir / "site.toml", text, true);
  auto c = load_site_file(dir / "site.toml");
  EXPECT_EQ(c.fit.kind, tidewright::study::RecordKind::annual_maxima);
  EXPECT_EQ(c.fit.series.detrend, tidewright::record::DetrendMethod::annual_mean);
  EXPECT_TRUE(c.notes.empty());
  // The older site-file spelling: the same values, and a note naming key and line.
  text = with_record;
  text.replace(text.find("path = \"data/gauge.csv\"\n"), 24,
               "path = \"data/gauge.csv\"\nkind = \"annual_maxima\"\ndetrend = \"annual_mean\"\n");
  tidewright::write_text_file(dir / "site.toml", text, true);
  c = load_site_file(dir / "site.toml");
  EXPECT_EQ(c.fit.kind, tidewright::study::RecordKind::annual_maxima);
  EXPECT_EQ(c.fit.series.detrend, tidewright::record::DetrendMethod::annual_mean);
  ASSERT_EQ(c.notes.size(), 2U);
  EXPECT_THAT(c.notes[0], HasSubstr("site.toml:8: record.kind: 'annual_maxima' is the older spelling of 'annual-maxima'"));
  EXPECT_THAT(c.notes[1], HasSubstr("record.detrend: 'annual_mean' is the older spelling"));
  // Neither spelling: refused, listing the names.
  EXPECT_THAT(error_for(dir, std::string(minimal) + "\n[[scenario]]\nname = \"x\"\npathway = \"p\"\nstoryline = \"worst\"\n"),
              HasSubstr("scenario[1].storyline: is 'worst'; use one of: assessed, high-end-ice"));
}

TEST(SiteConfig, FigureGridOceanRampAndFirstYearScenarioAreKeys) {
  TempDir dir;
  const std::string text = std::string(minimal) +
                           "\n[[scenario]]\nname = \"high\"\npathway = \"unchecked\"\n"
                           "\n[local]\nocean_dynamic_offset_m = 0.1\nocean_dynamic_year = 2080\n"
                           "\n[map]\ndem = \"dem.tif\"\nsame_datum = true\nfirst_year_scenario = \"medium\"\n"
                           "\n[figures]\nplot_last_year = 2120\nplot_step_yr = 10\nrisk_curve_from_return_period_yr = 5\n"
                           "risk_curve_step_m = 0.1\nrisk_curve_points = 11\n";
  tidewright::write_text_file(dir / "site.toml", text, false);
  const auto c = load_site_file(dir / "site.toml");
  EXPECT_EQ(c.local.ocean_dynamic_year, 2080);
  EXPECT_EQ(tidewright::study::first_year_scenario(c).name, "medium");
  EXPECT_EQ(c.figures.plot_last_year, 2120);
  EXPECT_EQ(c.figures.plot_step_yr, 10);
  EXPECT_DOUBLE_EQ(c.figures.risk_curve_from_return_period_yr, 5.0);
  EXPECT_DOUBLE_EQ(c.figures.risk_curve_step_m, 0.1);
  EXPECT_EQ(c.figures.risk_curve_points, 11);
  // Without the key, the first-year raster follows the last scenario listed.
  std::string without = text;
  without.erase(without.find("first_year_scenario = \"medium\"\n"), 31);
  tidewright::write_text_file(dir / "site.toml", without, true);
  EXPECT_EQ(tidewright::study::first_year_scenario(load_site_file(dir / "site.toml")).name, "high");
  std::string wrong = text;
  wrong.replace(wrong.find("\"medium\"\n\n[figures]"), 8, "\"middle\"");
  EXPECT_THAT(error_for(dir, wrong), HasSubstr("map.first_year_scenario: names no [[scenario]] ('middle'); name one of: medium, high"));
  EXPECT_THAT(error_for(dir, std::string(minimal) + "\n[figures]\nrisk_curve_points = 1\n"),
              HasSubstr("figures.risk_curve_points: must be 2 to 1000"));
}

// Two scenarios of one name would overwrite each other's tables and figures: refused at the second.
TEST(SiteConfig, ScenarioNamesAreUnique) {
  TempDir dir;
  const auto m = error_for(dir, std::string(minimal) + "\n[[scenario]]\nname = \"medium\"\npathway = \"midway\"\n");
  EXPECT_THAT(m, HasSubstr("site.toml:14: scenario[1].name: repeats the name 'medium' of an earlier [[scenario]]"));
}

// Design years and return periods are read sorted and once each, so the largest leads the
// headline and figures however the file lists them; r-largest columns are a [record] key, and
// errors about them and about the model name the site-file keys.
TEST(SiteConfig, PlanningListsAreSortedAndRLargestColumnsAreRead) {
  TempDir dir;
  tidewright::write_text_file(dir / "site.toml",
                              std::string(minimal) +
                                  "\n[planning]\ndesign_years = [2100, 2050, 2100]\nreturn_periods = [100, 10, 50]\n",
                              false);
  auto c = load_site_file(dir / "site.toml");
  EXPECT_EQ(c.planning.design_years, (std::vector<int>{2050, 2100}));
  EXPECT_EQ(c.planning.return_periods_yr, (std::vector<double>{10.0, 50.0, 100.0}));
  tidewright::write_text_file(dir / "site.toml", r_largest_site("data/gauge.csv"), true);
  c = load_site_file(dir / "site.toml");
  EXPECT_EQ(c.fit.read.r_largest_columns, (std::vector<std::string>{"second", "third"}));
  EXPECT_EQ(c.fit.model, "rlargest");
  EXPECT_EQ(c.fit.r_columns_input, "record.r_largest_columns");
  EXPECT_THAT(c.fit.model_input, HasSubstr("site.toml: extremes.model"));
  EXPECT_EQ(c.fit.gev_choice, "extremes.model = \"gev\"");
}

// A study can fit the r-largest model: the site file's columns reach the reader, and the fit
// uses the second and third values of each year (invented annual maxima, 20 years).
TEST(SiteConfig, RLargestFitRunsFromTheSiteFile) {
  TempDir dir;
  std::string csv = "year,level,second,third\n";
  for (int k = 0; k < 20; ++k) {
    const double top = 2.0 + 0.05 * ((k * 7) % 11);
    csv += std::to_string(1990 + k) + "," + std::to_string(top) + "," + std::to_string(top - 0.08 - 0.01 * (k % 3)) + "," +
           std::to_string(top - 0.15 - 0.01 * (k % 4)) + "\n";
  }
  std::filesystem::create_directories(dir / "data");
  tidewright::write_text_file(dir / "data/maxima.csv", csv, false);
  std::string text = r_largest_site("data/maxima.csv");
  tidewright::write_text_file(dir / "site.toml", text, false);
  const auto c = load_site_file(dir / "site.toml");
  const auto r = tidewright::study::run_fit_stage(c.fit);
  EXPECT_EQ(r.model, "rlargest");
  EXPECT_EQ(r.fit.n, 20U);
  // Without the columns the message names the site-file keys, not the command's flags.
  text.replace(text.find("r_largest_columns = [\"second\", \"third\"]"), 39, "");
  tidewright::write_text_file(dir / "site.toml", text, true);
  try {
    (void)tidewright::study::run_fit_stage(load_site_file(dir / "site.toml").fit);
    ADD_FAILURE() << "a fit without r-largest columns was accepted";
  } catch (const InputError& e) {
    EXPECT_THAT(e.what(), HasSubstr("name them with record.r_largest_columns, or choose extremes.model = \"gev\""));
    EXPECT_THAT(e.what(), ::testing::Not(HasSubstr("--")));
  }
}

// Names that differ only where the file names do not (a space against '_', or case) would
// also overwrite each other's files.
TEST(SiteConfig, ScenarioNamesGiveDistinctFileNames) {
  TempDir dir;
  const auto m = error_for(dir, std::string(minimal) + "\n[[scenario]]\nname = \"Medium\"\npathway = \"midway\"\n");
  EXPECT_THAT(m, HasSubstr("scenario[1].name: 'Medium' gives the same file names as the earlier [[scenario]] 'medium'"));
  EXPECT_EQ(tidewright::study::scenario_file_stem("high end/2"), "high_end_2");
}
