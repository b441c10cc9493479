// The project's one runs declustering (Coles 2001, An Introduction to Statistical Modeling of
// Extreme Values, §5.3.2): samples above a threshold belong to one cluster until the level has
// stayed at or below it for the separation; each cluster is represented by its highest sample.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

namespace tidewright {

// Walks the samples i with use[i] and level_m[i] > threshold_m in time order (time_s ascending)
// and calls on_peak(index) once per cluster with the index of its highest sample (the first of
// equal highs). A new cluster starts when the previous exceedance lies at least separation_s
// earlier. Returns the number of exceedances (samples above the threshold).
template <typename OnPeak>
std::size_t runs_declustering(const std::vector<std::int64_t>& time_s, const std::vector<double>& level_m,
                              const std::vector<bool>& use, double threshold_m, double separation_s,
                              OnPeak&& on_peak) {
  std::size_t exceedances = 0;
  bool in_cluster = false;
  std::int64_t last = 0;
  std::size_t peak = 0;
  for (std::size_t i = 0; i < level_m.size(); ++i) {
    if (!use[i] || !(level_m[i] > threshold_m)) continue;
    ++exceedances;
    if (!in_cluster || static_cast<double>(time_s[i] - last) >= separation_s) {
      if (in_cluster) on_peak(peak);
      in_cluster = true;
      peak = i;
    } else if (level_m[i] > level_m[peak]) {
      peak = i;
    }
    last = time_s[i];
  }
  if (in_cluster) on_peak(peak);
  return exceedances;
}

}  // namespace tidewright
