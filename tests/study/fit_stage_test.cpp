// Warnings a fit's numbers carry (issue: numerical guards): each condition on a hand-made fit,
// then on a real fit to a bounded sample.
#include "tidewright/study/fit_stage.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "tidewright/common/error.hpp"
#include "tidewright/extremes/fit.hpp"

using ::testing::HasSubstr;
using ::testing::IsEmpty;
namespace ex = tidewright::extremes;

namespace {

ex::FitResult gev(double mu, double sigma, double xi, std::vector<double> data) {
  ex::FitResult f;
  f.family = ex::Family::gev;
  f.parameter_names = {"location", "scale", "shape"};
  f.estimate = ex::ParamVector::Zero(3);
  f.estimate(0) = mu;
  f.estimate(1) = sigma;
  f.estimate(2) = xi;
  f.data = std::move(data);
  f.n = f.data.size();
  return f;
}

std::string joined(const std::vector<std::string>& w) {
  std::string s;
  for (const auto& x : w) s += x + "\n";
  return s;
}

}  // namespace

TEST(FitWarnings, OrdinaryShapesGiveNone) {
  // Upper end point 3 - 0.2/(-0.1) = 5 m, far above the largest value 3.6 m.
  EXPECT_THAT(tidewright::study::numerical_warnings(gev(3.0, 0.2, -0.1, {2.9, 3.1, 3.6})), IsEmpty());
  EXPECT_THAT(tidewright::study::numerical_warnings(gev(3.0, 0.2, 0.2, {2.9, 3.1, 3.6})), IsEmpty());
}

TEST(FitWarnings, EachConditionIsNamed) {
  const auto heavy = joined(tidewright::study::numerical_warnings(gev(3.0, 0.2, 0.6, {2.9, 3.1})));
  EXPECT_THAT(heavy, HasSubstr("above 0.5: a very heavy tail"));
  // xi = -0.6: end point 3 + 0.2/0.6 = 3.333 m; largest 3.332 m is within 1 % of sigma of it.
  const auto bounded = joined(tidewright::study::numerical_warnings(gev(3.0, 0.2, -0.6, {2.9, 3.1, 3.332})));
  EXPECT_THAT(bounded, HasSubstr("-0.600, at most -0.5, where the likelihood is not regular (Smith 1985)"));
  EXPECT_THAT(bounded, HasSubstr("lies at the fitted upper end point (3.333 m)"));
}

TEST(FitWarnings, RealFitToABoundedSampleIsFlagged) {
  // 400 maxima drawn from GEV(mu 2, sigma 0.3, xi -0.8) by inverting F (Coles 2001, eq. 3.2):
  // a shape this low puts the ML estimate past -0.5 and its end point at the largest value.
  std::mt19937_64 rng(7);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  std::vector<double> x;
  for (int i = 0; i < 400; ++i) x.push_back(2.0 + 0.3 * (std::pow(-std::log(u(rng)), 0.8) - 1.0) / -0.8);
  const ex::FitResult fit = ex::fit_gev(x);
  ASSERT_LE(fit.shape(), -0.5);
  EXPECT_THAT(joined(tidewright::study::numerical_warnings(fit)), HasSubstr("not regular (Smith 1985)"));
}

TEST(FitWarnings, ShapeAboveTwoTenthsGetsTheStillWaterCaution) {
  const auto w = joined(tidewright::study::numerical_warnings(gev(3.0, 0.2, 0.25, {2.9, 3.1, 3.6})));
  EXPECT_THAT(w, HasSubstr("above 0.200: still-water extremes are rarely this heavy-tailed"));
  EXPECT_THAT(w, ::testing::Not(HasSubstr("above 0.5")));
}

// A delta-method lower bound below a shorter return period's level is flagged (not printed);
// one above every shorter level is not, nor is the shortest period's.
TEST(FitIntervals, DeltaLowerBoundBelowAShorterPeriodsLevelIsFlagged) {
  tidewright::study::FitStageResult r;
  const auto level = [](double t, double z, double lo) {
    ex::ReturnLevel l;
    l.return_period_yr = t;
    l.level_m = z;
    l.lower_m = lo;
    l.upper_m = 2.0 * z - lo;
    return l;
  };
  r.delta = {level(2.0, 1.90, 1.80), level(10.0, 2.20, 1.85), level(100.0, 2.60, 2.30)};
  EXPECT_FALSE(tidewright::study::delta_lower_below_shorter_level(r, 0));
  EXPECT_TRUE(tidewright::study::delta_lower_below_shorter_level(r, 1));
  EXPECT_FALSE(tidewright::study::delta_lower_below_shorter_level(r, 2));
  EXPECT_FALSE(tidewright::study::delta_lower_below_shorter_level(r, 3));  // out of range
}
