// Damped Newton maximisation of a log-likelihood with analytic gradient and Hessian, used by
// the fits and by the profile likelihoods. Hand-written because no Debian library offers a
// small-dimension Newton method on a user Hessian with a support constraint (Eigen has the
// linear algebra, not the optimiser; Boost.Math's minimisers are one-dimensional).
//
// Each iteration: if the Hessian H is negative definite, the Newton step s = (-H)^-1 g;
// otherwise a gradient step in the metric |H| (the eigenvalues of -H replaced by their
// absolute values, floored at 1e-8 of the largest; Nocedal & Wright 2006, sec. 3.4), which is
// an ascent direction whatever the sign of H. The step is halved until the log-likelihood is
// finite (inside the support) and rises by the Armijo condition
// l(theta + alpha s) >= l(theta) + 1e-4 alpha g's (Nocedal & Wright 2006, eq. 3.4).
// Converged when a Newton step predicts a rise g's/2 below 1e-14 (1 + |l|), or when it cannot
// rise further and g's is below 1e-10 (1 + |l|) (round-off).
#pragma once

#include <functional>
#include <string>

#include "tidewright/extremes/likelihood.hpp"

namespace tidewright::extremes {

struct MaximiserResult {
  ParamVector estimate;
  LogLikelihood at_estimate;
  int iterations = 0;
};

using Objective = std::function<LogLikelihood(const ParamVector&)>;

// Throws ComputationError (naming `what`) if the start is outside the support, the iteration
// limit is reached or no step can raise the log-likelihood away from a stationary point.
[[nodiscard]] MaximiserResult maximise_newton(const Objective& objective, ParamVector start,
                                              const std::string& what, int max_iterations = 200);

}  // namespace tidewright::extremes
