#include "tidewright/local/relative_sea_level.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "tidewright/common/error.hpp"

using tidewright::InputError;
using namespace tidewright::local;
namespace climate = tidewright::climate;

namespace {

// Three members, years 2020/2050/2100, two components with known values, warming carried.
climate::ComponentEnsemble small_ensemble() {
  climate::ComponentEnsemble g;
  g.years = {2020, 2050, 2100};
  g.component_names = {climate::thermal_expansion, climate::glaciers};
  Eigen::MatrixXd te(3, 3), gl(3, 3);
  te << 0.0, 0.10, 0.30, 0.0, 0.12, 0.35, 0.0, 0.08, 0.25;
  gl << 0.0, 0.05, 0.12, 0.0, 0.06, 0.15, 0.0, 0.04, 0.10;
  g.rise_m = {te, gl};
  g.surface_warming_k = Eigen::MatrixXd::Constant(3, 3, 1.5);
  g.reference = "2020";
  g.reference_period = climate::YearSpan{2020, 2020};
  g.scenario = "test";
  return g;
}

climate::ComponentEnsemble constant_ensemble(Eigen::Index members) {
  climate::ComponentEnsemble g;
  g.years = {2020, 2050, 2100};
  g.component_names = {climate::thermal_expansion};
  g.rise_m = {Eigen::MatrixXd::Zero(members, 3)};
  g.reference = "2020";
  g.reference_period = climate::YearSpan{2020, 2020};
  return g;
}

}  // namespace

// R_it = sum_c f_c G_itc - v (t - t_v)/1000 (docs/methods-local.md): 1.1 x thermal + 0.8 x
// glaciers, 2 mm/yr uplift from 2020, member by member (values worked out by hand).
TEST(LocalRelativeRise, FingerprintsAndLandMotionAddMemberByMember) {
  const auto g = small_ensemble();
  LocalTerms terms;
  terms.fingerprint = {{climate::thermal_expansion, 1.1}, {climate::glaciers, 0.8}};
  terms.land_motion.uplift_mm_per_yr = 2.0;
  const LocalRise r = local_relative_rise(g, terms);
  for (Eigen::Index i = 0; i < 3; ++i) {
    for (Eigen::Index k = 0; k < 3; ++k) {
      const double t = g.years[static_cast<std::size_t>(k)];
      const double expect = 1.1 * g.rise_m[0](i, k) + 0.8 * g.rise_m[1](i, k) - 0.002 * (t - 2020.0);
      EXPECT_NEAR(r.total.rise_m(i, k), expect, 1e-15) << i << "," << k;
    }
  }
  EXPECT_NEAR(r.total.rise_m(1, 2), 1.1 * 0.35 + 0.8 * 0.15 - 0.16, 1e-15);
  ASSERT_EQ(r.component_names.size(), 3U);
  EXPECT_EQ(r.component_names[2], vertical_land_motion);
  EXPECT_NEAR(r.contribution_m[2](0, 2), -0.16, 1e-15);
  EXPECT_TRUE(r.cautions.empty());
  EXPECT_EQ(r.total.surface_warming_k.rows(), 3);
  EXPECT_DOUBLE_EQ(r.land_motion_reference_year, 2020.0);
}

TEST(LocalRelativeRise, DefaultFingerprintOfOneCarriesACaution) {
  LocalTerms terms;
  terms.fingerprint = {{climate::glaciers, 0.8}};
  const LocalRise r = local_relative_rise(small_ensemble(), terms);
  ASSERT_EQ(r.cautions.size(), 1U);
  EXPECT_NE(r.cautions[0].find("thermal_expansion"), std::string::npos);
  EXPECT_NE(r.cautions[0].find("gravitational, rotational and deformational"), std::string::npos);
  EXPECT_DOUBLE_EQ(r.fingerprint_used.at(climate::thermal_expansion), 1.0);
}

TEST(LocalRelativeRise, RefusesBadTerms) {
  LocalTerms unknown;
  unknown.fingerprint = {{"greenlnd", 0.5}};
  EXPECT_THROW((void)local_relative_rise(small_ensemble(), unknown), InputError);
  LocalTerms negative_sd;
  negative_sd.land_motion.uplift_sd_mm_per_yr = -1.0;
  EXPECT_THROW((void)local_relative_rise(small_ensemble(), negative_sd), InputError);
  auto g = small_ensemble();
  g.reference = "pre-industrial";
  g.reference_period.reset();
  LocalTerms moving;
  moving.land_motion.uplift_mm_per_yr = 1.0;
  EXPECT_THROW((void)local_relative_rise(g, moving), InputError);
  moving.land_motion.reference_year = 2000.0;
  EXPECT_NO_THROW((void)local_relative_rise(g, moving));
  auto bad_warming = small_ensemble();
  bad_warming.surface_warming_k = Eigen::MatrixXd::Zero(3, 2);
  EXPECT_THROW((void)local_relative_rise(bad_warming, LocalTerms{}), InputError);
  LocalTerms short_offset;
  short_offset.ocean_dynamic = {{2020, 2050}, {0.0, 0.02}, {0.0, 0.01}};
  EXPECT_THROW((void)local_relative_rise(small_ensemble(), short_offset), InputError);
}

// Land motion counts from the middle of the structured reference period, whatever the
// label says (a label is for people: "sea level and ocean heat: 1995-2014 mean; ...").
TEST(LocalRelativeRise, LandMotionCountsFromTheReferencePeriodsMiddleYear) {
  auto g = constant_ensemble(2);
  g.reference = "sea level and ocean heat: 1995-2014 mean; surface warming: 1850-1900 mean";
  g.reference_period = climate::YearSpan{1995, 2014};
  LocalTerms sinking;
  sinking.land_motion.uplift_mm_per_yr = -2.0;
  const LocalRise r = local_relative_rise(g, sinking);
  EXPECT_DOUBLE_EQ(r.land_motion_reference_year, 2004.5);  // (1995 + 2014) / 2
  // -v (t - t_v) / 1000 with v = -2 mm/yr: 2 mm/yr x (2100 - 2004.5) yr.
  EXPECT_NEAR(r.total.rise_m(0, 2), 0.002 * (2100 - 2004.5), 1e-15);
  ASSERT_TRUE(r.total.reference_period.has_value());
  EXPECT_EQ(*r.total.reference_period, (climate::YearSpan{1995, 2014}));
}

// Subsidence of 3 mm/yr with sd 1 mm/yr over 20000 members: the members' rates have sample
// mean within 4/sqrt(n) x sd and sample sd within 4 sd/sqrt(2n) (normal sampling errors), and
// each member's rate is constant in time.
TEST(LocalRelativeRise, LandMotionUncertaintyIsDrawnPerMemberAndSeeded) {
  const Eigen::Index n = 20000;
  LocalTerms terms;
  terms.land_motion.uplift_mm_per_yr = -3.0;
  terms.land_motion.uplift_sd_mm_per_yr = 1.0;
  const LocalRise r = local_relative_rise(constant_ensemble(n), terms);
  const Eigen::MatrixXd& vlm = r.contribution_m.back();
  Eigen::VectorXd rate = -vlm.col(2) / 80.0 * 1000.0;  // mm/yr, uplift positive
  const double mean = rate.mean();
  const double sd = std::sqrt((rate.array() - mean).square().sum() / static_cast<double>(n - 1));
  EXPECT_NEAR(mean, -3.0, 4.0 / std::sqrt(static_cast<double>(n)));
  EXPECT_NEAR(sd, 1.0, 4.0 / std::sqrt(2.0 * static_cast<double>(n)));
  for (Eigen::Index i = 0; i < 50; ++i) EXPECT_NEAR(vlm(i, 1) / 30.0, vlm(i, 2) / 80.0, 1e-15);
  // Subsidence raises relative sea level on average.
  EXPECT_GT(r.total.rise_m.col(2).mean(), 0.0);
  // Same seed, same bytes; another seed, other members.
  EXPECT_EQ(local_relative_rise(constant_ensemble(n), terms).total.rise_m, r.total.rise_m);
  terms.seed = 1;
  EXPECT_NE(local_relative_rise(constant_ensemble(n), terms).total.rise_m, r.total.rise_m);
}

// Ocean-dynamic offset N(m_t, sd_t) with one score per member: (O_it - m_t)/sd_t is the same
// in every year (a whole path), with standard normal sample moments (4 standard errors).
TEST(LocalRelativeRise, OceanDynamicOffsetIsAWholePathPerMember) {
  const Eigen::Index n = 20000;
  LocalTerms terms;
  terms.ocean_dynamic = {{2000, 2100}, {0.0, 0.10}, {0.0, 0.04}};
  const LocalRise r = local_relative_rise(constant_ensemble(n), terms);
  ASSERT_EQ(r.component_names.back(), ocean_dynamic);
  const Eigen::MatrixXd& o = r.contribution_m.back();
  // 2050: m = 0.05, sd = 0.02 (linear between 2000 and 2100); 2100: m = 0.10, sd = 0.04.
  for (Eigen::Index i = 0; i < 100; ++i) EXPECT_NEAR((o(i, 1) - 0.05) / 0.02, (o(i, 2) - 0.10) / 0.04, 1e-9);
  const Eigen::VectorXd z = (o.col(2).array() - 0.10) / 0.04;
  EXPECT_NEAR(z.mean(), 0.0, 4.0 / std::sqrt(static_cast<double>(n)));
  EXPECT_NEAR(std::sqrt(z.squaredNorm() / static_cast<double>(n)), 1.0, 4.0 / std::sqrt(2.0 * static_cast<double>(n)));
}

TEST(RiseEnsemble, WarmingOfTheWrongShapeIsInputError) {
  RiseEnsemble e;
  e.years = {2020, 2100};
  e.rise_m = Eigen::MatrixXd::Zero(3, 2);
  EXPECT_EQ(e.warming_in(2050).size(), 0);
  e.surface_warming_k = Eigen::MatrixXd::Constant(3, 2, 1.0);
  EXPECT_DOUBLE_EQ(e.warming_in(2050)(1), 1.0);
  e.surface_warming_k = Eigen::MatrixXd::Constant(3, 1, 1.0);
  EXPECT_THROW((void)e.warming_in(2050), InputError);
}
