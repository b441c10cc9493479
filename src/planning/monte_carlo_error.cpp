// Glossary: see include/tidewright/planning/monte_carlo_error.hpp.
#include "tidewright/planning/monte_carlo_error.hpp"

#include <algorithm>
#include <cmath>

namespace tidewright::planning {

MonteCarloError weighted_mean_error(std::span<const double> values, std::span<const double> weights, bool sampled) {
  MonteCarloError e;
  e.sampled = sampled;
  const std::size_t n = std::min(values.size(), weights.size());
  double mean = 0.0;
  double sum_c = 0.0;
  double sum_c2 = 0.0;
  double top = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    const double c = weights[i] * values[i];
    mean += c;
    sum_c += c;
    sum_c2 += c * c;
    top = std::max(top, c);
  }
  if (!(sum_c > 0.0)) return e;  // nothing contributes: no spread, no effective members
  double spread = 0.0;
  for (std::size_t i = 0; i < n; ++i) spread += weights[i] * weights[i] * (values[i] - mean) * (values[i] - mean);
  const auto dn = static_cast<double>(n);
  e.standard_error = n > 1 ? std::sqrt(spread * dn / (dn - 1.0)) : 0.0;
  // Kish (1965, Survey Sampling) effective sample size of the contributions.
  e.effective_sample_size = sum_c * sum_c / sum_c2;
  e.heaviest_share = top / sum_c;
  return e;
}

MonteCarloError through_root(MonteCarloError of_mean, double slope) {
  of_mean.standard_error = std::abs(slope) > 0.0 ? of_mean.standard_error / std::abs(slope) : 0.0;
  return of_mean;
}

MonteCarloError scaled(MonteCarloError e, double factor) {
  e.standard_error *= std::abs(factor);
  return e;
}

}  // namespace tidewright::planning
