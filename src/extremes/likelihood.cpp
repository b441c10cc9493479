// Analytic log-likelihood, gradient and Hessian of the extreme-value models.
// Glossary: see include/tidewright/extremes/likelihood.hpp (mu, sigma, xi, y, t, w, a, b).
//
// One value contributes l = a (-log sigma - (1 + xi) w) - b exp(-w), w = w(y(mu, sigma), xi).
// With g(w, xi) = -a (1 + xi) w - b exp(-w):
//   g_w = -a (1 + xi) + b exp(-w), g_ww = -b exp(-w), g_wxi = -a, g_xi = -a w;
//   w_y = 1/t, w_yy = -xi/t^2, w_yxi = -y/t^2, w_xi and w_xixi from shape_transform;
//   y_mu = -1/sigma, y_sigma = -y/sigma, y_musigma = 1/sigma^2, y_sigmasigma = 2y/sigma^2.
// The chain rule then gives l_a = g_w W_a + g_xi [a = xi] (- a/sigma for sigma) and
// l_ab = g_ww W_a W_b + g_w W_ab + g_wxi (W_a [b = xi] + W_b [a = xi]) (+ a/sigma^2 for
// sigma sigma), W_a = dw/dtheta_a. Derived here from Coles (2001) eq. 3.7; checked against
// finite differences in tests/extremes/likelihood_test.cpp.
#include "tidewright/extremes/likelihood.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "tidewright/common/error.hpp"
#include "tidewright/extremes/distributions.hpp"

namespace tidewright::extremes {
namespace {

constexpr double neg_inf = -std::numeric_limits<double>::infinity();

// Accumulates value, gradient and Hessian in (mu, sigma, xi).
struct Accumulator {
  double mu;
  double sigma;
  double xi;
  double log_sigma = std::log(sigma);
  double value = 0.0;
  Eigen::Vector3d g = Eigen::Vector3d::Zero();
  Eigen::Matrix3d h = Eigen::Matrix3d::Zero();
  bool inside = true;

  void add(double z, double a, double b) {
    if (!inside) return;
    const double y = (z - mu) / sigma;
    const double t = 1.0 + xi * y;
    if (!(t > 0.0)) {
      inside = false;
      return;
    }
    const ShapeTransform s = shape_transform(y, xi);
    const double e = std::exp(-s.w);
    const double inv_s = 1.0 / sigma;
    const double w_y = 1.0 / t;
    const double w_yy = -xi * w_y * w_y;
    const double w_yxi = -y * w_y * w_y;
    const double W_mu = -w_y * inv_s;
    const double W_sigma = -w_y * y * inv_s;
    const double W_xi = s.dw_dxi;
    const double W_mumu = w_yy * inv_s * inv_s;
    const double W_musigma = (w_yy * y + w_y) * inv_s * inv_s;
    const double W_sigmasigma = (w_yy * y * y + 2.0 * w_y * y) * inv_s * inv_s;
    const double W_muxi = -w_yxi * inv_s;
    const double W_sigmaxi = -w_yxi * y * inv_s;
    const double W_xixi = s.d2w_dxi2;

    const double g_w = -a * (1.0 + xi) + b * e;
    const double g_ww = -b * e;
    const double g_wxi = -a;

    value += a * (-log_sigma - (1.0 + xi) * s.w) - b * e;
    const Eigen::Vector3d W(W_mu, W_sigma, W_xi);
    g += g_w * W;
    g(1) -= a * inv_s;
    g(2) += -a * s.w;

    h.noalias() += g_ww * W * W.transpose();
    h(0, 0) += g_w * W_mumu;
    h(0, 1) += g_w * W_musigma;
    h(1, 1) += g_w * W_sigmasigma + a * inv_s * inv_s;
    h(0, 2) += g_w * W_muxi + g_wxi * W_mu;
    h(1, 2) += g_w * W_sigmaxi + g_wxi * W_sigma;
    h(2, 2) += g_w * W_xixi + 2.0 * g_wxi * W_xi;
  }

  LogLikelihood result(std::initializer_list<int> keep) const {
    LogLikelihood r;
    const auto k = static_cast<Eigen::Index>(keep.size());
    r.gradient.resize(k);
    r.hessian.resize(k, k);
    if (!inside) {
      r.value = neg_inf;
      r.gradient.setZero();
      r.hessian.setZero();
      return r;
    }
    r.value = value;
    Eigen::Matrix3d full = h.selfadjointView<Eigen::Upper>();
    Eigen::Index i = 0;
    for (int a : keep) {
      r.gradient(i) = g(a);
      Eigen::Index j = 0;
      for (int b : keep) r.hessian(i, j++) = full(a, b);
      ++i;
    }
    return r;
  }
};

bool valid_scale(double sigma) { return std::isfinite(sigma) && sigma > 0.0; }

LogLikelihood outside(Eigen::Index k) {
  LogLikelihood r;
  r.value = neg_inf;
  r.gradient = ParamVector::Zero(k);
  r.hessian = ParamMatrix::Zero(k, k);
  return r;
}

}  // namespace

bool LogLikelihood::inside() const { return std::isfinite(value); }

LogLikelihood gev_log_likelihood(std::span<const double> maxima, double location, double scale,
                                 double shape) {
  if (!valid_scale(scale) || !std::isfinite(location) || !std::isfinite(shape)) return outside(3);
  Accumulator acc{location, scale, shape};
  for (double z : maxima) acc.add(z, 1.0, 1.0);
  return acc.result({0, 1, 2});
}

LogLikelihood gumbel_log_likelihood(std::span<const double> maxima, double location,
                                    double scale) {
  if (!valid_scale(scale) || !std::isfinite(location)) return outside(2);
  Accumulator acc{location, scale, 0.0};
  for (double z : maxima) acc.add(z, 1.0, 1.0);
  return acc.result({0, 1});
}

LogLikelihood gpd_log_likelihood(std::span<const double> levels, double threshold, double scale,
                                 double shape) {
  if (!valid_scale(scale) || !std::isfinite(shape)) return outside(2);
  Accumulator acc{threshold, scale, shape};
  for (double x : levels) {
    if (x < threshold) {
      throw InputError("gpd_log_likelihood", "level " + std::to_string(x) +
                                                 " lies below the threshold " +
                                                 std::to_string(threshold),
                       "pass only the exceedances of the threshold");
    }
    acc.add(x, 1.0, 0.0);
  }
  return acc.result({1, 2});
}

LogLikelihood gev_r_largest_log_likelihood(const std::vector<std::vector<double>>& largest_per_year,
                                           double location, double scale, double shape) {
  if (!valid_scale(scale) || !std::isfinite(location) || !std::isfinite(shape)) return outside(3);
  Accumulator acc{location, scale, shape};
  for (std::size_t i = 0; i < largest_per_year.size(); ++i) {
    const auto& year = largest_per_year[i];
    if (year.empty()) {
      throw InputError("gev_r_largest_log_likelihood",
                       "year " + std::to_string(i + 1) + " holds no values",
                       "give at least the annual maximum for every year");
    }
    const auto smallest = std::min_element(year.begin(), year.end());
    for (auto it = year.begin(); it != year.end(); ++it) acc.add(*it, 1.0, it == smallest ? 1.0 : 0.0);
  }
  return acc.result({0, 1, 2});
}

}  // namespace tidewright::extremes
