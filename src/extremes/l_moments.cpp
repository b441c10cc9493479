// Sample L-moments and L-moment estimates. Glossary: see include/tidewright/extremes/l_moments.hpp.
#include "tidewright/extremes/l_moments.hpp"

#include <algorithm>
#include <boost/math/constants/constants.hpp>
#include <boost/math/special_functions/gamma.hpp>
#include <cmath>
#include <vector>

#include "tidewright/common/error.hpp"

namespace tidewright::extremes {

SampleLMoments sample_l_moments(std::span<const double> values) {
  const std::size_t n = values.size();
  if (n < 3) {
    throw InputError("sample_l_moments", std::to_string(n) + " values given",
                     "give at least 3 values");
  }
  std::vector<double> x(values.begin(), values.end());
  std::sort(x.begin(), x.end());
  // b_r = n^-1 sum_j [(j-1)...(j-r)]/[(n-1)...(n-r)] x_(j), ascending order (Hosking 1990,
  // eq. 2.3).
  const double nd = static_cast<double>(n);
  double b0 = 0.0;
  double b1 = 0.0;
  double b2 = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    const double j = static_cast<double>(i);  // j - 1 with j counted from 1
    b0 += x[i];
    b1 += x[i] * j / (nd - 1.0);
    b2 += x[i] * j * (j - 1.0) / ((nd - 1.0) * (nd - 2.0));
  }
  b0 /= nd;
  b1 /= nd;
  b2 /= nd;
  // l1 = b0, l2 = 2 b1 - b0, l3 = 6 b2 - 6 b1 + b0 (Hosking 1990, eq. 2.4).
  SampleLMoments m;
  m.l1 = b0;
  m.l2 = 2.0 * b1 - b0;
  const double l3 = 6.0 * b2 - 6.0 * b1 + b0;
  if (!(m.l2 > 0.0)) {
    throw InputError("sample_l_moments", "the values are all equal (L-scale 0)",
                     "give a record whose values vary");
  }
  m.t3 = l3 / m.l2;
  return m;
}

StartValues gumbel_l_moment_estimates(std::span<const double> maxima) {
  const SampleLMoments m = sample_l_moments(maxima);
  StartValues s;
  s.scale = m.l2 / boost::math::constants::ln_two<double>();              // Hosking 1990, Table 1
  s.location = m.l1 - boost::math::constants::euler<double>() * s.scale;  // Hosking 1990, Table 1
  return s;
}

StartValues gev_l_moment_estimates(std::span<const double> maxima) {
  const SampleLMoments m = sample_l_moments(maxima);
  // c = 2/(3 + t3) - ln 2/ln 3; k = 7.8590 c + 2.9554 c^2 (Hosking, Wallis & Wood 1985, eq. 14).
  const double c = 2.0 / (3.0 + m.t3) - std::log(2.0) / std::log(3.0);
  double k = 7.8590 * c + 2.9554 * c * c;
  // Keep the start inside the region where the approximation is meant to hold (|k| < 0.5 in
  // HWW 1985, with a margin) so that Gamma(1 + k) stays finite.
  k = std::clamp(k, -0.9, 0.9);
  if (std::abs(k) < 1e-6) return gumbel_l_moment_estimates(maxima);
  // sigma = l2 k / ((1 - 2^-k) Gamma(1 + k)); mu = l1 + sigma (Gamma(1 + k) - 1)/k (HWW 1985, eq.
  // 15).
  const double g = boost::math::tgamma(1.0 + k);
  StartValues s;
  s.scale = m.l2 * k / (-std::expm1(-k * std::log(2.0)) * g);
  s.location = m.l1 + s.scale * (g - 1.0) / k;
  s.shape = -k;
  return s;
}

StartValues gpd_l_moment_estimates(std::span<const double> excesses) {
  const SampleLMoments m = sample_l_moments(excesses);
  // For the GPD of the excess, l1 = sigma/(1 - xi), l2 = sigma/((1 - xi)(2 - xi))
  // (Hosking & Wallis 1987, sec. 3 with k = -xi): xi = 2 - l1/l2, sigma = (1 - xi) l1.
  StartValues s;
  s.shape = std::clamp(2.0 - m.l1 / m.l2, -0.9, 0.9);
  s.scale = (1.0 - s.shape) * m.l1;
  return s;
}

}  // namespace tidewright::extremes
