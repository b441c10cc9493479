// Shared helpers for the planning tests: models with known closed forms and seeded normal draws
// made independently of the library's own samplers.
#pragma once

#include <boost/math/distributions/normal.hpp>
#include <cstdint>
#include <random>
#include <vector>

#include "tidewright/extremes/still_water_model.hpp"
#include "tidewright/local/rise_ensemble.hpp"

namespace tidewright::testing {

inline extremes::StillWaterModel gumbel(double location_m, double scale_m) {
  return {extremes::Family::gumbel, location_m, scale_m, 0.0, 0.0, 1.0, {}};
}
inline extremes::StillWaterModel gev(double location_m, double scale_m, double shape) {
  return {extremes::Family::gev, location_m, scale_m, shape, 0.0, 1.0, {}};
}

// n draws from N(mean, sd): mt19937_64 uniforms (defined by the C++ standard, so the same on
// every platform) through the Boost.Math normal quantile.
inline std::vector<double> normal_draws(std::size_t n, double mean, double sd, std::uint64_t seed) {
  std::mt19937_64 gen(seed);
  const boost::math::normal_distribution<double> norm(mean, sd);
  std::vector<double> out(n);
  for (auto& x : out) {
    const double u = (static_cast<double>(gen() >> 11) + 0.5) * 0x1.0p-53;
    x = boost::math::quantile(norm, u);
  }
  return out;
}

// An ensemble with one member per row of `rise_m` (members x years).
inline local::RiseEnsemble ensemble(std::vector<int> years, Eigen::MatrixXd rise_m) {
  local::RiseEnsemble e;
  e.years = std::move(years);
  e.rise_m = std::move(rise_m);
  e.reference = "test";
  e.scenario = "test";
  return e;
}

// One member rising linearly at rate_m_per_yr from 0 in 2020 to 2150.
inline local::RiseEnsemble linear_rise_from_2020(double rate_m_per_yr) {
  Eigen::MatrixXd rise(1, 2);
  rise << 0.0, rate_m_per_yr * 130.0;
  return ensemble({2020, 2150}, rise);
}

}  // namespace tidewright::testing
