// Return levels and intervals: closed forms for the Gumbel, profile-deviance ends, the GPD and
// r-largest profiles, and the seeded bootstrap.
#include "tidewright/extremes/return_levels.hpp"

#include <gtest/gtest.h>

#include <boost/math/distributions/chi_squared.hpp>
#include <cmath>
#include <random>
#include <vector>

#include "tidewright/common/error.hpp"
#include "tidewright/extremes/distributions.hpp"
#include "tidewright/extremes/sampling.hpp"

namespace tx = tidewright::extremes;

namespace {

const double chi2_95 = boost::math::quantile(boost::math::chi_squared(1.0), 0.95);

}  // namespace

// Gumbel: z_T = mu - sigma log y_p, var = V_mumu + 2 s V_musigma + s^2 V_sigmasigma with
// s = -log y_p (Coles 2001, sec. 3.3.3 with xi = 0).
TEST(ExtremesReturnLevels, GumbelClosedForms) {
  const auto f = tx::fit_gumbel(tx::draw(tx::Gumbel(1.0, 0.1), 50, 21));
  const std::vector<double> periods{2.0, 100.0};
  const auto rl = tx::return_levels_delta(f, periods);
  for (const auto& r : rl) {
    // N_0(z_T) = 1/T: Coles (2001) eq. 3.10 with y_p = 1/T, s = -log y_p = log T.
    const double s = std::log(r.return_period_yr);
    EXPECT_NEAR(r.level_m, f.location() + f.scale() * s, 1e-14);
    const double var =
        f.covariance(0, 0) + 2.0 * s * f.covariance(0, 1) + s * s * f.covariance(1, 1);
    EXPECT_NEAR(r.standard_error_m, std::sqrt(var), 1e-14);
    EXPECT_NEAR(r.upper_m - r.level_m, 1.959963984540054 * r.standard_error_m, 1e-12);
  }
}

TEST(ExtremesReturnLevels, GevLevelIsTheUpperQuantile) {
  const auto f = tx::fit_gev(tx::draw(tx::Gev(1.0, 0.2, 0.1), 80, 22));
  for (double t : tx::standard_return_periods_yr) {
    EXPECT_NEAR(tx::return_level(f, t),
                tx::quantile(tx::complement(tx::Gev(f.location(), f.scale(), f.shape()), -std::expm1(-1.0 / t))),
                1e-12);
  }
}

// At both ends of every profile interval the deviance is the chi-square_1 quantile, and the
// interval holds the estimate. Gumbel, GPD (with the rate profiled too) and r-largest.
TEST(ExtremesReturnLevels, ProfileEndsSitOnTheCriticalDeviance) {
  const std::vector<double> periods{10.0, 100.0};
  std::vector<std::vector<double>> years;
  for (double z : tx::draw(tx::Gev(1.0, 0.2, 0.05), 40, 23)) years.push_back({z, z - 0.07});
  const tx::FitResult fits[] = {
      tx::fit_gumbel(tx::draw(tx::Gumbel(1.0, 0.1), 50, 24)),
      tx::fit_gpd(tx::draw(tx::Gpd(2.0, 0.25, 0.1), 120, 25), 2.0, 30.0),
      tx::fit_gev_r_largest(years),
  };
  for (const auto& f : fits) {
    double l_max = f.log_likelihood;
    if (f.family == tx::Family::gpd) {
      const double k = static_cast<double>(f.n);
      l_max += k * std::log(f.rate_per_yr) - f.rate_per_yr * f.years_of_record;
    }
    for (const auto& r : tx::return_levels_profile(f, periods)) {
      ASSERT_TRUE(std::isfinite(r.lower_m) && std::isfinite(r.upper_m));
      EXPECT_LT(r.lower_m, r.level_m);
      EXPECT_GT(r.upper_m, r.level_m);
      for (double z : {r.lower_m, r.upper_m}) {
        EXPECT_NEAR(2.0 * (l_max - tx::profile_log_likelihood(f, r.return_period_yr, z)), chi2_95,
                    1e-6);
      }
      // At the estimate the profile is the maximum itself.
      EXPECT_NEAR(tx::profile_log_likelihood(f, r.return_period_yr, r.level_m), l_max, 1e-9);
    }
  }
}

// GPD delta method with the rate's variance: the gradient term in lambda adds to the variance
// (Coles 2001, sec. 4.4.1), so the interval is wider than with the rate held fixed.
TEST(ExtremesReturnLevels, GpdDeltaIncludesRateUncertainty) {
  auto f = tx::fit_gpd(tx::draw(tx::Gpd(2.0, 0.25, 0.1), 120, 26), 2.0, 30.0);
  const std::vector<double> periods{100.0};
  const double with_rate = tx::return_levels_delta(f, periods)[0].standard_error_m;
  f.rate_standard_error_per_yr = 0.0;
  const double without = tx::return_levels_delta(f, periods)[0].standard_error_m;
  EXPECT_GT(with_rate, without);
  const double s = std::log(f.rate_per_yr * 100.0);
  const double dz_dlambda = f.scale() * std::exp(f.shape() * s) / f.rate_per_yr;
  EXPECT_NEAR(with_rate * with_rate - without * without,
              dz_dlambda * dz_dlambda * 120.0 / (30.0 * 30.0), 1e-12);
}

// Same seed, same numbers; the bootstrap spread agrees with the delta-method standard error
// (both estimate the sampling spread of z_T; with 1000 draws the Monte Carlo error of the
// standard deviation is about 2%, and for n = 200 the two should be within 15%).
TEST(ExtremesReturnLevels, BootstrapIsSeededAndAgreesWithDelta) {
  const auto f = tx::fit_gev(tx::draw(tx::Gev(1.0, 0.2, 0.0), 200, 27));
  const std::vector<double> periods{10.0};
  tx::BootstrapOptions o;
  o.samples = 1000;
  o.seed = 5;
  const auto a = tx::return_levels_bootstrap(f, periods, o);
  const auto b = tx::return_levels_bootstrap(f, periods, o);
  EXPECT_EQ(a.levels[0].lower_m, b.levels[0].lower_m);
  EXPECT_EQ(a.levels[0].upper_m, b.levels[0].upper_m);
  EXPECT_EQ(a.samples_used + a.failed_fits, 1000U);
  o.seed = 6;
  const auto c = tx::return_levels_bootstrap(f, periods, o);
  EXPECT_NE(a.levels[0].lower_m, c.levels[0].lower_m);
  const auto d = tx::return_levels_delta(f, periods)[0];
  EXPECT_NEAR(a.levels[0].standard_error_m / d.standard_error_m, 1.0, 0.15);
  EXPECT_LT(a.levels[0].lower_m, d.level_m);
  EXPECT_GT(a.levels[0].upper_m, d.level_m);
  std::printf(
      "[ bootstrap ] 10-year: delta se %.4f, bootstrap sd %.4f, interval [%.4f, %.4f], %zu "
      "failed\n",
      d.standard_error_m, a.levels[0].standard_error_m, a.levels[0].lower_m, a.levels[0].upper_m,
      a.failed_fits);
}

TEST(ExtremesReturnLevels, BadPeriodsThrow) {
  const auto f = tx::fit_gev(tx::draw(tx::Gev(1.0, 0.2, 0.1), 40, 28));
  EXPECT_THROW((void)tx::return_level(f, 1.0), tidewright::InputError);
  EXPECT_THROW((void)tx::return_level(f, std::nan("")), tidewright::InputError);
  const auto g = tx::fit_gpd(tx::draw(tx::Gpd(2.0, 0.25, 0.1), 20, 29), 2.0, 40.0);  // 0.5 per year
  EXPECT_THROW((void)tx::return_level(g, 1.5), tidewright::InputError);
  EXPECT_NO_THROW((void)tx::return_level(g, 3.0));
  const std::vector<double> periods{10.0};
  EXPECT_THROW((void)tx::return_levels_delta(f, periods, 1.0), tidewright::InputError);
}
