// Results passed between commands read back exactly as written.
#include "tidewright/study/stage_files.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "support/run_cli.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"

using tidewright::InputError;
using tidewright::testing::TempDir;
using ::testing::HasSubstr;
namespace study = tidewright::study;

TEST(StageFiles, MembersRoundTripBitForBit) {
  TempDir dir;
  tidewright::local::RiseEnsemble e;
  e.years = {2020, 2050, 2100};
  e.rise_m = Eigen::MatrixXd::Random(50, 3);
  e.rise_m(0, 0) = 0.1 + 0.2;  // a value with no short decimal form
  e.scenario = "middle";
  e.reference = "2020";
  e.illustrative = true;
  study::write_members_csv(dir / "m.csv", e, false);
  const auto back = study::read_members_csv(dir / "m.csv");
  EXPECT_EQ(back.years, e.years);
  EXPECT_EQ(back.scenario, "middle");
  EXPECT_EQ(back.reference, "2020");
  EXPECT_TRUE(back.illustrative);
  ASSERT_EQ(back.rise_m.rows(), 50);
  EXPECT_TRUE((back.rise_m.array() == e.rise_m.array()).all());
}

// Issue 12: the reference period travels as a structured field beside the sentence for
// people, so that the record's epoch can be checked against it.
TEST(StageFiles, MembersCarryTheReferencePeriodApartFromItsLabel) {
  TempDir dir;
  tidewright::local::RiseEnsemble e;
  e.years = {2020, 2100};
  e.rise_m = Eigen::MatrixXd::Zero(2, 2);
  e.reference = "sea level and ocean heat: 1995-2014 mean; surface warming: 1850-1900 mean";
  e.reference_period = tidewright::climate::YearSpan{1995, 2014};
  study::write_members_csv(dir / "m.csv", e, false);
  EXPECT_THAT(tidewright::testing::read_all(dir / "m.csv"),
              HasSubstr("\n# reference_period: 1995-2014\n"));
  const auto back = study::read_members_csv(dir / "m.csv");
  EXPECT_EQ(back.reference, e.reference);
  ASSERT_TRUE(back.reference_period.has_value());
  EXPECT_EQ(*back.reference_period, (tidewright::climate::YearSpan{1995, 2014}));
  // A file that states no period has none; a malformed one names its line.
  tidewright::write_text_file(dir / "none.csv", "# reference: 2020\nmember,2020\n1,0\n", false);
  EXPECT_FALSE(study::read_members_csv(dir / "none.csv").reference_period.has_value());
  tidewright::write_text_file(dir / "bad.csv",
                              "# scenario: x\n# reference_period: 1995 to 2014\nmember,2020\n1,0\n",
                              false);
  try {
    (void)study::read_members_csv(dir / "bad.csv");
    FAIL();
  } catch (const InputError& err) {
    EXPECT_THAT(err.where(), ::testing::EndsWith("bad.csv:2: reference_period")) << err.what();
  }
}

TEST(StageFiles, MembersFileErrorsNameTheLine) {
  TempDir dir;
  tidewright::write_text_file(dir / "m.csv", "member,2020,2019\n1,0.1,0.2\n", false);
  EXPECT_THROW((void)study::read_members_csv(dir / "m.csv"), InputError);
  tidewright::write_text_file(dir / "n.csv", "member,2020,2030\n1,0.1,x\n", false);
  try {
    (void)study::read_members_csv(dir / "n.csv");
    FAIL();
  } catch (const InputError& err) {
    EXPECT_THAT(std::string(err.what()), HasSubstr("n.csv:2: column '2030' holds 'x'"));
  }
}

// Found by tests/fuzz/stage_files_fuzz.cpp: a year column "2E20" was cast to int (undefined).
TEST(StageFiles, YearBeyondAnyCalendarIsBadInput) {
  TempDir dir;
  tidewright::write_text_file(dir / "m.csv", "member,2E20,2021\n1,0.1,0.2\n", false);
  try {
    (void)study::read_members_csv(dir / "m.csv");
    FAIL();
  } catch (const InputError& err) {
    EXPECT_THAT(std::string(err.what()), HasSubstr("column '2E20' is not a year"));
  }
  EXPECT_EQ(tidewright::whole_year(2100.0), 2100);
  EXPECT_EQ(tidewright::whole_year(-1e6), -1000000);
  EXPECT_FALSE(tidewright::whole_year(2e20).has_value());
  EXPECT_FALSE(tidewright::whole_year(2100.5).has_value());
  EXPECT_FALSE(tidewright::whole_year(std::nullopt).has_value());
}

TEST(StageFiles, FitJsonGivesTheModel) {
  TempDir dir;
  tidewright::extremes::StillWaterModel m{tidewright::extremes::Family::gev, 3.87, 0.198, -0.05, 0, 1, {}};
  nlohmann::ordered_json j;
  j["model"] = "gev";
  j["datum"] = "test datum";
  j["reference_epoch"] = 1955.0;
  j["parameters"] = {{"location", 3.87}, {"scale", 0.198}, {"shape", -0.05}};
  j["covariance"] = {{1e-3, 0, 0}, {0, 4e-4, 0}, {0, 0, 1e-2}};
  j["present_day_model"] = study::still_water_model_json(m);
  tidewright::write_json_file(dir / "fit.json", j, false);
  const auto f = study::read_fit_json(dir / "fit.json");
  EXPECT_EQ(f.model.family, tidewright::extremes::Family::gev);
  EXPECT_DOUBLE_EQ(f.model.location_m, 3.87);
  EXPECT_DOUBLE_EQ(f.model.shape, -0.05);
  EXPECT_EQ(f.datum, "test datum");
  ASSERT_TRUE(f.covariance.has_value());
  EXPECT_DOUBLE_EQ((*f.covariance)(2, 2), 1e-2);
  EXPECT_EQ(f.parameter_names.size(), 3U);
}

TEST(StageFiles, FitJsonErrors) {
  TempDir dir;
  tidewright::write_text_file(dir / "a.json", "{not json", false);
  EXPECT_THROW((void)study::read_fit_json(dir / "a.json"), InputError);
  tidewright::write_text_file(dir / "b.json", R"({"present_day_model": {"family": "gev", "scale_m": -1}})", false);
  EXPECT_THROW((void)study::read_fit_json(dir / "b.json"), InputError);
  tidewright::write_text_file(dir / "c.json", R"({"present_day_model": {"family": "gpd", "scale_m": 0.1}})", false);
  EXPECT_THROW((void)study::read_fit_json(dir / "c.json"), InputError);
  // Regression: a number beyond double made the JSON parser throw out_of_range, which escaped
  // as an internal error (found by tests/fuzz/stage_files_fuzz.cpp).
  tidewright::write_text_file(dir / "d.json", R"({"present_day_model": {"scale_m": 1e999}})", false);
  EXPECT_THROW((void)study::read_fit_json(dir / "d.json"), InputError);
}

// Issue 13: one decoder of a still-water model, the inverse of still_water_model_json, for the
// fit's present_day_model and map's --model-json alike.
TEST(StillWaterModelJson, RoundTripsEveryFamilyAndNamesTheBadKey) {
  namespace ex = tidewright::extremes;
  ex::StillWaterModel gpd{ex::Family::gpd, 0.0, 0.12, -0.1, 2.4, 3.5, {}};
  gpd.below_threshold.level_m = {2.0, 2.2};
  gpd.below_threshold.rate_per_yr = {40.0, 12.0};
  const auto where = [](const std::string& key) { return "m.json: " + key; };
  for (const auto& m : {ex::StillWaterModel{ex::Family::gumbel, 2.0, 0.15, 0.0, 0.0, 1.0, {}},
                        ex::StillWaterModel{ex::Family::gev, 2.0, 0.15, -0.05, 0.0, 1.0, {}}, gpd}) {
    const auto back = tidewright::study::still_water_model_from_json(
        nlohmann::json::parse(tidewright::study::still_water_model_json(m).dump()), where);
    EXPECT_EQ(back.family, m.family);
    EXPECT_EQ(back.location_m, m.family == ex::Family::gpd ? 0.0 : m.location_m);
    EXPECT_EQ(back.scale_m, m.scale_m);
    EXPECT_EQ(back.shape, m.shape);
    EXPECT_EQ(back.threshold_m, m.threshold_m);
    EXPECT_EQ(back.below_threshold.rate_per_yr, m.below_threshold.rate_per_yr);
  }
  const auto error = [&](const char* text) {
    try {
      (void)tidewright::study::still_water_model_from_json(nlohmann::json::parse(text), where);
    } catch (const tidewright::InputError& e) {
      return std::string(e.what());
    }
    return std::string("no error");
  };
  EXPECT_THAT(error(R"({"family": "weibull"})"), HasSubstr("m.json: family"));
  EXPECT_THAT(error(R"({"family": "gev", "location_m": 2, "scale_m": 0.1})"), HasSubstr("m.json: shape"));
  EXPECT_THAT(error(R"({"family": "gumbel", "location_m": 2, "scale_m": -1})"), HasSubstr("m.json: scale_m"));
  EXPECT_THAT(error(R"({"family": "gpd", "scale_m": 0.1, "shape": 0, "threshold_m": 2, "rate_per_yr": 0})"),
              HasSubstr("m.json: rate_per_yr"));
  EXPECT_THAT(error(R"({"family": "gumbel", "location_m": "2", "scale_m": 0.1})"), HasSubstr("m.json: location_m"));
}
