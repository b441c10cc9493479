// Glossary: see include/tidewright/climate/land_ice.hpp.
#include "tidewright/climate/land_ice.hpp"

#include <algorithm>
#include <cmath>
#include <string>
#include <utility>

#include "tidewright/common/error.hpp"

namespace tidewright::climate {

namespace {

void check_path(const std::vector<int>& years, const std::vector<double>& warming_k, const char* term) {
  if (years.empty() || years.size() != warming_k.size()) {
    throw InputError(term, "needs one warming value per year", "pass matching year and warming columns");
  }
  for (std::size_t i = 1; i < years.size(); ++i) {
    if (years[i] != years[i - 1] + 1) throw InputError(term, "needs consecutive years", "pass annual steps");
  }
}

// Integral over one step of g(T) for T linear in the step, by Simpson's rule (exact for the
// polynomials of degree <= 3 used here when T keeps its sign).
template <typename Rate>
std::vector<double> cumulate(const std::vector<double>& warming_k, Rate rate) {
  std::vector<double> out(warming_k.size(), 0.0);
  for (std::size_t i = 1; i < warming_k.size(); ++i) {
    const double t0 = warming_k[i - 1];
    const double t1 = warming_k[i];
    out[i] = out[i - 1] + (rate(t0) + 4.0 * rate(0.5 * (t0 + t1)) + rate(t1)) / 6.0;
  }
  return out;
}

// No more ice lost than there is.
std::vector<double> capped(std::vector<double> loss_m, double inventory_m) {
  for (double& x : loss_m) x = std::min(x, inventory_m);
  return loss_m;
}

}  // namespace

std::vector<double> glacier_rise_m(const GlacierParameters& p, const std::vector<int>& years,
                                   const std::vector<double>& warming_k) {
  check_path(years, warming_k, "glaciers");
  if (!(p.volume_2019_m > 0.0) || !(p.volume_exponent >= 0.0 && p.volume_exponent < 1.0)) {
    throw InputError("glaciers", "volume must be positive and the exponent in [0, 1)", "check the glacier parameters");
  }
  if (p.volume_year < years.front() || p.volume_year > years.back()) {
    throw InputError("glaciers", "the path must include the volume year " + std::to_string(p.volume_year),
                     "run from before the volume year");
  }
  const double one_minus_n = 1.0 - p.volume_exponent;
  // I(t) = int g(T - T_g0) dt.
  const double a = p.factor * p.sensitivity_m_per_yr_k;
  const double q = p.factor * p.quadratic_m_per_yr_k2;
  const double t0 = p.equilibrium_warming_k;
  const std::vector<double> integral =
      cumulate(warming_k, [a, q, t0](double t) { return a * (t - t0) + q * (t - t0) * std::fabs(t - t0); });
  const double i_ref = integral[static_cast<std::size_t>(p.volume_year - years.front())];
  const double u_ref = std::pow(p.volume_2019_m, one_minus_n);
  const double slope = one_minus_n * std::pow(p.volume_2019_m, -p.volume_exponent);
  std::vector<double> volume(warming_k.size());
  for (std::size_t i = 0; i < warming_k.size(); ++i) {
    const double u = u_ref - slope * (integral[i] - i_ref);
    volume[i] = u > 0.0 ? std::pow(u, 1.0 / one_minus_n) : 0.0;  // all glacier ice gone
  }
  std::vector<double> out(warming_k.size());
  for (std::size_t i = 0; i < warming_k.size(); ++i) out[i] = volume.front() - volume[i];
  return out;
}

std::vector<double> greenland_rise_m(const GreenlandParameters& p, const std::vector<int>& years,
                                     const std::vector<double>& warming_k) {
  check_path(years, warming_k, "greenland");
  const double s = p.factor * p.smb_m_per_yr_k2;
  const double d = p.factor * p.discharge_m_per_yr_k;
  return capped(cumulate(warming_k, [s, d](double t) { return s * t * std::fabs(t) + d * t; }),
                greenland_inventory_m);
}

std::vector<double> antarctic_rise_m(const AntarcticParameters& p, const std::vector<int>& years,
                                     const std::vector<double>& warming_k, const std::vector<double>& ocean_k) {
  check_path(years, warming_k, "antarctica");
  check_path(years, ocean_k, "antarctica");
  const double snow = p.accumulation_m_per_yr * p.snowfall_increase_per_k * p.antarctic_warming_ratio;
  const double discharge = p.discharge_factor * p.discharge_m_per_yr_k;
  std::vector<double> out(warming_k.size(), 0.0);
  for (std::size_t i = 1; i < warming_k.size(); ++i) {
    out[i] = out[i - 1] + 0.5 * (discharge * (ocean_k[i - 1] + ocean_k[i]) - snow * (warming_k[i - 1] + warming_k[i]));
  }
  return capped(std::move(out), antarctica_inventory_m);
}

std::vector<double> land_water_rise_m(const LandWaterParameters& p, const std::vector<int>& years) {
  if (years.empty()) throw InputError("land_water", "needs at least one year", "pass the years");
  std::vector<double> out(years.size());
  for (std::size_t i = 0; i < years.size(); ++i) {
    out[i] = p.factor * p.rate_m_per_yr * static_cast<double>(years[i] - years.front());
  }
  return out;
}

}  // namespace tidewright::climate
