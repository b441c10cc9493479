// Two-layer energy balance with deep-ocean heat-uptake efficacy (Held et al. 2010, J. Climate
// 23:2418; Geoffroy et al. 2013, J. Climate 26:1841 (Part I) and 1859 (Part II)):
//   C   dT/dt   = F - lambda T - eps gamma (T - T_d)
//   C_d dT_d/dt = gamma (T - T_d)
// integrated exactly over each step for forcing that is linear within the step.
//
// Glossary (code name -> symbol)
//   upper_heat_capacity_w_yr_m2_k   C       heat capacity of the upper (mixed-layer) box
//   deep_heat_capacity_w_yr_m2_k    C_d     heat capacity of the deep-ocean box
//   feedback_w_m2_k                 lambda  climate feedback parameter
//   heat_exchange_w_m2_k            gamma   heat-exchange coefficient between the boxes
//   efficacy                        eps     deep-ocean heat-uptake efficacy
//   surface_k, deep_k               T, T_d  temperature anomalies of the two boxes, K
//   toa_imbalance_w_m2              N       N = F - lambda T - (eps - 1) gamma (T - T_d)
//   heat_content_w_yr_m2            H       H = C T + C_d T_d (dH/dt = N)
#pragma once

#include <Eigen/Dense>
#include <vector>

namespace tidewright::climate {

// Defaults: CMIP5 multi-model means with efficacy, Geoffroy et al. (2013) Part II Table 3
// (secondary, docs/references.md).
struct TwoLayerParameters {
  double upper_heat_capacity_w_yr_m2_k = 8.2;
  double deep_heat_capacity_w_yr_m2_k = 109.0;
  double feedback_w_m2_k = 1.18;
  double heat_exchange_w_m2_k = 0.67;
  double efficacy = 1.28;
};
// Throws InputError when a parameter is not positive and finite.
void validate(const TwoLayerParameters& p);

struct TwoLayerState {
  double surface_k = 0.0;
  double deep_k = 0.0;
};

// The exact propagator of the linear system over one step of `step_yr` years:
//   x(t+h) = Phi x(t) + G0 F(t) + G1 (F(t+h) - F(t)),
//   Phi = exp(A h), G0 = A^-1 (Phi - I) b, G1 = A^-2 (Phi - I - A h) b / h
// (variation of constants with F linear in the step). Chosen over RK4 because it has no
// truncation error for the piecewise-linear forcing the model is driven with, and it costs one
// 2x2 matrix-vector product per step.
class TwoLayerPropagator {
 public:
  explicit TwoLayerPropagator(const TwoLayerParameters& p, double step_yr = 1.0);
  [[nodiscard]] TwoLayerState step(const TwoLayerState& x, double forcing_start_w_m2,
                                   double forcing_end_w_m2) const {
    const double df = forcing_end_w_m2 - forcing_start_w_m2;
    return {phi_(0, 0) * x.surface_k + phi_(0, 1) * x.deep_k + g0_(0) * forcing_start_w_m2 + g1_(0) * df,
            phi_(1, 0) * x.surface_k + phi_(1, 1) * x.deep_k + g0_(1) * forcing_start_w_m2 + g1_(1) * df};
  }
  // Eigenvalues of A (both negative): -1/tau_f and -1/tau_s.
  [[nodiscard]] double fast_time_yr() const { return fast_time_yr_; }
  [[nodiscard]] double slow_time_yr() const { return slow_time_yr_; }

 private:
  Eigen::Matrix2d phi_;
  Eigen::Vector2d g0_;
  Eigen::Vector2d g1_;
  double fast_time_yr_ = 0.0;
  double slow_time_yr_ = 0.0;
};

struct TwoLayerPath {
  std::vector<double> surface_k;           // T at each forcing point
  std::vector<double> deep_k;              // T_d
  std::vector<double> toa_imbalance_w_m2;  // N
  std::vector<double> heat_content_w_yr_m2;  // H = C T + C_d T_d, relative to the start state's zero
};
// Integrates from `initial` at the first forcing point; forcing_w_m2[i] is F at step i
// (linear in between). Throws InputError for bad parameters or non-finite forcing.
[[nodiscard]] TwoLayerPath integrate_two_layer(const TwoLayerParameters& p, const std::vector<double>& forcing_w_m2,
                                               TwoLayerState initial = {}, double step_yr = 1.0);

// Deep box driven by a prescribed surface warming (the energy balance skipped): exact solution of
// C_d dT_d/dt = gamma (T - T_d) over one step with T linear in the step.
[[nodiscard]] double deep_step_for_given_surface(double deep_k, double surface_start_k, double surface_end_k,
                                                 double gamma_over_cd_per_yr, double step_yr = 1.0);

// Equilibrium climate sensitivity F_2x / lambda (Geoffroy et al. 2013 Part I, sec. 2).
[[nodiscard]] inline double equilibrium_warming_k(double forcing_w_m2, double feedback_w_m2_k) {
  return forcing_w_m2 / feedback_w_m2_k;
}

}  // namespace tidewright::climate
