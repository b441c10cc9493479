// Glossary: see include/tidewright/planning/parameter_range.hpp.
#include "tidewright/planning/parameter_range.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <vector>

#include "tidewright/common/error.hpp"
#include "tidewright/common/sample_quantile.hpp"

namespace tidewright::planning {
namespace {

}  // namespace

ParameterRange range_over_parameters(const extremes::StillWaterModel& fit,
                                     std::span<const extremes::StillWaterModel> draws,
                                     const std::function<double(const extremes::StillWaterModel&)>& product,
                                     double coverage) {
  if (draws.empty()) {
    throw InputError("parameter draws", "none were given", "give bootstrap or covariance draws of the fit");
  }
  if (!(coverage > 0.0 && coverage < 1.0)) {
    throw InputError("coverage " + std::to_string(coverage), "must lie strictly between 0 and 1", "use e.g. 0.9");
  }
  ParameterRange r;
  r.coverage = coverage;
  r.at_fit = product(fit);
  std::vector<double> values;
  values.reserve(draws.size());
  for (const auto& d : draws) {
    try {
      const double v = product(d);
      if (std::isnan(v)) {
        ++r.draws_failed;
      } else {
        values.push_back(v);
      }
    } catch (const ComputationError&) {
      ++r.draws_failed;
    }
  }
  r.draws_used = static_cast<int>(values.size());
  if (values.empty() || static_cast<double>(r.draws_failed) > 0.1 * static_cast<double>(draws.size())) {
    throw ComputationError("parameter range", std::to_string(r.draws_failed) + " of " + std::to_string(draws.size()) +
                                                  " parameter draws gave no result",
                           "check the draws, or ask for levels inside every draw's support");
  }
  std::sort(values.begin(), values.end());
  r.lower = quantile_of_sorted(values, 0.5 * (1.0 - coverage));
  r.upper = quantile_of_sorted(values, 0.5 * (1.0 + coverage));
  char buf[160];
  std::snprintf(buf, sizeof buf, "%g-%g %% range over %d draws of the extreme-value parameters (at the fit: %g)",
                50.0 * (1.0 - coverage), 50.0 * (1.0 + coverage), r.draws_used, r.at_fit);
  r.label = buf;
  return r;
}

}  // namespace tidewright::planning
