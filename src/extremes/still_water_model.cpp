#include "tidewright/extremes/still_water_model.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "tidewright/common/error.hpp"

namespace tidewright::extremes {
namespace {

// Below this |xi| the xi -> 0 limit is used through log1p/expm1 series, avoiding 0/0.
constexpr double xi_small = 1e-9;

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

}  // namespace

std::string_view family_name(Family family) {
  switch (family) {
    case Family::gumbel: return "gumbel";
    case Family::gev: return "gev";
    case Family::gpd: return "gpd";
  }
  return "unknown";
}

double StillWaterModel::annual_exceedance_rate(double level_m) const {
  const double xi = family == Family::gumbel ? 0.0 : shape;
  if (family != Family::gpd) return tail_power((level_m - location_m) / scale_m, xi);
  if (level_m >= threshold_m) return rate_per_yr * tail_power((level_m - threshold_m) / scale_m, xi);
  const auto& c = below_threshold;
  if (c.level_m.empty()) {
    throw ComputationError("GPD model", "level " + std::to_string(level_m) +
                               " m lies below the threshold and no empirical rate curve is given",
                           "give the declustered peaks below the threshold or lower the threshold");
  }
  if (level_m <= c.level_m.front()) return c.rate_per_yr.front();
  // Log-linear interpolation on the curve, joined to lambda_u at u.
  std::vector<double> lv = c.level_m;
  std::vector<double> rt = c.rate_per_yr;
  if (lv.back() < threshold_m) {
    lv.push_back(threshold_m);
    rt.push_back(rate_per_yr);
  }
  const auto it = std::upper_bound(lv.begin(), lv.end(), level_m);
  const auto hi = static_cast<std::size_t>(std::min<std::ptrdiff_t>(it - lv.begin(), static_cast<std::ptrdiff_t>(lv.size()) - 1));
  const std::size_t lo = hi - 1;
  const double w = (level_m - lv[lo]) / (lv[hi] - lv[lo]);
  return std::exp((1.0 - w) * std::log(rt[lo]) + w * std::log(rt[hi]));
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
