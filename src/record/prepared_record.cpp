#include "prepared_record.hpp"

#include <algorithm>
#include <cstdio>

#include "tidewright/common/error.hpp"

namespace tidewright::record::detail {

std::string format_number(double value, const char* printf_format) {
  char buf[64];
  std::snprintf(buf, sizeof buf, printf_format, value);
  return buf;
}

std::string percent(double fraction) { return format_number(100.0 * fraction, "%.1f") + "%"; }

std::string dropped_list(const std::vector<DroppedYear>& dropped) {
  // Years that share a reason are grouped ("no value in the file: 1925, 1927"); a year with a
  // reason of its own reads "2002 (72.6% complete, below 75.0%)".
  std::vector<std::string> reasons;
  for (const auto& d : dropped) {
    if (std::find(reasons.begin(), reasons.end(), d.reason) == reasons.end()) {
      reasons.push_back(d.reason);
    }
  }
  std::string out;
  for (const auto& reason : reasons) {
    std::string years;
    std::size_t count = 0;
    for (const auto& d : dropped) {
      if (d.reason != reason) continue;
      years += (years.empty() ? "" : ", ") + std::to_string(d.year);
      ++count;
    }
    if (!out.empty()) out += "; ";
    if (count == 1) {
      out.append(years).append(" (").append(reason).append(")");
    } else {
      out.append(reason).append(": ").append(years);
    }
  }
  return out;
}

std::string completeness_line(double min_completeness, double sampling_interval_s) {
  return "  years kept when at least " + percent(min_completeness) +
         " complete (expected samples from the " + format_number(sampling_interval_s / 60.0, "%g") +
         "-min median spacing)\n";
}

std::string dropped_and_trend_lines(const std::vector<DroppedYear>& dropped,
                                    const std::optional<Detrend>& detrend) {
  std::string out;
  if (!dropped.empty()) {
    out += "  " + std::to_string(dropped.size()) + (dropped.size() == 1 ? " year" : " years") +
           " dropped: " + dropped_list(dropped) + "\n";
  }
  if (detrend && detrend->method != DetrendMethod::none) {
    out += "  mean-sea-level trend removed (" + std::string(detrend_method_name(detrend->method)) +
           "): " + format_number(detrend->trend_mm_per_yr, "%.2f") +
           " mm/yr; levels relative to the mean sea level of epoch " +
           format_number(detrend->epoch_yr, "%.2f") +
           (detrend->epoch_is_default ? " (the record's mid-point)" : "") + "\n";
  }
  return out;
}

PreparedRecord prepare_record(const WaterLevelSeries& series, int start_month,
                              double min_completeness, DetrendMethod method,
                              std::optional<double> epoch_yr) {
  PreparedRecord p;
  p.years = partition_record_years(series, start_month, min_completeness);
  if (p.years.kept_count() == 0) {
    const RecordYear* best = nullptr;
    for (const auto& y : p.years.years) {
      if (best == nullptr || y.completeness > best->completeness) best = &y;
    }
    throw InputError(series.source,
                     "no year is at least " + percent(min_completeness) + " complete" +
                         (best ? " (the most complete, " + std::to_string(best->year) + ", is " +
                                     percent(best->completeness) + ")"
                               : std::string()),
                     "give a longer record or a lower minimum completeness");
  }
  p.levels = remove_mean_sea_level_trend(series, p.years, method, epoch_yr);
  if (method != DetrendMethod::none) p.detrend = p.levels.detrend;
  for (const auto& y : p.years.years) {
    if (!y.kept) {
      p.dropped.push_back(
          {y.year, y.completeness,
           percent(y.completeness) + " complete, below " + percent(min_completeness)});
    }
  }
  return p;
}

RecordProvenance provenance(const WaterLevelSeries& series, int start_month, double min_completeness,
                            const PreparedRecord& prepared) {
  RecordProvenance p;
  p.datum = series.datum;
  p.source = series.source;
  p.cleaning = series.cleaning;
  p.dropped = prepared.dropped;
  p.detrend = prepared.detrend;
  p.year_start_month = start_month;
  p.min_completeness = min_completeness;
  p.sampling_interval_s = prepared.years.median_interval_s;
  return p;
}

}  // namespace tidewright::record::detail
