// The project's one sample quantile: Hyndman & Fan (1996, Am. Stat. 50:361) definition 7
// (R's and NumPy's default), h = (n - 1) p, linear between the order statistics x_(floor h) and
// x_(floor h + 1) (0-based). Sort once, then ask for as many probabilities as needed.
#pragma once

#include <algorithm>
#include <cmath>
#include <limits>
#include <span>
#include <vector>

namespace tidewright {

// The p-quantile of values already sorted ascending; p in [0, 1]; NaN when empty.
[[nodiscard]] inline double quantile_of_sorted(std::span<const double> sorted, double p) {
  if (sorted.empty()) return std::numeric_limits<double>::quiet_NaN();
  const double h = static_cast<double>(sorted.size() - 1) * p;
  const auto lo = static_cast<std::size_t>(std::floor(h));
  if (lo + 1 >= sorted.size()) return sorted.back();
  return sorted[lo] + (h - static_cast<double>(lo)) * (sorted[lo + 1] - sorted[lo]);
}

// Quantiles of `values` (copied and sorted once) at each of `ps`.
[[nodiscard]] inline std::vector<double> sample_quantiles(std::vector<double> values, std::span<const double> ps) {
  std::sort(values.begin(), values.end());
  std::vector<double> out;
  out.reserve(ps.size());
  for (const double p : ps) out.push_back(quantile_of_sorted(values, p));
  return out;
}

[[nodiscard]] inline double sample_quantile(std::vector<double> values, double p) {
  return sample_quantiles(std::move(values), std::span<const double>(&p, 1)).front();
}

}  // namespace tidewright
