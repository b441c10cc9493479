// Per-cell flood products. Glossary: include/tidewright/terrain/inundation.hpp.
#include "tidewright/terrain/inundation.hpp"

#include <algorithm>
#include <boost/math/tools/roots.hpp>
#include <cmath>
#include <limits>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::terrain {
namespace {

constexpr float nan_f = std::numeric_limits<float>::quiet_NaN();
constexpr double inf = std::numeric_limits<double>::infinity();

void check_range(double lowest_m, double highest_m, const char* what) {
  if (!std::isfinite(lowest_m) || !std::isfinite(highest_m) || highest_m < lowest_m) {
    throw InputError(what,
                     "the level range [" + std::to_string(lowest_m) + ", " +
                         std::to_string(highest_m) + "] m is not a finite interval",
                     "give finite levels with lowest <= highest");
  }
}

}  // namespace

ExtentClass classify_cell(float elevation_m, float threshold_m, double level_m) noexcept {
  if (std::isnan(threshold_m)) return ExtentClass::nodata;
  if (threshold_m == -std::numeric_limits<float>::infinity()) return ExtentClass::sea;
  if (static_cast<double>(threshold_m) <= level_m) return ExtentClass::connected_flooded;
  if (static_cast<double>(elevation_m) <= level_m) return ExtentClass::cut_off_low_ground;
  return ExtentClass::dry;
}

float flood_depth_m(float elevation_m, float threshold_m, double level_m) noexcept {
  if (classify_cell(elevation_m, threshold_m, level_m) != ExtentClass::connected_flooded) {
    return nan_f;
  }
  return static_cast<float>(level_m - static_cast<double>(elevation_m));
}

AepLookup::AepLookup(const RateFunction& rate, double lowest_m, double highest_m,
                     std::size_t points)
    : lowest_m_(lowest_m) {
  check_range(lowest_m, highest_m, "AEP lookup");
  points = std::max<std::size_t>(points, 2);
  step_m_ = (highest_m - lowest_m) / static_cast<double>(points - 1);
  log_rate_.resize(points);
  double previous = inf;
  for (std::size_t i = 0; i < points; ++i) {
    const double z = lowest_m + step_m_ * static_cast<double>(i);
    const double n = rate(z);
    if (std::isnan(n) || n < 0.0) {
      throw ComputationError("AEP lookup",
                             "the annual exceedance rate at " + std::to_string(z) + " m is " +
                                 std::to_string(n) + ", not a rate",
                             "check the still-water model's parameters");
    }
    if (n > previous * (1.0 + 1e-9)) {
      throw ComputationError(
          "AEP lookup",
          "the annual exceedance rate rises with level near " + std::to_string(z) + " m",
          "the rate function must not increase with level; check the model");
    }
    previous = std::min(previous, n);
    log_rate_[i] = std::log(previous);  // -inf for N = 0 (above a finite upper end point)
  }
}

double AepLookup::rate_per_yr(double level_m) const noexcept {
  const double u = step_m_ > 0.0 ? (level_m - lowest_m_) / step_m_ : 0.0;
  const double last = static_cast<double>(log_rate_.size() - 1);
  const double uc = std::clamp(u, 0.0, last);
  const auto i = static_cast<std::size_t>(std::min(std::floor(uc), last - 1.0));
  const double w = uc - static_cast<double>(i);
  const double a = log_rate_[i];
  const double b = log_rate_[i + 1];
  if (std::isfinite(a) && std::isfinite(b)) return std::exp(a + w * (b - a));
  // An infinite end (N = 0 or N = inf): take the lower level's rate, the cautious side.
  return w >= 1.0 ? std::exp(b) : std::exp(a);
}

float AepLookup::operator()(float threshold_m) const noexcept {
  if (std::isnan(threshold_m) || threshold_m == -std::numeric_limits<float>::infinity()) {
    return nan_f;
  }
  if (threshold_m == std::numeric_limits<float>::infinity()) return 0.0F;
  // P = 1 - exp(-N), through expm1 for accuracy at small N.
  return static_cast<float>(-std::expm1(-rate_per_yr(static_cast<double>(threshold_m))));
}

FirstPassingYear::FirstPassingYear(const std::vector<YearlyRate>& years, double aep,
                                   double lowest_m, double highest_m, const RateFunction& today) {
  check_range(lowest_m, highest_m, "first-year raster");
  if (!(aep > 0.0 && aep < 1.0)) {
    throw InputError("first-year raster", "the AEP to pass is " + std::to_string(aep),
                     "give a probability strictly between 0 and 1");
  }
  if (years.empty()) {
    throw InputError("first-year raster", "no years given", "give at least one year");
  }
  const double target_rate = -std::log1p(-aep);  // N with 1 - exp(-N) = p*
  // The highest level whose rate still reaches p*: -inf when none in range does, +inf when all do.
  const auto critical = [&](const RateFunction& rate) {
    const auto excess = [&](double z) { return rate(z) - target_rate; };
    if (excess(lowest_m) < 0.0) return -inf;
    if (excess(highest_m) >= 0.0) return inf;
    // Bisection (Boost.Math roots.hpp) to 1e-9 m: robust for any monotone N.
    const auto tolerance = [](double a, double b) { return std::abs(a - b) <= 1e-9; };
    const auto [lo, hi] = boost::math::tools::bisect(excess, lowest_m, highest_m, tolerance);
    (void)hi;
    return lo;  // excess(lo) >= 0: the highest level known to pass
  };
  int previous_year = std::numeric_limits<int>::min();
  for (const auto& y : years) {
    if (y.year <= previous_year || y.year <= already_today || y.year > 32767) {
      throw InputError("first-year raster",
                       "year " + std::to_string(y.year) + " is out of order or out of range",
                       "give years in ascending order between 2 and 32767");
    }
    previous_year = y.year;
    years_.push_back(y.year);
    critical_m_.push_back(critical(y.rate));
  }
  if (today) critical_today_m_ = critical(today);
}

std::int16_t FirstPassingYear::operator()(float threshold_m) const noexcept {
  if (std::isnan(threshold_m) || threshold_m == -std::numeric_limits<float>::infinity()) {
    return nodata;
  }
  if (threshold_m == std::numeric_limits<float>::infinity()) return never;
  const auto t = static_cast<double>(threshold_m);
  if (t <= critical_today_m_) return already_today;
  for (std::size_t i = 0; i < years_.size(); ++i) {
    if (t <= critical_m_[i]) return static_cast<std::int16_t>(years_[i]);
  }
  return never;
}

}  // namespace tidewright::terrain
