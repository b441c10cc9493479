// Seeded standard normal scores that are the same on every platform: std::mt19937_64 (its
// output sequence is fixed by the C++ standard) seeded through std::seed_seq (also fixed),
// 53-bit uniforms u = (k + 1/2) 2^-53, and the Boost.Math normal quantile. The standard
// library's normal_distribution is not used because its algorithm differs between libraries.
//
// Glossary: s normal score; u uniform in (0, 1); stream an integer that separates the draws
// of different terms (land motion, ocean dynamics, table sampling) made from one seed.
#pragma once

#include <cstdint>
#include <vector>

namespace tidewright::local {

// Streams used by this module, so that one seed gives independent terms.
inline constexpr std::uint64_t stream_land_motion = 1;
inline constexpr std::uint64_t stream_ocean_dynamic = 2;
inline constexpr std::uint64_t stream_table_members = 3;

[[nodiscard]] std::vector<double> normal_scores(std::uint64_t seed, std::uint64_t stream, std::size_t count);

}  // namespace tidewright::local
