#include "tidewright/record/block_maxima.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>

#include "prepared_record.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::record {
namespace {

// The r largest levels of samples [first, last) that are pairwise at least separation_s apart,
// taken greedily from the highest (ties: the earlier sample first).
std::vector<double> r_largest_independent(const std::vector<std::int64_t>& t,
                                          const std::vector<double>& h, std::size_t first,
                                          std::size_t last, std::size_t r, double separation_s) {
  std::vector<std::size_t> order(last - first);
  std::iota(order.begin(), order.end(), first);
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return h[a] > h[b]; });
  std::vector<std::size_t> taken;
  for (std::size_t i : order) {
    if (taken.size() == r) break;
    const bool independent = std::all_of(taken.begin(), taken.end(), [&](std::size_t j) {
      return std::abs(static_cast<double>(t[i] - t[j])) >= separation_s;
    });
    if (independent) taken.push_back(i);
  }
  std::vector<double> out;
  out.reserve(taken.size());
  for (std::size_t i : taken) out.push_back(h[i]);
  return out;
}

}  // namespace

AnnualMaxima annual_maxima_from_series(const WaterLevelSeries& series,
                                       const AnnualMaximaOptions& options) {
  if (options.r_largest < 1) {
    throw InputError("r largest", "0 values per year asked for", "ask for 1 or more");
  }
  if (!(options.separation_h > 0.0) || !std::isfinite(options.separation_h)) {
    throw InputError(
        "separation",
        detail::format_number(options.separation_h, "%g") + " h is not a positive time",
        "give the minimum separation of independent events in hours, such as 72");
  }
  const detail::PreparedRecord p =
      detail::prepare_record(series, options.year_start_month, options.min_completeness,
                             options.detrend, options.epoch_yr);
  AnnualMaxima am;
  static_cast<RecordProvenance&>(am) = detail::provenance(series, options.year_start_month, options.min_completeness, p);
  const auto& h = p.levels.level_m;
  for (const auto& y : p.years.years) {
    if (!y.kept) continue;
    std::size_t best = y.first;
    for (std::size_t i = y.first + 1; i < y.last; ++i) {
      if (h[i] > h[best]) best = i;
    }
    am.years.push_back(y.year);
    am.level_m.push_back(h[best]);
    am.time_utc_s.push_back(series.time_utc_s[best]);
    if (options.r_largest > 1) {
      am.r_largest_m.push_back(r_largest_independent(
          series.time_utc_s, h, y.first, y.last, options.r_largest, options.separation_h * 3600.0));
    }
  }
  return am;
}

}  // namespace tidewright::record
