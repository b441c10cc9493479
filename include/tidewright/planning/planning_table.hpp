// Tables of planning products over years x return periods, as the allowance and amplify
// commands print them: the same calls as allowance() and amplification_of_return_level(),
// spread over threads by year. Row order is year-major (all return periods of the first year,
// then the next year), whatever the thread count, and every row is computed independently, so
// the result does not depend on the threads used.
#pragma once

#include <span>
#include <vector>

#include "tidewright/planning/allowance.hpp"
#include "tidewright/planning/amplification.hpp"

namespace tidewright::planning {

// threads = 0: one per hardware thread (std::thread::hardware_concurrency), at most one per year.
[[nodiscard]] std::vector<Allowance> allowance_table(const extremes::StillWaterModel& present,
                                                     std::span<const YearConditions> years,
                                                     std::span<const double> return_periods_yr,
                                                     const AllowanceOptions& options = {}, unsigned threads = 0);

[[nodiscard]] std::vector<Amplification> amplification_table(const extremes::StillWaterModel& present,
                                                             std::span<const YearConditions> years,
                                                             std::span<const double> return_periods_yr,
                                                             unsigned threads = 0);

}  // namespace tidewright::planning
