// Mean-sea-level trend removal; glossary and formulas in the header.
#include "tidewright/record/mean_sea_level_trend.hpp"

#include <Eigen/Dense>
#include <cmath>
#include <cstdio>

#include "tidewright/common/error.hpp"
#include "tidewright/record/timestamp.hpp"

namespace tidewright::record {
namespace {

struct Line {
  double a = 0.0;  // value at the epoch (m)
  double b = 0.0;  // slope (m per mean Gregorian year)
};

// Least squares of y on [1, x] by column-pivoting Householder QR (Golub & Van Loan §5.4).
Line fit_line(const Eigen::VectorXd& x, const Eigen::VectorXd& y) {
  Eigen::MatrixXd design(x.size(), 2);
  design.col(0).setOnes();
  design.col(1) = x;
  const Eigen::Vector2d coef = design.colPivHouseholderQr().solve(y);
  return {coef(0), coef(1)};
}

std::string format_epoch(double epoch_yr) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%g", epoch_yr);
  return buf;
}

}  // namespace

std::string_view detrend_method_name(DetrendMethod method) {
  switch (method) {
    case DetrendMethod::none:
      return "none";
    case DetrendMethod::annual_mean:
      return "annual-mean";
    case DetrendMethod::linear:
      return "linear";
  }
  return "none";
}

DetrendMethod parse_detrend_method(std::string_view name, std::string_view where) {
  for (auto m : {DetrendMethod::none, DetrendMethod::annual_mean, DetrendMethod::linear}) {
    if (name == detrend_method_name(m)) return m;
  }
  throw InputError(std::string(where), "'" + std::string(name) + "' is not a detrending method",
                   "use none, annual-mean or linear");
}

double record_mid_epoch(const RecordYears& years) {
  const RecordYear* first = nullptr;
  const RecordYear* last = nullptr;
  for (const auto& y : years.years) {
    if (!y.kept) continue;
    if (first == nullptr) first = &y;
    last = &y;
  }
  if (first == nullptr) {
    throw InputError("reference epoch", "the record has no year complete enough to place it",
                     "give a longer record or a lower minimum completeness");
  }
  return decimal_year(
      0.5 * (static_cast<double>(first->start_utc_s) + static_cast<double>(last->end_utc_s)));
}

DetrendedLevels remove_mean_sea_level_trend(const WaterLevelSeries& series,
                                            const RecordYears& years, DetrendMethod method,
                                            std::optional<double> epoch_yr) {
  DetrendedLevels out;
  out.level_m = series.level_m;
  out.detrend.method = method;
  if (method == DetrendMethod::none) return out;
  out.detrend.epoch_is_default = !epoch_yr.has_value();
  out.detrend.epoch_yr = epoch_yr ? *epoch_yr : record_mid_epoch(years);
  // Years 1 to 9999: what ISO 8601 timestamps can express, and what the calendar code takes.
  if (!(out.detrend.epoch_yr >= 1.0 && out.detrend.epoch_yr < 10000.0)) {
    throw InputError("reference epoch",
                     format_epoch(out.detrend.epoch_yr) + " is not a year from 1 to 9999",
                     "give a decimal year such as 2000.0");
  }
  if (epoch_yr && !years.years.empty()) {
    const double first = years.years.front().year;
    const double end = years.years.back().year + 1.0;
    if (*epoch_yr < first - max_epoch_outside_record_yr || *epoch_yr > end + max_epoch_outside_record_yr) {
      throw InputError("reference epoch",
                       format_epoch(*epoch_yr) + " lies more than " + format_epoch(max_epoch_outside_record_yr) +
                           " years outside the record (" + std::to_string(years.years.front().year) + "-" +
                           std::to_string(years.years.back().year) + "), so the trend would be extrapolated too far",
                       "give an epoch within the record, e.g. its middle (the default)");
    }
  }
  const double epoch_s = utc_s_of_decimal_year(out.detrend.epoch_yr);
  auto years_from_epoch = [&](double utc_s) { return (utc_s - epoch_s) / seconds_per_year; };
  const std::size_t n_kept = years.kept_count();

  if (method == DetrendMethod::linear) {
    std::size_t n = 0;
    for (const auto& y : years.years) {
      if (y.kept) n += y.last - y.first;
    }
    if (n < 2) {
      throw InputError("detrend", "a linear trend needs at least 2 samples in complete years",
                       "give a longer record or choose no detrending");
    }
    Eigen::VectorXd x(static_cast<Eigen::Index>(n));
    Eigen::VectorXd h(static_cast<Eigen::Index>(n));
    Eigen::Index k = 0;
    for (const auto& y : years.years) {
      if (!y.kept) continue;
      for (std::size_t i = y.first; i < y.last; ++i, ++k) {
        x(k) = years_from_epoch(static_cast<double>(series.time_utc_s[i]));
        h(k) = series.level_m[i];
      }
    }
    const Line line = fit_line(x, h);
    for (std::size_t i = 0; i < out.level_m.size(); ++i) {
      out.level_m[i] -= line.b * years_from_epoch(static_cast<double>(series.time_utc_s[i]));
    }
    out.detrend.trend_mm_per_yr = 1000.0 * line.b;
    out.detrend.mean_at_epoch_m = line.a;
    out.detrend.points = n;
    return out;
  }

  // annual_mean
  if (n_kept < 2) {
    throw InputError("detrend",
                     "annual-mean detrending needs at least 2 complete years; the record has " +
                         std::to_string(n_kept),
                     "give a longer record or choose no detrending");
  }
  Eigen::VectorXd x(static_cast<Eigen::Index>(n_kept));
  Eigen::VectorXd m(static_cast<Eigen::Index>(n_kept));
  std::vector<double> year_mean(years.years.size(), 0.0);
  Eigen::Index k = 0;
  for (std::size_t j = 0; j < years.years.size(); ++j) {
    const auto& y = years.years[j];
    if (!y.kept) continue;
    double sum = 0.0;
    for (std::size_t i = y.first; i < y.last; ++i) sum += series.level_m[i];
    year_mean[j] = sum / static_cast<double>(y.last - y.first);
    x(k) = years_from_epoch(
        0.5 * (static_cast<double>(y.start_utc_s) + static_cast<double>(y.end_utc_s)));
    m(k) = year_mean[j];
    ++k;
  }
  const Line line = fit_line(x, m);
  for (std::size_t j = 0; j < years.years.size(); ++j) {
    const auto& y = years.years[j];
    for (std::size_t i = y.first; i < y.last; ++i) {
      out.level_m[i] =
          y.kept ? series.level_m[i] - year_mean[j] + line.a
                 : series.level_m[i] -
                       line.b * years_from_epoch(static_cast<double>(series.time_utc_s[i]));
    }
  }
  out.detrend.trend_mm_per_yr = 1000.0 * line.b;
  out.detrend.mean_at_epoch_m = line.a;
  out.detrend.points = n_kept;
  return out;
}

}  // namespace tidewright::record
