// Log-likelihoods of the extreme-value models with their analytic gradient and Hessian.
//
// Glossary (Coles 2001): mu location, sigma scale, xi shape (xi > 0 heavy tail); u threshold;
// y = (z - mu)/sigma; t = 1 + xi y; w = log(t)/xi (-> y as xi -> 0). Every model's
// log-likelihood is a sum over values of  a (-log sigma - (1 + xi) w) - b exp(-w):
//   GEV annual maxima   a = 1, b = 1             (Coles 2001, eq. 3.7)
//   Gumbel              the GEV with xi = 0      (Coles 2001, eq. 3.9)
//   GPD excesses        a = 1, b = 0, mu = u     (Coles 2001, eq. 4.10)
//   r-largest GEV       a = 1 for each of the r_i values of year i, b = 1 only for the
//                       smallest of them         (Coles 2001, eq. 3.15)
// Parameter order: GEV and r-largest (location, scale, shape); Gumbel (location, scale);
// GPD (scale, shape).
#pragma once

#include <Eigen/Dense>
#include <span>
#include <vector>

namespace tidewright::extremes {

// At most three parameters: fixed-capacity Eigen types avoid heap allocation in the fits.
using ParamVector = Eigen::Matrix<double, Eigen::Dynamic, 1, 0, 3, 1>;
using ParamMatrix = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, 0, 3, 3>;

struct LogLikelihood {
  double value = 0.0;  // -inf outside the support (some 1 + xi y <= 0) or for sigma <= 0
  ParamVector gradient;
  ParamMatrix hessian;
  [[nodiscard]] bool inside() const;
};

[[nodiscard]] LogLikelihood gev_log_likelihood(std::span<const double> maxima, double location,
                                               double scale, double shape);
[[nodiscard]] LogLikelihood gumbel_log_likelihood(std::span<const double> maxima, double location,
                                                  double scale);
// levels: the exceedances themselves (x >= u, not the excesses x - u).
[[nodiscard]] LogLikelihood gpd_log_likelihood(std::span<const double> levels, double threshold,
                                               double scale, double shape);
// largest_per_year[i]: the r_i >= 1 largest values of year i, in any order.
[[nodiscard]] LogLikelihood gev_r_largest_log_likelihood(
    const std::vector<std::vector<double>>& largest_per_year, double location, double scale,
    double shape);

}  // namespace tidewright::extremes
