// Peaks over a threshold taken from a water-level series, declustered into independent events
// by runs declustering (Coles 2001, §5.3.2): exceedances of u (levels strictly above u) belong
// to one cluster until the level has stayed at or below u for the separation r, that is until
// the next exceedance comes r or more after the cluster's last one; each cluster gives its
// highest level (the first, in a tie) as its peak.
//
// Glossary: u threshold (m); r separation (h); n_c number of clusters (peaks); T effective
// years of record (RecordYears::effective_years); λ_u = n_c / T events per year.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "tidewright/record/annual_maxima.hpp"
#include "tidewright/record/empirical_rate_curve.hpp"
#include "tidewright/record/mean_sea_level_trend.hpp"
#include "tidewright/record/record_years.hpp"
#include "tidewright/record/water_level_series.hpp"

namespace tidewright::record {

// The 99.7th percentile of hourly levels, the threshold of the IPCC AR6 WG1 amplification
// factors (Fig. 9.32; docs/references.md, confirmed).
inline constexpr double default_threshold_quantile = 0.997;
// 72 h between independent storm peaks: common practice (docs/references.md).
inline constexpr double default_separation_h = 72.0;
// Step of the empirical rate curve below the threshold: 1 cm, the usual resolution of
// tide-gauge levels (common practice).
inline constexpr double default_rate_curve_step_m = 0.01;

struct PeaksOptions {
  // The threshold: a level, or a quantile of the levels of the kept years (Hyndman & Fan 1996
  // type 7, as numpy.quantile and R quantile by default). Give at most one; neither means
  // default_threshold_quantile. On an hourly series this is the quantile of hourly levels.
  std::optional<double> threshold_m;
  std::optional<double> threshold_quantile;
  double separation_h = default_separation_h;
  double min_completeness = default_min_completeness;  // Slangen et al. (2017)
  int year_start_month = 1;
  DetrendMethod detrend = DetrendMethod::none;
  std::optional<double> epoch_yr;  // empty: the record's mid-point
  // The empirical rate curve below u: levels u − k·step for k = 1, 2, … down to the lowest
  // level (empty: the median level of the kept years), stopping where runs declustering
  // starts to merge events (the count of clusters stops growing as the level falls).
  double rate_curve_step_m = default_rate_curve_step_m;
  std::optional<double> rate_curve_lowest_m;
};

struct PeaksOverThreshold : RecordProvenance {
  std::vector<std::int64_t> time_utc_s;  // of each peak, increasing
  std::vector<double> level_m;           // peak levels (> threshold_m)
  double threshold_m = 0.0;
  std::optional<double> threshold_quantile;  // set when u came from a quantile
  double separation_h = default_separation_h;
  std::size_t exceedances = 0;   // samples above u in kept years (before declustering)
  double effective_years = 0.0;  // T
  double events_per_yr = 0.0;    // λ_u
  // Declustered events per year at levels below u (ascending levels, descending rates),
  // for StillWaterModel::below_threshold.
  EmpiricalRateCurve below_threshold;

  [[nodiscard]] std::size_t size() const noexcept { return level_m.size(); }
  [[nodiscard]] std::string summary() const;
};

// InputError for both or a bad threshold option, a quantile outside (0, 1), a separation that
// is not positive, no complete year, or no level above the threshold.
[[nodiscard]] PeaksOverThreshold peaks_over_threshold(const WaterLevelSeries& series,
                                                      const PeaksOptions& options = {});

// Number of clusters of levels above `level_m` (runs declustering with separation_s) among
// the samples i with use[i]; the building block of peaks_over_threshold and its rate curve.
[[nodiscard]] std::size_t count_clusters(const std::vector<std::int64_t>& time_utc_s,
                                         const std::vector<double>& level_m,
                                         const std::vector<bool>& use, double level_threshold_m,
                                         double separation_s);

// Hyndman & Fan (1996) type-7 sample quantile of `values` (copied and sorted), p in [0, 1].
[[nodiscard]] double sample_quantile(std::vector<double> values, double p);

}  // namespace tidewright::record
