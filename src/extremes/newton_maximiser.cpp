// Damped Newton maximiser; method and sources in include/tidewright/extremes/newton_maximiser.hpp.
// Glossary: theta parameters, l log-likelihood, g gradient, H Hessian, s step, alpha step length.
#include "tidewright/extremes/newton_maximiser.hpp"

#include <algorithm>
#include <cmath>

#include "tidewright/common/error.hpp"

namespace tidewright::extremes {

MaximiserResult maximise_newton(const Objective& objective, ParamVector start,
                                const std::string& what, int max_iterations) {
  MaximiserResult r;
  r.estimate = std::move(start);
  r.at_estimate = objective(r.estimate);
  if (!r.at_estimate.inside()) {
    throw ComputationError(what, "the starting values lie outside the support of the model",
                           "check the data for outliers or give another model");
  }
  for (int it = 1; it <= max_iterations; ++it) {
    r.iterations = it;
    const LogLikelihood& cur = r.at_estimate;
    const ParamMatrix neg_h = -cur.hessian;
    // Cholesky first: it succeeds exactly when -H is positive definite (the usual case near the
    // maximum) and is cheaper than the eigen-decomposition needed otherwise.
    Eigen::LLT<ParamMatrix> llt(neg_h);
    const bool newton = llt.info() == Eigen::Success && neg_h.allFinite();
    ParamVector step;
    if (newton) {
      step = llt.solve(cur.gradient);
    } else {
      Eigen::SelfAdjointEigenSolver<ParamMatrix> eig(neg_h);
      const auto& ev = eig.eigenvalues();
      const double floor_ev = 1e-8 * std::max(ev.cwiseAbs().maxCoeff(), 1e-300);
      const ParamVector absev = ev.cwiseAbs().cwiseMax(floor_ev);
      step =
          eig.eigenvectors() * (eig.eigenvectors().transpose() * cur.gradient).cwiseQuotient(absev);
    }
    const double rise = cur.gradient.dot(step);  // >= 0 for both kinds of step
    const double scale = 1.0 + std::abs(cur.value);
    if (newton && rise / 2.0 < 1e-14 * scale) {
      // Take the last tiny step (inside the quadratic regime it sharpens the estimate; its
      // predicted rise is at the rounding level of the value, so the value is not compared).
      const ParamVector next = r.estimate + step;
      LogLikelihood at_next = objective(next);
      if (at_next.inside() && at_next.value >= cur.value - 1e-12 * scale) {
        r.estimate = next;
        r.at_estimate = std::move(at_next);
      }
      return r;
    }
    double alpha = 1.0;
    bool moved = false;
    for (int half = 0; half < 60; ++half, alpha /= 2.0) {
      const ParamVector next = r.estimate + alpha * step;
      LogLikelihood at_next = objective(next);
      if (at_next.inside() && at_next.value >= cur.value + 1e-4 * alpha * rise) {
        r.estimate = next;
        r.at_estimate = std::move(at_next);
        moved = true;
        break;
      }
      // A full Newton step that predicts a rise below 1e-10 (1 + |l|) and is refused is lost
      // in the rounding of the summed log-likelihood (about n eps max|term|): converged.
      // Without this the search crept on with steps of 2^-7 forever (regression test:
      // tests/extremes/fit_test.cpp, RoundingLevelRiseEndsTheSearch).
      if (half == 0 && newton && rise < 1e-10 * scale) return r;
    }
    if (!moved) {
      if (newton && rise < 1e-10 * scale) return r;  // round-off floor reached
      throw ComputationError(
          what, "the likelihood maximisation stalled after " + std::to_string(it) + " iterations",
          "the maximum may lie on the edge of the parameter space; try "
          "another model or check the data");
    }
  }
  throw ComputationError(what,
                         "the likelihood maximisation did not converge in " +
                             std::to_string(max_iterations) + " iterations",
                         "try another model or check the data");
}

}  // namespace tidewright::extremes
