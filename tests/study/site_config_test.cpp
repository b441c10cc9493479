// The site file: keys read strictly, errors with key path and line, paths relative to the file.
#include "tidewright/study/site_config.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

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
}  // namespace

TEST(SiteConfig, MinimalFileGetsDocumentedDefaults) {
  TempDir dir;
  tidewright::write_text_file(dir / "site.toml", minimal, false);
  const auto c = load_site_file(dir / "site.toml");
  EXPECT_EQ(c.site.name, "Test harbour");
  EXPECT_EQ(c.record.path, (dir / "data/gauge.csv").lexically_normal());
  EXPECT_EQ(c.record.kind, "series");
  EXPECT_DOUBLE_EQ(c.record.min_completeness, 0.75);
  EXPECT_DOUBLE_EQ(c.extremes.declustering_hours, 72.0);
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
