#include "tidewright/extremes/still_water_model.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <utility>

#include "rate_sum_kernel.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::extremes {

namespace detail {
// Below a GPD threshold: log-linear interpolation on the empirical curve, joined to lambda_u at
// u, without copying the curve; `slope` gets d ln N / dz of the segment used (0 below the
// first point).
double below_threshold_rate(const StillWaterModel& m, double level_m, double& slope) {
  const auto& c = m.below_threshold;
  if (c.level_m.empty()) {
    throw ComputationError("GPD model", "level " + std::to_string(level_m) +
                               " m lies below the threshold and no empirical rate curve is given",
                           "give the declustered peaks below the threshold or lower the threshold");
  }
  slope = 0.0;
  if (level_m <= c.level_m.front()) return c.rate_per_yr.front();
  // Points 0..n-1 of the curve, then u itself when the curve stops short of it.
  const std::size_t n = c.level_m.size();
  const std::size_t points = c.level_m.back() < m.threshold_m ? n + 1 : n;
  const auto level_at = [&](std::size_t j) { return j < n ? c.level_m[j] : m.threshold_m; };
  const auto rate_at = [&](std::size_t j) { return j < n ? c.rate_per_yr[j] : m.rate_per_yr; };
  const auto pos = static_cast<std::size_t>(std::upper_bound(c.level_m.begin(), c.level_m.end(), level_m) -
                                            c.level_m.begin());
  const std::size_t hi = std::min(pos, points - 1);
  const std::size_t lo = hi - 1;
  const double w = (level_m - level_at(lo)) / (level_at(hi) - level_at(lo));
  const double log_lo = std::log(rate_at(lo));
  const double log_hi = std::log(rate_at(hi));
  slope = (log_hi - log_lo) / (level_at(hi) - level_at(lo));
  return std::exp((1.0 - w) * log_lo + w * log_hi);
}
}  // namespace detail

namespace {

using detail::below_threshold_rate;

using detail::xi_small;

// [1 + xi y]^(-1/xi) with y = (z - m)/sigma; the xi -> 0 limit is exp(-y) (Coles 2001, §3.1.3).
double tail_power(double y, double xi) {
  if (std::abs(xi) < xi_small) return std::exp(-y);
  const double t = 1.0 + xi * y;
  if (t <= 0.0) return xi < 0.0 ? 0.0 : std::numeric_limits<double>::infinity();
  return std::exp(-std::log1p(xi * y) / xi);
}

// Inverse of tail_power: y with [1 + xi y]^(-1/xi) = r.
double inverse_tail_power(double r, double xi) {
  if (std::abs(xi) < xi_small) return -std::log(r);
  return std::expm1(-xi * std::log(r)) / xi;
}


// N and its z-derivatives for c [1 + xi y]^(-1/xi), y = (z - m)/sigma (see the header).
RateDerivatives tail_derivatives(double y, double xi, double scale_m, double factor) {
  const double n = factor * tail_power(y, xi);
  if (std::abs(xi) < xi_small) return {n, -n / scale_m, n / (scale_m * scale_m)};
  const double t = 1.0 + xi * y;
  if (t <= 0.0) {
    return xi < 0.0 ? RateDerivatives{}
                    : RateDerivatives{n, -std::numeric_limits<double>::infinity(), n};
  }
  const double st = scale_m * t;
  return {n, -n / st, (1.0 + xi) * n / (st * st)};
}

}  // namespace

std::string_view family_name(Family family) {
  switch (family) {
    case Family::gumbel: return "gumbel";
    case Family::gev: return "gev";
    case Family::gpd: return "gpd";
  }
  return "unknown";
}

StillWaterModel StillWaterModel::squared_rates() const {
  StillWaterModel m = *this;
  m.scale_m = 0.5 * scale_m;
  m.shape = 0.5 * shape;
  m.rate_per_yr = rate_per_yr * rate_per_yr;
  for (double& r : m.below_threshold.rate_per_yr) r *= r;
  return m;
}

double StillWaterModel::annual_exceedance_rate(double level_m) const {
  const double xi = family == Family::gumbel ? 0.0 : shape;
  if (family != Family::gpd) return tail_power((level_m - location_m) / scale_m, xi);
  if (level_m >= threshold_m) return rate_per_yr * tail_power((level_m - threshold_m) / scale_m, xi);
  double slope = 0.0;
  return below_threshold_rate(*this, level_m, slope);
}

RateDerivatives StillWaterModel::annual_exceedance_rate_derivatives(double level_m) const {
  const double xi = family == Family::gumbel ? 0.0 : shape;
  if (family != Family::gpd) return tail_derivatives((level_m - location_m) / scale_m, xi, scale_m, 1.0);
  if (level_m >= threshold_m) {
    return tail_derivatives((level_m - threshold_m) / scale_m, xi, scale_m, rate_per_yr);
  }
  double slope = 0.0;
  const double r = below_threshold_rate(*this, level_m, slope);
  return {r, slope * r, slope * slope * r};
}

RateDerivatives StillWaterModel::weighted_shifted_rates(double level_m, std::span<const double> shift_m,
                                                        std::span<const double> weight, bool derivatives) const {
  if (shift_m.size() != weight.size()) {
    throw InputError("weighted rates", std::to_string(shift_m.size()) + " shifts for " +
                                           std::to_string(weight.size()) + " weights",
                     "give one weight per shift");
  }
  return detail::batch_rate_sum(*this, {}, level_m, shift_m, weight, derivatives);
}

std::vector<std::string_view> rate_sum_builds() { return detail::rate_sum_build_names(); }

RateDerivatives weighted_shifted_rates_in_build(const StillWaterModel& m, std::string_view build, double level_m,
                                                std::span<const double> shift_m, std::span<const double> weight,
                                                bool derivatives) {
  const std::vector<std::string_view> names = rate_sum_builds();
  if (std::find(names.begin(), names.end(), build) == names.end()) {
    throw InputError("rate sum build '" + std::string(build) + "'", "is not one this processor runs",
                     "pick one of rate_sum_builds()");
  }
  if (shift_m.size() != weight.size()) return m.weighted_shifted_rates(level_m, shift_m, weight, derivatives);
  return detail::batch_rate_sum(m, build, level_m, shift_m, weight, derivatives);
}

double StillWaterModel::level_for_rate(double rate) const {
  const double xi = family == Family::gumbel ? 0.0 : shape;
  if (family != Family::gpd) return location_m + scale_m * inverse_tail_power(rate, xi);
  if (rate <= rate_per_yr) return threshold_m + scale_m * inverse_tail_power(rate / rate_per_yr, xi);
  const auto& c = below_threshold;
  for (std::size_t i = c.level_m.size(); i-- > 0;) {
    const double r_hi = (i + 1 < c.level_m.size()) ? c.rate_per_yr[i + 1] : rate_per_yr;
    const double z_hi = (i + 1 < c.level_m.size()) ? c.level_m[i + 1] : threshold_m;
    if (rate <= c.rate_per_yr[i] && rate >= r_hi) {
      const double w = (std::log(rate) - std::log(c.rate_per_yr[i])) /
                       (std::log(r_hi) - std::log(c.rate_per_yr[i]));
      return c.level_m[i] + w * (z_hi - c.level_m[i]);
    }
  }
  throw ComputationError("GPD model", "rate " + std::to_string(rate) +
                             " per year is above every rate the model covers",
                         "ask for a rarer level or give more peaks below the threshold");
}

}  // namespace tidewright::extremes
