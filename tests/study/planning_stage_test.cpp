// Joining a fit to a projection (issue 12): the record's epoch is checked against the
// projected years and the projection's structured reference period, never its label.
#include "tidewright/study/planning_stage.hpp"
#include "tidewright/study/projection_stage.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "tidewright/common/error.hpp"

using ::testing::HasSubstr;
using tidewright::InputError;
namespace study = tidewright::study;

namespace {

study::FitSummary fit_with_epoch(std::optional<double> epoch) {
  study::FitSummary f;
  f.model = {tidewright::extremes::Family::gumbel, 2.0, 0.1, 0.0, 0.0, 1.0, {}};
  f.reference_epoch = epoch;
  f.source = "fit.json";
  return f;
}

// Two members, 2020 and 2100, rise 0.01/0.02 and 0.5/0.6 m since 1995-2014; the label is the
// sentence the projection writes, which names two periods.
tidewright::local::RiseEnsemble members() {
  tidewright::local::RiseEnsemble e;
  e.years = {2020, 2100};
  e.rise_m.resize(2, 2);
  e.rise_m << 0.01, 0.5, 0.02, 0.6;
  e.reference = "sea level and ocean heat: 1995-2014 mean; surface warming: 1850-1900 mean";
  e.reference_period = tidewright::climate::YearSpan{1995, 2014};
  return e;
}

std::string joined_note(double epoch) {
  const auto in = study::join_fit_and_projection(fit_with_epoch(epoch), members(), std::nullopt);
  EXPECT_EQ(in.notes.size(), 1U);
  return in.notes.empty() ? "" : in.notes.front();
}

}  // namespace

// A mean over 1995-2014 covers decimal years 1995.0 to 2015.0; its centre is 2005.0.
TEST(JoinFitAndProjection, EpochInsideTheReferencePeriodIsAccepted) {
  for (double epoch : {1995.0, 2004.9986, 2005.0, 2014.5, 2015.0}) {
    const auto in = study::join_fit_and_projection(fit_with_epoch(epoch), members(), std::nullopt);
    EXPECT_THAT(in.notes.at(0),
                HasSubstr("lies in the projection's reference period 1995-2014 mean"))
        << epoch;
    EXPECT_DOUBLE_EQ(in.rise.rise_m(1, 1), 0.6) << "the rise is left as it is";
    ASSERT_TRUE(in.rise.reference_period.has_value());
  }
  // The note sizes the approximation: 3 mm/yr x (1995.0 - 2005.0) = -30 mm; 0 at the centre.
  EXPECT_THAT(joined_note(1995.0), HasSubstr("about -30 mm"));
  EXPECT_THAT(joined_note(2004.9986), HasSubstr("about 0 mm"));
  EXPECT_THAT(joined_note(2015.0), HasSubstr("about 30 mm"));
}

TEST(JoinFitAndProjection, EpochInsideTheProjectedYearsReReferencesEachMember) {
  const auto in = study::join_fit_and_projection(fit_with_epoch(2020.0), members(), std::nullopt);
  EXPECT_DOUBLE_EQ(in.rise.rise_m(0, 1), 0.5 - 0.01);
  EXPECT_DOUBLE_EQ(in.rise.rise_m(1, 1), 0.6 - 0.02);
  EXPECT_FALSE(in.rise.reference_period.has_value()) << "the rise is now measured from the epoch";
  EXPECT_EQ(in.rise.reference, "the record's epoch 2020.0");
  EXPECT_EQ(in.rise_zero_year, 2020);
}

// The fan chart's components are measured from the same year as the re-referenced total, member
// by member, and carry readable names.
TEST(FanChartInput, ComponentsShareTheTotalsReferenceYear) {
  study::ProjectionStageResult r;
  r.local.total = members();
  r.local.component_names = {"thermal_expansion", "land_water"};
  Eigen::MatrixXd thermal(2, 2);
  thermal << 0.004, 0.2, 0.006, 0.3;
  r.local.contribution_m = {thermal, Eigen::MatrixXd::Zero(2, 2)};
  const auto in = study::join_fit_and_projection(fit_with_epoch(2020.0), members(), std::nullopt);
  const auto fan = study::fan_chart_input(r, in.rise, in.rise_zero_year);
  ASSERT_EQ(fan.component_medians_m.size(), 2U);
  EXPECT_EQ(fan.component_medians_m[0].name, "Thermal expansion");
  EXPECT_EQ(fan.component_medians_m[1].name, "Land water");
  // Median of (0.196, 0.294) with type 7 is their mean; zero in the reference year.
  EXPECT_DOUBLE_EQ(fan.component_medians_m[0].values[0], 0.0);
  EXPECT_NEAR(fan.component_medians_m[0].values[1], 0.245, 1e-12);
  EXPECT_NEAR(fan.q50_m[1], 0.5 * ((0.5 - 0.01) + (0.6 - 0.02)), 1e-12);
  // Without a zero year (the project command's plot) the components stay on the projection's reference.
  const auto raw = study::fan_chart_input(r, r.local.total);
  EXPECT_NEAR(raw.component_medians_m[0].values[1], 0.25, 1e-12);
}

TEST(JoinFitAndProjection, EpochOutsideBothIsRefusedWithTheCallersInputInTheHint) {
  for (double epoch : {1994.9, 2015.1, 1960.0}) {
    try {
      (void)study::join_fit_and_projection(fit_with_epoch(epoch), members(), std::nullopt, {},
                                           "site.toml: planning.epoch_offset_m");
      ADD_FAILURE() << epoch << " was accepted";
    } catch (const InputError& e) {
      EXPECT_THAT(std::string(e.what()), HasSubstr("nor in the reference period (1995-2014 mean)"));
      EXPECT_THAT(std::string(e.what()), HasSubstr("with site.toml: planning.epoch_offset_m"));
    }
  }
  // No structured period (a table that states none): the label alone never admits an epoch.
  auto unstated = members();
  unstated.reference_period.reset();
  EXPECT_THROW((void)study::join_fit_and_projection(fit_with_epoch(2005.0), unstated, std::nullopt),
               InputError);
}

TEST(JoinFitAndProjection, StatedOffsetIsAddedToEveryMember) {
  const auto in = study::join_fit_and_projection(fit_with_epoch(1960.0), members(), 0.07);
  EXPECT_DOUBLE_EQ(in.rise.rise_m(0, 0), 0.01 + 0.07);
  EXPECT_DOUBLE_EQ(in.rise.rise_m(1, 1), 0.6 + 0.07);
  EXPECT_THAT(in.notes.at(0), HasSubstr("rise shifted by 0.070 m"));
  EXPECT_EQ(in.rise.reference, "the record's epoch 1960.0 (stated offset)");
  EXPECT_FALSE(in.rise.reference_period.has_value());
  EXPECT_THROW(
      (void)study::join_fit_and_projection(fit_with_epoch(1960.0), members(), std::nan("")),
      InputError);
}
