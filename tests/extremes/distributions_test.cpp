// Gumbel, GEV and GPD functions against closed forms, Boost.Math's Gumbel (extreme_value), and
// their own inverses; xi -> 0 continuity; bad parameters.
#include "tidewright/extremes/distributions.hpp"

#include <gtest/gtest.h>

#include <boost/math/distributions/extreme_value.hpp>
#include <cmath>
#include <limits>
#include <string>

#include "tidewright/common/error.hpp"

namespace tx = tidewright::extremes;

// Boost.Math's extreme_value_distribution is the Gumbel for maxima: an independent
// implementation of the same pdf, cdf and quantile.
TEST(ExtremesDistributions, GumbelMatchesBoostExtremeValue) {
  const tx::Gumbel g(3.87, 0.195);
  const boost::math::extreme_value_distribution<double> b(3.87, 0.195);
  for (double z : {3.0, 3.5, 3.87, 4.2, 5.0, 7.0}) {
    EXPECT_NEAR(tx::pdf(g, z), boost::math::pdf(b, z), 1e-13 * boost::math::pdf(b, z) + 1e-300);
    EXPECT_NEAR(tx::cdf(g, z), boost::math::cdf(b, z), 1e-14);
    const double sf = boost::math::cdf(boost::math::complement(b, z));
    EXPECT_NEAR(tx::cdf(tx::complement(g, z)), sf, 1e-13 * sf);
  }
  for (double p : {1e-6, 0.01, 0.5, 0.9, 0.999}) {
    EXPECT_NEAR(tx::quantile(g, p), boost::math::quantile(b, p), 1e-12);
  }
}

// Closed form of Coles (2001) eq. 3.2 evaluated with std::pow: F = exp(-(1 + xi y)^(-1/xi)).
TEST(ExtremesDistributions, GevMatchesClosedFormAwayFromZeroShape) {
  for (double xi : {-0.4, -0.1, 0.1, 0.3}) {
    const tx::Gev d(1.0, 0.5, xi);
    for (double z : {0.2, 0.8, 1.0, 1.7, 2.2}) {
      const double t = 1.0 + xi * (z - 1.0) / 0.5;
      if (t <= 0.0) continue;
      const double tp = std::pow(t, -1.0 / xi);
      EXPECT_NEAR(tx::cdf(d, z), std::exp(-tp), 1e-14) << xi << " " << z;
      EXPECT_NEAR(tx::pdf(d, z), std::pow(t, -1.0 / xi - 1.0) * std::exp(-tp) / 0.5, 1e-13)
          << xi << " " << z;
    }
  }
  // Outside the support: below the lower end point (xi > 0) F = 0, above the upper (xi < 0) F = 1.
  EXPECT_EQ(tx::cdf(tx::Gev(0.0, 1.0, 0.5), -2.5), 0.0);
  EXPECT_EQ(tx::log_pdf(tx::Gev(0.0, 1.0, 0.5), -2.5), -std::numeric_limits<double>::infinity());
  EXPECT_EQ(tx::cdf(tx::Gev(0.0, 1.0, -0.5), 2.5), 1.0);
  EXPECT_EQ(tx::cdf(tx::complement(tx::Gev(0.0, 1.0, -0.5), 2.5)), 0.0);
}

// Far upper tail: 1 - F = 1 - exp(-e^-w) must keep its relative accuracy where 1 - F is far
// below machine epsilon. Reference: the series 1 - exp(-r) = r - r^2/2 + r^3/6 with
// r = (1 + xi y)^(-1/xi) from std::pow.
TEST(ExtremesDistributions, UpperTailKeepsRelativeAccuracy) {
  const tx::Gev d(0.0, 1.0, 0.1);
  for (double z : {60.0, 200.0, 1000.0}) {
    const double r = std::pow(1.0 + 0.1 * z, -10.0);
    const double expect = r - r * r / 2.0 + r * r * r / 6.0;
    const double got = tx::cdf(tx::complement(d, z));
    EXPECT_NEAR(got / expect, 1.0, 1e-13) << z;
  }
  EXPECT_LT(tx::cdf(tx::complement(d, 1000.0)), 1e-20);  // 101^-10: far below epsilon
  const tx::Gpd g(2.0, 0.3, -0.1);
  EXPECT_NEAR(tx::cdf(tx::complement(g, 2.0 + 2.9)), std::pow(1.0 - 0.1 * 2.9 / 0.3, 10.0), 1e-15);
}

TEST(ExtremesDistributions, QuantileRoundTrips) {
  const tx::Gev gevs[] = {tx::Gev(3.87, 0.198, -0.05), tx::Gev(0.0, 1.0, 0.4),
                          tx::Gev(0.0, 1.0, 1e-12), tx::Gev(0.0, 1.0, -0.3)};
  for (const auto& d : gevs) {
    for (double p : {1e-9, 1e-3, 0.1, 0.5, 0.9, 0.999}) {
      EXPECT_NEAR(tx::cdf(d, tx::quantile(d, p)), p, 4e-15 + 1e-12 * p) << d.shape() << " " << p;
    }
    for (double q : {1e-14, 1e-8, 1e-3, 0.01}) {
      const double z = tx::quantile(tx::complement(d, q));
      EXPECT_NEAR(tx::cdf(tx::complement(d, z)) / q, 1.0, 1e-11) << d.shape() << " " << q;
    }
  }
  const tx::Gpd gpds[] = {tx::Gpd(1.5, 0.2, 0.1), tx::Gpd(1.5, 0.2, 0.0), tx::Gpd(1.5, 0.2, -0.4)};
  for (const auto& d : gpds) {
    for (double p : {1e-9, 0.1, 0.5, 0.99}) {
      EXPECT_NEAR(tx::cdf(d, tx::quantile(d, p)), p, 4e-15 + 1e-12 * p);
    }
    for (double q : {1e-12, 1e-4, 0.2}) {
      EXPECT_NEAR(tx::cdf(tx::complement(d, tx::quantile(tx::complement(d, q)))) / q, 1.0, 1e-11);
    }
  }
  // End points: p = 0 and p = 1 give the support's ends (Coles 2001, sec. 3.1.2).
  EXPECT_DOUBLE_EQ(tx::quantile(tx::Gev(0.0, 1.0, -0.25), 1.0), 4.0);
  EXPECT_DOUBLE_EQ(tx::quantile(tx::Gev(0.0, 1.0, 0.25), 0.0), -4.0);
  EXPECT_DOUBLE_EQ(tx::quantile(tx::Gpd(1.0, 1.0, -0.5), 1.0), 3.0);
}

// xi -> 0: the GEV tends to the Gumbel and the GPD to the exponential, with the first-order
// term of the series: F_xi - F_0 = -F_0 e^-y (y^2/2) xi + O(xi^2) for the GEV (differentiate
// exp(-e^-w) with dw/dxi = -y^2/2 at xi = 0), and 1 - e^-w gives -e^-y (y^2/2) xi for the GPD.
// Checked at xi = +-1e-12 (the difference is then ~1e-13, so agreement to that order proves
// there is no 0/0 trouble) and at xi = 1e-6 (the slope).
TEST(ExtremesDistributions, ShapeNearZeroIsContinuous) {
  const tx::Gumbel g(0.0, 1.0);
  for (double z : {-1.0, 0.0, 1.5, 4.0}) {
    const double f0 = tx::cdf(g, z);
    const double slope = -f0 * std::exp(-z) * z * z / 2.0;
    for (double xi : {1e-12, -1e-12}) {
      EXPECT_NEAR(tx::cdf(tx::Gev(0.0, 1.0, xi), z) - f0, slope * xi,
                  1e-3 * std::abs(slope * xi) + 4e-16);
    }
    EXPECT_NEAR((tx::cdf(tx::Gev(0.0, 1.0, 1e-6), z) - f0) / 1e-6, slope, 1e-5);
    EXPECT_NEAR(tx::pdf(tx::Gev(0.0, 1.0, 1e-13), z), tx::pdf(g, z), 1e-12);
    const double x = z + 2.0;
    const double gpd_slope = -std::exp(-x) * x * x / 2.0;
    EXPECT_NEAR(tx::cdf(tx::Gpd(0.0, 1.0, 1e-12), x) + std::expm1(-x), gpd_slope * 1e-12,
                1e-3 * std::abs(gpd_slope) * 1e-12 + 4e-16);
  }
  // z_p = s + xi s^2/2 + O(xi^2), s = -log(-log p) (series of expm1(xi s)/xi).
  const double s = -std::log(-std::log(0.99));
  EXPECT_NEAR(tx::quantile(tx::Gev(0.0, 1.0, 1e-13), 0.99), s + 1e-13 * s * s / 2.0, 4e-15);
}

// The series branch (|xi y| < small_shape_argument) and the closed forms, either side of the
// switch, against the closed forms in long double (64-bit mantissa: their cancellation error,
// about 1e-19/|xi y|, is negligible here).
TEST(ExtremesDistributions, SeriesAndClosedFormAgreeAtTheSwitch) {
  using ld = long double;
  const double y = 2.0;
  for (double f : {0.5, 1.0 - 1e-9, 1.0 + 1e-9, 2.0}) {
    for (double sign : {1.0, -1.0}) {
      const double xi = sign * f * tx::small_shape_argument / y;
      const ld x = static_cast<ld>(xi) * y;
      const ld t = 1.0L + x;
      const ld w = std::log1p(x) / xi;
      const ld w1 = (y / t - w) / xi;
      const ld w2 = -(static_cast<ld>(y) * y / (t * t) + 2.0L * w1) / xi;
      const auto s = tx::shape_transform(y, xi);
      EXPECT_NEAR(s.w, static_cast<double>(w), 1e-15 * std::abs(static_cast<double>(w)));
      EXPECT_NEAR(s.dw_dxi, static_cast<double>(w1), 1e-14 * std::abs(static_cast<double>(w1)));
      EXPECT_NEAR(s.d2w_dxi2, static_cast<double>(w2), 2e-13 * std::abs(static_cast<double>(w2)));
      const ld e = std::exp(x);
      const ld a = std::expm1(x) / xi;
      const ld a1 = (y * e - a) / xi;
      const ld a2 = (static_cast<ld>(y) * y * e - 2.0L * a1) / xi;
      const auto ea = tx::expm1_over_shape(y, xi);
      EXPECT_NEAR(ea.a, static_cast<double>(a), 1e-15 * std::abs(static_cast<double>(a)));
      EXPECT_NEAR(ea.da_dxi, static_cast<double>(a1), 1e-14 * std::abs(static_cast<double>(a1)));
      EXPECT_NEAR(ea.d2a_dxi2, static_cast<double>(a2), 2e-13 * std::abs(static_cast<double>(a2)));
    }
  }
  // Against long-double central differences of log1p(xi y)/xi away from zero.
  auto w = [](long double yy, long double xi) { return std::log1p(xi * yy) / xi; };
  for (double xi : {-0.3, 0.02, 0.2}) {
    const long double h = 1e-5L;
    const auto s = tx::shape_transform(y, xi);
    const long double d1 = (w(y, xi + h) - w(y, xi - h)) / (2 * h);
    const long double d2 = (w(y, xi + h) - 2 * w(y, xi) + w(y, xi - h)) / (h * h);
    EXPECT_NEAR(s.dw_dxi, static_cast<double>(d1), 1e-8);
    EXPECT_NEAR(s.d2w_dxi2, static_cast<double>(d2), 1e-4);
  }
}

TEST(ExtremesDistributions, BadParametersThrowNamingTheParameter) {
  auto message = [](auto&& f) {
    try {
      f();
    } catch (const tidewright::InputError& e) {
      return std::string(e.what());
    }
    return std::string("no throw");
  };
  EXPECT_NE(message([] { (void)tx::Gev(0.0, -1.0, 0.1); }).find("scale = -1"), std::string::npos);
  EXPECT_NE(message([] { (void)tx::Gev(0.0, 0.0, 0.1); }).find("scale = 0"), std::string::npos);
  EXPECT_NE(message([] { (void)tx::Gev(0.0, 1.0, std::nan("")); }).find("shape = nan"),
            std::string::npos);
  EXPECT_NE(message([] {
              (void)tx::Gumbel(std::numeric_limits<double>::infinity(), 1.0);
            }).find("location = inf"),
            std::string::npos);
  EXPECT_NE(message([] { (void)tx::Gpd(0.0, -2.0, 0.0); }).find("Gpd"), std::string::npos);
  EXPECT_NE(
      message([] { (void)tx::quantile(tx::Gev(0.0, 1.0, 0.0), 1.5); }).find("probability = 1.5"),
      std::string::npos);
  EXPECT_THROW((void)tx::quantile(tx::complement(tx::Gpd(0.0, 1.0, 0.0), -0.1)),
               tidewright::InputError);
}
