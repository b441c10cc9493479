// Glossary: see include/tidewright/local/normal_scores.hpp.
#include "tidewright/local/normal_scores.hpp"

#include <boost/math/distributions/normal.hpp>
#include <random>

namespace tidewright::local {

std::vector<double> normal_scores(std::uint64_t seed, std::uint64_t stream, std::size_t count) {
  std::seed_seq seq{static_cast<std::uint32_t>(seed), static_cast<std::uint32_t>(seed >> 32),
                    static_cast<std::uint32_t>(stream), static_cast<std::uint32_t>(stream >> 32)};
  std::mt19937_64 gen(seq);
  const boost::math::normal_distribution<double> standard;
  std::vector<double> out(count);
  for (double& s : out) {
    // Uniform on the 2^53 midpoints of (0, 1): never 0 or 1, so the quantile is finite.
    const double u = (static_cast<double>(gen() >> 11) + 0.5) * 0x1.0p-53;
    s = boost::math::quantile(standard, u);
  }
  return out;
}

}  // namespace tidewright::local
