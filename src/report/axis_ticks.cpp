// Glossary (Heckbert 1990): range = nicenum(hi - lo, false), d = nicenum(range / (n - 1), true),
// graph_min = floor(lo / d) * d, graph_max = ceil(hi / d) * d, nfrac = max(-floor(log10 d), 0).
#include "tidewright/report/axis_ticks.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "tidewright/report/text_table.hpp"

namespace tidewright::report {
namespace {
// Small slack so that floor/ceil of values that are whole steps up to rounding stay put.
constexpr double step_slack = 1e-9;

int decimals_for_step(double step) {
  return std::max(0, -static_cast<int>(std::floor(std::log10(step) + step_slack)));
}

// A log-axis label: a plain number, or 10 with a superscript exponent when `powers` (used for
// a whole axis at once, so that one axis never mixes the two styles).
std::string log_label(double v, bool powers) {
  const double e = std::log10(v);
  if (!powers) {
    return tick_label(v, std::max(0, -static_cast<int>(std::floor(e + step_slack))));
  }
  static const char* const superscripts[] = {"⁰", "¹", "²", "³", "⁴", "⁵", "⁶", "⁷", "⁸", "⁹"};
  const int k = static_cast<int>(std::floor(e + step_slack));
  const long mantissa = std::lround(v / std::pow(10.0, k));  // 1, 2 or 5
  std::string s = mantissa == 1 ? "10" : std::to_string(mantissa) + "\u00d710";
  if (k < 0) s += "⁻";
  for (char c : std::to_string(std::abs(k))) s += superscripts[c - '0'];
  return s;
}
}  // namespace

double nice_number(double x, bool round) {
  if (!(x > 0) || !std::isfinite(x)) throw std::invalid_argument("nice_number needs x > 0");
  const double exponent = std::floor(std::log10(x));
  const double f = x / std::pow(10.0, exponent);  // Heckbert: fraction in [1, 10)
  double nf = 10;
  if (round) {
    nf = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;  // Heckbert (1990), nicenum, round branch
  } else {
    nf = f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10;  // Heckbert (1990), nicenum, ceiling branch
  }
  return nf * std::pow(10.0, exponent);
}

AxisTicks linear_ticks(double lo, double hi, int target_count) {
  if (!std::isfinite(lo) || !std::isfinite(hi))
    throw std::invalid_argument("axis range not finite");
  if (lo > hi) std::swap(lo, hi);
  if (target_count < 2) target_count = 2;
  if (hi - lo <= 1e-12 * std::max(1.0, std::abs(hi))) {
    const double pad = lo == 0 ? 1.0 : std::pow(10.0, std::floor(std::log10(std::abs(lo))));
    lo -= pad;
    hi += pad;
  }
  const double range = nice_number(hi - lo, false);
  const double d = nice_number(range / (target_count - 1), true);
  const double gmin = std::floor(lo / d + step_slack) * d;
  const double gmax = std::ceil(hi / d - step_slack) * d;
  const int decimals = decimals_for_step(d);
  AxisTicks t;
  t.min = gmin;
  t.max = gmax;
  const long n = std::lround((gmax - gmin) / d);
  for (long i = 0; i <= n; ++i) {
    double v = gmin + static_cast<double>(i) * d;
    if (std::abs(v) < d * 1e-9) v = 0;
    t.major.push_back(v);
    t.labels.push_back(tick_label(v, decimals));
  }
  return t;
}

AxisTicks log_ticks(double lo, double hi) {
  if (!(lo > 0) || !(hi > 0) || !std::isfinite(lo) || !std::isfinite(hi)) {
    throw std::invalid_argument("log axis needs positive finite limits");
  }
  if (lo > hi) std::swap(lo, hi);
  if (hi / lo < 1.0 + 1e-9) {
    lo /= 2;
    hi *= 2;
  }
  const int e_lo = static_cast<int>(std::floor(std::log10(lo) + step_slack));
  const int e_hi = static_cast<int>(std::ceil(std::log10(hi) - step_slack));
  const int decades = std::max(1, e_hi - e_lo);
  // Plain numbers while they stay short (0.001 .. 10000), powers of ten beyond.
  const bool powers = e_lo < -3 || e_hi > 4;
  AxisTicks t;
  if (decades <= 3) {
    // Short range: 1-2-5 steps, widened to the nearest of them on each side.
    static constexpr double steps[] = {1, 2, 5};
    std::vector<double> candidates;
    for (int e = e_lo - 1; e <= e_hi; ++e) {
      for (double s : steps) candidates.push_back(s * std::pow(10.0, e));
    }
    candidates.push_back(std::pow(10.0, e_hi + 1));
    double amin = candidates.front(), amax = candidates.back();
    for (double c : candidates) {
      if (c <= lo * (1 + step_slack)) amin = c;
    }
    for (auto it = candidates.rbegin(); it != candidates.rend(); ++it) {
      if (*it >= hi * (1 - step_slack)) amax = *it;
    }
    t.min = amin;
    t.max = amax;
    for (double c : candidates) {
      if (c >= amin * (1 - step_slack) && c <= amax * (1 + step_slack)) {
        t.major.push_back(c);
        t.labels.push_back(log_label(c, powers));
      }
    }
  } else {
    t.min = std::pow(10.0, e_lo);
    t.max = std::pow(10.0, e_hi);
    const int every = decades > 6 ? 2 : 1;  // at most about six labels along the axis
    for (int e = e_lo; e <= e_hi; ++e) {
      const double v = std::pow(10.0, e);
      if ((e - e_lo) % every == 0) {
        t.major.push_back(v);
        t.labels.push_back(log_label(v, powers));
      } else {
        t.minor.push_back(v);
      }
    }
  }
  // Minor ticks at 2..9 times each decade, unless there are so many decades that they would
  // crowd into a grey band.
  for (int e = e_lo; e < e_hi && decades <= 6; ++e) {
    for (int m = 2; m <= 9; ++m) {
      const double v = m * std::pow(10.0, e);
      if (v <= t.min || v >= t.max) continue;
      const bool is_major = std::any_of(t.major.begin(), t.major.end(),
                                        [&](double x) { return std::abs(x - v) <= 1e-9 * v; });
      if (!is_major) t.minor.push_back(v);
    }
  }
  std::sort(t.minor.begin(), t.minor.end());
  return t;
}

std::string tick_label(double value, int decimals) {
  std::string s = fixed(value, decimals);
  if (!s.empty() && s[0] == '-') {
    const bool all_zero = s.find_first_not_of("-0.") == std::string::npos;
    s = all_zero ? s.substr(1) : "\u2212" + s.substr(1);
  }
  return s;
}

}  // namespace tidewright::report
