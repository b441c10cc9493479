// tidewright map: help, a good run on a small DEM written here (answers worked out by hand), and
// each bad input: one line on stderr naming the file or option, exit code 2, no output folder.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "support/run_cli.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "terrain/terrain_fixtures.hpp"

using ::testing::HasSubstr;
using ::testing::StartsWith;
using tidewright::testing::count_lines;
using tidewright::testing::read_all;
using tidewright::testing::run_cli;
using tidewright::testing::shell_quote;
using tidewright::testing::TempDir;
using tidewright::testing::utm_10m;
using tidewright::testing::write_raster;
using tidewright::testing::write_vector;

namespace {

// 5 x 3, rows alike: sea 0 | beach 0.5 | ridge 3 | bowl 1 | slope 2 (10 m cells, UTM 33N).
std::string profile_dem(const TempDir& tmp, int epsg = 32633) {
  const auto path = (tmp / "dem.tif").string();
  std::vector<double> z;
  for (int r = 0; r < 3; ++r) z.insert(z.end(), {0.0, 0.5, 3.0, 1.0, 2.0});
  write_raster(path, 5, 3, utm_10m, epsg, z);
  return path;
}

void expect_input_error(const tidewright::testing::CliResult& r, const std::string& text,
                        const std::filesystem::path& out) {
  EXPECT_EQ(r.exit_code, 2) << r.err;
  EXPECT_THAT(r.err, StartsWith("tidewright: error: "));
  EXPECT_THAT(r.err, HasSubstr(text));
  EXPECT_EQ(count_lines(r.err), 1U) << r.err;
  EXPECT_FALSE(std::filesystem::exists(out));
}

}  // namespace

TEST(MapCommand, HelpNamesTheInputsAndExitsZero) {
  const auto r = run_cli("map --help");
  EXPECT_EQ(r.exit_code, 0);
  for (const char* opt : {"--dem", "--same-datum", "--datum-offset-raster", "--sea", "--sea-point",
                          "--defences", "--connectivity", "--level", "--gev", "--rise", "--cog"}) {
    EXPECT_THAT(r.out, HasSubstr(opt));
  }
  EXPECT_THAT(run_cli("--help").out, HasSubstr("map"));
}

TEST(MapCommand, GoodRunWritesTheSummaryWorkedOutByHand) {
  // Level 1.5: the three beach cells flood (depth 1.0 m, 100 m2 each); the bowls are low-lying
  // but behind the 3 m ridge (3 cut-off cells). Level 3.5: all 12 land cells flood,
  // volume 100 x 3 x (3.0 + 0.5 + 2.5 + 1.5) = 2250 m3, deepest 3.0 m on the beach.
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const auto out = tmp / "maps";
  const auto r = run_cli("map --dem " + shell_quote(dem) +
                         " --same-datum --sea-edge-below 0 --level 1.5 --level 3.5 --quiet --out " +
                         shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_TRUE(r.out.empty());
  EXPECT_EQ(read_all(out / "summary.csv"),
            "level_m,year,scenario,connected_cells,cut_off_cells,flooded_area_m2,"
            "cut_off_area_m2,volume_m3,max_depth_m\n"
            "1.5000,,,3,3,300.00,300.00,300.00,1.0000\n"
            "3.5000,,,12,0,1200.00,0.00,2250.00,3.0000\n");
  for (const char* f : {"threshold.tif", "extent.tif", "depth.tif", "summary.json"}) {
    EXPECT_TRUE(std::filesystem::exists(out / f)) << f;
  }
  // Printed table without --quiet; the existing folder is refused without --force.
  const auto again =
      run_cli("map --dem " + shell_quote(dem) +
              " --same-datum --sea-edge-below 0 --level 1.5 --out " + shell_quote(out.string()));
  EXPECT_EQ(again.exit_code, 2);
  EXPECT_THAT(again.err, HasSubstr("already exists"));
  EXPECT_THAT(again.err, HasSubstr("--force"));
  EXPECT_TRUE(std::filesystem::exists(out / "depth.tif"));  // untouched
  const auto forced = run_cli("map --dem " + shell_quote(dem) +
                              " --same-datum --sea-edge-below 0 --level 1.5 --force --out " +
                              shell_quote(out.string()));
  EXPECT_EQ(forced.exit_code, 0) << forced.err;
  EXPECT_THAT(forced.out, HasSubstr("1.500"));
  EXPECT_THAT(forced.out, HasSubstr("Cautions:"));
  EXPECT_THAT(read_all(out / "summary.csv"), HasSubstr("1.5000,,,3,3,300.00"));
  EXPECT_THAT(read_all(out / "summary.csv"), ::testing::Not(HasSubstr("3.5000")));
  // Issue 14: --force once deleted every file in the folder. A user's notes and sea polygon
  // put beside the outputs are never deleted: the run is refused with their names.
  tidewright::write_text_file(out / "notes.txt", "site visit notes", false);
  tidewright::write_text_file(out / "sea.geojson", "{}", false);
  const auto kept = run_cli("map --dem " + shell_quote(dem) +
                            " --same-datum --sea-edge-below 0 --level 1.5 --force --quiet --out " +
                            shell_quote(out.string()));
  EXPECT_EQ(kept.exit_code, 2);
  EXPECT_THAT(kept.err, HasSubstr("did not write (notes.txt, sea.geojson)"));
  EXPECT_EQ(read_all(out / "notes.txt"), "site visit notes");
  EXPECT_EQ(read_all(out / "sea.geojson"), "{}");
  EXPECT_TRUE(std::filesystem::exists(out / "depth.tif"));
  // Lists of numbers take the same syntax as in allowance and amplify: "--level 1.5,3.5".
  const auto listed = tmp / "listed";
  ASSERT_EQ(run_cli("map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1.5,3.5 --quiet --out " +
                    shell_quote(listed.string()))
                .exit_code,
            0);
  EXPECT_THAT(read_all(listed / "summary.csv"), HasSubstr("\n3.5000,,,12,0,1200.00"));
}

TEST(MapCommand, AepAndFirstYearFromAStatedRise) {
  // Gumbel mu 1.0, sigma 0.5: the bowl's threshold is 3 m. First year the AEP reaches 0.1:
  // c_t = mu + rise_t - sigma ln(-ln 0.9) = 1.0 + rise_t + 1.1252; with rises 0.5 (2050) and
  // 1.0 (2100), the bowl (3 m) passes in 2100; the beach (0.5 m) is below today's c_0 = 2.13 m,
  // so it passes already today (code 1), not in the first year given.
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const auto out = tmp / "maps";
  const auto r = run_cli("map --dem " + shell_quote(dem) +
                         " --same-datum --sea-edge-below 0 --gumbel 1.0,0.5 --rise 2050=0.5"
                         " --rise 2100=1.0 --aep-pass 0.1 --quiet --out " +
                         shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  GDALDatasetUniquePtr first(GDALDataset::Open((out / "first_year.tif").c_str(), GDAL_OF_RASTER));
  ASSERT_TRUE(first);
  std::vector<std::int16_t> y(15);
  ASSERT_EQ(first->GetRasterBand(1)->RasterIO(GF_Read, 0, 0, 5, 3, y.data(), 5, 3, GDT_Int16, 0, 0,
                                              nullptr),
            CE_None);
  EXPECT_EQ(std::vector<std::int16_t>(y.begin(), y.begin() + 5),
            (std::vector<std::int16_t>{-32768, 1, 2100, 2100, 2100}));
  GDALDatasetUniquePtr aep(GDALDataset::Open((out / "aep.tif").c_str(), GDAL_OF_RASTER));
  ASSERT_TRUE(aep);
  EXPECT_EQ(aep->GetRasterCount(), 3);  // present day, 2050, 2100
}

TEST(MapCommand, BadInputsAreOneLineExitTwoAndLeaveNothing) {
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const auto out = tmp / "maps";
  const std::string tail = " --level 1 --out " + shell_quote(out.string());
  const std::string good = "map --dem " + shell_quote(dem) + " --same-datum";

  expect_input_error(run_cli("map --dem " + shell_quote((tmp / "nope.tif").string()) +
                             " --same-datum --sea-edge-below 0" + tail),
                     "the DEM file does not exist", out);
  expect_input_error(run_cli("map --dem " + shell_quote(dem) + " --sea-edge-below 0" + tail),
                     "--same-datum", out);
  expect_input_error(run_cli(good + tail), "no sea is given", out);
  expect_input_error(run_cli(good + " --sea-edge-below -1" + tail), "no sea cell found", out);

  TempDir other;
  const auto no_crs = profile_dem(other, 0);
  expect_input_error(
      run_cli("map --dem " + shell_quote(no_crs) + " --same-datum --sea-edge-below 0" + tail),
      "no coordinate reference system", out);

  const auto far = (tmp / "far.gpkg").string();
  write_vector(far, "GPKG", 32633, {{"POLYGON((0 0,10 0,10 10,0 10,0 0))", {}}}, "");
  expect_input_error(run_cli(good + " --sea " + shell_quote(far) + tail), "covers no cell", out);

  const auto walls = (tmp / "walls.gpkg").string();
  write_vector(walls, "GPKG", 32633, {{"LINESTRING(500020 6000000,500020 5999970)", {}}}, "height");
  expect_input_error(run_cli(good + " --sea-edge-below 0 --defences " + shell_quote(walls) + tail),
                     "no crest-level attribute 'crest_m'", out);

  const auto offset = (tmp / "offset.tif").string();
  write_raster(offset, 2, 2, {20.0, 0.1, 0.0, 10.0, 0.0, -0.1}, 4326, {0, 0, 0, 0});
  expect_input_error(run_cli("map --dem " + shell_quote(dem) + " --datum-offset-raster " +
                             shell_quote(offset) + " --sea-edge-below 0" + tail),
                     "does not cover", out);

  const auto blank = (tmp / "blank.tif").string();
  write_raster(blank, 2, 2, utm_10m, 32633, {-1, -1, -1, -1}, -1.0);
  expect_input_error(
      run_cli("map --dem " + shell_quote(blank) + " --same-datum --sea-edge-below 0" + tail),
      "every cell of the DEM is nodata", out);

  expect_input_error(run_cli(good + " --datum-offset 0.1 --sea-edge-below 0" + tail),
                     "more than one datum relation", out);
  expect_input_error(run_cli(good + " --sea-edge-below 0 --rise 2050=0.3" + tail),
                     "needs a present-day still-water model", out);
}

TEST(MapCommand, ModelJsonGivesTheSameAepAsTheOptions) {
  // The JSON form of the hand-stated present-day model (docs/map.md) against --gumbel with the
  // same parameters: band 1 of aep.tif must agree cell for cell; a bad family is refused.
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const auto json = tmp / "model.json";
  {
    std::ofstream out(json);
    out << R"({"family": "gumbel", "location_m": 1.0, "scale_m": 0.5})";
  }
  const std::string base =
      "map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --quiet";
  ASSERT_EQ(run_cli(base + " --model-json " + shell_quote(json.string()) + " --out " +
                    shell_quote((tmp / "a").string()))
                .exit_code,
            0);
  ASSERT_EQ(
      run_cli(base + " --gumbel 1.0,0.5 --out " + shell_quote((tmp / "b").string())).exit_code, 0);
  const auto band = [](const std::filesystem::path& p) {
    GDALDatasetUniquePtr ds(GDALDataset::Open(p.c_str(), GDAL_OF_RASTER));
    std::vector<float> v(15);
    if (!ds || ds->GetRasterBand(1)->RasterIO(GF_Read, 0, 0, 5, 3, v.data(), 5, 3, GDT_Float32, 0,
                                              0, nullptr) != CE_None) {
      v.clear();
    }
    return v;
  };
  const auto a = band(tmp / "a" / "aep.tif");
  const auto b = band(tmp / "b" / "aep.tif");
  ASSERT_EQ(a.size(), 15U);
  for (std::size_t i = 1; i < 5; ++i) EXPECT_EQ(a[i], b[i]) << i;
  EXPECT_NEAR(a[1], -std::expm1(-std::exp(-(0.5 - 1.0) / 0.5)), 1e-6);  // beach, T = 0.5 m
  {
    std::ofstream out(json);
    out << R"({"family": "weibull", "scale_m": 0.5})";
  }
  expect_input_error(run_cli(base + " --model-json " + shell_quote(json.string()) + " --out " +
                             shell_quote((tmp / "c").string())),
                     "is not gumbel, gev or gpd", tmp / "c");
}

namespace {

std::vector<float> read_band(const std::filesystem::path& file, int band, int cols, int rows) {
  GDALDatasetUniquePtr ds(GDALDataset::Open(file.c_str(), GDAL_OF_RASTER));
  std::vector<float> v(static_cast<std::size_t>(cols) * static_cast<std::size_t>(rows), -1.0F);
  if (!ds || ds->GetRasterBand(band)->RasterIO(GF_Read, 0, 0, cols, rows, v.data(), cols, rows, GDT_Float32, 0, 0,
                                               nullptr) != CE_None) {
    ADD_FAILURE() << "cannot read band " << band << " of " << file;
  }
  return v;
}

}  // namespace

TEST(MapCommand, AepAndLevelsFromProjectionMembers) {
  // Gumbel mu 1.0 m, sigma 0.5 m, so N_0(z) = exp(-(z - 1)/0.5) (Coles 2001, eq. 3.2 with xi = 0);
  // two members rise 0.2 and 0.4 m by 2050, so N_2050(z) = mean_i exp(-(z - 1 - d_i)/0.5)
  // (design.md), worked out here with std::exp, not with the library.
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  {
    std::ofstream fit(tmp / "fit.json");
    fit << R"({"present_day_model": {"family": "gumbel", "location_m": 1.0, "scale_m": 0.5}, "datum": "test datum"})";
    std::ofstream members(tmp / "members.csv");
    members << "# scenario: two members\nmember,2020,2050,2100\n1,0,0.2,0.6\n2,0,0.4,1.0\n";
  }
  const auto out = tmp / "maps";
  const auto r = run_cli("map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --fit " +
                         shell_quote((tmp / "fit.json").string()) + " --members " +
                         shell_quote((tmp / "members.csv").string()) +
                         " --years 2050,2100 --return-periods 10 --aep-pass 0.1 --first-year-step 10 --depth-per-level --out " +
                         shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("note: water-level datum: test datum"));
  // Issue 15 item 5: every file names the fit and members it came from, and the datum; each
  // level's depths also stand alone (--depth-per-level), equal to depth.tif's band.
  GDALDatasetUniquePtr depth(GDALDataset::Open((out / "depth.tif").c_str(), GDAL_OF_RASTER));
  ASSERT_TRUE(depth);
  EXPECT_THAT(std::string(depth->GetMetadataItem("TIDEWRIGHT_FIT")), HasSubstr("fit.json"));
  EXPECT_THAT(std::string(depth->GetMetadataItem("TIDEWRIGHT_MEMBERS")), HasSubstr("members.csv"));
  EXPECT_STREQ(depth->GetMetadataItem("TIDEWRIGHT_WATER_LEVEL_DATUM"), "test datum");
  EXPECT_STREQ(depth->GetRasterBand(1)->GetMetadataItem("RETURN_PERIOD_YR"), "10.0000");
  for (int k = 1; k <= depth->GetRasterCount(); ++k) {
    const auto own = read_band(out / ("depth_level_" + std::to_string(k) + ".tif"), 1, 5, 3);
    const auto band = read_band(out / "depth.tif", k, 5, 3);
    for (std::size_t i = 0; i < own.size(); ++i) {
      EXPECT_TRUE(own[i] == band[i] || (std::isnan(own[i]) && std::isnan(band[i]))) << "level " << k << " cell " << i;
    }
  }
  const auto n0 = [](double z) { return std::exp(-(z - 1.0) / 0.5); };
  const auto n2050 = [](double z) { return 0.5 * (std::exp(-(z - 1.2) / 0.5) + std::exp(-(z - 1.4) / 0.5)); };
  const auto aep = [](double n) { return 1.0 - std::exp(-n); };
  const auto today = read_band(out / "aep.tif", 1, 5, 3);
  const auto in2050 = read_band(out / "aep.tif", 2, 5, 3);
  // Tolerance: float32 storage (6e-8 relative) and the lookup's bound, 1e-9 here (ln N of each
  // member is linear in z; the mixture's curvature over 2.5 mm steps).
  for (const auto& [col, z] : std::vector<std::pair<int, double>>{{1, 0.5}, {2, 3.0}, {3, 3.0}, {4, 3.0}}) {
    EXPECT_NEAR(today[static_cast<std::size_t>(col)], aep(n0(z)), 1e-6) << "column " << col;
    EXPECT_NEAR(in2050[static_cast<std::size_t>(col)], aep(n2050(z)), 1e-6) << "column " << col;
  }
  // Today's 10-year level: N_0(z) = 1/10, T as an average recurrence interval (planning's
  // convention, include/tidewright/planning/future_exceedance.hpp); the 2050 level z' keeps the
  // expected number of exceedances: N_2050(z') = N_0(z) (Hunter 2012).
  const double n_target = 0.1;
  const double z_today = 1.0 - 0.5 * std::log(n_target);
  const double z_2050 = 1.0 + 0.5 * std::log(0.5 * (std::exp(0.4) + std::exp(0.8)) / n_target);
  const std::string summary = read_all(out / "summary.csv");
  char buf[64];
  std::snprintf(buf, sizeof buf, "\n%.4f,,present day,", z_today);
  EXPECT_THAT(summary, HasSubstr(buf));
  std::snprintf(buf, sizeof buf, "\n%.4f,2050,two members,", z_2050);
  EXPECT_THAT(summary, HasSubstr(buf));
  // First year (every 10 years from 2020) the AEP reaches 0.1: the beach (0.5 m) already today
  // (code 1; today's c_0 = 1 - 0.5 ln(-ln 0.9) = 2.13 m);
  // the 3 m cells never by 2100 (N_2100(3) = mean(exp(-(2 - d)/0.5)) = 0.093 < -ln 0.9 = 0.105).
  GDALDatasetUniquePtr first(GDALDataset::Open((out / "first_year.tif").c_str(), GDAL_OF_RASTER));
  ASSERT_TRUE(first);
  std::vector<std::int16_t> y(5);
  ASSERT_EQ(first->GetRasterBand(1)->RasterIO(GF_Read, 0, 0, 5, 1, y.data(), 5, 1, GDT_Int16, 0, 0, nullptr), CE_None);
  EXPECT_EQ(y, (std::vector<std::int16_t>{-32768, 1, 0, 0, 0}));
}

TEST(MapCommand, ProjectionOptionsRefuseWhatDoesNotFit) {
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  {
    std::ofstream fit(tmp / "fit.json");
    fit << R"({"present_day_model": {"family": "gumbel", "location_m": 1.0, "scale_m": 0.5}})";
    std::ofstream members(tmp / "members.csv");
    members << "member,2020,2050\n1,0,0.2\n";
  }
  const std::string base = "map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 ";
  const std::string fit = " --fit " + shell_quote((tmp / "fit.json").string());
  const std::string members = " --members " + shell_quote((tmp / "members.csv").string());
  const auto out = tmp / "out";
  const std::string tail = " --out " + shell_quote(out.string());
  expect_input_error(run_cli(base + members + " --years 2050" + tail), "--members: a projection needs the fit", out);
  expect_input_error(run_cli(base + fit + members + " --years 2300" + tail), "year 2300: lies outside the projection",
                     out);
  expect_input_error(run_cli(base + fit + " --years 2050" + tail), "--years: mapping projected years needs", out);
  expect_input_error(run_cli(base + fit + members + " --rise 2050=0.3" + tail), "were both given", out);
  expect_input_error(run_cli(base + fit + members + " --gumbel 1,0.5" + tail), "were both given", out);
  expect_input_error(run_cli(base + fit + " --return-periods 1" + tail), "return period", out);
  // Without members these would be ignored silently.
  expect_input_error(run_cli(base + fit + " --level 1 --storminess-scale-per-yr 0.001" + tail),
                     "applies to projection members, and none were given", out);
}

TEST(MapCommand, LongScenarioLabelsGetAKeySoRowsStayNarrow) {
  // A label over 16 characters is shown as S1 in the table, with the key below it; a short one
  // as itself. The summary files keep the full label.
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const std::string label = "a long scenario label (illustrative, not official)";
  const auto r = run_cli("map --dem " + shell_quote(dem) +
                         " --same-datum --sea-edge-below 0 --level 1.5 --scenario " +
                         shell_quote(label) + " --out " + shell_quote((tmp / "long").string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.out, HasSubstr("  S1: " + label + "\n"));
  std::size_t widest = 0;
  std::istringstream lines(r.out);
  for (std::string line; std::getline(lines, line);) {
    if (line.find("1.500") != std::string::npos) widest = std::max(widest, line.size());
  }
  EXPECT_GT(widest, 0U);
  // Measured: keyed rows are 123 characters wide; with the label in them they were 165.
  EXPECT_LT(widest, label.size() + 80);
  EXPECT_THAT(read_all(tmp / "long" / "summary.csv"), HasSubstr(label));
  const auto short_label =
      run_cli("map --dem " + shell_quote(dem) +
              " --same-datum --sea-edge-below 0 --level 1.5 --scenario high --out " +
              shell_quote((tmp / "short").string()));
  ASSERT_EQ(short_label.exit_code, 0) << short_label.err;
  EXPECT_THAT(short_label.out, HasSubstr(" high "));
  EXPECT_THAT(short_label.out, ::testing::Not(HasSubstr("S1:")));
}

TEST(MapCommand, SeaSpreadMakesTheBeachSeaAndSaysSo) {
  // The profile DEM spread to 0.5 m: the beach (T 0.5) becomes sea, so at 1.5 m no land floods
  // and the bowl behind the ridge stays cut off (3 cells); 6 sea cells in the summary.
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const auto out = tmp / "maps";
  const auto r = run_cli("map --dem " + shell_quote(dem) +
                         " --same-datum --sea-edge-below 0 --sea-spread-to 0.5 --level 1.5 --quiet "
                         "--out " +
                         shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(read_all(out / "summary.csv"),
            "level_m,year,scenario,connected_cells,cut_off_cells,flooded_area_m2,"
            "cut_off_area_m2,volume_m3,max_depth_m\n"
            "1.5000,,,0,3,0.00,300.00,0.00,0.0000\n");
  const auto summary = nlohmann::json::parse(read_all(out / "summary.json"));
  EXPECT_EQ(summary["sea_cells"], 6);
  EXPECT_THAT(summary["sea"].get<std::string>(), HasSubstr("at or below 0.5 m"));
}

TEST(MapCommand, ProgressBarInGdalsStyleUnlessQuiet) {
  // GDAL's terminal progress ("0...10...20 ... 100 - done.") on standard output; --quiet leaves
  // standard output empty.
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const std::string args =
      "map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1.5 --out ";
  const auto loud = run_cli(args + shell_quote((tmp / "loud").string()));
  ASSERT_EQ(loud.exit_code, 0) << loud.err;
  EXPECT_THAT(loud.out, HasSubstr("0...10...20...30...40...50...60...70...80...90...100 - done."));
  const auto quiet = run_cli(args + shell_quote((tmp / "quiet").string()) + " --quiet");
  ASSERT_EQ(quiet.exit_code, 0) << quiet.err;
  EXPECT_EQ(quiet.out, "");
  EXPECT_EQ(quiet.err, "");
}

// Inputs that touch nothing run but say so (issue: GIS edges): defences off the DEM, defences
// whose crests are all below the ground, and a common fill value (-9999) on more than three
// cells without being declared nodata. Declared, the fill value raises no warning.
TEST(MapCommand, InputsThatTouchNothingAreWarnedAbout) {
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const std::string base = "map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1.5 --out ";
  const auto far = (tmp / "far.gpkg").string();
  write_vector(far, "GPKG", 32633, {{"LINESTRING(0 0,10 0)", 5.0}});
  const auto off = run_cli(base + shell_quote((tmp / "a").string()) + " --defences " + shell_quote(far));
  EXPECT_EQ(off.exit_code, 0) << off.err;
  EXPECT_THAT(off.err, HasSubstr("touch none of the DEM's cells, so they change nothing"));
  const auto low = (tmp / "low.gpkg").string();
  // Along the ridge column (x 500020-500030, 3 m ground) with a 1 m crest.
  write_vector(low, "GPKG", 32633, {{"LINESTRING(500025 6000000,500025 5999970)", 1.0}});
  const auto under = run_cli(base + shell_quote((tmp / "b").string()) + " --defences " + shell_quote(low));
  EXPECT_EQ(under.exit_code, 0) << under.err;
  EXPECT_THAT(under.err, HasSubstr("every defence crest is at or below the ground under it"));
  // A 6 x 3 DEM whose last column holds -9999 (4 of 18 cells would do; 3 are there plus one).
  const auto filled = (tmp / "filled.tif").string();
  std::vector<double> z;
  for (int r = 0; r < 3; ++r) z.insert(z.end(), {0.0, 0.5, 3.0, 1.0, 2.0, -9999.0});
  z[4] = -9999.0;
  write_raster(filled, 6, 3, utm_10m, 32633, z);
  const std::string filled_base =
      "map --dem " + shell_quote(filled) + " --same-datum --sea-edge-below 0 --level 1.5 --quiet --out ";
  const auto undeclared = run_cli(filled_base + shell_quote((tmp / "c").string()));
  EXPECT_EQ(undeclared.exit_code, 0) << undeclared.err;
  EXPECT_THAT(undeclared.err, HasSubstr("4 cells hold -9999, a common no-data value, but it is not declared nodata"));
  const auto declared = run_cli(filled_base + shell_quote((tmp / "d").string()) + " --dem-nodata -9999");
  EXPECT_EQ(declared.exit_code, 0) << declared.err;
  EXPECT_THAT(declared.err, ::testing::Not(HasSubstr("common no-data value")));
}

// The recorded command line is shell-quoted, so it can be pasted back: a path with a space and
// a quote survives a POSIX shell's reading.
TEST(MapCommand, RecordedCommandLineIsShellQuoted) {
  TempDir tmp;
  const auto dir = tmp / "survey 2026's";
  std::filesystem::create_directories(dir);
  std::vector<double> z;
  for (int r = 0; r < 3; ++r) z.insert(z.end(), {0.0, 0.5, 3.0, 1.0, 2.0});
  const auto dem = (dir / "dem.tif").string();
  write_raster(dem, 5, 3, utm_10m, 32633, z);
  const auto out = tmp / "maps";
  ASSERT_EQ(run_cli("map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1.5 --quiet --out " +
                    shell_quote(out.string()))
                .exit_code,
            0);
  const auto j = nlohmann::json::parse(read_all(out / "summary.json"));
  const std::string command = j["command"].get<std::string>();
  EXPECT_THAT(command, HasSubstr("--dem '" + tmp.path().string() + "/survey 2026'\\''s/dem.tif'"));
  // Pasted back into a shell, the words are the original ones.
  const std::string words = command.substr(command.find("--dem"));
  FILE* pipe = popen(("printf '%s\\n' " + words).c_str(), "r");
  ASSERT_NE(pipe, nullptr);
  std::string echoed;
  char buf[512];
  std::size_t n = 0;
  while ((n = std::fread(buf, 1, sizeof buf, pipe)) > 0) echoed.append(buf, n);
  ASSERT_EQ(pclose(pipe), 0);
  EXPECT_THAT(echoed, HasSubstr("\n" + dem + "\n"));
}

namespace {
struct LayerSpec {
  std::string name;
  std::vector<std::pair<std::string, std::string>> features;  // WKT, kind
};
// A vector file of the given layers, each feature with a text field `kind` (UTM 33N).
void write_layers(const std::string& path, const std::string& driver, const std::vector<LayerSpec>& layers) {
  GDALAllRegister();
  GDALDriver* drv = GetGDALDriverManager()->GetDriverByName(driver.c_str());
  GDALDatasetUniquePtr ds(drv->Create(path.c_str(), 0, 0, 0, GDT_Unknown, nullptr));
  OGRSpatialReference srs;
  srs.importFromEPSG(32633);
  srs.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  for (const auto& spec : layers) {
    OGRLayer* layer = ds->CreateLayer(spec.name.c_str(), &srs, wkbUnknown, nullptr);
    OGRFieldDefn kind("kind", OFTString);
    layer->CreateField(&kind);
    for (const auto& [wkt, k] : spec.features) {
      OGRFeature f(layer->GetLayerDefn());
      OGRGeometry* g = nullptr;
      OGRGeometryFactory::createFromWkt(wkt.c_str(), &srs, &g);
      f.SetGeometryDirectly(g);
      f.SetField("kind", k.c_str());
      ASSERT_EQ(layer->CreateFeature(&f), OGRERR_NONE);
    }
  }
}
// Column 0 of profile_dem (the sea, 3 cells) and the whole DEM.
const std::string sea_column = "POLYGON((500000 5999970,500010 5999970,500010 6000000,500000 6000000,500000 5999970))";
const std::string whole_dem = "POLYGON((500000 5999970,500050 5999970,500050 6000000,500000 6000000,500000 5999970))";
}  // namespace

// Issue 15: a multi-layer source needs its sea layer named; a filter picks features; a coastline
// line is not taken for sea polygons.
TEST(MapCommand, SeaLayerIsChosenFilteredAndMustBeAnArea) {
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const auto out = tmp / "maps";
  const std::string base = "map --dem " + shell_quote(dem) + " --same-datum --level 1.5 --quiet --out " +
                           shell_quote(out.string()) + " --sea ";
  const auto both = (tmp / "coast.gpkg").string();
  write_layers(both, "GPKG", {{"land", {{whole_dem, "land"}}}, {"sea", {{sea_column, "sea"}}}});
  expect_input_error(run_cli(base + shell_quote(both)), "holds 2 layers ('land', 'sea') and none is named as the sea",
                     out);
  expect_input_error(run_cli(base + shell_quote(both) + " --sea-layer shore"), "has no layer 'shore'", out);
  auto r = run_cli(base + shell_quote(both) + " --sea-layer sea");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  auto summary = nlohmann::json::parse(read_all(out / "summary.json"));
  EXPECT_EQ(summary["sea_cells"], 3);
  EXPECT_THAT(summary["sea"].get<std::string>(), HasSubstr("layer 'sea', 1 features"));
  std::filesystem::remove_all(out);

  const auto one = (tmp / "mixed.gpkg").string();
  write_layers(one, "GPKG", {{"water", {{sea_column, "sea"}, {whole_dem, "lake"}}}});
  r = run_cli(base + shell_quote(one) + " --sea-where \"kind = 'sea'\"");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  summary = nlohmann::json::parse(read_all(out / "summary.json"));
  EXPECT_EQ(summary["sea_cells"], 3);
  EXPECT_THAT(summary["sea"].get<std::string>(), HasSubstr("where kind = 'sea'"));
  std::filesystem::remove_all(out);
  expect_input_error(run_cli(base + shell_quote(one) + " --sea-where \"depth > 2\""), "--sea-where 'depth > 2'", out);
  expect_input_error(run_cli(base + shell_quote(one) + " --sea-where \"kind = 'ocean'\""),
                     "holds no feature that passes the filter", out);

  const auto line = (tmp / "coastline.geojson").string();
  write_layers(line, "GeoJSON", {{"coast", {{"LINESTRING(500010 5999970,500010 6000000)", "coast"}}}});
  expect_input_error(run_cli(base + shell_quote(line)), "lines and points are not sea polygons", out);
  expect_input_error(run_cli("map --dem " + shell_quote(dem) + " --same-datum --level 1.5 --quiet --out " +
                             shell_quote(out.string()) + " --sea " + shell_quote(dem) + " --sea-layer sea"),
                     "--sea-layer: applies to a vector sea mask", out);
}

// Issue 15 item 3: a hole in the survey declared sea, and flooded cells beside a hole that is not
// sea, each get a warning with counts (stderr and summary.json).
TEST(MapCommand, GapsInTheDemAreWarnedAboutWithCounts) {
  TempDir tmp;
  // 8 x 5 cells, a slope from -0.5 m (column 0) up by 0.5 m a column; a 2 x 2 hole (nodata
  // -9999) at rows 1-2, columns 4-5, well inside the frame.
  std::vector<double> z;
  for (int r = 0; r < 5; ++r) {
    for (int c = 0; c < 8; ++c) z.push_back((r == 1 || r == 2) && (c == 4 || c == 5) ? -9999.0 : 0.5 * c - 0.5);
  }
  const auto dem = (tmp / "holed.tif").string();
  write_raster(dem, 8, 5, utm_10m, 32633, z, -9999.0);
  const std::string base = "map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --out ";
  auto r = run_cli(base + shell_quote((tmp / "a").string()) + " --level 1.5 --nodata-is-sea --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.err, HasSubstr("4 nodata cells lie inside the DEM"));
  auto summary = nlohmann::json::parse(read_all(tmp / "a" / "summary.json"));
  ASSERT_EQ(summary["warnings"].size(), 1U);
  // Without --nodata-is-sea the hole is a barrier: at 2.0 m columns 0-5 flood (z <= 2.0), and the
  // cells beside the hole are rows 0 and 3 of columns 4-5 and rows 1-2 of columns 3 and 6
  // (column 6 lies at 2.5 m: dry): 4 + 2 = 6.
  r = run_cli(base + shell_quote((tmp / "b").string()) + " --level 2 --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_THAT(r.err, HasSubstr("at 2.000 m, 6 flooded cells border nodata cells that are not sea"));
  summary = nlohmann::json::parse(read_all(tmp / "b" / "summary.json"));
  EXPECT_EQ(summary["warnings"].size(), 1U);
}

// Issue 15 item 7: a DEM clipped to its coast has nodata beyond the coastline; --sea-edge-below
// finds the sea at the edge of the valid data, not only on the raster's frame. A hole inside
// the land is not an edge.
TEST(MapCommand, SeaEdgeIsTheEdgeOfTheValidData) {
  TempDir tmp;
  // 8 x 5: columns 0-1 nodata (clipped away), column 2 at -0.2 m, then 0.5 m a column up;
  // a nodata cell at row 2, column 5 inside the land with a cell at -0.1 m beside it.
  std::vector<double> z;
  for (int r = 0; r < 5; ++r) {
    for (int c = 0; c < 8; ++c) {
      double v = c < 2 ? -9999.0 : 0.5 * (c - 2) - 0.2;
      if (r == 2 && c == 5) v = -9999.0;
      if (r == 2 && c == 6) v = -0.1;
      z.push_back(v);
    }
  }
  const auto dem = (tmp / "clipped.tif").string();
  write_raster(dem, 8, 5, utm_10m, 32633, z, -9999.0);
  const auto out = tmp / "m";
  const auto r = run_cli("map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 0.5 --quiet --out " +
                         shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto summary = nlohmann::json::parse(read_all(out / "summary.json"));
  // The sea: column 2 (5 cells); not the -0.1 m cell beside the inland hole. At 0.5 m column 3
  // (0.3 m) floods: 5 cells.
  EXPECT_EQ(summary["sea_cells"], 5);
  EXPECT_EQ(summary["levels"][0]["connected_cells"], 5);
  EXPECT_THAT(summary["sea"].get<std::string>(), HasSubstr("edge of the valid data"));
}

// Issue 15 item 6: extent polygons as GeoPackage, FlatGeobuf or Shapefile (10-character field
// names), each listing its files and holding the same polygons and areas.
TEST(MapCommand, PolygonFormatsHoldTheSamePolygons) {
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  std::vector<double> areas;
  for (const std::string format : {"gpkg", "fgb", "shp"}) {
    SCOPED_TRACE(format);
    const auto out = tmp / format;
    const auto r = run_cli("map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1.5 --quiet" +
                           " --polygons --polygon-format " + format + " --out " + shell_quote(out.string()));
    ASSERT_EQ(r.exit_code, 0) << r.err;
    const auto file = out / ("extent." + format);
    GDALDatasetUniquePtr ds(GDALDataset::Open(file.c_str(), GDAL_OF_VECTOR));
    ASSERT_TRUE(ds);
    OGRLayer* layer = ds->GetLayer(0);
    const char* class_field = format == "shp" ? "ext_class" : "extent_class";
    EXPECT_GE(layer->GetLayerDefn()->GetFieldIndex(class_field), 0);
    double total = 0.0;
    for (auto& f : layer) total += f->GetFieldAsDouble("area_m2");
    areas.push_back(total);
    const auto summary = nlohmann::json::parse(read_all(out / "summary.json"));
    const auto files = summary["files"].dump();
    EXPECT_THAT(files, HasSubstr("extent." + format));
    if (format == "shp") {
      for (const char* side : {"extent.shx", "extent.dbf", "extent.prj"}) EXPECT_THAT(files, HasSubstr(side));
    }
  }
  // Beach (3 cells) and bowl (3 cells) of 100 m2: 600 m2 in every format.
  EXPECT_EQ(areas, (std::vector<double>{600.0, 600.0, 600.0}));
}

// Issue 15 item 6: --co passes GDAL creation options through, over the defaults and --compress
// (to the COG driver with --cog); an option the driver does not list is refused before output.
TEST(MapCommand, CreationOptionsArePassedThroughAndChecked) {
  TempDir tmp;
  const auto dem = profile_dem(tmp);
  const std::string base = "map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1.5 --quiet";
  auto out = tmp / "lzw";
  auto r = run_cli(base + " --compress zstd --co COMPRESS=LZW --co BLOCKXSIZE=128 --out " + shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  GDALDatasetUniquePtr ds(GDALDataset::Open((out / "depth.tif").c_str(), GDAL_OF_RASTER));
  ASSERT_TRUE(ds);
  EXPECT_STREQ(ds->GetMetadataItem("COMPRESSION", "IMAGE_STRUCTURE"), "LZW");
  int bx = 0;
  int by = 0;
  ds->GetRasterBand(1)->GetBlockSize(&bx, &by);
  EXPECT_EQ(bx, 128);
  out = tmp / "cog";
  r = run_cli(base + " --cog --compress zstd --co LEVEL=12 --out " + shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  expect_input_error(run_cli(base + " --co NOT_AN_OPTION=1 --out " + shell_quote((tmp / "bad").string())),
                     "creation option NOT_AN_OPTION=1: is not one the GTiff driver takes", tmp / "bad");
  expect_input_error(run_cli(base + " --co ZLEVEL --out " + shell_quote((tmp / "bad").string())),
                     "--co ZLEVEL: is not KEY=VALUE", tmp / "bad");
}

// Issue 15 item 6: --projwin maps a window of the DEM in its CRS (widened to whole cells), as
// gdal_translate -projwin does; a window reaching outside the DEM is refused.
TEST(MapCommand, ProjwinMapsAWindowOfTheDem) {
  TempDir tmp;
  const auto dem = profile_dem(tmp);  // 5 x 3 cells of 10 m from (500000, 6000000)
  const std::string base = "map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1.5 --quiet";
  const auto out = tmp / "w";
  // 500000-500032 widens to columns 0-3, 6000000-5999985 to rows 0-1.
  const auto r = run_cli(base + " --projwin 500000 6000000 500032 5999985 --out " + shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  GDALDatasetUniquePtr ds(GDALDataset::Open((out / "threshold.tif").c_str(), GDAL_OF_RASTER));
  ASSERT_TRUE(ds);
  EXPECT_EQ(ds->GetRasterXSize(), 4);
  EXPECT_EQ(ds->GetRasterYSize(), 2);
  std::array<double, 6> gt{};
  ds->GetGeoTransform(gt.data());
  EXPECT_EQ(gt[0], 500000.0);
  EXPECT_EQ(gt[3], 6000000.0);
  const auto summary = nlohmann::json::parse(read_all(out / "summary.json"));
  EXPECT_EQ(summary["cells"], 8);
  EXPECT_EQ(summary["levels"][0]["connected_cells"], 2);  // the beach cells of rows 0-1
  expect_input_error(run_cli(base + " --projwin 500000 6000000 500100 5999985 --out " + shell_quote((tmp / "x").string())),
                     "--projwin 500000 6000000 500100 5999985: reaches outside the DEM", tmp / "x");
}
