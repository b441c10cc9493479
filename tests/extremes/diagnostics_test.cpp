// Model choice and goodness-of-fit helpers: Gringorten positions, Anderson-Darling against a
// direct evaluation with Boost.Math's Gumbel cdf, AIC, and the automatic choice.
#include "tidewright/extremes/diagnostics.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <boost/math/distributions/extreme_value.hpp>
#include <cmath>
#include <random>
#include <vector>

#include "tidewright/extremes/distributions.hpp"
#include "tidewright/extremes/sampling.hpp"

namespace tx = tidewright::extremes;

// Gringorten (1963): P_i = (i - 0.44)/(n + 0.12), i = 1 for the smallest; the model columns are
// F(x_(i)) and F^-1(P_i).
TEST(ExtremesDiagnostics, GringortenPlotPoints) {
  const auto data = tx::draw(tx::Gumbel(1.0, 0.1), 30, 31);
  const auto f = tx::fit_gumbel(data);
  const auto pts = tx::diagnostic_plot_points(f);
  ASSERT_EQ(pts.size(), 30U);
  std::vector<double> sorted = data;
  std::sort(sorted.begin(), sorted.end());
  const tx::Gumbel g(f.location(), f.scale());
  for (std::size_t i = 0; i < pts.size(); ++i) {
    const double p = (static_cast<double>(i) + 1.0 - 0.44) / (30.0 + 0.12);
    EXPECT_DOUBLE_EQ(pts[i].level_m, sorted[i]);
    EXPECT_DOUBLE_EQ(pts[i].plotting_position, p);
    EXPECT_NEAR(pts[i].model_probability, tx::cdf(g, sorted[i]), 1e-15);
    EXPECT_NEAR(pts[i].model_level_m, tx::quantile(g, p), 1e-12);
    // T = 1/N_0 with N_0 = -log F for annual maxima (return_levels.hpp).
    EXPECT_NEAR(pts[i].return_period_yr, -1.0 / std::log(p), 1e-12);
  }
  EXPECT_NEAR(pts.front().plotting_position, 0.56 / 30.12, 1e-15);
  EXPECT_NEAR(pts.back().plotting_position, 29.56 / 30.12, 1e-15);
}

// Stephens (1974) eq. 2 evaluated here with Boost.Math's extreme_value cdf and complement.
TEST(ExtremesDiagnostics, AndersonDarlingMatchesDirectEvaluation) {
  const auto data = tx::draw(tx::Gumbel(1.0, 0.1), 40, 32);
  const auto f = tx::fit_gumbel(data);
  const boost::math::extreme_value_distribution<double> b(f.location(), f.scale());
  std::vector<double> x = data;
  std::sort(x.begin(), x.end());
  const double n = 40.0;
  double s = 0.0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    s += (2.0 * static_cast<double>(i + 1) - 1.0) *
         (std::log(boost::math::cdf(b, x[i])) +
          std::log(boost::math::cdf(boost::math::complement(b, x[x.size() - 1 - i]))));
  }
  const double expect = -n - s / n;
  EXPECT_NEAR(tx::anderson_darling(f), expect, 1e-12 * std::abs(expect));
  // A misfit is worse: the same data against a Gumbel fitted elsewhere (scale doubled).
  auto wrong = f;
  wrong.estimate(1) *= 2.0;
  EXPECT_GT(tx::anderson_darling(wrong), 5.0 * tx::anderson_darling(f));
}

// AIC = 2k - 2l (Akaike 1974); the deviance test rejects the Gumbel for a clearly heavy tail
// (xi = 0.3, n = 300: se(xi) ~ 0.05, so D is far beyond chi-square_1's 3.84) and the automatic
// choice then keeps the GEV.
TEST(ExtremesDiagnostics, AicAndAutomaticChoice) {
  const auto data = tx::draw(tx::Gev(10.0, 2.0, 0.3), 300, 33);
  const auto g = tx::fit_gumbel(data);
  const auto e = tx::fit_gev(data);
  EXPECT_DOUBLE_EQ(tx::aic(g), 4.0 - 2.0 * g.log_likelihood);
  EXPECT_DOUBLE_EQ(tx::aic(e), 6.0 - 2.0 * e.log_likelihood);
  const auto t = tx::gumbel_against_gev(g, e);
  EXPECT_GT(t.deviance, 3.841);
  EXPECT_LT(t.p_value, 0.05);
  EXPECT_EQ(t.chosen, tx::Family::gev);
  EXPECT_LT(t.aic_gev, t.aic_gumbel);
  EXPECT_EQ(tx::fit_annual_maxima_auto(data).fit.family, tx::Family::gev);
  // Mismatched inputs are refused.
  EXPECT_THROW((void)tx::gumbel_against_gev(e, g), std::exception);
}
