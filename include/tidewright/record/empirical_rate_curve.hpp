// Empirical annual exceedance rates of declustered peaks at levels below a peaks-over-threshold
// threshold: a product of the record (runs declustering at falling levels) that the still-water
// model uses where sea-level rise brings a level of interest below the threshold.
#pragma once

#include <vector>

namespace tidewright::record {

// Levels ascending, rates descending (events per year); the model interpolates log-linearly.
struct EmpiricalRateCurve {
  std::vector<double> level_m;
  std::vector<double> rate_per_yr;
};

}  // namespace tidewright::record
