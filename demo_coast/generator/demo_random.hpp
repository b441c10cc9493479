// Portable random draws for the demo generator (invented data).
//
// std::mt19937_64's output sequence is fixed by the C++ standard, but the std:: distributions
// (uniform_real_distribution, normal_distribution, poisson_distribution) are not: each standard
// library implements them differently. The generator promises "same seed, same bytes", so the
// draws are made here by hand from the engine's raw 64-bit output.
//
// Glossary: u ~ U(0,1) open interval; z ~ N(0,1); e ~ Exp(rate).
#pragma once

#include <cmath>
#include <cstdint>
#include <numbers>
#include <random>

namespace tidewright::demo {

// SplitMix64 finaliser (Steele, Lea & Flood 2014, OOPSLA "Fast splittable pseudorandom number
// generators"), used to derive independent sub-stream seeds from one user seed, so that each
// part of the generator keeps its own draws when another part changes.
[[nodiscard]] constexpr std::uint64_t split_seed(std::uint64_t seed, std::uint64_t stream) {
  std::uint64_t z = seed + 0x9E3779B97F4A7C15ULL * (stream + 1);
  z = (z ^ (z >> 30U)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27U)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31U);
}

class Draws {
 public:
  explicit Draws(std::uint64_t seed) : engine_(seed) {}

  // u in (0, 1): the top 53 bits of one engine output, shifted half a step off zero.
  double uniform() { return (static_cast<double>(engine_() >> 11U) + 0.5) * 0x1.0p-53; }
  // Box–Muller transform (Box & Muller 1958, Ann. Math. Stat. 29:610), both values used.
  double normal() {
    if (has_spare_) {
      has_spare_ = false;
      return spare_;
    }
    const double r = std::sqrt(-2.0 * std::log(uniform()));
    const double a = 2.0 * std::numbers::pi * uniform();
    spare_ = r * std::sin(a);
    has_spare_ = true;
    return r * std::cos(a);
  }
  // Inverse-CDF draw of an exponential waiting time with the given rate.
  double exponential(double rate) { return -std::log(uniform()) / rate; }
  // An index in [0, n) (n > 0); the bias of the floor is below 2^-40 for the n used here.
  std::uint64_t index_below(std::uint64_t n) {
    return static_cast<std::uint64_t>(uniform() * static_cast<double>(n)) % n;
  }

 private:
  std::mt19937_64 engine_;
  bool has_spare_ = false;
  double spare_ = 0.0;
};

}  // namespace tidewright::demo
