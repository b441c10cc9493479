#include "tidewright/record/block_maxima.hpp"

#include "prepared_record.hpp"

namespace tidewright::record {

AnnualMaxima annual_maxima_from_series(const WaterLevelSeries& series,
                                       const AnnualMaximaOptions& options) {
  const detail::PreparedRecord p =
      detail::prepare_record(series, options.year_start_month, options.min_completeness,
                             options.detrend, options.epoch_yr);
  AnnualMaxima am;
  am.datum = series.datum;
  am.source = series.source;
  am.cleaning = series.cleaning;
  am.year_start_month = options.year_start_month;
  am.min_completeness = options.min_completeness;
  am.detrend = p.detrend;
  am.dropped = p.dropped;
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
  }
  return am;
}

}  // namespace tidewright::record
