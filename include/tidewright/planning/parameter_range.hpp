// A planning product over the extreme model's parameter uncertainty: the product at the fitted
// parameters and its range over a set of parameter draws (from a bootstrap, or from the
// fit's covariance), labelled as such. The range covers the extreme-value parameter
// uncertainty only; the sea-level uncertainty is already inside each product through E_Delta.
//
// Glossary: theta_hat fitted parameters; theta_j the j-th draw; g(theta) the product;
// [lower, upper] the central `coverage` range of g(theta_j) (sample quantiles, Hyndman &
// Fan 1996 type 7, the default of R and NumPy).
#pragma once

#include <functional>
#include <span>
#include <string>

#include "tidewright/extremes/still_water_model.hpp"

namespace tidewright::planning {

struct ParameterRange {
  double at_fit = 0.0;     // g(theta_hat)
  double lower = 0.0;      // (1 - coverage)/2 sample quantile over the draws
  double upper = 0.0;      // (1 + coverage)/2 sample quantile
  double coverage = 0.9;
  int draws_used = 0;
  int draws_failed = 0;    // draws whose product could not be computed (ComputationError)
  std::string label;       // e.g. "5-95 % range over 200 draws of the extreme-value parameters"
};

// Evaluates `product` at `fit` and at every draw. A draw whose product throws
// ComputationError (e.g. a level outside that draw's support) is counted in draws_failed; if
// more than a tenth of the draws fail, throws ComputationError (the range would be biased).
// coverage default 0.90 (5-95 %, common practice in sea-level reporting).
[[nodiscard]] ParameterRange range_over_parameters(
    const extremes::StillWaterModel& fit, std::span<const extremes::StillWaterModel> draws,
    const std::function<double(const extremes::StillWaterModel&)>& product, double coverage = 0.9);

}  // namespace tidewright::planning
