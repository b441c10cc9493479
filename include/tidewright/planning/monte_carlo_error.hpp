// How far a planning figure computed from ensemble members could move with another draw of
// the members: the Monte Carlo standard error, the effective sample size and the share of the
// heaviest member. Quadrature nodes (a published table through Gauss-Hermite) carry no
// sampling error, so `sampled` is false there and the figures are not reported.
//
// Glossary: v_i the member's value (a rate or a probability); w_i its weight (sum 1);
// c_i = w_i v_i its contribution to the estimate m = sum c_i; n members.
#pragma once

#include <span>

namespace tidewright::planning {

// Below this effective sample size a figure rests on too few members to be quoted without a
// warning (our choice: at 100 the relative error of a weighted mean is about 10 %).
inline constexpr double min_effective_sample_size = 100.0;

struct MonteCarloError {
  bool sampled = false;                // members drawn at random (false for quadrature nodes)
  double standard_error = 0.0;         // of the figure, in its own unit
  double effective_sample_size = 0.0;  // Kish (1965): (sum c_i)^2 / sum c_i^2
  double heaviest_share = 0.0;         // max c_i / sum c_i
  [[nodiscard]] bool few_effective_members() const {
    return sampled && effective_sample_size < min_effective_sample_size;
  }
};

// The error of m = sum w_i v_i for members drawn independently with equal weights:
// SE^2 = sum_i (v_i - m)^2 / (n (n - 1)) (the sample variance over n), generalised to weights
// as n/(n-1) sum_i w_i^2 (v_i - m)^2. Values must be non-negative (rates, probabilities).
[[nodiscard]] MonteCarloError weighted_mean_error(std::span<const double> values, std::span<const double> weights,
                                                  bool sampled);

// The error carried through a root: for a figure x solving S(x) = target with S a weighted
// mean, SE(x) = SE(S) / |dS/dx| (the delta method).
[[nodiscard]] MonteCarloError through_root(MonteCarloError of_mean, double slope);

// The same figure scaled by a constant (e.g. an amplification factor S / N_0).
[[nodiscard]] MonteCarloError scaled(MonteCarloError e, double factor);

}  // namespace tidewright::planning
