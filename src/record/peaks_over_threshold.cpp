// Peaks over threshold by runs declustering; glossary in the header.
#include "tidewright/record/peaks_over_threshold.hpp"

#include <algorithm>
#include <cmath>

#include "prepared_record.hpp"
#include "tidewright/common/declustering.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/common/sample_quantile.hpp"

namespace tidewright::record {
namespace {

using detail::format_number;

// Largest number of levels the rate curve may visit; guards against a step far too small.
constexpr double max_rate_curve_levels = 100000.0;

}  // namespace

double sample_quantile(std::vector<double> values, double p) {
  return tidewright::sample_quantile(std::move(values), p);
}

std::size_t count_clusters(const std::vector<std::int64_t>& time_utc_s,
                           const std::vector<double>& level_m, const std::vector<bool>& use,
                           double level_threshold_m, double separation_s) {
  std::size_t clusters = 0;
  (void)runs_declustering(time_utc_s, level_m, use, level_threshold_m, separation_s,
                          [&clusters](std::size_t) { ++clusters; });
  return clusters;
}

std::string PeaksOverThreshold::summary() const {
  std::string out = source + ": " + std::to_string(size()) + " declustered peaks above " +
                    format_number(threshold_m, "%.3f") + " m";
  if (threshold_quantile) out += " (quantile " + format_number(*threshold_quantile, "%g") + ")";
  out += ", separation " + format_number(separation_h, "%g") + " h; " +
         format_number(events_per_yr, "%.3f") + " events per year over " +
         format_number(effective_years, "%.2f") +
         " effective years; datum: " + (datum.empty() ? std::string("not stated") : datum) + "\n";
  out += "  " + std::to_string(cleaning.rows_read) + " rows read, " +
         std::to_string(cleaning.missing) + " missing, " + std::to_string(cleaning.sentinels) +
         " sentinels; " + std::to_string(exceedances) + " samples above the threshold\n";
  out += detail::completeness_line(min_completeness, sampling_interval_s);
  out += detail::dropped_and_trend_lines(dropped, detrend);
  if (!below_threshold.level_m.empty()) {
    out += "  empirical rates below the threshold from " +
           format_number(below_threshold.level_m.front(), "%.3f") + " m (" +
           format_number(below_threshold.rate_per_yr.front(), "%.3g") + " per year)\n";
  }
  return out;
}

PeaksOverThreshold peaks_over_threshold(const WaterLevelSeries& series,
                                        const PeaksOptions& options) {
  if (options.threshold_m && options.threshold_quantile) {
    throw InputError("threshold", "both a level and a quantile are given",
                     "give the threshold as a level in metres or as a quantile, not both");
  }
  if (options.threshold_m && !std::isfinite(*options.threshold_m)) {
    throw InputError("threshold", "is not a finite level", "give a level in metres");
  }
  const double quantile = options.threshold_quantile.value_or(default_threshold_quantile);
  if (!options.threshold_m && !(quantile > 0.0 && quantile < 1.0)) {
    throw InputError("threshold quantile", format_number(quantile, "%g") + " is not inside (0, 1)",
                     "give a quantile such as 0.99 or 0.997");
  }
  if (!(options.separation_h > 0.0) || !std::isfinite(options.separation_h)) {
    throw InputError("separation",
                     format_number(options.separation_h, "%g") + " h is not a positive time",
                     "give the minimum separation of independent events in hours, such as 72");
  }
  if (!(options.rate_curve_step_m > 0.0) || !std::isfinite(options.rate_curve_step_m)) {
    throw InputError("rate curve step",
                     format_number(options.rate_curve_step_m, "%g") + " m is not positive",
                     "give a step such as 0.01 m");
  }
  if (options.rate_curve_lowest_m && !std::isfinite(*options.rate_curve_lowest_m)) {
    throw InputError("rate curve lowest level", "is not a finite level", "give a level in metres");
  }
  const detail::PreparedRecord prepared =
      detail::prepare_record(series, options.year_start_month, options.min_completeness,
                             options.detrend, options.epoch_yr);
  const RecordYears& years = prepared.years;
  const DetrendedLevels& levels = prepared.levels;
  const auto& h = levels.level_m;
  const auto& t = series.time_utc_s;

  PeaksOverThreshold pot;
  static_cast<RecordProvenance&>(pot) =
      detail::provenance(series, options.year_start_month, options.min_completeness, prepared);
  pot.separation_h = options.separation_h;

  std::vector<bool> use(h.size(), false);
  std::vector<double> kept_levels;
  kept_levels.reserve(h.size());
  for (const auto& y : years.years) {
    if (!y.kept) continue;
    for (std::size_t i = y.first; i < y.last; ++i) {
      use[i] = true;
      kept_levels.push_back(h[i]);
    }
  }
  std::sort(kept_levels.begin(), kept_levels.end());
  if (options.threshold_m) {
    pot.threshold_m = *options.threshold_m;
  } else {
    pot.threshold_quantile = quantile;
    pot.threshold_m = sample_quantile(kept_levels, quantile);
  }
  const double u = pot.threshold_m;
  const double separation_s = options.separation_h * 3600.0;

  pot.exceedances = runs_declustering(t, h, use, u, separation_s, [&](std::size_t peak) {
    pot.time_utc_s.push_back(t[peak]);
    pot.level_m.push_back(h[peak]);
  });
  if (pot.level_m.empty()) {
    throw InputError(series.source,
                     "no level of the complete years lies above the threshold " +
                         format_number(u, "%.4g") + " m",
                     "lower the threshold");
  }
  pot.effective_years = years.effective_years();
  pot.events_per_yr = static_cast<double>(pot.level_m.size()) / pot.effective_years;

  // Empirical rate curve below u: clusters at u − k·step, kept while the count grows as the
  // level falls; N(z) = n_c(z) / T.
  const double lowest = options.rate_curve_lowest_m ? *options.rate_curve_lowest_m
                                                    : sample_quantile(kept_levels, 0.5);
  if ((u - lowest) / options.rate_curve_step_m > max_rate_curve_levels) {
    throw InputError("rate curve step",
                     "would visit more than " + format_number(max_rate_curve_levels, "%.0f") +
                         " levels between " + format_number(lowest, "%.3f") +
                         " m and the threshold",
                     "give a larger step or a higher lowest level");
  }
  std::size_t best = pot.level_m.size();
  std::vector<double> curve_level;
  std::vector<double> curve_rate;
  for (std::size_t k = 1;; ++k) {
    const double z = u - static_cast<double>(k) * options.rate_curve_step_m;
    if (z < lowest) break;
    const std::size_t c = count_clusters(t, h, use, z, separation_s);
    if (c < best) break;  // events merge from here down: the curve stops
    if (c > best) {
      curve_level.push_back(z);
      curve_rate.push_back(static_cast<double>(c) / pot.effective_years);
      best = c;
    }
  }
  pot.below_threshold.level_m.assign(curve_level.rbegin(), curve_level.rend());
  pot.below_threshold.rate_per_yr.assign(curve_rate.rbegin(), curve_rate.rend());
  return pot;
}

}  // namespace tidewright::record
