// Glossary: see include/tidewright/climate/energy_balance.hpp.
#include "tidewright/climate/energy_balance.hpp"

#include <cmath>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::climate {

namespace {

void require_positive(double v, const char* name) {
  if (!std::isfinite(v) || v <= 0.0) {
    throw InputError(name, "must be a positive number, got " + std::to_string(v),
                     "see docs/methods-climate.md for typical values");
  }
}

}  // namespace

void validate(const TwoLayerParameters& p) {
  require_positive(p.upper_heat_capacity_w_yr_m2_k, "upper heat capacity C");
  require_positive(p.deep_heat_capacity_w_yr_m2_k, "deep heat capacity C_d");
  require_positive(p.feedback_w_m2_k, "climate feedback lambda");
  require_positive(p.heat_exchange_w_m2_k, "heat exchange gamma");
  require_positive(p.efficacy, "efficacy eps");
}

TwoLayerPropagator::TwoLayerPropagator(const TwoLayerParameters& p, double step_yr) {
  validate(p);
  require_positive(step_yr, "step length");
  const double c = p.upper_heat_capacity_w_yr_m2_k;
  const double cd = p.deep_heat_capacity_w_yr_m2_k;
  const double lambda = p.feedback_w_m2_k;
  const double gamma = p.heat_exchange_w_m2_k;
  const double eps = p.efficacy;
  // System matrix of Geoffroy et al. (2013) Part II eq. 1 written as x' = A x + b F.
  Eigen::Matrix2d a;
  a << -(lambda + eps * gamma) / c, eps * gamma / c, gamma / cd, -gamma / cd;
  const Eigen::Vector2d b(1.0 / c, 0.0);
  // Eigenvalues of a 2x2 matrix from its trace and determinant; real and distinct here because
  // the off-diagonal product is positive (Geoffroy et al. 2013 Part I, delta > 0).
  const double tr = a.trace();
  const double det = a.determinant();
  const double disc = std::sqrt(tr * tr - 4.0 * det);
  const double r_fast = 0.5 * (tr - disc);  // more negative
  const double r_slow = 0.5 * (tr + disc);
  fast_time_yr_ = -1.0 / r_fast;
  slow_time_yr_ = -1.0 / r_slow;
  // exp(A h) by Sylvester's formula for distinct eigenvalues (hand-written: a closed form for
  // 2x2 is exact and cheaper per member than a general Pade approximant).
  const Eigen::Matrix2d identity = Eigen::Matrix2d::Identity();
  phi_ = (std::exp(r_fast * step_yr) * (a - r_slow * identity) - std::exp(r_slow * step_yr) * (a - r_fast * identity)) /
         (r_fast - r_slow);
  const Eigen::Matrix2d a_inv = a.inverse();
  g0_ = a_inv * (phi_ - identity) * b;
  g1_ = a_inv * a_inv * (phi_ - identity - a * step_yr) * b / step_yr;
}

TwoLayerPath integrate_two_layer(const TwoLayerParameters& p, const std::vector<double>& forcing_w_m2,
                                 TwoLayerState initial, double step_yr) {
  const TwoLayerPropagator prop(p, step_yr);
  for (double f : forcing_w_m2) {
    if (!std::isfinite(f)) throw InputError("forcing", "contains a value that is not a number", "give finite forcing");
  }
  TwoLayerPath out;
  const std::size_t n = forcing_w_m2.size();
  out.surface_k.resize(n);
  out.deep_k.resize(n);
  out.toa_imbalance_w_m2.resize(n);
  out.heat_content_w_yr_m2.resize(n);
  TwoLayerState x = initial;
  for (std::size_t i = 0; i < n; ++i) {
    if (i > 0) x = prop.step(x, forcing_w_m2[i - 1], forcing_w_m2[i]);
    out.surface_k[i] = x.surface_k;
    out.deep_k[i] = x.deep_k;
    // Geoffroy et al. (2013) Part II eq. 2: N = F - lambda T - (eps - 1) gamma (T - T_d).
    out.toa_imbalance_w_m2[i] = forcing_w_m2[i] - p.feedback_w_m2_k * x.surface_k -
                                (p.efficacy - 1.0) * p.heat_exchange_w_m2_k * (x.surface_k - x.deep_k);
    // Heat stored in the two boxes; its time derivative is N exactly (sum of the two equations).
    out.heat_content_w_yr_m2[i] = p.upper_heat_capacity_w_yr_m2_k * x.surface_k + p.deep_heat_capacity_w_yr_m2_k * x.deep_k;
  }
  return out;
}

double deep_step_for_given_surface(double deep_k, double surface_start_k, double surface_end_k,
                                   double gamma_over_cd_per_yr, double step_yr) {
  // Exact solution of T_d' = k (T - T_d) with T linear over the step (variation of constants).
  const double kh = gamma_over_cd_per_yr * step_yr;
  const double e = std::exp(-kh);
  return e * deep_k + (1.0 - e) * surface_start_k + (surface_end_k - surface_start_k) * (1.0 + std::expm1(-kh) / kh);
}

}  // namespace tidewright::climate
