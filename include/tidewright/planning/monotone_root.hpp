// Root of a non-increasing function of one level, as the allowance and design-life solves need:
// an additive bracket search, then TOMS748 (Alefeld, Potra & Shi 1995, ACM TOMS 21:327) from
// Boost.Math. The bracket search is written here because boost::math::tools::
// bracket_and_solve_root grows the bracket by a factor, which suits positive scale-like
// variables, not levels or allowances that may be zero or negative. With derivatives at hand,
// Halley steps inside a known bracket (solve_non_increasing_halley) reach the root in fewer
// evaluations and hand over to TOMS748 when they do not settle.
#pragma once

#include <algorithm>
#include <boost/math/tools/roots.hpp>
#include <cmath>
#include <cstdint>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::planning {

struct MonotoneRoot {
  double x = 0.0;
  int evaluations = 0;
};

// Solves f(x) = 0 for f non-increasing; starts from [lo, hi] and widens it until
// f(lo) >= 0 >= f(hi). Infinite values of f are clamped to +-1e300 so that the sign is kept
// and TOMS748 still sees finite numbers. `what` names the quantity in errors.
template <class F>
MonotoneRoot solve_non_increasing(F f, double lo, double hi, double tolerance, const std::string& what) {
  int evaluations = 0;
  auto g = [&](double x) {
    ++evaluations;
    const double v = f(x);
    if (std::isnan(v)) {
      throw ComputationError(what, "the equation is not defined at " + std::to_string(x),
                             "check the extreme model and the rise distribution");
    }
    return std::isinf(v) ? std::copysign(1e300, v) : v;
  };
  if (!(hi > lo)) hi = lo + 1e-3;
  double flo = g(lo);
  double fhi = g(hi);
  double step = hi - lo;
  for (int k = 0; k < 60 && flo < 0.0; ++k, step *= 2.0) {
    hi = lo;
    fhi = flo;
    lo -= step;
    flo = g(lo);
  }
  for (int k = 0; k < 60 && fhi > 0.0; ++k, step *= 2.0) {
    lo = hi;
    flo = fhi;
    hi += step;
    fhi = g(hi);
  }
  if (flo < 0.0 || fhi > 0.0) {
    throw ComputationError(what, "no bracket for the root was found", "check the inputs for a solution");
  }
  if (flo == 0.0) return {lo, evaluations};
  if (fhi == 0.0) return {hi, evaluations};
  std::uintmax_t max_iter = 200;
  const auto tol = [tolerance](double a, double b) { return std::abs(b - a) <= tolerance; };
  const auto r = boost::math::tools::toms748_solve(g, lo, hi, flo, fhi, tol, max_iter);
  if (max_iter >= 200) {
    throw ComputationError(what, "TOMS748 did not converge in 200 iterations", "report this case");
  }
  // A root pinned against a clamped infinity is no root: the equation jumps there (e.g. a
  // GEV lower end point entered by one node), so the answer would only mark the jump.
  if (std::abs(g(r.first)) >= 1e300 || std::abs(g(r.second)) >= 1e300) {
    throw ComputationError(what, "the equation jumps to infinity at the solution (an end point of the extreme model)",
                           "check the extreme model's shape and the spread of the rise");
  }
  return {0.5 * (r.first + r.second), evaluations};
}

// f with its first two derivatives at one point.
struct ValueAndSlopes {
  double value = 0.0;
  double first = 0.0;
  double second = 0.0;
};

// The same root by Halley's method, x <- x - 2 f f' / (2 f'^2 - f f'') (cubic convergence;
// Scavo & Thoo 1995, Amer. Math. Monthly 102:417), for f non-increasing with its root in
// [lo, hi]. `fd(x)` gives f, f', f'' in one evaluation. Each evaluation narrows the bracket by
// the sign of f; a step that leaves the bracket is replaced by its midpoint. The step that
// follows an evaluation is accepted as the answer once it is at most `settled_step` (its own
// size is then about the error before it, and the error after it is of that size cubed over
// the square of f's length scale) or at most `tolerance`. An infinity, f' >= 0 or no settling
// in 12 evaluations hands the narrowed bracket to solve_non_increasing (TOMS748).
template <class FD>
MonotoneRoot solve_non_increasing_halley(FD fd, double guess, double lo, double hi, double tolerance,
                                         double settled_step, const std::string& what) {
  int evaluations = 0;
  double a = lo;  // f(a) >= 0 (assumed, or seen)
  double b = hi;  // f(b) <= 0
  double x = std::clamp(guess, lo, hi);
  for (int k = 0; k < 12; ++k) {
    ++evaluations;
    const ValueAndSlopes v = fd(x);
    if (!std::isfinite(v.value) || !std::isfinite(v.first) || !std::isfinite(v.second) || !(v.first < 0.0)) break;
    if (v.value == 0.0) return {x, evaluations};
    if (v.value > 0.0) {
      a = x;
    } else {
      b = x;
    }
    const double newton = -v.value / v.first;
    const double denominator = 2.0 * v.first * v.first - v.value * v.second;
    double step = denominator > 0.0 ? -2.0 * v.value * v.first / denominator : newton;
    if (!std::isfinite(step)) step = newton;
    double next = x + step;
    // A settled step is taken even when rounding puts it on or just past the bracket's end.
    if (std::abs(step) <= settled_step || std::abs(step) <= tolerance) return {std::clamp(next, a, b), evaluations};
    if (!(next > a && next < b)) {
      next = 0.5 * (a + b);  // outside the bracket: bisect instead
      if (b - a <= tolerance) return {next, evaluations};
    }
    x = next;
  }
  MonotoneRoot r = solve_non_increasing([&](double y) { return fd(y).value; }, a, b, tolerance, what);
  r.evaluations += evaluations;
  return r;
}

}  // namespace tidewright::planning
