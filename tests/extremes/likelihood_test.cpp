// Log-likelihoods against sums of log densities, and their analytic gradients and Hessians
// against central finite differences, including xi = 0 and the r-largest model.
#include "tidewright/extremes/likelihood.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <vector>

#include "tidewright/extremes/distributions.hpp"

namespace tx = tidewright::extremes;

namespace {

const std::vector<double> maxima{3.2, 3.9, 4.1, 3.5, 3.75, 4.6, 3.3, 3.95, 4.05, 3.6};

using Fn = std::function<tx::LogLikelihood(const tx::ParamVector&)>;

// Central differences with step h_i = 1e-5 (1 + |theta_i|): truncation error O(h^2) ~ 1e-10
// relative, rounding O(eps/h) ~ 1e-11; the tolerance 1e-6 relative covers both with margin.
void expect_derivatives_match(const Fn& f, tx::ParamVector theta) {
  const tx::LogLikelihood at = f(theta);
  ASSERT_TRUE(at.inside());
  const auto k = theta.size();
  for (Eigen::Index i = 0; i < k; ++i) {
    const double h = 1e-5 * (1.0 + std::abs(theta(i)));
    tx::ParamVector up = theta;
    tx::ParamVector dn = theta;
    up(i) += h;
    dn(i) -= h;
    const tx::LogLikelihood fu = f(up);
    const tx::LogLikelihood fd = f(dn);
    const double g = (fu.value - fd.value) / (2.0 * h);
    EXPECT_NEAR(at.gradient(i), g, 1e-6 * (1.0 + std::abs(g))) << "gradient " << i;
    for (Eigen::Index j = 0; j < k; ++j) {
      const double hij = (fu.gradient(j) - fd.gradient(j)) / (2.0 * h);
      EXPECT_NEAR(at.hessian(i, j), hij, 1e-6 * (1.0 + std::abs(hij))) << "hessian " << i << j;
    }
  }
  EXPECT_TRUE(at.hessian.isApprox(at.hessian.transpose(), 1e-14));
}

tx::ParamVector p3(double a, double b, double c) {
  tx::ParamVector p(3);
  p << a, b, c;
  return p;
}
tx::ParamVector p2(double a, double b) {
  tx::ParamVector p(2);
  p << a, b;
  return p;
}

}  // namespace

TEST(ExtremesLikelihood, GevValueIsTheSumOfLogDensities) {
  for (double xi : {-0.2, 0.0, 1e-10, 0.15}) {
    double sum = 0.0;
    for (double z : maxima) sum += tx::log_pdf(tx::Gev(3.8, 0.35, xi), z);
    EXPECT_NEAR(tx::gev_log_likelihood(maxima, 3.8, 0.35, xi).value, sum, 1e-12);
  }
  double sum = 0.0;
  for (double z : maxima) sum += tx::log_pdf(tx::Gumbel(3.8, 0.35), z);
  EXPECT_NEAR(tx::gumbel_log_likelihood(maxima, 3.8, 0.35).value, sum, 1e-12);
  sum = 0.0;
  for (double z : maxima) sum += tx::log_pdf(tx::Gpd(3.0, 0.4, 0.1), z);
  EXPECT_NEAR(tx::gpd_log_likelihood(maxima, 3.0, 0.4, 0.1).value, sum, 1e-12);
}

TEST(ExtremesLikelihood, GevDerivativesMatchFiniteDifferences) {
  const Fn f = [](const tx::ParamVector& p) {
    return tx::gev_log_likelihood(maxima, p(0), p(1), p(2));
  };
  // Shapes on both sides of zero, at zero, and inside the series region for every value.
  for (double xi : {-0.3, -0.05, 0.0, 1e-7, 0.01, 0.25}) {
    SCOPED_TRACE(xi);
    expect_derivatives_match(f, p3(3.8, 0.35, xi));
  }
}

TEST(ExtremesLikelihood, GumbelIsTheGevBlockAtZeroShape) {
  const auto gev = tx::gev_log_likelihood(maxima, 3.8, 0.35, 0.0);
  const auto gum = tx::gumbel_log_likelihood(maxima, 3.8, 0.35);
  EXPECT_DOUBLE_EQ(gum.value, gev.value);
  EXPECT_TRUE(gum.hessian.isApprox(gev.hessian.topLeftCorner(2, 2), 1e-14));
  const Fn f = [](const tx::ParamVector& p) {
    return tx::gumbel_log_likelihood(maxima, p(0), p(1));
  };
  expect_derivatives_match(f, p2(3.8, 0.35));
}

TEST(ExtremesLikelihood, GpdDerivativesMatchFiniteDifferences) {
  const Fn f = [](const tx::ParamVector& p) {
    return tx::gpd_log_likelihood(maxima, 3.1, p(0), p(1));
  };
  for (double xi : {-0.3, 0.0, 1e-8, 0.2}) {
    SCOPED_TRACE(xi);
    expect_derivatives_match(f, p2(0.5, xi));
  }
}

// Coles (2001) eq. 3.15 with r = 1 is the GEV likelihood (eq. 3.7); derivatives for r > 1.
TEST(ExtremesLikelihood, RLargestReducesToGevAndHasMatchingDerivatives) {
  std::vector<std::vector<double>> years;
  for (double z : maxima) years.push_back({z});
  const auto r1 = tx::gev_r_largest_log_likelihood(years, 3.8, 0.35, 0.1);
  const auto g = tx::gev_log_likelihood(maxima, 3.8, 0.35, 0.1);
  EXPECT_NEAR(r1.value, g.value, 1e-12);
  EXPECT_TRUE(r1.gradient.isApprox(g.gradient, 1e-12));
  for (std::size_t i = 0; i < years.size(); ++i) {
    years[i].push_back(maxima[i] - 0.1 - 0.01 * static_cast<double>(i));
    if (i % 2 == 0) years[i].push_back(maxima[i] - 0.3);
  }
  const Fn f = [&years](const tx::ParamVector& p) {
    return tx::gev_r_largest_log_likelihood(years, p(0), p(1), p(2));
  };
  for (double xi : {-0.2, 0.0, 0.2}) {
    SCOPED_TRACE(xi);
    expect_derivatives_match(f, p3(3.6, 0.3, xi));
  }
  // Direct evaluation of eq. 3.15 for one year with values {z1 > z2}: the sum of
  // -log sigma - (1 + 1/xi) log t_k over both, minus t_2^(-1/xi) for the smaller.
  const double mu = 3.6;
  const double s = 0.3;
  const double xi = 0.2;
  const std::vector<std::vector<double>> one{{4.0, 3.7}};
  auto t = [&](double z) { return 1.0 + xi * (z - mu) / s; };
  const double expect = -2.0 * std::log(s) -
                        (1.0 + 1.0 / xi) * (std::log(t(4.0)) + std::log(t(3.7))) -
                        std::pow(t(3.7), -1.0 / xi);
  EXPECT_NEAR(tx::gev_r_largest_log_likelihood(one, mu, s, xi).value, expect, 1e-13);
}

TEST(ExtremesLikelihood, OutsideTheSupportIsMinusInfinity) {
  // xi = -0.5, sigma = 0.2: upper end point mu + 0.4 = 4.2 < 4.6 (a value in the sample).
  EXPECT_FALSE(tx::gev_log_likelihood(maxima, 3.8, 0.2, -0.5).inside());
  EXPECT_FALSE(tx::gev_log_likelihood(maxima, 3.8, -0.2, 0.1).inside());
  EXPECT_FALSE(tx::gpd_log_likelihood(maxima, 3.1, 0.5, -1.0).inside());
  EXPECT_THROW((void)tx::gpd_log_likelihood(maxima, 3.4, 0.5, 0.1), std::exception);
}
