// Internal to the extremes module: the batch rate sum's kernel (rate_sum_kernel.cpp) and the
// pieces of still_water_model.cpp it shares.
#pragma once

#include <span>
#include <string_view>
#include <vector>

#include "tidewright/extremes/still_water_model.hpp"

namespace tidewright::extremes::detail {

// Below this |xi| the xi -> 0 limit is used through log1p/expm1 series, avoiding 0/0.
inline constexpr double xi_small = 1e-9;

// A GPD's empirical rate curve below its threshold at `level_m` (log-linear between its
// points), with d ln N / dz in `slope`; ComputationError when the model has no curve.
[[nodiscard]] double below_threshold_rate(const StillWaterModel& m, double level_m, double& slope);

// The builds this processor runs, best first ("x86-64-v4", "x86-64-v3", "portable"; "scalar"
// where the vector extension is missing).
[[nodiscard]] std::vector<std::string_view> rate_sum_build_names();

// sum_i w_i N_0(z - d_i) with its derivatives, in the named build (empty: the best).
[[nodiscard]] RateDerivatives batch_rate_sum(const StillWaterModel& m, std::string_view build, double level_m,
                                             std::span<const double> shift_m, std::span<const double> weight,
                                             bool derivatives);

}  // namespace tidewright::extremes::detail
