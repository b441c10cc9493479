// Seeded draws from the extreme-value distributions, by inversion of the cdf: used by the
// parametric bootstrap and by the tests. u = ((bits >> 11) + 0.5) 2^-53 from std::mt19937_64
// lies in (0, 1) (never 0 or 1) and does not depend on the standard library's distributions,
// so the same seed gives the same draws on every platform.
#pragma once

#include <cstdint>
#include <random>
#include <vector>

#include "tidewright/extremes/distributions.hpp"

namespace tidewright::extremes {

[[nodiscard]] inline double uniform_open01(std::mt19937_64& rng) {
  return (static_cast<double>(rng() >> 11) + 0.5) * 0x1p-53;
}

// n draws from dist (Gumbel, Gev or Gpd) by inversion, continuing rng's sequence.
template <class Dist>
void draw_into(const Dist& dist, std::vector<double>& out, std::mt19937_64& rng) {
  for (double& x : out) x = quantile(dist, uniform_open01(rng));
}

template <class Dist>
[[nodiscard]] std::vector<double> draw(const Dist& dist, std::size_t n, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::vector<double> out(n);
  draw_into(dist, out, rng);
  return out;
}

}  // namespace tidewright::extremes
