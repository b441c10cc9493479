#include "tidewright/climate/forcing.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

#include "tidewright/climate/scenario.hpp"
#include "tidewright/common/error.hpp"

using namespace tidewright::climate;

// Myhre et al. (1998): doubled CO2 gives 5.35 ln 2 = 3.71 W m-2 (docs/references.md, secondary/computed).
TEST(ClimateForcing, MyhreDoublingIs371) {
  EXPECT_NEAR(co2_forcing_w_m2(2.0 * preindustrial_co2_ppm), 3.71, 0.005);
  EXPECT_NEAR(co2_forcing_w_m2(560.0, Co2ForcingFormula::myhre1998, 280.0), 5.35 * std::log(2.0), 1e-12);
  EXPECT_NEAR(co2_forcing_w_m2(preindustrial_co2_ppm), 0.0, 1e-15);
}

// Meinshausen et al. (2020), AR6 WG1 Table 7.SM.1: doubling about 3.75 W m-2 (secondary).
TEST(ClimateForcing, MeinshausenDoublingIsAbout375) {
  const double f = co2_forcing_w_m2(2.0 * preindustrial_co2_ppm, Co2ForcingFormula::meinshausen2020);
  EXPECT_NEAR(f, 3.75, 0.01);
  // Below C0 alpha' = d1 (5.2488): the slope of F against ln(C/C0) there is d1 + c1 sqrt(N).
  const double below = co2_forcing_w_m2(200.0, Co2ForcingFormula::meinshausen2020);
  EXPECT_NEAR(below / std::log(200.0 / preindustrial_co2_ppm), 5.2488 - 2.1492e-3 * std::sqrt(preindustrial_n2o_ppb), 1e-12);
  // Above C_alpha_max = C0 - b1/(2 a1) (about 1808 ppm) alpha' stays at its maximum: continuous there.
  const double c_max = preindustrial_co2_ppm + 7.5906e-4 / (2.0 * 2.4785e-7);
  const double lo = co2_forcing_w_m2(c_max - 1e-6, Co2ForcingFormula::meinshausen2020);
  const double hi = co2_forcing_w_m2(c_max + 1e-6, Co2ForcingFormula::meinshausen2020);
  EXPECT_NEAR(lo, hi, 1e-8);
}

TEST(ClimateForcing, BadConcentrationsAndNamesThrow) {
  EXPECT_THROW((void)co2_forcing_w_m2(0.0), tidewright::InputError);
  EXPECT_THROW((void)co2_forcing_w_m2(std::numeric_limits<double>::quiet_NaN()), tidewright::InputError);
  EXPECT_THROW((void)co2_forcing_formula_from_name("myhre", "--co2-formula"), tidewright::InputError);
  EXPECT_EQ(co2_forcing_formula_from_name("meinshausen2020", "x"), Co2ForcingFormula::meinshausen2020);
}

// The spin-up ramp ends at the AR6 2019 total anthropogenic ERF, 2.72 W m-2 (confirmed).
TEST(ClimateForcing, HistoricalRampEndsAtAr6Value) {
  EXPECT_DOUBLE_EQ(historical_forcing_w_m2(1850), 0.0);
  EXPECT_NEAR(historical_forcing_w_m2(2019), 2.72, 1e-12);
  const double slope = (historical_forcing_w_m2(2019.0 + 1e-5) - historical_forcing_w_m2(2019.0 - 1e-5)) / 2e-5;
  EXPECT_NEAR(slope, historical_forcing_slope_2019_w_m2_per_yr(), 1e-6);
}

TEST(ClimatePathways, StartAtAr6ForcingReachStatedLevelsAndHold) {
  for (const PathwayDescription& d : builtin_pathways()) {
    SCOPED_TRACE(d.name);
    EXPECT_NEAR(builtin_pathway_forcing_w_m2(d.name, 2019), 2.72, 1e-12);
    EXPECT_NEAR(builtin_pathway_forcing_w_m2(d.name, 2100), d.forcing_2100_w_m2, 1e-12);
    EXPECT_NEAR(builtin_pathway_forcing_w_m2(d.name, 2250), d.forcing_2100_w_m2, 1e-12);
    // Smooth join with the historical ramp: same slope at 2019.
    const double slope = (builtin_pathway_forcing_w_m2(d.name, 2019.0 + 1e-5) - builtin_pathway_forcing_w_m2(d.name, 2019.0)) / 1e-5;
    EXPECT_NEAR(slope, historical_forcing_slope_2019_w_m2_per_yr(), 1e-4);
    const Scenario s = builtin_pathway(d.name, 2300);
    EXPECT_TRUE(s.illustrative);
    EXPECT_NE(s.label.find("illustrative"), std::string::npos);
    EXPECT_EQ(s.first_year(), 2019);
    EXPECT_EQ(s.last_year(), 2300);
  }
  EXPECT_NEAR(builtin_pathway_forcing_w_m2("restrained", 2050), 3.6, 1e-12);
  EXPECT_THROW((void)builtin_pathway("ssp245"), tidewright::InputError);
  EXPECT_THROW((void)builtin_pathway("midway", 2090), tidewright::InputError);
}

TEST(ClimateScenario, BuildersRejectBadColumns) {
  using tidewright::InputError;
  EXPECT_THROW((void)forcing_scenario("x", {2020, 2022}, {1.0, 2.0}, "f.csv"), InputError);  // gap
  EXPECT_THROW((void)forcing_scenario("x", {2021, 2020}, {1.0, 2.0}, "f.csv"), InputError);  // unsorted
  EXPECT_THROW((void)forcing_scenario("x", {2020, 2020}, {1.0, 2.0}, "f.csv"), InputError);  // repeated
  EXPECT_THROW((void)forcing_scenario("x", {2020, 2021}, {1.0}, "f.csv"), InputError);       // lengths
  EXPECT_THROW((void)forcing_scenario("x", {}, {}, "f.csv"), InputError);
  EXPECT_THROW((void)surface_warming_scenario("x", {2020}, {std::nan("")}, "t.csv"), InputError);
  EXPECT_THROW((void)co2_scenario("x", {2020, 2021}, {400.0, -1.0}, {}, Co2ForcingFormula::myhre1998, "c.csv"), InputError);
  try {
    (void)forcing_scenario("x", {2020, 2022}, {1.0, 2.0}, "f.csv");
  } catch (const InputError& e) {
    EXPECT_EQ(e.where(), "f.csv");
    EXPECT_NE(e.problem().find("2020 and 2022"), std::string::npos);
  }
}

TEST(ClimateScenario, Co2PlusNonCo2) {
  const Scenario s = co2_scenario("c", {2020, 2021}, {2.0 * preindustrial_co2_ppm, preindustrial_co2_ppm}, {0.5, -0.25},
                                  Co2ForcingFormula::myhre1998, "c.csv");
  EXPECT_NEAR(s.value_in(2020), 5.35 * std::log(2.0) + 0.5, 1e-12);
  EXPECT_NEAR(s.value_in(2021), -0.25, 1e-12);
  EXPECT_FALSE(s.illustrative);
  EXPECT_THROW((void)s.value_in(2022), tidewright::InputError);
}
